/** Public API of the parts library: preferred-number series, value codes, dielectrics, BOM value text. */
export {
  SERIES_NAMES,
  isInSeries,
  isSeriesName,
  nearestInSeries,
  seriesMantissas,
  seriesSignificands,
  seriesTolerance,
  seriesValues,
} from './series.ts';
export type { SeriesName, SeriesNeighbours } from './series.ts';
export {
  TOLERANCE_LETTER_CODES,
  formatValue,
  parseComponentValue,
  parseEia96Code,
  parseNumericCode,
  parseToleranceLetter,
} from './value-parse.ts';
export type { ComponentKind, ToleranceBand } from './value-parse.ts';
export { capacitanceChangeAt, parseDielectric } from './dielectric.ts';
export type { CapacitanceChange, Dielectric, DielectricFamily } from './dielectric.ts';
export { parseBomValueText } from './bom-value-text.ts';
export type { BomValueText } from './bom-value-text.ts';
export * from './catalogue.ts';
