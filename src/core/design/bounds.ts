/**
 * Limits a design must respect before values are chosen: the timing and
 * divider resistances the amplifier can drive and still switch accurately, the
 * highest frequency it can make cleanly, and the supply it is rated for.
 */
import type { AmplifierModel } from '../amplifiers/model.ts';
import { BIAS_SHIFT_WARNING_FRACTION } from '../circuit/checks.ts';
import { formatSi, formatVolts } from '../circuit/format.ts';
import { DEFAULT_EDGE_FRACTION, frequencyCeilingHz as circuitFrequencyCeilingHz, stageEdgeTimeS } from '../circuit/frequency-ceiling.ts';
import type { Supply } from '../circuit/types.ts';
import { CoreError } from '../errors.ts';
import type { OutputLevels, ThresholdPair } from './thresholds.ts';

/**
 * The trade's rule that the output must not be asked to source or sink more than
 * it can: a design uses at most this fraction of the output current limit (our
 * design margin), half of it for the timing branch and half for the threshold network.
 */
export const OUTPUT_CURRENT_DERATING = 0.8;
export const TIMING_CURRENT_SHARE = 0.5;

/**
 * Bias current through a resistor moves a threshold or the capacitor's asymptote;
 * a design keeps that shift to 0.1 % of the hysteresis (our design window), a tenth
 * of the fraction at which the analysis warns (checks.ts), so designs stay far from it.
 */
export const BIAS_DESIGN_FRACTION = BIAS_SHIFT_WARNING_FRACTION / 10;

/** Each edge (delay + slew across the swing) may take at most this share of the period: the analysis's own slew-limit margin. */
export const EDGE_BUDGET_FRACTION = DEFAULT_EDGE_FRACTION;

export interface ResistanceBounds {
  minOhm: number;
  maxOhm: number;
  /** Why each end is where it is, for messages. */
  minReason: string;
  maxReason: string;
}

function biasLimitOhm(amplifier: AmplifierModel, hysteresisV: number): number {
  const bias = Math.abs(amplifier.inputBiasCurrentA);
  return bias > 0 ? (BIAS_DESIGN_FRACTION * hysteresisV) / bias : Infinity;
}

function biasReason(amplifier: AmplifierModel): string {
  return Math.abs(amplifier.inputBiasCurrentA) > 0
    ? `input bias current ${formatSi(Math.abs(amplifier.inputBiasCurrentA), 'A')} must shift the switching levels by at most ${BIAS_DESIGN_FRACTION * 100} % of the hysteresis`
    : 'no bias-current limit';
}

/**
 * The timing resistor: at the switching instant it carries the largest voltage
 * across it (the output level minus the far threshold), which the output must
 * supply within its share; bias current through it shifts the asymptote.
 */
export function timingResistorBounds(t: ThresholdPair, levels: OutputLevels, amplifier: AmplifierModel): ResistanceBounds {
  const worstV = Math.max(levels.highV - t.lowerV, t.upperV - levels.lowV);
  const usableA = amplifier.outputCurrentLimitA * OUTPUT_CURRENT_DERATING * TIMING_CURRENT_SHARE;
  return {
    minOhm: Number.isFinite(usableA) ? worstV / usableA : 0,
    maxOhm: biasLimitOhm(amplifier, t.upperV - t.lowerV),
    minReason: Number.isFinite(usableA)
      ? `the output may drive at most ${formatSi(usableA, 'A')} into the timing branch (${OUTPUT_CURRENT_DERATING * TIMING_CURRENT_SHARE * 100} % of its limit) across ${formatVolts(worstV)}`
      : 'no output current limit',
    maxReason: biasReason(amplifier),
  };
}

/**
 * The Thevenin resistance at the decision node (rTop ∥ rBottom ∥ rFeedback, or
 * rFeedback ∥ rGround): the feedback resistor is Rp / feedbackFraction and sees
 * up to the whole swing; bias current through Rp shifts both thresholds.
 */
export function decisionResistanceBounds(feedbackFraction: number, levels: OutputLevels, amplifier: AmplifierModel, hysteresisV: number): ResistanceBounds {
  const swingV = levels.highV - levels.lowV;
  const usableA = amplifier.outputCurrentLimitA * OUTPUT_CURRENT_DERATING * (1 - TIMING_CURRENT_SHARE);
  return {
    minOhm: Number.isFinite(usableA) ? (swingV * feedbackFraction) / usableA : 0,
    maxOhm: biasLimitOhm(amplifier, hysteresisV),
    minReason: Number.isFinite(usableA) ? `the feedback resistor may draw at most ${formatSi(usableA, 'A')} from the output` : 'no output current limit',
    maxReason: biasReason(amplifier),
  };
}

/** Highest frequency whose edges and recovery delays fit the edge budget, Hz (Infinity for an ideal amplifier). */
export function frequencyCeilingHz(levels: OutputLevels, amplifier: AmplifierModel): number {
  const edgeS = stageEdgeTimeS(levels.highV - levels.lowV, amplifier);
  return circuitFrequencyCeilingHz({ riseSettleS: edgeS, fallSettleS: edgeS }, EDGE_BUDGET_FRACTION);
}

/** The request must fit the amplifier before any search: rated supply span, frequency ceiling. */
export function requireFeasibleRequest(supply: Supply, amplifier: AmplifierModel, levels: OutputLevels, targetFrequencyHz: number): void {
  const spanV = supply.positiveV - supply.negativeV;
  if (spanV < amplifier.supplyMinV || spanV > amplifier.supplyMaxV) {
    throw new CoreError(
      'infeasible',
      `The supply span ${formatVolts(spanV)} is outside the amplifier's rated ${formatVolts(amplifier.supplyMinV)} to ${formatVolts(amplifier.supplyMaxV)}`,
      '/supply',
      { supplySpanV: spanV, supplyMinV: amplifier.supplyMinV, supplyMaxV: Number.isFinite(amplifier.supplyMaxV) ? amplifier.supplyMaxV : null },
    );
  }
  if (amplifier.outputStage === 'open-drain') {
    throw new CoreError('infeasible', 'Design and joint snap do not yet size open-drain outputs (open-drain-pullup topology); use a push-pull amplifier', '/amplifier');
  }
  if (!(levels.highV > levels.lowV)) {
    throw new CoreError('infeasible', 'The output has no swing on this supply (headroom exceeds the span)', '/supply');
  }
  const ceilingHz = frequencyCeilingHz(levels, amplifier);
  if (targetFrequencyHz > ceilingHz) {
    throw new CoreError(
      'infeasible',
      `${formatSi(targetFrequencyHz, 'Hz')} is above this amplifier's frequency ceiling of ${formatSi(ceilingHz, 'Hz')}: an edge (recovery delay plus slewing ${formatVolts(levels.highV - levels.lowV)}) would take more than ${EDGE_BUDGET_FRACTION * 100} % of the period`,
      '/targetFrequencyHz',
      { frequencyCeilingHz: ceilingHz, nearestFeasibleFrequencyHz: ceilingHz, slewRateVPerS: amplifier.slewRateVPerS, recoveryDelayS: amplifier.recoveryDelayS },
    );
  }
}
