/** The analysis result both models (closed form, time-domain engine) produce. */
import type { Check } from './checks.ts';
import type { OutputState } from './types.ts';
import type { CapacitancePoint } from '../parts/capacitor/dc-bias.ts';

/**
 * Which model produced an answer. There is one model (docs/model.md): the walk of
 * exactly solved linear pieces. 'closed-form' names its special case with no
 * dynamic pieces (one exponential per state); 'time-domain' says at least one
 * of the effects in modelEffects was active.
 */
export type ModelName = 'closed-form' | 'time-domain';

/** Amplifier effects the model can include, each adding its own kind of piece or event. */
export const MODEL_EFFECTS = ['slew-rate', 'recovery-delay', 'current-limit', 'input-clamp'] as const;
export type ModelEffect = (typeof MODEL_EFFECTS)[number];

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
  /** The amplifier effects the answer includes (empty: the closed-form special case). */
  modelEffects: ModelEffect[];
  frequencyHz: number;
  periodS: number;
  /** Fraction of the period the output is high (between 50 % crossings). */
  dutyCycle: number;
  timeHighS: number;
  timeLowS: number;
  /** Time from power-up with the capacitor empty to the first output edge, s. */
  firstEdgeS: number;
  thresholds: { upperV: number; lowerV: number; hysteresisV: number };
  /**
   * Output state levels as a scope shows them (IEEE Std 181-2011 state levels): the level the pin settles
   * to in each state; meanHighV/meanLowV are time-means over the drive intervals (delay and slew included).
   */
  output: { highV: number; lowV: number; swingV: number; meanHighV: number; meanLowV: number };
  /** 10–90 % transition durations of the output (IEEE Std 181-2011 reference levels), s. */
  transitions: { riseTimeS: number; fallTimeS: number };
  /**
   * Timing-capacitor voltage range in steady state; with a C(v) capacitor also
   * ΔQ/ΔV over that range and the curve used there (C at 0 V times the shape).
   */
  capacitor: { minV: number; maxV: number; effectiveCapacitanceF?: number; capacitanceCurve?: CapacitancePoint[] };
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
  /** Edge durations, decision to output settled (delay + slew), s: measured by the time-domain engine, estimated otherwise. */
  edges?: { riseSettleS: number; fallSettleS: number };
  /** Time-domain engine only, when the output ran into its current limit during the cycle. */
  currentLimit?: {
    /** Share of the period spent current-limited (0..1). */
    limitedFraction: number;
    /** Largest current the network would have drawn from the voltage drive while limited, A. */
    demandPeakA: number;
  };
}

export interface AnalysisResult extends OscillationFigures {
  /** Highest frequency at which the edges stay within edgeFractionLimit of the period, Hz (null: instant edges). */
  frequencyCeilingHz?: number | null;
  /** The edge fraction the ceiling and the slew-limited check use (0..0.5). */
  edgeFractionLimit?: number;
  checks: Check[];
}
