/**
 * The split-supply op-amp astable with a leakage R_L across its timing capacitor, derived by hand (Thevenin's
 * theorem and the RC charging law, as in Sedra & Smith's op-amp astable):
 *   T = 2·R_th·C·ln((V_th + βV)/(V_th − βV)),  V_th = V·R_L/(R + R_L),  R_th = R‖R_L,
 * with β the feedback divider's ratio and V the symmetric supply. leakOhm = Infinity is the plain astable,
 * T = 2·R·C·ln((1 + β)/(1 − β)).
 */
export interface LeakyAstable {
  supplyV: number;
  beta: number;
  rOhm: number;
  cF: number;
  leakOhm: number;
}

export function leakyAstablePeriodS({ supplyV, beta, rOhm, cF, leakOhm }: LeakyAstable): number {
  const share = 1 / (1 + rOhm / leakOhm); // R_L/(R + R_L), 1 without leakage
  const vTh = supplyV * share;
  const rTh = rOhm * share;
  return 2 * rTh * cF * Math.log((vTh + beta * supplyV) / (vTh - beta * supplyV));
}
