/**
 * Read an axis back from the drawn SVG the way a person does: parse each tick
 * label ("20 µs") into a value in base units and pair it with where the tick
 * sits. Tests then map any drawn line back into data units and compare with the
 * value they asked for, without looking at the plot's internals.
 */
import { byClass, findAll, hasClass, textOf } from './svg-tree.ts';
import type { XmlElement } from './svg-tree.ts';

// SI Brochure, 9th edition (BIPM 2019), table 7: decimal prefixes.
const SI_PREFIX_FACTORS: Record<string, number> = {
  f: 1e-15,
  p: 1e-12,
  n: 1e-9,
  'µ': 1e-6,
  m: 1e-3,
  '': 1,
  k: 1e3,
  M: 1e6,
  G: 1e9,
};

/** "−1.5 mV" with base unit "V" -> -0.0015. Throws when the label does not parse. */
export function parseTickLabel(label: string, baseUnit: string): number {
  const m = /^([\u2212-]?[0-9]+(?:\.[0-9]+)?)(?: (.*))?$/.exec(label);
  if (!m) throw new Error(`tick label ${JSON.stringify(label)} does not parse`);
  const number = Number(m[1].replace('\u2212', '-'));
  const unitText = m[2] ?? '';
  if (baseUnit === '') {
    if (unitText !== '') throw new Error(`unexpected unit in ${label}`);
    return number;
  }
  if (!unitText.endsWith(baseUnit)) throw new Error(`label ${label} is not in ${baseUnit}`);
  const prefix = unitText.slice(0, unitText.length - baseUnit.length);
  const factor = SI_PREFIX_FACTORS[prefix];
  if (factor === undefined) throw new Error(`unknown prefix ${JSON.stringify(prefix)} in ${label}`);
  return number * factor;
}

export interface AxisReadout {
  labels: string[];
  values: number[];
  positionsPx: number[];
  /** Pixel position of a data value by the straight line through the first and last tick. */
  toPx(value: number): number;
  /** Largest distance (px) of any tick from that line: near zero when labels and positions agree. */
  worstTickMisfitPx: number;
}

/** `axisClass` is 'axis-x', 'axis-left' or 'axis-right'. */
export function readAxis(root: XmlElement, axisClass: string, baseUnit: string): AxisReadout {
  const [axis] = byClass(root, axisClass);
  if (!axis) throw new Error(`no ${axisClass} group`);
  const labelsEl = findAll(axis, (el) => el.name === 'text' && hasClass(el, 'tick-label'));
  const labels = labelsEl.map(textOf);
  const values = labels.map((l) => parseTickLabel(l, baseUnit));
  const horizontal = axisClass === 'axis-x';
  // Tick marks are the short <line>s that are not grid lines, in the same order as the labels.
  const tickLines = findAll(axis, (el) => el.name === 'line' && !hasClass(el, 'grid'));
  const positionsPx = tickLines.slice(0, labels.length).map((el) => Number(horizontal ? el.attrs.x1 : el.attrs.y1));
  if (values.length < 2) throw new Error(`${axisClass} has fewer than two ticks`);
  const v0 = values[0];
  const v1 = values[values.length - 1];
  const p0 = positionsPx[0];
  const p1 = positionsPx[positionsPx.length - 1];
  const toPx = (value: number) => p0 + ((value - v0) / (v1 - v0)) * (p1 - p0);
  const worstTickMisfitPx = Math.max(...values.map((v, k) => Math.abs(toPx(v) - positionsPx[k])));
  return { labels, values, positionsPx, toPx, worstTickMisfitPx };
}
