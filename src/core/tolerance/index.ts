/** Tolerance analysis: worst case, Monte Carlo, temperature and supply, sensitivities. */
export * from './types.ts';
export { runToleranceAnalysis, monteCarloOptions, MONTE_CARLO_SAMPLE_CAP, DEFAULT_MONTE_CARLO, MAX_HISTOGRAM_BINS } from './analyze-tolerance.ts';
export type { PartialToleranceRun, ToleranceParts, ToleranceRun, ToleranceRunOptions } from './analyze-tolerance.ts';
export { Xoshiro128 } from './prng.ts';
export { DEFAULT_SIGMA_PER_TOLERANCE } from './monte-carlo.ts';
export { REFERENCE_TEMPERATURE_C } from './variation-model.ts';
export { MAX_EXHAUSTIVE_DIMENSIONS } from './worst-case.ts';
export { PILOT_MEASURE_MS, PILOT_STRIDE, PILOT_WARMUP_MS, readableFloor, type AnalysisTimeBudget, type MonotonicClockMs } from './time-budget.ts';
