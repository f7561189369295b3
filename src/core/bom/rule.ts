/** Builds rule results: one place that pairs a code with its fixed severity. */
import type { BomFigureValue, BomLineReading, BomRuleResult } from './types.ts';

export interface RuleDefinition {
  readonly code: string;
  readonly severity: BomRuleResult['severity'];
}

/** Infinity and NaN cannot travel as JSON numbers: "no limit" becomes null. */
function wireSafe(figures: Record<string, BomFigureValue | undefined>): Record<string, BomFigureValue> {
  const out: Record<string, BomFigureValue> = {};
  // for...in over a plain literal visits its own keys in the order Object.entries would, without the pair arrays.
  for (const k in figures) {
    const v = figures[k];
    if (v === undefined) continue;
    out[k] = typeof v === 'number' && !Number.isFinite(v) ? null : v;
  }
  return out;
}

export function ruleResult(
  def: RuleDefinition,
  message: string,
  figures: Record<string, BomFigureValue | undefined> = {},
  where?: { refdes?: string; role?: string },
): BomRuleResult {
  const result: BomRuleResult = { code: def.code, severity: def.severity, message, figures: wireSafe(figures) };
  if (where?.refdes !== undefined) result.refdes = where.refdes;
  if (where?.role !== undefined) result.role = where.role;
  return result;
}

/** Where a line-level rule points: the line's refdes and the role it fills. */
export function at(line: Pick<BomLineReading, 'refdes' | 'role'>): { refdes: string; role: string } {
  return { refdes: line.refdes, role: line.role };
}
