/**
 * The parts every plot shares: the standalone SVG document with its white
 * background, the title block and a legend that wraps onto as many rows as it
 * needs. Layout is computed from estimated text widths so output is
 * deterministic and independent of the fonts on the viewing machine.
 */
import { CoreError } from '../errors.ts';
import { SUBTLE_TEXT_COLOUR, TEXT_COLOUR } from './palette.ts';
import { escapeXml, px, textWidthPx } from './svg-text.ts';

export const MIN_SIZE_PX = 200;
export const MAX_SIZE_PX = 4000;
export const OUTER_MARGIN_PX = 16;
const TITLE_FONT_PX = 16;
const SUBTITLE_FONT_PX = 12;
const LEGEND_FONT_PX = 12;
const LEGEND_ROW_PX = 18;
const SWATCH_PX = 22;

/** Checks an optional pixel size and returns it or the default. */
export function plotSize(value: number | undefined, fallback: number, field: string): number {
  if (value === undefined) return fallback;
  if (!Number.isFinite(value) || value < MIN_SIZE_PX || value > MAX_SIZE_PX) {
    throw new CoreError('invalid-value', `${field} must be between ${MIN_SIZE_PX} and ${MAX_SIZE_PX} pixels`, undefined, {
      field,
      value,
    });
  }
  return Math.round(value);
}

/** Opening tag, accessible name and background; close with `'</svg>'`. */
export function openSvg(widthPx: number, heightPx: number, accessibleTitle: string): string {
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" width="${widthPx}" height="${heightPx}" viewBox="0 0 ${widthPx} ${heightPx}"` +
    ` font-family="sans-serif" role="img">` +
    `<title>${escapeXml(accessibleTitle)}</title>` +
    `<rect class="background" x="0" y="0" width="${widthPx}" height="${heightPx}" fill="#ffffff"/>`
  );
}

export type LegendSwatch =
  | { kind: 'line'; colour: string; dashed?: boolean; strokeWidthPx?: number }
  | { kind: 'box'; colour: string };

export interface LegendItem {
  label: string;
  swatch: LegendSwatch;
}

interface PlacedItem extends LegendItem {
  x: number;
  row: number;
}

/** Greedy left-to-right layout that starts a new row when the next item would not fit. */
function layoutLegend(items: readonly LegendItem[], availableWidthPx: number): PlacedItem[] {
  const placed: PlacedItem[] = [];
  let x = 0;
  let row = 0;
  for (const item of items) {
    const itemWidth = SWATCH_PX + 6 + textWidthPx(item.label, LEGEND_FONT_PX);
    if (x > 0 && x + itemWidth > availableWidthPx) {
      row++;
      x = 0;
    }
    placed.push({ ...item, x, row });
    x += itemWidth + 20;
  }
  return placed;
}

export interface Header {
  svg: string;
  /** y where the plot area may begin. */
  bottomPx: number;
}

/** Title, optional subtitle and the legend, stacked from the top edge. */
export function renderHeader(
  widthPx: number,
  title: string,
  subtitle: string | undefined,
  legend: readonly LegendItem[],
): Header {
  const parts: string[] = ['<g class="header">'];
  let y = OUTER_MARGIN_PX + TITLE_FONT_PX * 0.8;
  parts.push(
    `<text class="plot-title" x="${OUTER_MARGIN_PX}" y="${px(y)}" font-size="${TITLE_FONT_PX}" font-weight="bold" fill="${TEXT_COLOUR}">${escapeXml(title)}</text>`,
  );
  if (subtitle !== undefined && subtitle !== '') {
    y += SUBTITLE_FONT_PX + 8;
    parts.push(
      `<text class="plot-subtitle" x="${OUTER_MARGIN_PX}" y="${px(y)}" font-size="${SUBTITLE_FONT_PX}" fill="${SUBTLE_TEXT_COLOUR}">${escapeXml(subtitle)}</text>`,
    );
  }
  const placed = layoutLegend(legend, widthPx - 2 * OUTER_MARGIN_PX);
  const rows = placed.length === 0 ? 0 : placed[placed.length - 1].row + 1;
  const legendTop = y + 10;
  if (rows > 0) parts.push('<g class="legend">');
  for (const item of placed) {
    const x = OUTER_MARGIN_PX + item.x;
    const midY = legendTop + item.row * LEGEND_ROW_PX + LEGEND_ROW_PX / 2;
    const swatch = item.swatch;
    parts.push('<g class="legend-item">');
    if (swatch.kind === 'line') {
      const dash = swatch.dashed ? ' stroke-dasharray="6 4"' : '';
      parts.push(
        `<line x1="${px(x)}" y1="${px(midY)}" x2="${px(x + SWATCH_PX)}" y2="${px(midY)}" stroke="${swatch.colour}" stroke-width="${swatch.strokeWidthPx ?? 2.5}"${dash}/>`,
      );
    } else {
      parts.push(`<rect x="${px(x + 4)}" y="${px(midY - 6)}" width="14" height="12" fill="${swatch.colour}"/>`);
    }
    parts.push(
      `<text x="${px(x + SWATCH_PX + 6)}" y="${px(midY + LEGEND_FONT_PX * 0.35)}" font-size="${LEGEND_FONT_PX}" fill="${TEXT_COLOUR}">${escapeXml(item.label)}</text>`,
      '</g>',
    );
  }
  if (rows > 0) parts.push('</g>');
  parts.push('</g>');
  return { svg: parts.join(''), bottomPx: legendTop + rows * LEGEND_ROW_PX + 10 };
}

/**
 * In-plot label with a white halo (painted stroke under the fill) so it stays
 * legible where it crosses grid lines or data.
 */
export function haloText(
  text: string,
  xPx: number,
  yPx: number,
  options: { anchor: 'start' | 'middle' | 'end'; colour: string; fontSizePx?: number; className?: string },
): string {
  const size = options.fontSizePx ?? 11;
  const cls = options.className ? ` class="${options.className}"` : '';
  return (
    `<text${cls} x="${px(xPx)}" y="${px(yPx)}" text-anchor="${options.anchor}" font-size="${size}" fill="${options.colour}"` +
    ` stroke="#ffffff" stroke-width="3" stroke-linejoin="round" paint-order="stroke">${escapeXml(text)}</text>`
  );
}

/**
 * In-plot label on a mostly opaque white backing, for labels that
 * may cross other reference lines (a halo leaves the line showing between the
 * glyphs). The backing uses a narrower width estimate than layout does, 0.5 em
 * per character (common-practice average for digits and lower case), so it
 * hides as little of the plot as possible.
 */
export function backedText(
  text: string,
  xPx: number,
  yPx: number,
  options: { anchor: 'start' | 'end'; colour: string; fontSizePx: number; className: string },
): string {
  const size = options.fontSizePx;
  const width = [...text].length * size * 0.5 + 4;
  const rectX = options.anchor === 'start' ? xPx - 2 : xPx + 2 - width;
  return (
    `<rect class="label-backing" x="${px(rectX)}" y="${px(yPx - size * 0.85)}" width="${px(width)}" height="${px(size * 1.15)}" fill="#ffffff" fill-opacity="0.85"/>` +
    `<text class="${options.className}" x="${px(xPx)}" y="${px(yPx)}" text-anchor="${options.anchor}" font-size="${size}" fill="${options.colour}">${escapeXml(text)}</text>`
  );
}
