export { renderWaveformSvg } from './waveform-svg.ts';
export type { WaveformPlotInput, WaveformTrace } from './waveform-svg.ts';
export { binValues, renderHistogramSvg } from './histogram-svg.ts';
export type { HistogramPlotInput } from './histogram-svg.ts';
export { siTickFormatter } from './axes.ts';
export type { SiTickFormatter } from './axes.ts';
export { escapeXml } from './svg-text.ts';
