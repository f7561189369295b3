/** Exact helpers for a first-order exponential piece v(t) = vInf + (v0 − vInf)·e^(−t/τ). */

/** Time for v to go from v0 to v1 toward vInf; Infinity when v1 is not reached. */
export function dwellTimeS(tauS: number, asymptoteV: number, fromV: number, toV: number): number {
  const ratio = (asymptoteV - fromV) / (asymptoteV - toV);
  if (!(ratio >= 1) || !Number.isFinite(ratio)) return ratio === 1 ? 0 : Infinity;
  return tauS * Math.log(ratio);
}

/** ∫ v dt over a piece that goes from v0 to v1 in time t: vInf·t + τ·(v0 − v1). */
export function integralOfVoltage(tauS: number, asymptoteV: number, fromV: number, toV: number, durationS: number): number {
  return asymptoteV * durationS + tauS * (fromV - toV);
}

export function voltageAt(tauS: number, asymptoteV: number, fromV: number, tS: number): number {
  return asymptoteV + (fromV - asymptoteV) * Math.exp(-tS / tauS);
}
