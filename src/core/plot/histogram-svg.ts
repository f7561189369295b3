/**
 * Histogram plot for Monte Carlo results: bars over equal or unequal bins, spec
 * limits as solid red lines with the out-of-spec side lightly tinted, and
 * markers (percentiles, nominal) as labelled dashed lines.
 */
import { scaleLinear } from 'd3-scale';
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
import { OUTER_MARGIN_PX, backedText, openSvg, plotSize, renderHeader } from './frame.ts';
import type { LegendItem } from './frame.ts';
import { assignLabelRows } from './label-rows.ts';
import { BAR_COLOUR, LIMIT_COLOUR, REFERENCE_COLOUR } from './palette.ts';
import { px, textWidthPx } from './svg-text.ts';

export { binValues } from './bin-values.ts';

export interface HistogramPlotInput {
  /** `edges.length === counts.length + 1`, edges strictly ascending, counts >= 0. */
  bins: { edges: ArrayLike<number>; counts: ArrayLike<number> };
  /** Base SI unit of the binned quantity, e.g. "Hz". */
  unit: string;
  title: string;
  subtitle?: string;
  specLimits?: { low?: number; high?: number };
  markers?: { label: string; value: number }[];
  widthPx?: number;
  heightPx?: number;
  /** Horizontal axis quantity name; defaults from the unit ("frequency" for Hz). */
  quantityName?: string;
  /** Vertical axis title; defaults to "count". */
  countLabel?: string;
}

export const DEFAULT_HISTOGRAM_WIDTH_PX = 760;
export const DEFAULT_HISTOGRAM_HEIGHT_PX = 420;
const LABEL_FONT_PX = 11;
const LABEL_ROW_PX = 15;
const BAR_OUTLINE_COLOUR = '#2a7ab8';

function invalid(message: string, details: Record<string, unknown>): CoreError {
  return new CoreError('invalid-value', message, undefined, details);
}

function validate(input: HistogramPlotInput): void {
  const { edges, counts } = input.bins;
  if (counts.length < 1 || edges.length !== counts.length + 1) {
    throw invalid('bins need at least one count and exactly one more edge than counts', { field: 'bins' });
  }
  for (let i = 0; i < edges.length; i++) {
    if (!Number.isFinite(edges[i])) throw invalid(`edge ${i} is not a finite number`, { field: 'bins.edges', index: i });
    if (i > 0 && !(edges[i] > edges[i - 1])) throw invalid('edges must be strictly ascending', { field: 'bins.edges', index: i });
  }
  for (let i = 0; i < counts.length; i++) {
    if (!(Number.isFinite(counts[i]) && counts[i] >= 0)) {
      throw invalid(`count ${i} must be a finite number >= 0`, { field: 'bins.counts', index: i });
    }
  }
  const { low, high } = input.specLimits ?? {};
  for (const [name, v] of [['low', low], ['high', high]] as const) {
    if (v !== undefined && !Number.isFinite(v)) throw invalid(`spec limit ${name} is not a finite number`, { field: 'specLimits' });
  }
  (input.markers ?? []).forEach((m, i) => {
    if (!Number.isFinite(m.value)) throw invalid(`marker "${m.label}" is not a finite number`, { field: 'markers', index: i });
  });
}

interface VerticalLine {
  kind: 'limit' | 'marker';
  value: number;
  text: string;
}

function verticalLines(input: HistogramPlotInput, formatter: SiTickFormatter): VerticalLine[] {
  const out: VerticalLine[] = [];
  const { low, high } = input.specLimits ?? {};
  if (low !== undefined) out.push({ kind: 'limit', value: low, text: `low limit ${formatter.formatPrecise(low, 4)}` });
  if (high !== undefined) out.push({ kind: 'limit', value: high, text: `high limit ${formatter.formatPrecise(high, 4)}` });
  for (const m of input.markers ?? []) {
    out.push({ kind: 'marker', value: m.value, text: `${m.label} ${formatter.formatPrecise(m.value, 4)}` });
  }
  return out;
}

export function renderHistogramSvg(input: HistogramPlotInput): string {
  validate(input);
  const widthPx = plotSize(input.widthPx, DEFAULT_HISTOGRAM_WIDTH_PX, 'widthPx');
  const heightPx = plotSize(input.heightPx, DEFAULT_HISTOGRAM_HEIGHT_PX, 'heightPx');
  const { edges, counts } = input.bins;
  const binCount = counts.length;

  let total = 0;
  let maxCount = 0;
  let integerCounts = true;
  for (let i = 0; i < binCount; i++) {
    total += counts[i];
    maxCount = Math.max(maxCount, counts[i]);
    if (!Number.isInteger(counts[i])) integerCounts = false;
  }

  const legend: LegendItem[] = [
    { label: `${integerCounts ? 'samples' : 'weight'} per bin (total ${integerCounts ? total : Number(total.toPrecision(4))})`, swatch: { kind: 'box', colour: BAR_COLOUR } },
  ];
  const limits = input.specLimits ?? {};
  if (limits.low !== undefined || limits.high !== undefined) {
    legend.push({ label: 'spec limit', swatch: { kind: 'line', colour: LIMIT_COLOUR, strokeWidthPx: 2 } });
  }
  if ((input.markers ?? []).length > 0) {
    legend.push({ label: 'marker', swatch: { kind: 'line', colour: REFERENCE_COLOUR, dashed: true, strokeWidthPx: 1.25 } });
  }
  const header = renderHeader(widthPx, input.title, input.subtitle, legend);

  // Horizontal domain: the bins plus every limit and marker, rounded out to ticks.
  let xLo = edges[0];
  let xHi = edges[binCount];
  for (const v of [limits.low, limits.high, ...(input.markers ?? []).map((m) => m.value)]) {
    if (v === undefined) continue;
    xLo = Math.min(xLo, v);
    xHi = Math.max(xHi, v);
  }
  const xPad = (xHi - xLo) * 0.02;
  const provisionalWidth = widthPx - 2 * OUTER_MARGIN_PX - 60;
  const xTickCount = Math.max(2, Math.round(provisionalWidth / 100));
  const xScale = scaleLinear().domain([xLo - xPad, xHi + xPad]).nice(xTickCount);
  const xDomain = xScale.domain() as [number, number];
  const xFormatter = siTickFormatter(xDomain, input.unit, xTickCount);

  const top = header.bottomPx;
  const plotHeight = Math.max(60, heightPx - top - BOTTOM_AXIS_HEIGHT_PX - 4);
  const yCountMax = maxCount > 0 ? maxCount : 1;
  // Half a sample per bin means nothing: asking d3 for no more ticks than the
  // largest count keeps its step (1, 2 or 5 times a power of ten) at 1 or more.
  const yTickCount = Math.max(1, Math.min(Math.round(plotHeight / 50), integerCounts ? Math.floor(yCountMax) : Infinity));
  const yScale = scaleLinear().domain([0, yCountMax]).nice(yTickCount);
  const yFormatter = siTickFormatter(yScale.domain() as [number, number], '', yTickCount);

  const left = OUTER_MARGIN_PX + sideAxisWidthPx(yFormatter) - 10;
  const area: PlotArea = { left, top, width: Math.max(60, widthPx - left - OUTER_MARGIN_PX - 12), height: plotHeight };
  xScale.range([area.left, area.left + area.width]);

  // Label rows for limits and markers go at the top of the plot; bars scale to the space under them.
  const lines = verticalLines(input, xFormatter);
  const linePositions = lines.map((l) => xScale(l.value));
  const spans = lines.map((l, i) => {
    const x = linePositions[i];
    const w = textWidthPx(l.text, LABEL_FONT_PX);
    // Prefer the right of the line, then the left; first choice is a side that
    // stays inside the plot and crosses no other line, then one that stays inside.
    const candidates = [x + 4, x - 4 - w];
    const inside = (start: number) => start >= area.left + 2 && start + w <= area.left + area.width - 2;
    const clear = (start: number) => linePositions.every((other, j) => j === i || other < start - 2 || other > start + w + 2);
    const start =
      candidates.find((c) => inside(c) && clear(c)) ??
      candidates.find(inside) ??
      Math.max(area.left + 2, area.left + area.width - 2 - w);
    // A label left of its line is anchored at its end so it ends at the line
    // whatever the real font width turns out to be.
    const anchor: 'start' | 'end' = start === candidates[1] ? 'end' : 'start';
    return { startPx: start, endPx: start + w, anchor, anchorPx: anchor === 'end' ? x - 4 : start };
  });
  const rows = assignLabelRows(spans);
  const rowCount = rows.length === 0 ? 0 : Math.max(...rows) + 1;
  const reservedPx = rowCount * LABEL_ROW_PX + (rowCount > 0 ? 6 : 0);
  yScale.range([area.top + area.height, area.top + Math.min(reservedPx, area.height * 0.5)]);

  const bottom = area.top + area.height;
  const parts: string[] = [openSvg(widthPx, heightPx, input.subtitle ? `${input.title}. ${input.subtitle}` : input.title)];
  parts.push(header.svg);

  // Out-of-spec tint under everything else.
  const tint: string[] = [];
  if (limits.low !== undefined && xScale(limits.low) > area.left) {
    tint.push(`<rect class="out-of-spec" x="${px(area.left)}" y="${px(area.top)}" width="${px(xScale(limits.low) - area.left)}" height="${px(area.height)}" fill="${LIMIT_COLOUR}" fill-opacity="0.07"/>`);
  }
  if (limits.high !== undefined && xScale(limits.high) < area.left + area.width) {
    tint.push(`<rect class="out-of-spec" x="${px(xScale(limits.high))}" y="${px(area.top)}" width="${px(area.left + area.width - xScale(limits.high))}" height="${px(area.height)}" fill="${LIMIT_COLOUR}" fill-opacity="0.07"/>`);
  }
  parts.push(tint.join(''));
  parts.push(renderBottomAxis(xScale, xFormatter, area, axisTitle(xFormatter, input.unit, input.quantityName)));
  parts.push(renderSideAxis('left', yScale, yFormatter, area, input.countLabel ?? 'count', { grid: true }));

  // Bars as one filled step outline: the size grows with the bin count by a
  // few bytes per bin, not by a whole element per bin.
  let d = `M${px(xScale(edges[0]))},${px(bottom)}`;
  for (let i = 0; i < binCount; i++) {
    d += `V${px(yScale(counts[i]))}H${px(xScale(edges[i + 1]))}`;
  }
  d += `V${px(bottom)}Z`;
  parts.push(`<path class="bars" d="${d}" fill="${BAR_COLOUR}" stroke="${BAR_OUTLINE_COLOUR}" stroke-width="1" stroke-linejoin="miter"/>`);
  const minBarPx = Math.min(...Array.from({ length: binCount }, (_, i) => xScale(edges[i + 1]) - xScale(edges[i])));
  if (minBarPx >= 5 && binCount > 1) {
    // Thin separators make individual bins countable when they are wide enough to see.
    let sep = '';
    for (let i = 1; i < binCount; i++) {
      const top = Math.min(yScale(counts[i - 1]), yScale(counts[i]));
      if (top < bottom) sep += `M${px(xScale(edges[i]))},${px(bottom)}V${px(top)}`;
    }
    if (sep !== '') parts.push(`<path class="bar-separators" d="${sep}" stroke="${BAR_OUTLINE_COLOUR}" stroke-width="0.75" fill="none"/>`);
  }

  const labelParts: string[] = [];
  lines.forEach((l, i) => {
    const x = xScale(l.value);
    const colour = l.kind === 'limit' ? LIMIT_COLOUR : REFERENCE_COLOUR;
    const style = l.kind === 'limit' ? 'stroke-width="2"' : 'stroke-width="1.25" stroke-dasharray="6 4"';
    parts.push(
      `<line class="${l.kind === 'limit' ? 'spec-limit' : 'marker'}" x1="${px(x)}" y1="${px(area.top)}" x2="${px(x)}" y2="${px(bottom)}" stroke="${colour}" ${style}/>`,
    );
    const y = area.top + rows[i] * LABEL_ROW_PX + LABEL_FONT_PX + 2;
    labelParts.push(
      backedText(l.text, spans[i].anchorPx, y, {
        anchor: spans[i].anchor,
        colour,
        fontSizePx: LABEL_FONT_PX,
        className: l.kind === 'limit' ? 'spec-limit-label' : 'marker-label',
      }),
    );
  });
  parts.push(labelParts.join(''));
  parts.push(
    `<rect class="plot-frame" x="${px(area.left)}" y="${px(area.top)}" width="${px(area.width)}" height="${px(area.height)}" fill="none" stroke="#333333" stroke-width="1"/>`,
  );
  parts.push('</svg>');
  return parts.join('');
}
