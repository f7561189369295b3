/** The analysis result both models (closed form, time-domain engine) produce. */
import type { Check } from './checks.ts';
import type { OutputState } from './types.ts';

export type ModelName = 'closed-form' | 'time-domain';

export interface StateSummary {
  /** Time constant of the capacitor in this state, s. */
  tauS: number;
  /** Capacitor voltage the state heads for, V. */
  asymptoteV: number;
  /** Capacitor voltage at which the output leaves this state, V. */
  switchingV: number;
  /** Output-stage source level, V (null when the output does not drive). */
  sourceV: number | null;
  dwellS: number;
}

export interface OscillationFigures {
  model: ModelName;
  frequencyHz: number;
  periodS: number;
  /** Fraction of the period the output is high (between 50 % crossings). */
  dutyCycle: number;
  timeHighS: number;
  timeLowS: number;
  /** Time from power-up with the capacitor empty to the first output edge, s. */
  firstEdgeS: number;
  thresholds: { upperV: number; lowerV: number; hysteresisV: number };
  output: { highV: number; lowV: number; swingV: number };
  capacitor: { minV: number; maxV: number };
  states: { high: StateSummary; low: StateSummary };
  powerUp: { initialState: OutputState; determinate: boolean };
  currents: {
    /** Largest current the output sources into the network, A. */
    outputPeakSourceA: number;
    /** Largest current the output sinks from the network, A. */
    outputPeakSinkA: number;
    /** Mean current drawn from the positive rail (network, output stage, amplifier quiescent), A. */
    supplyAverageA: number;
    /** Peak current drawn from the positive rail, A. */
    supplyPeakA: number;
  };
  inputs: {
    nonInvertingMinV: number;
    nonInvertingMaxV: number;
    invertingMinV: number;
    invertingMaxV: number;
    /** Largest |P − N| over the cycle, V. */
    differentialMaxV: number;
  };
  /** Shift of the thresholds caused by input bias current through the decision-node resistance, V. */
  biasThresholdShiftV: number;
}

export interface AnalysisResult extends OscillationFigures {
  checks: Check[];
}
