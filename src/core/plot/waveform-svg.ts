/**
 * Waveform plot: one or more traces against time, switching thresholds as
 * labelled dashed lines. Traces that share a unit share a vertical axis; a
 * second unit gets an axis on the right. Long traces are decimated to the
 * plot's pixel columns so the document stays small.
 */
import { scaleLinear } from 'd3-scale';
import type { ScaleLinear } from 'd3-scale';
import { line } from 'd3-shape';
import { CoreError } from '../errors.ts';
import {
  BOTTOM_AXIS_HEIGHT_PX,
  axisTitle,
  renderBottomAxis,
  renderSideAxis,
  sideAxisWidthPx,
  siTickFormatter,
} from './axes.ts';
import type { PlotArea, SiTickFormatter } from './axes.ts';
import { decimateMinMax } from './decimate.ts';
import { OUTER_MARGIN_PX, haloText, openSvg, plotSize, renderHeader } from './frame.ts';
import type { LegendItem } from './frame.ts';
import { REFERENCE_COLOUR, traceColour } from './palette.ts';
import { escapeXml, px } from './svg-text.ts';

export interface WaveformTrace {
  name: string;
  unit: string;
  values: ArrayLike<number>;
  /** Optional colour override (any SVG colour); defaults to the palette in trace order. */
  colour?: string;
}

export interface WaveformPlotInput {
  /** Sample times, ascending (uniform spacing not required). */
  timeS: ArrayLike<number>;
  traces: WaveformTrace[];
  /** Switching thresholds, drawn on the axis of the first trace in volts ("V"), else the first axis. */
  thresholds?: { upperV: number; lowerV: number };
  title: string;
  subtitle?: string;
  widthPx?: number;
  heightPx?: number;
}

export const DEFAULT_WAVEFORM_WIDTH_PX = 800;
export const DEFAULT_WAVEFORM_HEIGHT_PX = 420;
const TRACE_STROKE_PX = 2;

function invalid(message: string, details: Record<string, unknown>): CoreError {
  return new CoreError('invalid-value', message, undefined, details);
}

function validate(input: WaveformPlotInput): void {
  const { timeS, traces } = input;
  if (timeS.length < 2) throw invalid('a waveform plot needs at least two samples', { field: 'timeS' });
  for (let i = 0; i < timeS.length; i++) {
    if (!Number.isFinite(timeS[i])) throw invalid(`timeS[${i}] is not a finite number`, { field: 'timeS', index: i });
    if (i > 0 && timeS[i] < timeS[i - 1]) {
      throw invalid(`timeS must be ascending (timeS[${i}] < timeS[${i - 1}])`, { field: 'timeS', index: i });
    }
  }
  if (!(timeS[timeS.length - 1] > timeS[0])) throw invalid('timeS spans no time', { field: 'timeS' });
  if (traces.length === 0) throw invalid('a waveform plot needs at least one trace', { field: 'traces' });
  traces.forEach((trace, t) => {
    if (trace.values.length !== timeS.length) {
      throw invalid(`trace "${trace.name}" has ${trace.values.length} values for ${timeS.length} times`, {
        field: 'traces',
        trace: t,
      });
    }
    for (let i = 0; i < trace.values.length; i++) {
      if (!Number.isFinite(trace.values[i])) {
        throw invalid(`trace "${trace.name}" value ${i} is not a finite number`, { field: 'traces', trace: t, index: i });
      }
    }
  });
  const th = input.thresholds;
  if (th !== undefined && !(Number.isFinite(th.upperV) && Number.isFinite(th.lowerV))) {
    throw invalid('thresholds must be finite numbers', { field: 'thresholds' });
  }
}

interface AxisGroup {
  unit: string;
  traceIndexes: number[];
  extraValues: number[];
}

/** Traces grouped by unit in order of first appearance; at most two groups fit (left and right axes). */
function groupByUnit(input: WaveformPlotInput): AxisGroup[] {
  const groups: AxisGroup[] = [];
  input.traces.forEach((trace, index) => {
    const group = groups.find((g) => g.unit === trace.unit);
    if (group) group.traceIndexes.push(index);
    else groups.push({ unit: trace.unit, traceIndexes: [index], extraValues: [] });
  });
  if (groups.length > 2) {
    throw invalid(`a waveform plot has at most two vertical axes; got units ${groups.map((g) => `"${g.unit}"`).join(', ')}`, {
      field: 'traces',
    });
  }
  return groups;
}

/** Data range with a small margin so extremes do not sit on the frame. */
function paddedDomain(input: WaveformPlotInput, group: AxisGroup): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const index of group.traceIndexes) {
    const values = input.traces[index].values;
    for (let i = 0; i < values.length; i++) {
      if (values[i] < lo) lo = values[i];
      if (values[i] > hi) hi = values[i];
    }
  }
  for (const v of group.extraValues) {
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  if (hi === lo) {
    const half = lo === 0 ? 1 : Math.abs(lo) * 0.1;
    return [lo - half, hi + half];
  }
  const pad = (hi - lo) * 0.06;
  return [lo - pad, hi + pad];
}

function thresholdLines(
  thresholds: { upperV: number; lowerV: number },
  scale: ScaleLinear<number, number>,
  formatter: SiTickFormatter,
  area: PlotArea,
): { lines: string; labels: string } {
  const upper = Math.max(thresholds.upperV, thresholds.lowerV);
  const lower = Math.min(thresholds.upperV, thresholds.lowerV);
  const right = area.left + area.width;
  const lines: string[] = ['<g class="thresholds">'];
  const labels: string[] = ['<g class="threshold-labels">'];
  // Baselines: the upper label above its line and the lower one below, so they
  // cannot collide however close the thresholds are; a label that would leave
  // the plot area goes to the other side of its line instead.
  const above = -5;
  const below = 13;
  const upperY = scale(upper);
  const lowerY = scale(lower);
  let upperBaseline = upperY + (upperY + above - 11 < area.top ? below : above);
  let lowerBaseline = lowerY + (lowerY + below > area.top + area.height - 2 ? above : below);
  // Both flipped towards each other and too close: the lower one moves to the left end.
  let lowerAtLeft = false;
  if (Math.abs(lowerBaseline - upperBaseline) < 13) lowerAtLeft = true;
  upperBaseline = Math.min(upperBaseline, area.top + area.height - 3);
  lowerBaseline = Math.max(lowerBaseline, area.top + 12);
  for (const [name, value, y, baseline, atLeft] of [
    ['upper', upper, upperY, upperBaseline, false],
    ['lower', lower, lowerY, lowerBaseline, lowerAtLeft],
  ] as const) {
    lines.push(
      `<line class="threshold threshold-${name}" x1="${px(area.left)}" y1="${px(y)}" x2="${px(right)}" y2="${px(y)}" stroke="${REFERENCE_COLOUR}" stroke-width="1.25" stroke-dasharray="7 5"/>`,
    );
    labels.push(
      haloText(`${name} threshold ${formatter.formatPrecise(value, 3)}`, atLeft ? area.left + 6 : right - 6, baseline, {
        anchor: atLeft ? 'start' : 'end',
        colour: REFERENCE_COLOUR,
        className: `threshold-label threshold-label-${name}`,
      }),
    );
  }
  lines.push('</g>');
  labels.push('</g>');
  return { lines: lines.join(''), labels: labels.join('') };
}

export function renderWaveformSvg(input: WaveformPlotInput): string {
  validate(input);
  const widthPx = plotSize(input.widthPx, DEFAULT_WAVEFORM_WIDTH_PX, 'widthPx');
  const heightPx = plotSize(input.heightPx, DEFAULT_WAVEFORM_HEIGHT_PX, 'heightPx');
  const groups = groupByUnit(input);
  const thresholdGroup = groups.find((g) => g.unit === 'V') ?? groups[0];
  if (input.thresholds) thresholdGroup.extraValues.push(input.thresholds.upperV, input.thresholds.lowerV);

  const colours = input.traces.map((trace, i) => trace.colour ?? traceColour(i));
  const legend: LegendItem[] = input.traces.map((trace, i) => ({
    label: groups.length > 1 && groups[1].traceIndexes.includes(i) ? `${trace.name} (right axis)` : trace.name,
    swatch: { kind: 'line', colour: colours[i] },
  }));
  if (input.thresholds) legend.push({ label: 'thresholds', swatch: { kind: 'line', colour: REFERENCE_COLOUR, dashed: true, strokeWidthPx: 1.25 } });
  const header = renderHeader(widthPx, input.title, input.subtitle, legend);

  // Vertical layout first: the tick count on y depends on the plot height.
  const top = header.bottomPx;
  const plotHeight = Math.max(40, heightPx - top - BOTTOM_AXIS_HEIGHT_PX - 4);
  const yTickCount = Math.max(2, Math.round(plotHeight / 45));
  const yAxes = groups.map((group) => {
    const domain = paddedDomain(input, group);
    return { group, domain, formatter: siTickFormatter(domain, group.unit, yTickCount) };
  });
  const left = OUTER_MARGIN_PX + sideAxisWidthPx(yAxes[0].formatter) - 10;
  const rightMargin = yAxes.length > 1 ? OUTER_MARGIN_PX + sideAxisWidthPx(yAxes[1].formatter) - 10 : OUTER_MARGIN_PX + 8;
  const area: PlotArea = { left, top, width: Math.max(40, widthPx - left - rightMargin), height: plotHeight };

  const t0 = input.timeS[0];
  const t1 = input.timeS[input.timeS.length - 1];
  const xScale = scaleLinear().domain([t0, t1]).range([area.left, area.left + area.width]);
  const xFormatter = siTickFormatter([t0, t1], 's', Math.max(2, Math.round(area.width / 90)));
  const yScales = yAxes.map((axis) =>
    scaleLinear().domain(axis.domain).range([area.top + area.height, area.top]),
  );

  const parts: string[] = [openSvg(widthPx, heightPx, input.subtitle ? `${input.title}. ${input.subtitle}` : input.title)];
  parts.push(header.svg);
  parts.push(
    `<rect class="plot-area" x="${px(area.left)}" y="${px(area.top)}" width="${px(area.width)}" height="${px(area.height)}" fill="#ffffff" stroke="none"/>`,
  );
  // Grid and axes first so the data draws over them.
  parts.push(renderBottomAxis(xScale, xFormatter, area, axisTitle(xFormatter, 's')));
  yAxes.forEach((axis, i) => {
    parts.push(
      renderSideAxis(i === 0 ? 'left' : 'right', yScales[i], axis.formatter, area, axisTitle(axis.formatter, axis.group.unit), {
        grid: i === 0,
      }),
    );
  });

  let thresholdLabels = '';
  if (input.thresholds) {
    const index = groups.indexOf(thresholdGroup);
    const drawn = thresholdLines(input.thresholds, yScales[index], yAxes[index].formatter, area);
    parts.push(drawn.lines);
    thresholdLabels = drawn.labels;
  }

  parts.push('<g class="traces" fill="none" stroke-linejoin="round" stroke-linecap="round">');
  input.traces.forEach((trace, i) => {
    const groupIndex = groups.findIndex((g) => g.traceIndexes.includes(i));
    const yScale = yScales[groupIndex];
    const reduced = decimateMinMax(input.timeS, trace.values, area.width);
    const indexes = Array.from({ length: reduced.timeS.length }, (_, k) => k);
    const path = line<number>()
      .x((k) => xScale(reduced.timeS[k]))
      .y((k) => yScale(reduced.values[k]))
      .digits(1)(indexes);
    parts.push(
      `<path class="trace" data-trace="${i}" d="${path ?? ''}" stroke="${escapeXml(colours[i])}" stroke-width="${TRACE_STROKE_PX}"><title>${escapeXml(trace.name)}</title></path>`,
    );
  });
  parts.push('</g>');
  parts.push(thresholdLabels);
  // Frame last so trace strokes at the extremes do not cover it.
  parts.push(
    `<rect class="plot-frame" x="${px(area.left)}" y="${px(area.top)}" width="${px(area.width)}" height="${px(area.height)}" fill="none" stroke="#333333" stroke-width="1"/>`,
  );
  parts.push('</svg>');
  return parts.join('');
}
