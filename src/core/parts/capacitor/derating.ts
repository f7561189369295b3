/**
 * What a capacitor's C(V) does to the timing in the closed-form special case of
 * the model (no slew, delay, clamp or current-limit pieces: one exponential
 * piece per output state, docs/model.md). Each state's piece is the non-linear
 * piece kind of charging.ts: from the other state's switching level to its own,
 * heading for its asymptote with the state's Thevenin conductance, so
 *
 *     dwell = τ_C0 · ∫ r(v) / (v∞ − v) dv,        τ_C0 = (C at 0 V) / G
 *
 * — the textbook τ·ln(...) when r ≡ 1. The thresholds do not depend on the
 * capacitor, so the states of a linear analysis carry everything else.
 */
import type { StateSummary } from '../../circuit/result.ts';
import { NonlinearCharge, effectiveCapacitanceF } from './charging.ts';
import type { BiasShape, CapacitancePoint } from './dc-bias.ts';
import { curvePoints } from './model.ts';

export interface DeratedTiming {
  /** ΔQ/ΔV over the steady swing between the thresholds, F. */
  effectiveCapacitanceF: number;
  /** Effective capacitance over the marked value. */
  effectiveFraction: number;
  timeHighS: number;
  timeLowS: number;
  periodS: number;
  frequencyHz: number;
  /** The C(V) curve used, over the swing (API names). */
  capacitanceCurve: CapacitancePoint[];
}

/**
 * states: a linear analysis made with the capacitor at nominalF. The part's
 * capacitance at 0 V is zeroBiasF and its shape `shape`.
 */
export function deratedTiming(
  states: { high: StateSummary; low: StateSummary },
  shape: BiasShape,
  zeroBiasF: number,
  nominalF: number,
): DeratedTiming {
  const lowerV = states.low.switchingV;
  const upperV = states.high.switchingV;
  const charge = new NonlinearCharge();
  const dwell = (s: StateSummary, fromV: number): number =>
    charge.setPiece(shape, (s.tauS * zeroBiasF) / nominalF, s.asymptoteV, 1).timeBetween(fromV, s.switchingV);
  const timeHighS = dwell(states.high, lowerV);
  const timeLowS = dwell(states.low, upperV);
  const periodS = timeHighS + timeLowS;
  const ceff = effectiveCapacitanceF(shape, zeroBiasF, lowerV, upperV);
  return {
    effectiveCapacitanceF: ceff,
    effectiveFraction: ceff / nominalF,
    timeHighS,
    timeLowS,
    periodS,
    frequencyHz: 1 / periodS,
    capacitanceCurve: curvePoints(shape, zeroBiasF, lowerV, upperV, 9),
  };
}
