/**
 * Colours. Traces use the Okabe–Ito palette (Okabe & Ito, "Color Universal
 * Design", 2008), chosen so the traces stay distinct for readers with the
 * common forms of colour-vision deficiency. Order puts the three most
 * different hues first because a waveform plot usually has two or three traces.
 */
export const TRACE_COLOURS: readonly string[] = [
  '#0072b2', // blue
  '#d55e00', // vermillion
  '#009e73', // bluish green
  '#cc79a7', // reddish purple
  '#e69f00', // orange
  '#56b4e9', // sky blue
  '#000000', // black
];

/** Colour for trace number `index`, cycling when there are more traces than colours. */
export function traceColour(index: number): string {
  return TRACE_COLOURS[index % TRACE_COLOURS.length];
}

/** Reference lines (thresholds, percentiles): dark grey, dashed, so they never read as data. */
export const REFERENCE_COLOUR = '#4d4d4d';
/** Spec limits: a saturated red that none of the trace colours resembles. */
export const LIMIT_COLOUR = '#c00000';
/** Histogram bars: the palette's sky blue, light enough for dark lines to show on top. */
export const BAR_COLOUR = '#56b4e9';
export const TEXT_COLOUR = '#1a1a1a';
export const SUBTLE_TEXT_COLOUR = '#555555';
