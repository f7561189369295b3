/**
 * The forward model of the fit: effective circuit -> the figures a scope
 * shows. Static behaviour comes from the per-state network solve (the same
 * state models the closed form uses); finite slew rate and recovery delay are
 * folded in to first order as an EFFECTIVE EDGE DELAY
 *     d = recoveryDelay + (source swing / slew rate) / 2,
 * i.e. each output edge acts as a step at the middle of its ramp. For a
 * first-order RC driven by a linear ramp of duration Tr the response after the
 * ramp equals that of a step delayed by Tr/2 up to a relative (Tr/τ)²/24 term
 * (expand (e^x − 1)/x against e^(x/2)), so the error is negligible while edges
 * are short against τ. During d the capacitor keeps heading for the old
 * state's asymptote and overshoots the switching level; the next state starts
 * from there. Closed form throughout, so the fit can afford thousands of
 * evaluations.
 */
import { prepareCircuit } from '../../circuit/analyze.ts';
import { requireOscillation } from '../../circuit/closed-form.ts';
import { evalAffine } from '../../circuit/state-model.ts';
import type { Circuit } from '../../circuit/types.ts';

export interface PredictedFigures {
  frequencyHz: number;
  periodS: number;
  /** Output-high share of the period between 50 % crossings, 0..1. */
  dutyCycle: number;
  /** Capacitor extremes (at the effective edges, overshoot included), V. */
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
  /** The effective edge delay d used, s. */
  effectiveEdgeDelayS: number;
}

/** IEEE Std 181 10 % and 90 % reference levels: a linear ramp spends 80 % of its duration between them. */
const TEN_TO_NINETY_SHARE = 0.8;

export function predictFigures(circuit: Circuit): PredictedFigures {
  const prepared = prepareCircuit(circuit);
  const { high, low } = prepared;
  const { upperV, lowerV } = requireOscillation(high, low);
  const sourceSwingV = Number.isFinite(high.sourceV) && Number.isFinite(low.sourceV) ? Math.abs(high.sourceV - low.sourceV) : Number.NaN;
  const slew = circuit.amplifier.slewRateVPerS;
  // Open drain: the released edge is the pull-up's RC, not a slew; only the driven swing is counted then.
  const rampS = Number.isFinite(slew) && slew > 0 && Number.isFinite(sourceSwingV) ? sourceSwingV / slew : 0;
  const delayS = circuit.amplifier.recoveryDelayS + rampS / 2;

  const maxV = high.asymptoteV + (upperV - high.asymptoteV) * Math.exp(-delayS / high.tauS);
  const minV = low.asymptoteV + (lowerV - low.asymptoteV) * Math.exp(-delayS / low.tauS);
  const timeHighS = high.tauS * Math.log((high.asymptoteV - minV) / (high.asymptoteV - upperV)) + delayS;
  const timeLowS = low.tauS * Math.log((low.asymptoteV - maxV) / (low.asymptoteV - lowerV)) + delayS;
  const periodS = timeHighS + timeLowS;
  const edgeS = TEN_TO_NINETY_SHARE * rampS;
  // Pin levels: the pin is affine in v, so its mean over a state is the pin at the
  // state's mean capacitor voltage, v∞ + τ·(v_start − v_end)/duration (exact for one exponential).
  const outputHighV = evalAffine(high.outputPin, high.asymptoteV + (high.tauS * (minV - maxV)) / timeHighS);
  const outputLowV = evalAffine(low.outputPin, low.asymptoteV + (low.tauS * (maxV - minV)) / timeLowS);
  return {
    frequencyHz: 1 / periodS,
    periodS,
    dutyCycle: timeHighS / periodS,
    capacitorMinV: minV,
    capacitorMaxV: maxV,
    outputHighV,
    outputLowV,
    riseTimeS: edgeS,
    fallTimeS: edgeS,
    capacitorRisingTauS: high.tauS,
    capacitorFallingTauS: low.tauS,
    upperThresholdV: upperV,
    lowerThresholdV: lowerV,
    hysteresisRatio: (upperV - lowerV) / (outputHighV - outputLowV),
    effectiveEdgeDelayS: delayS,
  };
}
