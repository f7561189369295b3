/**
 * The amplifier model every analysis uses. An op-amp run open loop or a
 * comparator is, for a relaxation oscillator, a decision element (P vs N) driving
 * an output stage. Figures are SI base units; `Infinity` means "no such limit"
 * (the HTTP layer carries that as JSON null).
 */
export type OutputStage = 'push-pull' | 'open-drain';

export interface AmplifierModel {
  /** Our own id (kebab-case). */
  id: string;
  name: string;
  /** Technology class in words, e.g. "bipolar, single supply, general purpose". */
  technologyClass: string;
  description: string;
  /** Where the figures come from: class-typical archetype, registered by a caller, or inline in a request. */
  figuresBasis: 'ideal' | 'class-typical' | 'caller-supplied';
  outputStage: OutputStage;
  /** Total supply span V+ − V− the part is rated for, V. */
  supplyMinV: number;
  supplyMaxV: number;
  /** Light-load output swing limit below V+ in the high state, V. */
  outputHeadroomHighV: number;
  /** Light-load output swing limit above V− in the low state (saturation voltage for open drain), V. */
  outputHeadroomLowV: number;
  /** Output resistance behind the swing limit, ohm: the output sags by I·R under load. */
  outputResistanceOhm: number;
  /** Short-circuit / current-limit magnitude, A (Infinity: none). */
  outputCurrentLimitA: number;
  /** Large-signal slew rate, V/s (Infinity: instant edges). */
  slewRateVPerS: number;
  /** Saturation-recovery (op-amp) or propagation (comparator) delay from the input crossing to the output starting to move, s. */
  recoveryDelayS: number;
  /** Input common-mode range lower limit relative to V−, V (negative: extends below the rail). */
  inputCommonModeLowMarginV: number;
  /** Input common-mode range upper limit relative to V+, V (the range ends at V+ − margin; negative: beyond the rail). */
  inputCommonModeHighMarginV: number;
  /** Input bias current flowing INTO each input pin, A (negative for PNP-input stages). */
  inputBiasCurrentA: number;
  /** Input offset voltage, V, referred to the non-inverting input (switching happens at N = P + offset). */
  inputOffsetV: number;
  /** Differential input clamp: the inputs are diode-clamped beyond ±this, V (Infinity: no clamp). */
  differentialClampV: number;
  /** Supply current of the amplifier itself, A. */
  quiescentCurrentA: number;
}

/** The fields a caller may set (everything but identity), used for inline and stored amplifiers. */
export type AmplifierFigures = Omit<AmplifierModel, 'id' | 'name' | 'technologyClass' | 'description' | 'figuresBasis'>;

/** Ideal behaviour: rails reached, no resistance, no limits, instant, no input errors. */
export const IDEAL_FIGURES: Readonly<AmplifierFigures> = Object.freeze({
  outputStage: 'push-pull',
  supplyMinV: 0,
  supplyMaxV: Infinity,
  outputHeadroomHighV: 0,
  outputHeadroomLowV: 0,
  outputResistanceOhm: 0,
  outputCurrentLimitA: Infinity,
  slewRateVPerS: Infinity,
  recoveryDelayS: 0,
  inputCommonModeLowMarginV: -Infinity,
  inputCommonModeHighMarginV: -Infinity,
  inputBiasCurrentA: 0,
  inputOffsetV: 0,
  differentialClampV: Infinity,
  quiescentCurrentA: 0,
});

/** True when the time-domain dynamics (slew, delay, limits, clamps) can change the answer. */
export function hasDynamicLimits(amp: AmplifierFigures): boolean {
  return (
    Number.isFinite(amp.slewRateVPerS) ||
    amp.recoveryDelayS > 0 ||
    Number.isFinite(amp.outputCurrentLimitA) ||
    Number.isFinite(amp.differentialClampV)
  );
}
