/** Public surface of measurement fitting: capture analysis, MAP estimation, diagnosis. */
export * from './capture/index.ts';
export * from './estimate/forward.ts';
export * from './estimate/parameters.ts';
export * from './estimate/measurements.ts';
export * from './estimate/map-lm.ts';
export * from './estimate/setup.ts';
export * from './estimate/estimate.ts';
export * from './diagnose/chi-square.ts';
export * from './diagnose/wording.ts';
export * from './diagnose/explain.ts';
export * from './diagnose/fit-circuit.ts';
