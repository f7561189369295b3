/**
 * Axis ticks and labels. Tick positions come from d3-scale; this module only
 * chooses ONE SI prefix per axis (so a reader compares "10 µs" with "40 µs",
 * never "10 µs" with "0.04 ms") and draws ticks, labels and grid lines.
 */
import { scaleLinear } from 'd3-scale';
import type { ScaleLinear } from 'd3-scale';
import { escapeXml, px, textWidthPx } from './svg-text.ts';

/** SI prefixes (SI Brochure, 9th ed., table 7), femto to tera: the span our quantities use. */
const SI_PREFIXES: readonly { exponent: number; symbol: string }[] = [
  { exponent: -15, symbol: 'f' },
  { exponent: -12, symbol: 'p' },
  { exponent: -9, symbol: 'n' },
  { exponent: -6, symbol: 'µ' }, // U+00B5, the same micro sign the rest of the project writes
  { exponent: -3, symbol: 'm' },
  { exponent: 0, symbol: '' },
  { exponent: 3, symbol: 'k' },
  { exponent: 6, symbol: 'M' },
  { exponent: 9, symbol: 'G' },
  { exponent: 12, symbol: 'T' },
];

/** Units that take no prefix (a "k%" or "mdB" reads as nonsense). */
const UNPREFIXED_UNITS = new Set(['', '%', '1', 'dB', '°', '°C', 'ppm']);

const MINUS = '\u2212'; // typographic minus: same width as the digits, unlike the hyphen

export interface SiTickFormatter {
  /** Prefix symbol for the whole axis ('' for none). */
  readonly prefix: string;
  /** Value of the prefix: a value in base units divided by this is what the label shows. */
  readonly factor: number;
  /** Prefixed unit, e.g. "µs". */
  readonly unitLabel: string;
  /** Tick values in base units, from d3-scale `ticks()`. */
  readonly ticks: number[];
  /** Digits after the decimal point that all ticks need. */
  readonly fractionDigits: number;
  /** Tick label: number and prefixed unit, e.g. "20 µs". */
  format(valueBase: number): string;
  /** Number only, with the tick digits, e.g. "20". */
  formatNumber(valueBase: number): string;
  /** A value label (threshold, percentile) in the axis prefix with at least `significantDigits`. */
  formatPrecise(valueBase: number, significantDigits?: number): string;
}

function formatFixed(scaled: number, digits: number): string {
  const text = scaled.toFixed(digits);
  // "-0.0" and friends read as "0".
  if (Number(text) === 0) return (0).toFixed(digits);
  return text.startsWith('-') ? MINUS + text.slice(1) : text;
}

function prefixFor(maxAbsBase: number, unit: string): { exponent: number; symbol: string } {
  if (UNPREFIXED_UNITS.has(unit) || !(maxAbsBase > 0) || !Number.isFinite(maxAbsBase)) {
    return { exponent: 0, symbol: '' };
  }
  // The epsilon keeps exact powers of 1000 (1e-3 s) in the higher prefix (1 ms, not 1000 µs).
  const exponent = Math.floor(Math.log10(maxAbsBase) / 3 + 1e-9) * 3;
  const clamped = Math.min(12, Math.max(-15, exponent));
  return SI_PREFIXES.find((p) => p.exponent === clamped)!;
}

/**
 * One SI prefix for a whole axis, picked from the larger end of the domain, and
 * a label format with just enough decimals to tell the ticks apart.
 */
export function siTickFormatter(
  domain: readonly [number, number],
  unit: string,
  tickCount = 6,
): SiTickFormatter {
  const [d0, d1] = domain;
  const ticks = scaleLinear().domain([d0, d1]).ticks(tickCount);
  const { exponent, symbol } = prefixFor(Math.max(Math.abs(d0), Math.abs(d1)), unit);
  const factor = 10 ** exponent;
  let fractionDigits = 0;
  if (ticks.length >= 2) {
    const stepScaled = Math.abs(ticks[1] - ticks[0]) / factor;
    // d3 steps are 1, 2 or 5 times a power of ten, so the step's own decade gives the digits.
    fractionDigits = Math.min(12, Math.max(0, -Math.floor(Math.log10(stepScaled) + 1e-9)));
  }
  const unitLabel = `${symbol}${unit}`;
  const withUnit = (n: string) => (unitLabel === '' ? n : unitLabel === '%' ? `${n} %` : `${n} ${unitLabel}`);
  const formatNumber = (valueBase: number) => formatFixed(valueBase / factor, fractionDigits);
  return {
    prefix: symbol,
    factor,
    unitLabel,
    ticks,
    fractionDigits,
    format: (valueBase) => withUnit(formatNumber(valueBase)),
    formatNumber,
    formatPrecise(valueBase, significantDigits = 3) {
      const scaled = valueBase / factor;
      const magnitude = scaled === 0 ? 0 : Math.floor(Math.log10(Math.abs(scaled)));
      const digits = Math.min(12, Math.max(fractionDigits, significantDigits - 1 - magnitude, 0));
      return withUnit(formatFixed(scaled, digits));
    },
  };
}

/** Everyday name of the quantity a unit measures, for axis titles. */
const QUANTITY_BY_UNIT: Record<string, string> = {
  s: 'time',
  V: 'voltage',
  A: 'current',
  Hz: 'frequency',
  'Ω': 'resistance',
  F: 'capacitance',
  W: 'power',
};

/** Axis title such as "time (µs)"; `name` overrides the quantity. */
export function axisTitle(formatter: SiTickFormatter, baseUnit: string, name?: string): string {
  const quantity = name ?? QUANTITY_BY_UNIT[baseUnit] ?? 'value';
  return formatter.unitLabel === '' ? quantity : `${quantity} (${formatter.unitLabel})`;
}

/** Widest tick label on an axis, for sizing the margin it sits in. */
export function maxTickLabelWidthPx(formatter: SiTickFormatter, fontSizePx: number): number {
  return Math.max(0, ...formatter.ticks.map((t) => textWidthPx(formatter.format(t), fontSizePx)));
}

export interface PlotArea {
  left: number;
  top: number;
  width: number;
  height: number;
}

export const AXIS_FONT_PX = 11;
const TICK_LENGTH_PX = 5;
const AXIS_COLOUR = '#333333';
const GRID_COLOUR = '#e3e3e3';

function inRange(scale: ScaleLinear<number, number>, value: number): boolean {
  const [a, b] = scale.domain();
  const lo = Math.min(a, b);
  const hi = Math.max(a, b);
  const slack = (hi - lo) * 1e-9;
  return value >= lo - slack && value <= hi + slack;
}

/** Vertical grid lines, bottom ticks, tick labels and the axis title under the plot area. */
export function renderBottomAxis(
  scale: ScaleLinear<number, number>,
  formatter: SiTickFormatter,
  area: PlotArea,
  title: string,
): string {
  const bottom = area.top + area.height;
  const parts: string[] = ['<g class="axis axis-x">'];
  for (const tick of formatter.ticks) {
    if (!inRange(scale, tick)) continue;
    const x = px(scale(tick));
    parts.push(
      `<line class="grid" x1="${x}" y1="${px(area.top)}" x2="${x}" y2="${px(bottom)}" stroke="${GRID_COLOUR}" stroke-width="1"/>`,
      `<line x1="${x}" y1="${px(bottom)}" x2="${x}" y2="${px(bottom + TICK_LENGTH_PX)}" stroke="${AXIS_COLOUR}" stroke-width="1"/>`,
      `<text class="tick-label" x="${x}" y="${px(bottom + TICK_LENGTH_PX + AXIS_FONT_PX + 2)}" text-anchor="middle" font-size="${AXIS_FONT_PX}" fill="${AXIS_COLOUR}">${escapeXml(formatter.format(tick))}</text>`,
    );
  }
  parts.push(
    `<line x1="${px(area.left)}" y1="${px(bottom)}" x2="${px(area.left + area.width)}" y2="${px(bottom)}" stroke="${AXIS_COLOUR}" stroke-width="1"/>`,
    `<text class="axis-title" x="${px(area.left + area.width / 2)}" y="${px(bottom + TICK_LENGTH_PX + 2 * AXIS_FONT_PX + 12)}" text-anchor="middle" font-size="12" fill="${AXIS_COLOUR}">${escapeXml(title)}</text>`,
    '</g>',
  );
  return parts.join('');
}

/**
 * Ticks, labels and title beside the plot area, on the left or right side.
 * `grid` draws horizontal grid lines (only one vertical axis should, or the
 * two sets of lines fight each other).
 */
export function renderSideAxis(
  side: 'left' | 'right',
  scale: ScaleLinear<number, number>,
  formatter: SiTickFormatter,
  area: PlotArea,
  title: string,
  options: { grid: boolean; colour?: string },
): string {
  const colour = options.colour ?? AXIS_COLOUR;
  const edge = side === 'left' ? area.left : area.left + area.width;
  const direction = side === 'left' ? -1 : 1;
  const anchor = side === 'left' ? 'end' : 'start';
  const parts: string[] = [`<g class="axis axis-y axis-${side}">`];
  for (const tick of formatter.ticks) {
    if (!inRange(scale, tick)) continue;
    const y = px(scale(tick));
    if (options.grid) {
      parts.push(
        `<line class="grid" x1="${px(area.left)}" y1="${y}" x2="${px(area.left + area.width)}" y2="${y}" stroke="${GRID_COLOUR}" stroke-width="1"/>`,
      );
    }
    parts.push(
      `<line x1="${px(edge)}" y1="${y}" x2="${px(edge + direction * TICK_LENGTH_PX)}" y2="${y}" stroke="${colour}" stroke-width="1"/>`,
      `<text class="tick-label" x="${px(edge + direction * (TICK_LENGTH_PX + 3))}" y="${px(scale(tick) + AXIS_FONT_PX * 0.35)}" text-anchor="${anchor}" font-size="${AXIS_FONT_PX}" fill="${colour}">${escapeXml(formatter.format(tick))}</text>`,
    );
  }
  const labelWidth = maxTickLabelWidthPx(formatter, AXIS_FONT_PX);
  const titleX = edge + direction * (TICK_LENGTH_PX + 3 + labelWidth + 12);
  const titleY = area.top + area.height / 2;
  const rotation = side === 'left' ? -90 : 90;
  parts.push(
    `<line x1="${px(edge)}" y1="${px(area.top)}" x2="${px(edge)}" y2="${px(area.top + area.height)}" stroke="${colour}" stroke-width="1"/>`,
    `<text class="axis-title" x="${px(titleX)}" y="${px(titleY)}" transform="rotate(${rotation} ${px(titleX)} ${px(titleY)})" text-anchor="middle" font-size="12" fill="${colour}">${escapeXml(title)}</text>`,
    '</g>',
  );
  return parts.join('');
}

/** Horizontal room a side axis needs outside the plot area. */
export function sideAxisWidthPx(formatter: SiTickFormatter): number {
  return TICK_LENGTH_PX + 3 + maxTickLabelWidthPx(formatter, AXIS_FONT_PX) + 12 + 10;
}

/** Vertical room the bottom axis needs under the plot area. */
export const BOTTOM_AXIS_HEIGHT_PX = TICK_LENGTH_PX + 2 * AXIS_FONT_PX + 12 + 10;
