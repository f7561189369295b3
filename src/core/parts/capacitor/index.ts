/** The timing capacitor as a real part: C(V), temperature, ageing, leakage, and the exact non-linear charging primitive. */
export * from './model.ts';
export * from './dc-bias.ts';
export * from './temperature.ts';
export * from './ageing.ts';
export * from './insulation.ts';
export { NonlinearCharge, chargeBetween, effectiveCapacitanceF, CHARGE_RELATIVE_TOLERANCE } from './charging.ts';
export { integrateAdaptive, lastQuadratureError } from './quadrature.ts';
export { ChebyshevPiece } from './chebyshev-piece.ts';
