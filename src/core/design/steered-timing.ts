/**
 * The screening arithmetic of the diode-steered astable: where to put the
 * threshold pair, how many path time constants each half lasts, and the
 * resistance range each steering path may take.
 *
 * While the output is high only the charge diode conducts, so the capacitor
 * heads for Vh − Vf through rCharge + rD (+ the output resistance); while it is
 * low only the discharge diode conducts and it heads for Vl + Vf through
 * rDischarge + rD. Each half therefore depends on one resistor:
 *   t_high = (rCharge + rD + r0)·C·ln((Vh − Vf − L)/(Vh − Vf − U))
 *   t_low  = (rDischarge + rD + r0)·C·ln((U − Vl − Vf)/(L − Vl − Vf)).
 * As in thresholds.ts the output levels are the light-load levels; analyzeCircuit
 * has the last word on every returned design.
 */
import type { AmplifierModel } from '../amplifiers/model.ts';
import { formatSi, formatVolts } from '../circuit/format.ts';
import type { DiodeModel } from '../circuit/types.ts';
import { BIAS_DESIGN_FRACTION, OUTPUT_CURRENT_DERATING, TIMING_CURRENT_SHARE, type ResistanceBounds } from './bounds.ts';
import type { OutputLevels, ThresholdPair } from './thresholds.ts';

export interface SteeredFactors {
  /** High-state dwell in charge-path time constants: ln((Vh − Vf − L)/(Vh − Vf − U)). */
  highTau: number;
  /** Low-state dwell in discharge-path time constants: ln((U − Vl − Vf)/(L − Vl − Vf)). */
  lowTau: number;
}

/** Dwell factors with the asymptotes moved in by the forward drop; null when the pair is not inside them. */
export function steeredDwellFactors(t: ThresholdPair, levels: OutputLevels, forwardDropV: number): SteeredFactors | null {
  const top = levels.highV - forwardDropV;
  const bottom = levels.lowV + forwardDropV;
  if (!(top > t.upperV && t.upperV > t.lowerV && t.lowerV > bottom)) return null;
  return { highTau: Math.log((top - t.lowerV) / (top - t.upperV)), lowTau: Math.log((t.upperV - bottom) / (t.lowerV - bottom)) };
}

/** Centred pairs are the threshold solver's (the steered topology's threshold networks use them). */
export { centredThresholds } from '../circuit/topologies/threshold-solver.ts';

export interface SteeringBounds {
  /** Bounds on rCharge itself (the diode resistance is already taken off), ohm. */
  charge: ResistanceBounds;
  /** Bounds on rDischarge itself, ohm. */
  discharge: ResistanceBounds;
}

/**
 * Each path carries its largest current at the instant its half begins (the
 * capacitor at the far threshold): (Vh − Vf − L)/(rCharge + rD) while charging,
 * (U − Vl − Vf)/(rDischarge + rD) while discharging. Only one path conducts at a
 * time, so each may take the whole timing share of the derated output limit
 * (the same share bounds.ts gives the single timing resistor). Bias current from
 * the inverting input flows through the conducting path and moves its asymptote,
 * bounded like the timing resistor's.
 */
export function steeringResistorBounds(t: ThresholdPair, levels: OutputLevels, amplifier: AmplifierModel, diode: DiodeModel): SteeringBounds {
  const usableA = amplifier.outputCurrentLimitA * OUTPUT_CURRENT_DERATING * TIMING_CURRENT_SHARE;
  const bias = Math.abs(amplifier.inputBiasCurrentA);
  const biasPathOhm = bias > 0 ? (BIAS_DESIGN_FRACTION * (t.upperV - t.lowerV)) / bias : Infinity;
  const maxReason =
    bias > 0
      ? `input bias current ${formatSi(bias, 'A')} through the steering path must move its asymptote by at most ${BIAS_DESIGN_FRACTION * 100} % of the hysteresis`
      : 'no bias-current limit';
  const one = (name: string, acrossV: number): ResistanceBounds => ({
    minOhm: Number.isFinite(usableA) ? Math.max(0, acrossV / usableA - diode.resistanceOhm) : 0,
    maxOhm: biasPathOhm - diode.resistanceOhm,
    minReason: Number.isFinite(usableA)
      ? `the output may drive at most ${formatSi(usableA, 'A')} into the ${name} path (${OUTPUT_CURRENT_DERATING * TIMING_CURRENT_SHARE * 100} % of its limit) across ${formatVolts(acrossV)}`
      : 'no output current limit',
    maxReason,
  });
  return {
    charge: one('charge', levels.highV - diode.forwardDropV - t.lowerV),
    discharge: one('discharge', t.upperV - levels.lowV - diode.forwardDropV),
  };
}
