/**
 * The forward model of the fit: effective circuit -> the figures a scope
 * shows, defined as the capture analysis measures them. Two ways to get them:
 *
 * 1. Closed form (microseconds). Static behaviour comes from the per-state
 *    network solve (the state models the closed form uses); slew rate and
 *    recovery delay enter as an EFFECTIVE STEP DELAY per edge. A first-order RC
 *    whose asymptote ramps linearly for Tr ends the ramp exactly where a step
 *    delayed by
 *        d = τ·ln((e^x − 1)/x),  x = Tr/τ   (= Tr/2 + τx²/24 + O(x⁴))
 *    would have put it (solve dv/dt = (a(t) − v)/τ over the ramp and match).
 *    The older mid-ramp rule d = Tr/2 is off by τx²/24 per edge. Until
 *    recoveryDelay + d after the decision the capacitor keeps heading for the
 *    old asymptote; the new state runs from there. This is exact (to rounding)
 *    when both states share one time constant, the ramp ends inside its state,
 *    the output resistance does not shift the pin's 50 % crossing and no
 *    current limit, input clamp or diode acts during the edge.
 * 2. The exact time-domain engine (forward-engine.ts), read the same way.
 *
 * predictFigures takes the closed form where those conditions hold (checked
 * per evaluation) and the engine elsewhere. Both agree within
 * FORWARD_MODEL_TIMING_ERROR / FORWARD_MODEL_LEVEL_ERROR where the closed form
 * is chosen (test/core/fit/estimate-forward-engine.test.ts holds it to that),
 * so the switch adds no step the fit's finite differences could trip over,
 * and the fit may treat the forward model as exact: that budget is the model
 * error it assumes.
 */
import { prepareCircuit, type PreparedCircuit } from '../../circuit/analyze.ts';
import { requireOscillation } from '../../circuit/closed-form.ts';
import { evalAffine } from '../../circuit/state-model.ts';
import type { Circuit } from '../../circuit/types.ts';
import { engineFigures } from './forward-engine.ts';

export interface PredictedFigures {
  frequencyHz: number;
  periodS: number;
  /** Output-high share of the period between 50 % crossings, 0..1. */
  dutyCycle: number;
  /** Capacitor at the output's 50 % crossings as the capture's segment fits read it (overshoot included), V. */
  capacitorMinV: number;
  capacitorMaxV: number;
  /** Output pin levels, V. */
  outputHighV: number;
  outputLowV: number;
  /** 10–90 % transition durations of a linear slew across the source swing, s. */
  riseTimeS: number;
  fallTimeS: number;
  /** Capacitor time constants while charging (output high) / discharging, s. */
  capacitorRisingTauS: number;
  capacitorFallingTauS: number;
  /** Switching levels without overshoot, V. */
  upperThresholdV: number;
  lowerThresholdV: number;
  /** Hysteresis over output swing, (upper − lower)/(high − low): topology-independent and identifiable. */
  hysteresisRatio: number;
  /** Decision to the output's 50 % crossing (recovery delay + half the ramp), s. */
  effectiveEdgeDelayS: number;
}

/** IEEE Std 181 10 % and 90 % reference levels: a linear ramp spends 80 % of its duration between them. */
const TEN_TO_NINETY_SHARE = 0.8;

/**
 * Model error the fit assumes of its forward model on timing figures
 * (period, duty cycle × period, edge durations), relative to the period:
 * one fifth of the smallest default capture uncertainty on a timing figure
 * (the 5e-5 time base of measurements.ts), so treating the model as exact
 * inflates a residual's variance by at most 4 % (our choice).
 */
export const FORWARD_MODEL_TIMING_ERROR = 1e-5;
/** The same on voltages, relative to the output swing: 1/50 of the default 0.5 % vertical uncertainty (our choice). */
export const FORWARD_MODEL_LEVEL_ERROR = 1e-4;
/** The closed form needs delay + ramp to end inside the state: at most this share of it (our margin). */
const EDGE_SHARE_LIMIT = 0.5;
/** ...and the edge to stay this far inside the current limit and the input clamp (our margin). */
const LIMIT_MARGIN = 0.8;
/** Time constants this close (relative) count as one. */
const SAME_TAU = 1e-9;

export type ForwardModelChoice = 'auto' | 'closed-form' | 'time-domain';

/** Effective step delay of a linear ramp of duration rampS into a first-order RC of time constant tauS, s. */
export function rampStepDelayS(rampS: number, tauS: number): number {
  if (!(rampS > 0)) return 0;
  const x = rampS / tauS;
  // ln(expm1(x)/x) loses digits for tiny x; its series is x/2 + x²/24 − x⁴/2880.
  return x < 1e-3 ? tauS * (x / 2 + (x * x) / 24 - (x * x * x * x) / 2880) : tauS * Math.log(Math.expm1(x) / x);
}

interface ClosedForm {
  figures: PredictedFigures;
  /** Recovery delay + ramp: decision to the end of the edge, s. */
  edgeS: number;
  rampS: number;
}

export function predictFigures(circuit: Circuit, model: ForwardModelChoice = 'auto'): PredictedFigures {
  const prepared = prepareCircuit(circuit);
  if (model === 'time-domain') return engineFigures(prepared);
  const closed = closedForm(prepared);
  if (model === 'closed-form' || closedFormHolds(prepared, closed)) return closed.figures;
  return engineFigures(prepared);
}

/** Which model predictFigures('auto') uses for this circuit. */
export function forwardModelFor(circuit: Circuit): 'closed-form' | 'time-domain' {
  const prepared = prepareCircuit(circuit);
  return closedFormHolds(prepared, closedForm(prepared)) ? 'closed-form' : 'time-domain';
}

function closedFormHolds(prepared: PreparedCircuit, closed: ClosedForm): boolean {
  const { circuit, high, low } = prepared;
  const amp = circuit.amplifier;
  const f = closed.figures;
  const slewing = Number.isFinite(amp.slewRateVPerS);
  // Open drain: the closed form has no slew for the pull-down edge.
  if (slewing && circuit.amplifier.outputStage === 'open-drain') return false;
  if (closed.rampS > 0 && Math.abs(high.tauS - low.tauS) > SAME_TAU * high.tauS) return false;
  // Output resistance: the pin's 50 % crossing leaves mid-ramp (the pin sags with the load).
  if (closed.rampS > 0 && !(amp.outputResistanceOhm === 0)) return false;
  const shortest = Math.min(f.dutyCycle, 1 - f.dutyCycle) * f.periodS;
  if (!(closed.edgeS <= EDGE_SHARE_LIMIT * shortest)) return false;
  // Largest output current and input difference come right after an edge (capacitor at its extreme).
  if (Number.isFinite(amp.outputCurrentLimitA)) {
    const peakA = Math.max(Math.abs(evalAffine(high.outputCurrent, f.capacitorMinV)), Math.abs(evalAffine(low.outputCurrent, f.capacitorMaxV)));
    if (!(peakA <= LIMIT_MARGIN * amp.outputCurrentLimitA)) return false;
  }
  if (Number.isFinite(amp.differentialClampV)) {
    const diffV = Math.max(Math.abs(evalAffine(high.decision, f.capacitorMinV) - f.capacitorMinV), Math.abs(evalAffine(low.decision, f.capacitorMaxV) - f.capacitorMaxV));
    if (!(diffV <= LIMIT_MARGIN * amp.differentialClampV)) return false;
  }
  return true;
}

function closedForm(prepared: PreparedCircuit): ClosedForm {
  const { circuit, high, low } = prepared;
  const { upperV, lowerV } = requireOscillation(high, low);
  const sourceSwingV = Number.isFinite(high.sourceV) && Number.isFinite(low.sourceV) ? Math.abs(high.sourceV - low.sourceV) : Number.NaN;
  const slew = circuit.amplifier.slewRateVPerS;
  // Open drain: the released edge is the pull-up's RC, not a slew (predictFigures hands finite slew there to the engine).
  const rampS = Number.isFinite(slew) && slew > 0 && Number.isFinite(sourceSwingV) ? sourceSwingV / slew : 0;
  const recoveryS = circuit.amplifier.recoveryDelayS;
  // Decision to the output's 50 % crossing (mid-ramp), and to the effective step of each edge.
  const crossingS = recoveryS + rampS / 2;
  const intoHighS = recoveryS + rampStepDelayS(rampS, high.tauS);
  const intoLowS = recoveryS + rampStepDelayS(rampS, low.tauS);

  // The old state's exponential continued to the effective step: where the new state starts.
  const startHighV = low.asymptoteV + (lowerV - low.asymptoteV) * Math.exp(-intoHighS / low.tauS);
  const startLowV = high.asymptoteV + (upperV - high.asymptoteV) * Math.exp(-intoLowS / high.tauS);
  const timeHighS = high.tauS * Math.log((high.asymptoteV - startHighV) / (high.asymptoteV - upperV)) + intoHighS;
  const timeLowS = low.tauS * Math.log((low.asymptoteV - startLowV) / (low.asymptoteV - lowerV)) + intoLowS;
  const periodS = timeHighS + timeLowS;
  // The capture's segment fits give the capacitor at the 50 % crossing twice, the old state's
  // exponential carried forward and the new one's carried back, and pool them.
  const atFallV =
    0.5 *
    (high.asymptoteV + (upperV - high.asymptoteV) * Math.exp(-crossingS / high.tauS) +
      (low.asymptoteV + (startLowV - low.asymptoteV) * Math.exp((intoLowS - crossingS) / low.tauS)));
  const atRiseV =
    0.5 *
    (low.asymptoteV + (lowerV - low.asymptoteV) * Math.exp(-crossingS / low.tauS) +
      (high.asymptoteV + (startHighV - high.asymptoteV) * Math.exp((intoHighS - crossingS) / high.tauS)));
  const edgeS = TEN_TO_NINETY_SHARE * rampS;
  // Pin levels: the pin is affine in v, so its mean over a state is the pin at the
  // state's mean capacitor voltage, v∞ + τ·(v_start − v_end)/duration (exact for one exponential).
  const outputHighV = evalAffine(high.outputPin, high.asymptoteV + (high.tauS * (startHighV - startLowV)) / timeHighS);
  const outputLowV = evalAffine(low.outputPin, low.asymptoteV + (low.tauS * (startLowV - startHighV)) / timeLowS);
  const figures: PredictedFigures = {
    frequencyHz: 1 / periodS,
    periodS,
    dutyCycle: timeHighS / periodS,
    capacitorMinV: atRiseV,
    capacitorMaxV: atFallV,
    outputHighV,
    outputLowV,
    riseTimeS: edgeS,
    fallTimeS: edgeS,
    capacitorRisingTauS: high.tauS,
    capacitorFallingTauS: low.tauS,
    upperThresholdV: upperV,
    lowerThresholdV: lowerV,
    hysteresisRatio: (upperV - lowerV) / (outputHighV - outputLowV),
    effectiveEdgeDelayS: crossingS,
  };
  return { figures, edgeS: recoveryS + rampS, rampS };
}
