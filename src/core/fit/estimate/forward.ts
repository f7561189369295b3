/**
 * The forward model of the fit: circuit -> the figures a scope shows. It IS the
 * time-domain engine (per-state nodal solve + event-driven piece walk, DESIGN
 * §2.1): the engine walks to its steady cycle and the figures are read off the
 * exact logged pieces with the definitions of ../definitions/scope-definitions.ts,
 * the same ones the capture analysis applies to samples. There is no second
 * copy of the physics here: only the reading of a solved cycle.
 */
import { prepareCircuit, type PreparedCircuit } from '../../circuit/analyze.ts';
import { requireHysteresis } from '../../circuit/closed-form.ts';
import { walkToCycle } from '../../circuit/engine/prepared.ts';
import { OscillatorWalk, type SteadyCycle } from '../../circuit/engine/walker.ts';
import type { Circuit } from '../../circuit/types.ts';
import { CoreError } from '../../errors.ts';
import {
  LEVEL_ITERATIONS,
  LEVEL_MARGIN,
  REF_HIGH,
  REF_LOW,
  REF_MID,
  TAU_WINDOW_HIGH,
  TAU_WINDOW_LOW,
  tauFromWindowMeans,
} from '../definitions/scope-definitions.ts';

export interface PredictedFigures {
  frequencyHz: number;
  periodS: number;
  /** Output-high share of the period between 50 % crossings, 0..1. */
  dutyCycle: number;
  /** Capacitor turning points (overshoot included), V. */
  capacitorMinV: number;
  capacitorMaxV: number;
  /** Settled output levels, V. */
  outputHighV: number;
  outputLowV: number;
  /** 10–90 % transition durations, s. */
  riseTimeS: number;
  fallTimeS: number;
  /** Windowed time constants of the charging / discharging capacitor, s. */
  capacitorRisingTauS: number;
  capacitorFallingTauS: number;
  /** Share of the period the capacitor spends above the middle of its range, 0..1. */
  capacitorAboveMidShare: number;
  /** Switching levels (capacitor at the decisions), V. */
  upperThresholdV: number;
  lowerThresholdV: number;
  /** Hysteresis over output swing, (upper − lower)/(high − low). */
  hysteresisRatio: number;
}

export const FORWARD_MODEL_DESCRIPTION =
  'the time-domain engine (per-state nodal solve and event-driven piece walk, the model of /v1/analyze) walked to its steady cycle; figures read off the exact cycle with the same definitions the capture analysis applies to samples';

/** Coefficients of a quantity affine in (v, s) for the loaded piece. */
const PIN = 0;
const CAP = 1;

/**
 * Reads figures off a steady cycle: values, first crossings, integrals over
 * windows that may wrap around the cycle end. Times are absolute walk times;
 * any time is folded into [cycle.startS, cycle.startS + period).
 */
class CycleReader {
  private readonly crossT = new Float64Array(2);
  private readonly crossDir = new Int8Array(2);
  constructor(
    private readonly walk: OscillatorWalk,
    private readonly cycle: SteadyCycle,
  ) {}

  private coef(kind: number): [number, number, number] {
    const cfg = this.walk.evaluator.config;
    return kind === PIN ? [cfg.oC, cfg.oV, cfg.oS] : [0, 1, 0];
  }

  fold(tS: number): number {
    const c = this.cycle;
    const phase = (((tS - c.startS) % c.periodS) + c.periodS) % c.periodS;
    return c.startS + phase;
  }

  /** First crossing of `kind` through levelV in each direction after the cycle start: [rise, fall]. */
  crossings(kind: number, levelV: number): [number, number] {
    const ev = this.walk.evaluator;
    const { startIndex, endIndex } = this.cycle;
    let rise = Number.NaN;
    let fall = Number.NaN;
    ev.load(endIndex - 1);
    let [c0, cv, cs] = this.coef(kind);
    let prevEnd = ev.atEnd(c0 - levelV, cv, cs);
    for (let i = startIndex; i < endIndex; i++) {
      ev.load(i);
      [c0, cv, cs] = this.coef(kind);
      c0 -= levelV;
      const start = ev.atStart(c0, cv, cs);
      if (prevEnd < 0 && start >= 0 && Number.isNaN(rise)) rise = ev.startS;
      if (prevEnd >= 0 && start < 0 && Number.isNaN(fall)) fall = ev.startS;
      const n = ev.crossings(c0, cv, cs, this.crossT, this.crossDir);
      for (let k = 0; k < n; k++) {
        if (this.crossDir[k] > 0 && Number.isNaN(rise)) rise = ev.startS + this.crossT[k];
        if (this.crossDir[k] < 0 && Number.isNaN(fall)) fall = ev.startS + this.crossT[k];
      }
      prevEnd = ev.atEnd(c0, cv, cs);
    }
    return [rise, fall];
  }

  /** Capacitor turning points: [time of the maximum, max, time of the minimum, min]. */
  turningPoints(): [number, number, number, number] {
    const ev = this.walk.evaluator;
    const { startIndex, endIndex } = this.cycle;
    let maxT = Number.NaN;
    let maxV = -Infinity;
    let minT = Number.NaN;
    let minV = Infinity;
    const consider = (t: number, v: number) => {
      if (v > maxV) ((maxV = v), (maxT = t));
      if (v < minV) ((minV = v), (minT = t));
    };
    for (let i = startIndex; i < endIndex; i++) {
      ev.load(i);
      const cfg = ev.config;
      consider(ev.startS, ev.ends.v0);
      // v' = b0 + bS·s − a·v is affine in (v, s) and monotone within a piece: at most one interior zero.
      const n = ev.crossings(cfg.b0, -cfg.a, cfg.bS, this.crossT, this.crossDir);
      for (let k = 0; k < n; k++) consider(ev.startS + this.crossT[k], ev.kin.v(this.crossT[k]));
    }
    return [maxT, maxV, minT, minV];
  }

  /** ∫ over [t1, t2] (t2 − t1 ≤ one period) of `kind`. */
  integral(kind: number, t1: number, t2: number): number {
    const span = t2 - t1;
    if (!(span > 0)) return 0;
    const a = this.fold(t1);
    const end = this.cycle.startS + this.cycle.periodS;
    if (a + span <= end) return this.integralInside(kind, a, a + span);
    return this.integralInside(kind, a, end) + this.integralInside(kind, this.cycle.startS, this.cycle.startS + (a + span - end));
  }

  private integralInside(kind: number, a: number, b: number): number {
    const ev = this.walk.evaluator;
    let total = 0;
    for (let i = this.cycle.startIndex; i < this.cycle.endIndex; i++) {
      ev.load(i);
      const p0 = ev.startS;
      const p1 = p0 + ev.durationS;
      if (p1 <= a || p0 >= b) continue;
      const [c0, cv, cs] = this.coef(kind);
      total += ev.integral(c0, cv, cs, Math.max(a, p0) - p0, Math.min(b, p1) - p0);
    }
    return total;
  }
}

/** One walk reused by every evaluation: the fit calls this thousands of times, synchronously. */
const walk = new OscillatorWalk();

const mod = (x: number, m: number) => ((x % m) + m) % m;

export function figuresOfPrepared(prepared: PreparedCircuit): PredictedFigures {
  requireHysteresis(prepared.high.switchingV, prepared.low.switchingV);
  const cycle = walkToCycle(walk, prepared.shape, prepared.values, prepared.dynamics);
  const r = new CycleReader(walk, cycle);
  const periodS = cycle.periodS;

  // Output levels: settled means, iterated with the reference instants they define.
  let highV = walk.highV;
  let lowV = walk.lowV;
  let mid: [number, number] = [Number.NaN, Number.NaN];
  let low: [number, number] = mid;
  let high: [number, number] = mid;
  for (let pass = 0; pass < LEVEL_ITERATIONS; pass++) {
    const swing = highV - lowV;
    low = r.crossings(PIN, lowV + REF_LOW * swing);
    high = r.crossings(PIN, lowV + REF_HIGH * swing);
    const riseDur = mod(high[0] - low[0], periodS);
    const fallDur = mod(low[1] - high[1], periodS);
    // High: from the rise's 90 % instant to the fall's 90 % instant; low: 10 % fall to 10 % rise.
    const hA = high[0] + LEVEL_MARGIN * riseDur;
    const hB = high[0] + mod(high[1] - high[0], periodS) - LEVEL_MARGIN * fallDur;
    const lA = low[1] + LEVEL_MARGIN * fallDur;
    const lB = low[1] + mod(low[0] - low[1], periodS) - LEVEL_MARGIN * riseDur;
    if (!(hB > hA && lB > lA)) break; // edges fill the states: keep the previous levels
    highV = r.integral(PIN, hA, hB) / (hB - hA);
    lowV = r.integral(PIN, lA, lB) / (lB - lA);
  }
  const swing = highV - lowV;
  if (!(swing > 0)) throw new CoreError('no-oscillation', 'the output does not swing between two levels');
  low = r.crossings(PIN, lowV + REF_LOW * swing);
  high = r.crossings(PIN, lowV + REF_HIGH * swing);
  mid = r.crossings(PIN, lowV + REF_MID * swing);
  const [, maxV, , minV] = r.turningPoints();
  const rangeV = maxV - minV;
  const capLow = r.crossings(CAP, minV + TAU_WINDOW_LOW * rangeV);
  const capHigh = r.crossings(CAP, minV + TAU_WINDOW_HIGH * rangeV);
  const capMid = r.crossings(CAP, minV + 0.5 * rangeV);
  const tauOf = (fromT: number, toT: number) => {
    const h = mod(toT - fromT, periodS) / 3;
    return tauFromWindowMeans(r.integral(CAP, fromT, fromT + h) / h, r.integral(CAP, fromT + h, fromT + 2 * h) / h, r.integral(CAP, fromT + 2 * h, fromT + 3 * h) / h, h);
  };
  return {
    frequencyHz: 1 / periodS,
    periodS,
    dutyCycle: mod(mid[1] - mid[0], periodS) / periodS,
    capacitorMinV: minV,
    capacitorMaxV: maxV,
    outputHighV: highV,
    outputLowV: lowV,
    riseTimeS: mod(high[0] - low[0], periodS),
    fallTimeS: mod(low[1] - high[1], periodS),
    capacitorRisingTauS: tauOf(capLow[0], capHigh[0]),
    capacitorFallingTauS: tauOf(capHigh[1], capLow[1]),
    capacitorAboveMidShare: mod(capMid[1] - capMid[0], periodS) / periodS,
    upperThresholdV: cycle.upperV,
    lowerThresholdV: cycle.lowerV,
    hysteresisRatio: (cycle.upperV - cycle.lowerV) / swing,
  };
}

export function predictFigures(circuit: Circuit): PredictedFigures {
  return figuresOfPrepared(prepareCircuit(circuit));
}
