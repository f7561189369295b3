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

/**
 * The figures at temperatureC. offsetSign (+1/−1) picks the direction of the
 * offset drift (a corner takes both).
 */
export function figuresAtTemperature<T extends AmplifierFigures>(amp: T, drift: AmplifierDrift, temperatureC: number, offsetSign = 1): T {
  const dT = temperatureC - DRIFT_REFERENCE_TEMPERATURE_C;
  if (dT === 0) return amp;
  const biasFactor = Number.isFinite(drift.inputBiasDoublingK) ? 2 ** (dT / drift.inputBiasDoublingK) : 1;
  const delayFactor = Math.max(0, 1 + drift.delayDriftPerK * dT);
  return {
    ...amp,
    inputOffsetV: amp.inputOffsetV + offsetSign * drift.inputOffsetDriftVPerK * dT,
    inputBiasCurrentA: amp.inputBiasCurrentA * biasFactor,
    outputHeadroomHighV: Math.max(0, amp.outputHeadroomHighV + drift.outputHeadroomDriftVPerK * dT),
    outputHeadroomLowV: Math.max(0, amp.outputHeadroomLowV + drift.outputHeadroomDriftVPerK * dT),
    recoveryDelayS: amp.recoveryDelayS * delayFactor,
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
