/**
 * The threshold arithmetic design needs before any part is chosen: where the
 * decision node sits for a given resistor network, how long the capacitor takes
 * between the thresholds (in time constants), where to place a threshold pair
 * for a duty cycle, and the three divider resistors that produce a pair.
 *
 * This is the fast screening model: the output levels are the light-load
 * saturation levels and loading through the output resistance is ignored. The
 * full nodal solve (analyzeCircuit) has the last word on every returned design.
 */
import type { AmplifierModel } from '../../amplifiers/model.ts';
import type { Supply } from '../types.ts';
import { CoreError } from '../../errors.ts';

export interface OutputLevels {
  highV: number;
  lowV: number;
}

/** Light-load output levels of a push-pull stage on these rails. */
export function outputLevels(supply: Supply, amplifier: AmplifierModel): OutputLevels {
  return { highV: supply.positiveV - amplifier.outputHeadroomHighV, lowV: supply.negativeV + amplifier.outputHeadroomLowV };
}

/** The resistors around the decision node P (absent branches are open). */
export interface DecisionNetwork {
  /** P to the positive rail, ohm. */
  toPositiveOhm?: number;
  /** P to ground, ohm. */
  toGroundOhm?: number;
  /** P to the output pin, ohm. */
  toOutputOhm: number;
}

export interface ThresholdPair {
  /** Capacitor voltage that ends the high state, V. */
  upperV: number;
  /** Capacitor voltage that ends the low state, V. */
  lowerV: number;
}

export interface ScreeningContext {
  supply: Supply;
  levels: OutputLevels;
  /** Bias current into each input, A (it flows out of the decision node). */
  inputBiasCurrentA: number;
  /** Switching happens at N = P + offset, V. */
  inputOffsetV: number;
}

export function screeningContext(supply: Supply, amplifier: AmplifierModel): ScreeningContext {
  return { supply, levels: outputLevels(supply, amplifier), inputBiasCurrentA: amplifier.inputBiasCurrentA, inputOffsetV: amplifier.inputOffsetV };
}

/** Thresholds of a decision network: P by superposition of the branch conductances, less the bias drop, plus the offset. */
export function networkThresholds(net: DecisionNetwork, ctx: ScreeningContext): ThresholdPair {
  const gTop = net.toPositiveOhm ? 1 / net.toPositiveOhm : 0;
  const gGround = net.toGroundOhm ? 1 / net.toGroundOhm : 0;
  const gOut = 1 / net.toOutputOhm;
  const g = gTop + gGround + gOut;
  const fixed = (gTop * ctx.supply.positiveV - ctx.inputBiasCurrentA) / g + ctx.inputOffsetV;
  return { upperV: fixed + (gOut * ctx.levels.highV) / g, lowerV: fixed + (gOut * ctx.levels.lowV) / g };
}

export interface TimingFactors {
  /** High-state dwell in time constants: ln((Vh − L)/(Vh − U)). */
  highTau: number;
  /** Low-state dwell in time constants: ln((U − Vl)/(L − Vl)). */
  lowTau: number;
  /** Period in time constants. */
  periodTau: number;
  dutyCycle: number;
}

/** Dwell times in time constants, or null when the pair cannot oscillate between these levels. */
export function timingFactors(t: ThresholdPair, levels: OutputLevels): TimingFactors | null {
  const { upperV, lowerV } = t;
  if (!(levels.highV > upperV && upperV > lowerV && lowerV > levels.lowV)) return null;
  const highTau = Math.log((levels.highV - lowerV) / (levels.highV - upperV));
  const lowTau = Math.log((upperV - levels.lowV) / (lowerV - levels.lowV));
  const periodTau = highTau + lowTau;
  return { highTau, lowTau, periodTau, dutyCycle: highTau / periodTau };
}

/**
 * The threshold pair of a given width whose duty cycle is `dutyCycle`. Duty rises
 * monotonically as the window moves up the swing (the charge toward the high
 * level gets longer, the discharge shorter), so the lower threshold is bisected.
 */
export function placeThresholds(dutyCycle: number, widthV: number, levels: OutputLevels): ThresholdPair {
  const swingV = levels.highV - levels.lowV;
  if (!(dutyCycle > 0 && dutyCycle < 1)) throw new CoreError('invalid-value', 'dutyCycle must lie strictly between 0 and 1', '/targetDutyCycle');
  if (!(widthV > 0 && widthV < swingV)) throw new CoreError('infeasible', 'The hysteresis must be narrower than the output swing');
  let lo = levels.lowV;
  let hi = levels.highV - widthV;
  for (let i = 0; i < 200 && hi - lo > 1e-15 * swingV; i++) {
    const mid = (lo + hi) / 2;
    const f = timingFactors({ lowerV: mid, upperV: mid + widthV }, levels);
    // At the ends of the bracket a dwell is infinite; treat them as the duty limits 0 and 1.
    const d = f ? f.dutyCycle : mid - levels.lowV < levels.highV - widthV - mid ? 0 : 1;
    if (d < dutyCycle) lo = mid;
    else hi = mid;
  }
  const lowerV = (lo + hi) / 2;
  return { lowerV, upperV: lowerV + widthV };
}

export interface DividerResistors {
  rTop: number;
  rBottom: number;
  rFeedback: number;
}

/**
 * The three divider resistors (rTop to V+, rBottom to ground, rFeedback from the
 * output) that put the decision node's thresholds at `t`. Superposition gives
 * P = b·V+ + a·Vout − Ib·Rp + Vos with a, b, c the branch conductances as
 * fractions of the total (a + b + c = 1) and Rp their parallel resistance:
 *   a = (U − L)/(Vh − Vl),  b = (L − a·Vl − Vos + Ib·Rp)/V+,  c = 1 − a − b.
 * One degree of freedom is left, the scale Rp (the Thevenin resistance at P),
 * which the caller chooses from the current and bias-error bounds.
 */
export function solveDivider(t: ThresholdPair, ctx: ScreeningContext, parallelOhm: number): DividerResistors {
  const { levels, supply } = ctx;
  const a = (t.upperV - t.lowerV) / (levels.highV - levels.lowV);
  const b = (t.lowerV - a * levels.lowV - ctx.inputOffsetV + ctx.inputBiasCurrentA * parallelOhm) / supply.positiveV;
  const c = 1 - a - b;
  if (!(a > 0) || !(b > 0) || !(c > 0) || !(supply.positiveV > 0)) {
    throw new CoreError(
      'infeasible',
      `The threshold pair ${t.lowerV.toPrecision(4)} V / ${t.upperV.toPrecision(4)} V cannot be set by a divider from V+ and ground with feedback from the output swing`,
      undefined,
      { upperThresholdV: t.upperV, lowerThresholdV: t.lowerV },
    );
  }
  return { rTop: parallelOhm / b, rBottom: parallelOhm / c, rFeedback: parallelOhm / a };
}

/**
 * A threshold pair of the given width centred on the middle of the swing. Both
 * asymptotes of a diode-steered design sit the same forward drop inside the
 * levels, so a centred pair gives equal dwell factors and the duty cycle is the
 * ratio of the path resistances alone, at every width (our design choice: no
 * placement on top of steering).
 */
export function centredThresholds(widthV: number, levels: OutputLevels): ThresholdPair {
  const midV = (levels.highV + levels.lowV) / 2;
  return { lowerV: midV - widthV / 2, upperV: midV + widthV / 2 };
}
