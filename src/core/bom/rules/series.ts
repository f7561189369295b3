/** value-off-series: a value outside the IEC 60063 series the design declared for the role. */
import { nearestInSeries, seriesMantissas, type SeriesName } from '../../parts/series.ts';
import { formatValue } from '../../parts/value-parse.ts';
import { BOM_RULES } from '../codes.ts';
import { at, ruleResult } from '../rule.ts';
import type { BomLineReading, BomRuleResult } from '../types.ts';

/** Values are read by decimal conversion, so a series value matches to rounding noise only. */
const SERIES_MATCH_REL = 1e-9;

/**
 * Membership by the decade mantissa (a bisection in one sorted decade), the hot
 * path of a batch: nearestInSeries builds neighbour lists and is kept for the
 * rare value that is off the series. Mantissas near 1 or 10 are tried in both
 * neighbouring decades, so log10 rounding at a power of ten cannot miss.
 */
function inSeries(series: SeriesName, value: number): boolean {
  if (!(value > 0) || !Number.isFinite(value)) return false;
  const mantissas = seriesMantissas(series);
  const exponent = Math.floor(Math.log10(value));
  for (const e of [exponent, exponent - 1, exponent + 1]) {
    const m = value / 10 ** e;
    if (m < 0.999 || m > 10.001) continue;
    let lo = 0;
    let hi = mantissas.length - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (mantissas[mid] < m) lo = mid + 1;
      else hi = mid;
    }
    for (const k of [lo - 1, lo, 0]) {
      const c = k >= 0 ? mantissas[k] : undefined;
      if (c !== undefined && (Math.abs(c - m) <= SERIES_MATCH_REL * m || Math.abs(c * 10 - m) <= SERIES_MATCH_REL * m)) return true;
    }
  }
  return false;
}

export function seriesRule(line: BomLineReading, series: SeriesName): BomRuleResult | undefined {
  if (line.value === undefined || inSeries(series, line.value)) return undefined;
  const near = nearestInSeries(series, line.value);
  return ruleResult(
    BOM_RULES.valueOffSeries,
    `${formatValue(line.value, line.kind)} is not an ${series} value (neighbours ${formatValue(near.lower, line.kind)} and ${formatValue(near.higher, line.kind)})`,
    { value: line.value, series, nearestSeriesValue: near.nearest, errorToNearest: near.errorNearest },
    at(line),
  );
}
