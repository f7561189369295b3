/**
 * The forward model of the fit: circuit -> the figures a scope shows. It IS the
 * time-domain engine (per-state nodal solve + event-driven piece walk, DESIGN
 * §2.1): the engine walks to its steady cycle and the figures are read off the
 * exact logged pieces: the output's levels, duty and transitions by the engine's
 * own read-out (the definitions of ../../scope/ieee181.ts), the capacitor's by
 * ../definitions/scope-definitions.ts; the capture analysis applies both to samples. There is no second
 * copy of the physics here: only the reading of a solved cycle.
 */
import { getTopology } from '../../circuit/analyze.ts';
import { shapeFor, type CompiledShape } from '../../circuit/engine/compiled-network.ts';
import { OUTPUT_LENGTH, OUTPUT_SLOT, readTiming, walkToCycle } from '../../circuit/engine/prepared.ts';
import { QUANTITY, R_X, ROW, SLOT } from '../../circuit/engine/modal.ts';
import type { PieceEvaluator } from '../../circuit/engine/piece-evaluator.ts';
import { OscillatorWalk, SteadyStart, type SteadyCycle } from '../../circuit/engine/walker.ts';
import type { Circuit } from '../../circuit/types.ts';
import { validateCircuit } from '../../circuit/validate.ts';
import { CoreError } from '../../errors.ts';
import {
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

/** Which quantity affine in (v, s) a reader pass reads. */
const PIN = 0;
const CAP = 1;

// Module-local copies of the shared definitions (read per evaluation, thousands of times per fit).
const TAU_LOW = TAU_WINDOW_LOW;
const TAU_HIGH = TAU_WINDOW_HIGH;

const mod = (x: number, m: number) => ((x % m) + m) % m;

/** The capacitor N as a row of a multi-state piece (modal.ts ROW). */
const ROW_N = new Float64Array(ROW);
ROW_N[R_X + SLOT.N] = 1;

/**
 * The quantity `kind` reads as a row of the loaded piece when it is multi-state
 * (a capacitance at P or at the pin: modal.ts), undefined for a one-capacitor piece
 * (read with its affine triplet).
 */
function rowOf(ev: PieceEvaluator, kind: number): Float64Array | undefined {
  if (!ev.dynamic) return undefined;
  return kind === PIN ? ev.config.dyn!.row(QUANTITY.o) : ROW_N;
}

/**
 * Reads figures off a steady cycle in passes over its pieces: first crossings
 * of several levels at once, integrals over several windows at once (windows
 * may wrap around the cycle end), capacitor turning points. Times are absolute
 * walk times, folded into [cycle.startS, cycle.startS + period).
 */
class CycleReader {
  // A multi-state piece can cross a level up to four times (modal.ts); a one-capacitor piece twice.
  private readonly crossT = new Float64Array(4);
  private readonly crossDir = new Int8Array(4);
  /** First rising / falling crossing per level of the last crossings() pass. */
  readonly rise = new Float64Array(4);
  readonly fall = new Float64Array(4);
  /** Integrals per window of the last integrals() pass. */
  readonly sums = new Float64Array(8);
  private readonly prevEnd = new Float64Array(4);
  private readonly wA = new Float64Array(16);
  private readonly wB = new Float64Array(16);
  private readonly wOf = new Int8Array(16);
  maxV = 0;
  minV = 0;
  walk!: OscillatorWalk;
  cycle!: SteadyCycle;

  bind(walk: OscillatorWalk, cycle: SteadyCycle): void {
    this.walk = walk;
    this.cycle = cycle;
  }

  /** First crossing of `kind` through each level, after the cycle start, into rise[k] / fall[k]. */
  crossings(kind: number, levels: ArrayLike<number>, count: number): void {
    const ev = this.walk.evaluator;
    const { startIndex, endIndex } = this.cycle;
    ev.load(endIndex - 1);
    let cfg = ev.config;
    let row = rowOf(ev, kind);
    let c0 = kind === PIN ? cfg.oC : 0;
    let cv = kind === PIN ? cfg.oV : 1;
    let cs = kind === PIN ? cfg.oS : 0;
    for (let k = 0; k < count; k++) {
      this.rise[k] = Number.NaN;
      this.fall[k] = Number.NaN;
      this.prevEnd[k] = row ? ev.atRow(row, ev.durationS) - levels[k] : ev.atEnd(c0 - levels[k], cv, cs);
    }
    for (let i = startIndex; i < endIndex; i++) {
      ev.load(i);
      cfg = ev.config;
      row = rowOf(ev, kind);
      c0 = kind === PIN ? cfg.oC : 0;
      cv = kind === PIN ? cfg.oV : 1;
      cs = kind === PIN ? cfg.oS : 0;
      for (let k = 0; k < count; k++) {
        const g0 = c0 - levels[k];
        const start = row ? ev.atRow(row, 0) - levels[k] : ev.atStart(g0, cv, cs);
        const prev = this.prevEnd[k];
        if (prev < 0 && start >= 0 && Number.isNaN(this.rise[k])) this.rise[k] = ev.startS;
        if (prev >= 0 && start < 0 && Number.isNaN(this.fall[k])) this.fall[k] = ev.startS;
        if (Number.isNaN(this.rise[k]) || Number.isNaN(this.fall[k])) {
          const n = row ? ev.crossingsRow(row, -levels[k], this.crossT, this.crossDir) : ev.crossings(g0, cv, cs, this.crossT, this.crossDir);
          for (let j = 0; j < n; j++) {
            if (this.crossDir[j] > 0 && Number.isNaN(this.rise[k])) this.rise[k] = ev.startS + this.crossT[j];
            if (this.crossDir[j] < 0 && Number.isNaN(this.fall[k])) this.fall[k] = ev.startS + this.crossT[j];
          }
        }
        this.prevEnd[k] = row ? ev.atRow(row, ev.durationS) - levels[k] : ev.atEnd(g0, cv, cs);
      }
    }
  }

  /** Capacitor turning points (its extremes over the cycle) into maxV, minV. */
  turningPoints(): void {
    const ev = this.walk.evaluator;
    const { startIndex, endIndex } = this.cycle;
    this.maxV = -Infinity;
    this.minV = Infinity;
    for (let i = startIndex; i < endIndex; i++) {
      ev.load(i);
      if (ev.dynamic) {
        // A multi-state piece: N's extremes over the piece from its critical points (modal.ts).
        ev.rangeRow(ROW_N);
        this.consider(ev.rangeMin);
        this.consider(ev.rangeMax);
        continue;
      }
      const cfg = ev.config;
      this.consider(ev.ends.v0);
      // v' = b0 + bS·s − a·v is affine in (v, s) and monotone within a piece: at most one interior zero.
      const n = ev.crossings(cfg.b0, -cfg.a, cfg.bS, this.crossT, this.crossDir);
      for (let k = 0; k < n; k++) this.consider(ev.kin.v(this.crossT[k]));
    }
  }

  private consider(v: number): void {
    if (v > this.maxV) this.maxV = v;
    if (v < this.minV) this.minV = v;
  }

  /** ∫ of `kind` over each window [from[k], to[k]] (each at most one period long) into sums[k]. */
  integrals(kind: number, from: ArrayLike<number>, to: ArrayLike<number>, count: number): void {
    const { startS, periodS, startIndex, endIndex } = this.cycle;
    const end = startS + periodS;
    // Fold each window into the cycle, splitting one that wraps.
    let parts = 0;
    for (let k = 0; k < count; k++) {
      this.sums[k] = 0;
      const span = to[k] - from[k];
      if (!(span > 0)) continue;
      const a = startS + mod(from[k] - startS, periodS);
      if (a + span <= end) {
        this.wA[parts] = a;
        this.wB[parts] = a + span;
        this.wOf[parts++] = k;
      } else {
        this.wA[parts] = a;
        this.wB[parts] = end;
        this.wOf[parts++] = k;
        this.wA[parts] = startS;
        this.wB[parts] = startS + (a + span - end);
        this.wOf[parts++] = k;
      }
    }
    const ev = this.walk.evaluator;
    for (let i = startIndex; i < endIndex; i++) {
      ev.load(i);
      const p0 = ev.startS;
      const p1 = p0 + ev.durationS;
      const cfg = ev.config;
      const row = rowOf(ev, kind);
      const c0 = kind === PIN ? cfg.oC : 0;
      const cv = kind === PIN ? cfg.oV : 1;
      const cs = kind === PIN ? cfg.oS : 0;
      for (let w = 0; w < parts; w++) {
        const a = this.wA[w];
        const b = this.wB[w];
        if (p1 <= a || p0 >= b) continue;
        const t1 = Math.max(a, p0) - p0;
        const t2 = Math.min(b, p1) - p0;
        this.sums[this.wOf[w]] += row ? ev.integralRowBetween(row, t1, t2) : ev.integral(c0, cv, cs, t1, t2);
      }
    }
  }
}

/** One walk and one reader reused by every evaluation: the fit calls this thousands of times, synchronously. */
const walk = new OscillatorWalk();
const reader = new CycleReader();
const levels = new Float64Array(3);
const timing = new Float64Array(OUTPUT_LENGTH);
const from = new Float64Array(6);
const to = new Float64Array(6);

/**
 * Figures of a walked steady cycle. The walk must be the module's own (`walk`)
 * and the cycle the one it just found.
 */
function figuresOfCycle(cycle: SteadyCycle): PredictedFigures {
  const r = reader;
  r.bind(walk, cycle);
  const periodS = cycle.periodS;

  // Output levels, duty and transitions: the engine's own read-out of the cycle (src/core/scope/ieee181.ts).
  readTiming(walk, cycle, timing, true);
  const highV = timing[OUTPUT_SLOT.highV];
  const lowV = timing[OUTPUT_SLOT.lowV];
  const swing = highV - lowV;
  if (!(swing > 0)) throw new CoreError('no-oscillation', 'the output does not swing between two levels');
  const dutyCycle = timing[OUTPUT_SLOT.dutyCycle];
  const riseTimeS = timing[OUTPUT_SLOT.riseTimeS];
  const fallTimeS = timing[OUTPUT_SLOT.fallTimeS];

  r.turningPoints();
  const maxV = r.maxV;
  const minV = r.minV;
  const rangeV = maxV - minV;
  levels[0] = minV + TAU_LOW * rangeV;
  levels[1] = minV + TAU_HIGH * rangeV;
  levels[2] = minV + 0.5 * rangeV;
  r.crossings(CAP, levels, 3);
  const aboveMid = mod(r.fall[2] - r.rise[2], periodS) / periodS;
  // Three equal sub-windows of the rising stretch (low → high level) and of the falling one (high → low).
  const hr = mod(r.rise[1] - r.rise[0], periodS) / 3;
  const hf = mod(r.fall[0] - r.fall[1], periodS) / 3;
  for (let k = 0; k < 3; k++) {
    from[k] = r.rise[0] + k * hr;
    to[k] = from[k] + hr;
    from[3 + k] = r.fall[1] + k * hf;
    to[3 + k] = from[3 + k] + hf;
  }
  r.integrals(CAP, from, to, 6);
  const s = r.sums;
  return {
    frequencyHz: 1 / periodS,
    periodS,
    dutyCycle,
    capacitorMinV: minV,
    capacitorMaxV: maxV,
    outputHighV: highV,
    outputLowV: lowV,
    riseTimeS,
    fallTimeS,
    capacitorRisingTauS: tauFromWindowMeans(s[0] / hr, s[1] / hr, s[2] / hr, hr),
    capacitorFallingTauS: tauFromWindowMeans(s[3] / hf, s[4] / hf, s[5] / hf, hf),
    capacitorAboveMidShare: aboveMid,
    upperThresholdV: cycle.upperV,
    lowerThresholdV: cycle.lowerV,
    hysteresisRatio: (cycle.upperV - cycle.lowerV) / swing,
  };
}

/** The circuit's parameter vector in its compiled shape (validated like any analysis). */
function compiled(circuit: Circuit): { shape: CompiledShape; values: Float64Array } {
  const topology = getTopology(circuit.topology);
  validateCircuit(circuit, topology);
  const shape = shapeFor(circuit, topology);
  return { shape, values: shape.layout.valuesOf(circuit) };
}

/** Figures of one circuit, walked from power-up like /v1/analyze. */
export function predictFigures(circuit: Circuit): PredictedFigures {
  const { shape, values } = compiled(circuit);
  return figuresOfCycle(walkToCycle(walk, shape, values, true, undefined, false));
}

/**
 * The forward model of one fit: the same walk and reading as predictFigures,
 * but every circuit is walked from the steady switching state of the first
 * circuit of its shape (the nominal, normally) instead of from power-up — the
 * prepared model's start (docs/model.md §4). The fit evaluates hundreds of
 * vectors near the nominal, and a walk from power-up spends most of its pieces
 * on the transient; from the steady state the cycle repeats after one or two.
 * The answer is the same steady cycle (the walk's convergence test decides, and
 * falls back to power-up when the start does not carry over).
 */
export class ForwardModel {
  /** One start per compiled shape (a capacitor of another dielectric walks another shape). */
  private readonly starts = new Map<CompiledShape, SteadyStart>();

  figures(circuit: Circuit): PredictedFigures {
    const { shape, values } = compiled(circuit);
    const start = this.starts.get(shape);
    const cycle = walkToCycle(walk, shape, values, true, start, false);
    if (start === undefined) this.starts.set(shape, walk.snapshot());
    return figuresOfCycle(cycle);
  }
}
