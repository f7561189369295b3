/** Forward design and snapping: value sets, per-value snap, joint search, threshold placement, bounds, diode steering, design. */
export * from './value-set.ts';
export * from './snap-value.ts';
export * from './thresholds.ts';
export * from './bounds.ts';
export * from './hysteresis.ts';
export * from './joint-search.ts';
export * from './joint-snap.ts';
export * from './role-sources.ts';
export * from './scales.ts';
export * from './network-plan.ts';
export * from './steered-timing.ts';
export * from './steered-search.ts';
export * from './steered-design.ts';
export * from './design.ts';
export { TopN } from './top-n.ts';
export { ascendingOrder } from './sorted-order.ts';
export * from './robustness.ts';
