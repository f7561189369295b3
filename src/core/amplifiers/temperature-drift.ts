/**
 * Temperature drift of the amplifier figures, about 25 °C:
 * - input offset: linear, inputOffsetDriftVPerK (its sign is not known for a
 *   part, so corners take ± the drift);
 * - input bias current: doubles every inputBiasDoublingK kelvin for JFET and
 *   CMOS inputs (gate leakage, about every 10 K — common practice); bipolar
 *   inputs fall slowly with heat (Infinity here: no doubling);
 * - output headroom: linear, outputHeadroomDriftVPerK (a saturated bipolar
 *   stage's headroom shrinks as V_BE falls with heat, about −2 mV/K per junction);
 * - delay and slew: a fractional change per kelvin (bias currents of the
 *   internal stages track temperature).
 */
import type { AmplifierFigures } from './model.ts';

export interface AmplifierDrift {
  inputOffsetDriftVPerK: number;
  /** Kelvin per doubling of the input bias current (Infinity: does not double). */
  inputBiasDoublingK: number;
  outputHeadroomDriftVPerK: number;
  /** Fractional change of the delay per kelvin (0.003 = +0.3 %/K). */
  delayDriftPerK: number;
}

export const NO_DRIFT: Readonly<AmplifierDrift> = Object.freeze({
  inputOffsetDriftVPerK: 0,
  inputBiasDoublingK: Infinity,
  outputHeadroomDriftVPerK: 0,
  delayDriftPerK: 0,
});

export const DRIFT_REFERENCE_TEMPERATURE_C = 25;

/** Factor on the input bias current dT kelvin above 25 °C (doublingK: Infinity = no doubling). */
export function biasCurrentFactorAt(doublingK: number, dT: number): number {
  return Number.isFinite(doublingK) ? 2 ** (dT / doublingK) : 1;
}

/** Factor on the delay dT kelvin above 25 °C (never below zero). */
export function delayFactorAt(driftPerK: number, dT: number): number {
  return Math.max(0, 1 + driftPerK * dT);
}

/** An output headroom dT kelvin above 25 °C, V (never below zero). */
export function headroomAtV(headroom25V: number, driftVPerK: number, dT: number): number {
  return Math.max(0, headroom25V + driftVPerK * dT);
}

/**
 * The figures at temperatureC. offsetSign (−1…+1) scales the offset drift (its
 * sign is unknown for a part: a corner takes both ends).
 */
export function figuresAtTemperature<T extends AmplifierFigures>(amp: T, drift: AmplifierDrift, temperatureC: number, offsetSign = 1): T {
  const dT = temperatureC - DRIFT_REFERENCE_TEMPERATURE_C;
  if (dT === 0) return amp;
  return {
    ...amp,
    inputOffsetV: amp.inputOffsetV + offsetSign * drift.inputOffsetDriftVPerK * dT,
    inputBiasCurrentA: amp.inputBiasCurrentA * biasCurrentFactorAt(drift.inputBiasDoublingK, dT),
    outputHeadroomHighV: headroomAtV(amp.outputHeadroomHighV, drift.outputHeadroomDriftVPerK, dT),
    outputHeadroomLowV: headroomAtV(amp.outputHeadroomLowV, drift.outputHeadroomDriftVPerK, dT),
    recoveryDelayS: amp.recoveryDelayS * delayFactorAt(drift.delayDriftPerK, dT),
  };
}

/** The drift figures of an amplifier (its table entries). */
export function driftOf(amp: AmplifierFigures): AmplifierDrift {
  return {
    inputOffsetDriftVPerK: amp.inputOffsetDriftVPerK,
    inputBiasDoublingK: amp.inputBiasDoublingK,
    outputHeadroomDriftVPerK: amp.outputHeadroomDriftVPerK,
    delayDriftPerK: amp.recoveryDelayDriftPerK,
  };
}
