/**
 * Steady-state oscillation from the two state models when each state is one
 * linear piece (instant edges, no delay, nothing clips): the capacitor swings
 * between the two switching levels along exponentials, so every figure is exact
 * and closed form.
 */
import { CoreError } from '../errors.ts';
import { dwellTimeS, integralOfVoltage } from './exponential.ts';
import type { OscillationFigures, StateSummary } from './result.ts';
import { evalAffine, type AffineInCap, type StateModel } from './state-model.ts';
import type { OutputState } from './types.ts';
import { formatVolts } from './format.ts';

export interface OscillationConditions {
  lowerV: number;
  upperV: number;
}

/** Throws 'no-oscillation' when the thresholds leave no hysteresis band (both models need one). */
export function requireHysteresis(upperV: number, lowerV: number): void {
  if (!(upperV > lowerV)) {
    throw new CoreError(
      'no-oscillation',
      `No hysteresis: the upper threshold (${formatVolts(upperV)}) is not above the lower one (${formatVolts(lowerV)}), so the output cannot hold a state`,
      undefined,
      { upperThresholdV: upperV, lowerThresholdV: lowerV },
    );
  }
}

/** Throws 'no-oscillation' with the reason when the pair of states latches. */
export function requireOscillation(high: StateModel, low: StateModel): OscillationConditions {
  const upperV = high.switchingV;
  const lowerV = low.switchingV;
  requireHysteresis(upperV, lowerV);
  if (!(high.asymptoteV > upperV)) {
    throw new CoreError(
      'no-oscillation',
      `The output latches high: in the high state the capacitor settles at ${formatVolts(high.asymptoteV)}, which does not reach the upper threshold ${formatVolts(upperV)}`,
      undefined,
      { stuckState: 'high', asymptoteV: high.asymptoteV, thresholdV: upperV },
    );
  }
  if (!(low.asymptoteV < lowerV)) {
    throw new CoreError(
      'no-oscillation',
      `The output latches low: in the low state the capacitor settles at ${formatVolts(low.asymptoteV)}, which does not fall to the lower threshold ${formatVolts(lowerV)}`,
      undefined,
      { stuckState: 'low', asymptoteV: low.asymptoteV, thresholdV: lowerV },
    );
  }
  return { lowerV, upperV };
}

export function closedFormOscillation(high: StateModel, low: StateModel, quiescentCurrentA: number, biasCurrentA: number): OscillationFigures {
  const { lowerV, upperV } = requireOscillation(high, low);
  const timeHighS = dwellTimeS(high.tauS, high.asymptoteV, lowerV, upperV);
  const timeLowS = dwellTimeS(low.tauS, low.asymptoteV, upperV, lowerV);
  const periodS = timeHighS + timeLowS;

  const highMean = (q: AffineInCap) => meanOver(q, high, lowerV, upperV, timeHighS);
  const lowMean = (q: AffineInCap) => meanOver(q, low, upperV, lowerV, timeLowS);
  const outputHighV = highMean(high.outputPin);
  const outputLowV = lowMean(low.outputPin);

  const ends = (q: AffineInCap) => [evalAffine(q, lowerV), evalAffine(q, upperV)];
  const outputCurrents = [...ends(high.outputCurrent), ...ends(low.outputCurrent)];
  const railDrawHigh = integrateOutputAndRail(high, lowerV, upperV, timeHighS);
  const railDrawLow = integrateOutputAndRail(low, upperV, lowerV, timeLowS);
  const supplyAverageA = quiescentCurrentA + (railDrawHigh.chargeC + railDrawLow.chargeC) / periodS;
  const supplyPeakA = quiescentCurrentA + Math.max(railDrawHigh.peakA, railDrawLow.peakA);

  const p = [...ends(high.decision), ...ends(low.decision)];
  const differential = [
    evalAffine(high.decision, lowerV) - lowerV,
    evalAffine(high.decision, upperV) - upperV,
    evalAffine(low.decision, lowerV) - lowerV,
    evalAffine(low.decision, upperV) - upperV,
  ].map(Math.abs);

  const powerUp = powerUpState(high, low);
  const first = powerUp.initialState === 'high' ? dwellTimeS(high.tauS, high.asymptoteV, 0, upperV) : dwellTimeS(low.tauS, low.asymptoteV, 0, lowerV);

  return {
    model: 'closed-form',
    frequencyHz: 1 / periodS,
    periodS,
    dutyCycle: timeHighS / periodS,
    timeHighS,
    timeLowS,
    firstEdgeS: first,
    thresholds: { upperV, lowerV, hysteresisV: upperV - lowerV },
    output: { highV: outputHighV, lowV: outputLowV, swingV: outputHighV - outputLowV },
    capacitor: { minV: lowerV, maxV: upperV },
    states: { high: summary(high, timeHighS), low: summary(low, timeLowS) },
    powerUp,
    currents: {
      outputPeakSourceA: Math.max(0, ...outputCurrents),
      outputPeakSinkA: Math.max(0, ...outputCurrents.map((i) => -i)),
      supplyAverageA,
      supplyPeakA,
    },
    inputs: {
      nonInvertingMinV: Math.min(...p),
      nonInvertingMaxV: Math.max(...p),
      invertingMinV: lowerV,
      invertingMaxV: upperV,
      differentialMaxV: Math.max(...differential),
    },
    biasThresholdShiftV: Math.abs(biasCurrentA) * Math.max(high.decisionResistanceOhm, low.decisionResistanceOhm),
  };
}

function summary(s: StateModel, dwellS: number): StateSummary {
  return {
    tauS: s.tauS,
    asymptoteV: s.asymptoteV,
    switchingV: s.switchingV,
    sourceV: Number.isNaN(s.sourceV) ? null : s.sourceV,
    dwellS,
  };
}

/** Time-mean of an affine quantity over a piece from v0 to v1 lasting durationS. */
function meanOver(q: AffineInCap, s: StateModel, fromV: number, toV: number, durationS: number): number {
  const meanCapV = integralOfVoltage(s.tauS, s.asymptoteV, fromV, toV, durationS) / durationS;
  return evalAffine(q, meanCapV);
}

/**
 * Charge drawn from the positive rail over a piece: the passive network's share
 * plus whatever the output stage sources (the high-side transistor takes it from
 * V+). The sourced part is integrated exactly, splitting the piece where the
 * output current changes sign.
 */
function integrateOutputAndRail(s: StateModel, fromV: number, toV: number, durationS: number): { chargeC: number; peakA: number } {
  const railC = evalAffine(s.positiveRailCurrent, integralOfVoltage(s.tauS, s.asymptoteV, fromV, toV, durationS) / durationS) * durationS;
  const sourcedC = positivePartIntegral(s.outputCurrent, s, fromV, toV);
  const atEnd = (v: number) => evalAffine(s.positiveRailCurrent, v) + Math.max(0, evalAffine(s.outputCurrent, v));
  return { chargeC: railC + sourcedC, peakA: Math.max(atEnd(fromV), atEnd(toV)) };
}

function positivePartIntegral(q: AffineInCap, s: StateModel, fromV: number, toV: number): number {
  const segment = (a: number, b: number) => {
    const t = dwellTimeS(s.tauS, s.asymptoteV, a, b);
    if (!(t > 0) || !Number.isFinite(t)) return 0;
    return q.constant * t + q.perCapV * integralOfVoltage(s.tauS, s.asymptoteV, a, b, t);
  };
  const qa = evalAffine(q, fromV);
  const qb = evalAffine(q, toV);
  if (qa >= 0 && qb >= 0) return segment(fromV, toV);
  if (qa <= 0 && qb <= 0) return 0;
  const zeroV = -q.constant / q.perCapV;
  return qa > 0 ? segment(fromV, zeroV) : segment(zeroV, toV);
}

/**
 * Which state the output takes at power-up with the capacitor empty. Inside the
 * hysteresis band both are consistent and the real outcome depends on how the
 * rails come up: we then assume the output rises first and say it is not determinate.
 */
export function powerUpState(high: StateModel, low: StateModel): { initialState: OutputState; determinate: boolean } {
  const highOk = 0 < high.switchingV;
  const lowOk = 0 > low.switchingV;
  if (highOk && lowOk) return { initialState: 'high', determinate: false };
  return { initialState: highOk ? 'high' : 'low', determinate: true };
}
