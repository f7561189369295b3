export * from './sample-clock.ts';
export * from './sample-checks.ts';
export * from './units.ts';
export * from './csv.ts';
export * from './channel-map.ts';
export * from './levels.ts';
export * from './crossings.ts';
export * from './turning-points.ts';
export * from './exp-fit.ts';
export {
  analyzeCapacitorSegments,
} from './exp-segments.ts';
export type { CapacitorSegment, CapacitorSegmentAnalysis, CapacitorSegmentOptions } from './exp-segments.ts';
export * from './analyze-capture.ts';
