/**
 * The event-driven walk (docs/model.md §2): from power-up, piece by piece, each solved
 * exactly, until the switching state repeats.
 *
 * The model of the amplifier, and why:
 * - The comparator decision flips the instant N crosses P + Vos (no input
 *   hysteresis of its own; the network provides it).
 * - The output stage follows the decision after the recovery delay: the level it
 *   heads for is the decision delayed by recoveryDelayS (a pure delay, so a flip
 *   that comes back before the delay elapses is still honoured in order). While
 *   waiting, the output stays where it is — saturated, as after recovery.
 * - It then moves at ±slew rate toward the new saturation level (the source s
 *   ramps; the pin follows through the output resistance). Infinite slew rate:
 *   a jump.
 * - Current limit: when the stage would source or sink more than the limit it
 *   becomes a current source of that size; s keeps its own motion so that the
 *   walk knows when the voltage drive would ask for less again (leave event).
 * - Open drain: the high level is "released" (no drive, no slew: without a
 *   capacitance at the pin the rise is set by the network at once; with one,
 *   the pin is a state and rises as the pull-up charges it); a low level pulls
 *   down from the pin's voltage at the slew rate.
 * - Capacitance at P or at the output pin (strays): those nodes are states of
 *   the piece beside N, solved by the multi-state form (modal.ts); the walk,
 *   its events and its decisions are the same.
 * - Input clamp and steering diodes: piecewise linear, on/off events.
 *
 * Every loop is bounded: a walk that does not repeat within the cycle bound
 * ends with CoreError('not-converged'); one that stops switching ends with
 * CoreError('no-oscillation') and says which state sticks and why.
 */
import { CoreError } from '../../errors.ts';
import { formatVolts } from '../format.ts';
import type { CompiledShape } from './compiled-network.ts';
import { CLAMP, configKey, STAGE as STAGE_IMPORTED } from './compiled-network.ts';
import { BOUNDARY_TOLERANCE, ConfigCache, diodeBits, EVENT, type ConfigModel } from './configs.ts';
import { delayForRampS } from '../../amplifiers/propagation-delay.ts';
import { CapacitorKinematics } from './capacitor-kinematics.ts';
import { PieceEvaluator } from './piece-evaluator.ts';
import { LOG, PieceLog } from './piece-log.ts';
import { AffineProbe, firstExit, PieceEnds } from './root-solve.ts';
import { MAX_STATES, ModalKinematics, QUANTITY, R_C, R_S, R_X, rowAt, SLOT } from './modal.ts';
import type { DynamicModel } from './modal.ts';

// Module-local binding: SteadyStart.sourceAt reads it for every prepared evaluation, and must not pay a live
// import binding's accessor per read (some loaders compile one to a getter call).
const STAGE = STAGE_IMPORTED;

/** Full switching cycles the walk may take to repeat before it gives up. */
export const MAX_CYCLES = 200;
/** Events (of any kind) per cycle allowed before the walk counts as chattering. */
const MAX_EVENTS_PER_CYCLE = 64;
/** Change of the capacitor (and source) voltage at an edge, relative to the supply span, that counts as "repeats". */
export const STEADY_STATE_TOLERANCE = 1e-12;
/** Consecutive discrete changes at one instant before the configuration counts as inconsistent. */
const MAX_RESOLUTION_STEPS = 32;
/** Output flips waiting for the recovery delay at once. */
const PENDING_CAPACITY = 16;

// The log record's fields as plain numbers: read once here, not through the imported object per piece.
const LOG_START = LOG.startS;
const LOG_DURATION = LOG.durationS;
const LOG_V0 = LOG.v0;
const LOG_S0 = LOG.s0;
const LOG_RATE = LOG.rate;
const LOG_KEY = LOG.key;
const LOG_LOGIC = LOG.logic;
const LOG_TARGET = LOG.target;
const LOG_VEND = LOG.vEnd;
const LOG_INTEGRAL = LOG.integralV;
const LOG_XP0 = LOG.xP0;
const LOG_XO0 = LOG.xO0;
const LOG_END = LOG.end;

/** Time events that end a piece (beside the function events of configs.ts EVENT): the delayed flip reaching the stage, the end of a slew ramp. */
export const TIME_EVENT = { target: -1, slewEnd: -2 } as const;
const TIME_TARGET = TIME_EVENT.target;
const TIME_SLEW_END = TIME_EVENT.slewEnd;

/** The output stage's high saturation level: the positive rail less the high headroom, V. */
export function saturationHighV(shape: CompiledShape, values: ArrayLike<number>): number {
  return values[shape.slot.positiveV] - values[shape.slot.headroomHigh];
}

/** The low saturation level: the negative rail plus the low headroom, V. */
export function saturationLowV(shape: CompiledShape, values: ArrayLike<number>): number {
  return values[shape.slot.negativeV] + values[shape.slot.headroomLow];
}

export interface SteadyCycle {
  /** Log index of the first piece of the repeating cycle (it starts at a decision, rising or falling). */
  startIndex: number;
  /** One past its last piece. */
  endIndex: number;
  startS: number;
  periodS: number;
  /** Time of the rising decision inside the cycle (= startS when the cycle starts at one), s. */
  risingS: number;
  /** Capacitor voltage at the rising and the falling decision. */
  lowerV: number;
  upperV: number;
  /** Decision time from the rising to the falling decision, s. */
  decisionHighS: number;
  /** Decision to output settled at the new level, s (NaN when the motion never completes). */
  riseS: number;
  fallS: number;
  /** Steady cycles the walk needed. */
  cycles: number;
}

/** A walk's switching state at a decision, carried to another parameter vector (OscillatorWalk.startFrom). */
export class SteadyStart {
  valid = false;
  logic = 0;
  target = 0;
  stage = 0;
  clamp = 0;
  diodes = 0;
  /** Source voltage as a fraction of the way from the low to the high saturation level (exactly 0 or 1 when it sat there). */
  sFraction = 0;
  rate = 0;
  pendingCount = 0;
  readonly pendingRelS = new Float64Array(PENDING_CAPACITY);
  motionFlipRelS = 0;
  /** Voltages of P and of the pin when they are states (capacitance there), V. */
  xP = 0;
  xO = 0;

  /** The source's slope for a vector with this slew rate: the start's direction, 0 when it sat still or jumps. */
  rateAt(slewVPerS: number): number {
    return this.rate === 0 || !Number.isFinite(slewVPerS) ? 0 : this.rate > 0 ? slewVPerS : -slewVPerS;
  }

  /**
   * The source voltage for a vector with these saturation levels and slope: it keeps its place between
   * the two levels (exactly at a level when it sat there); a driven source at rest sits at its target.
   */
  sourceAt(lowV: number, highV: number, rate: number): number {
    if (rate === 0 && this.stage === STAGE.driven) return this.target ? highV : lowV;
    const f = this.sFraction;
    return f === 0 ? lowV : f === 1 ? highV : lowV + f * (highV - lowV);
  }
}

/** The switching state at one decision. */
class DecisionRecord {
  valid = false;
  t = 0;
  v = 0;
  xP = 0;
  xO = 0;
  s = 0;
  key = 0;
  target = 0;
  pending = 0;
  pendingRelS = 0;
  logIndex = 0;
}

export class OscillatorWalk {
  readonly cache = new ConfigCache();
  readonly log = new PieceLog();
  /** Re-evaluates logged pieces (figures, samples); shares the walk's log and cache. */
  readonly evaluator = new PieceEvaluator(this.log, this.cache);
  private readonly kin = new CapacitorKinematics();
  private readonly probe = new AffineProbe(this.kin);
  private readonly ends = new PieceEnds();
  private readonly endScratch = new Float64Array(2);
  /** The multi-state form of the pieces (a shape with capacitance at P or at the output pin). */
  private readonly modal = new ModalKinematics();
  private readonly xScratch = new Float64Array(MAX_STATES);
  shape!: CompiledShape;
  values!: ArrayLike<number>;
  /** False: the closed-form special case (instant edges, no delay, clamp or current limit). */
  dynamics = true;
  highV = 0;
  lowV = 0;
  private slewVPerS = Infinity;
  private delayS = 0;
  private vTol = 0;
  private steadyTolV = 0;

  t = 0;
  v = 0;
  /** Voltage of P and of the output pin when they are states (capacitance there), V; else 0. */
  xP = 0;
  xO = 0;
  s = 0;
  rate = 0;
  logic = 1;
  target = 1;
  stage: number = STAGE.driven;
  clamp: number = CLAMP.off;
  diodes = 0;
  private readonly pending = new Float64Array(PENDING_CAPACITY);
  private pendingHead = 0;
  private pendingCount = 0;
  /** Written by nextTimeEvent(): seconds to the piece's earliest time event and its kind. */
  private timeEventDt = Infinity;
  private timeEventKind = 0;
  private motionFlipS = 0;
  /** Delay of each pending flip (it depends on the input slope when the delay follows overdrive). */
  private readonly pendingDelay = new Float64Array(PENDING_CAPACITY);
  /** Half the comparator's internal hysteresis, V, and its overdrive-delay charge k, V·s. */
  private halfHystV = 0;
  private delayChargeVS = 0;
  private riseS = Number.NaN;
  private fallS = Number.NaN;
  private upperV = Number.NaN;
  private events = 0;
  private flippedNow = false;
  private cycles = 0;
  private lastRiseT = Number.NaN;
  private lastRiseV = Number.NaN;
  private lastFallT = Number.NaN;
  private riseDoneT = Number.NaN;
  private fallDoneT = Number.NaN;
  /** Previous decision record per direction (index 0 falling, 1 rising), for steady-state detection. */
  private readonly rec = [new DecisionRecord(), new DecisionRecord()];
  private readonly accHistory = new Float64Array(3);
  private accCount = 0;
  private accKey = 0;
  private accTarget = 0;
  private accPending = 0;
  private accPendingRelS = 0;
  /** Time of the first extrapolation jump (NaN: the logged transient is the physical one throughout). */
  extrapolatedAtS = Number.NaN;
  steady: SteadyCycle | undefined;

  /**
   * Target a shape and parameter vector (the walk object is reusable: nothing of
   * the previous circuit survives). `dynamics` false gives the closed-form special
   * case of the same model: no slew, delay, clamp or current-limit pieces.
   */
  reset(shape: CompiledShape, values: ArrayLike<number>, dynamics = true, currents = true): this {
    this.shape = shape;
    this.values = values;
    this.dynamics = dynamics;
    this.cache.reset(shape, values, dynamics, currents);
    this.kin.setShape(this.cache.biasShape, this.cache.spanV);
    const slot = shape.slot;
    this.highV = saturationHighV(shape, values);
    this.lowV = saturationLowV(shape, values);
    this.slewVPerS = dynamics ? values[slot.slew] : Infinity;
    this.delayS = dynamics ? values[slot.delay] : 0;
    this.halfHystV = dynamics ? values[slot.hysteresis] / 2 : 0;
    this.delayChargeVS = dynamics ? values[slot.delayCharge] : 0;
    this.vTol = BOUNDARY_TOLERANCE * this.cache.spanV;
    this.steadyTolV = STEADY_STATE_TOLERANCE * this.cache.spanV;
    this.riseS = this.fallS = this.upperV = Number.NaN;
    this.lastRiseT = this.lastRiseV = this.lastFallT = this.riseDoneT = this.fallDoneT = Number.NaN;
    return this;
  }

  get key(): number {
    return configKey(this.stage, this.clamp, this.diodes);
  }

  /** Power-up: capacitor empty, output settled in `initial`. */
  powerUp(initial: 'high' | 'low'): void {
    const high = initial === 'high' ? 1 : 0;
    this.t = 0;
    this.v = 0;
    this.xP = this.xO = 0;
    this.logic = this.target = high;
    this.stage = this.cache.openDrain && high ? STAGE.released : STAGE.driven;
    this.s = high ? this.highV : this.lowV;
    this.rate = 0;
    this.clamp = CLAMP.off;
    this.diodes = diodeBits(this.shape.topology.nominalDiodes?.(initial));
    if (this.shape.dynamic) {
      // The timing capacitor starts empty; the small capacitances at P and at the pin start where the
      // network holds them then (their quasi-static values: the one-capacitor model's power-up).
      const cfg = this.cache.get(this.key);
      this.xP = this.shape.capacitiveThreshold ? cfg.pC + cfg.pS * this.s : 0;
      this.xO = this.shape.capacitiveOutput ? cfg.oC + cfg.oS * this.s : 0;
    }
    this.pendingCount = 0;
    this.pendingHead = 0;
    this.log.clear();
    this.steady = undefined;
    this.rec[0].valid = this.rec[1].valid = false;
    this.accCount = 0;
    this.extrapolatedAtS = Number.NaN;
    this.events = 0;
    this.cycles = 0;
    this.resolve();
    this.flippedNow = false;
  }

  /**
   * The switching state right now (call it when runToSteadyState has returned:
   * the walk then sits on the repeating decision), for startFrom on another
   * parameter vector near this one (docs/model.md §4).
   */
  snapshot(into: SteadyStart = new SteadyStart()): SteadyStart {
    into.valid = true;
    into.logic = this.logic;
    into.target = this.target;
    into.stage = this.stage;
    into.clamp = this.clamp;
    into.diodes = this.diodes;
    into.sFraction = this.s === this.lowV ? 0 : this.s === this.highV ? 1 : (this.s - this.lowV) / (this.highV - this.lowV);
    into.rate = this.rate;
    into.pendingCount = this.pendingCount;
    for (let k = 0; k < this.pendingCount; k++) into.pendingRelS[k] = this.pending[(this.pendingHead + k) % PENDING_CAPACITY] - this.t;
    into.motionFlipRelS = this.motionFlipS - this.t;
    into.xP = this.xP;
    into.xO = this.xO;
    return into;
  }

  /**
   * Start the walk at a decision instant in the switching state another vector's
   * steady cycle ended in, instead of at power-up: near a nominal the cycle then
   * repeats after one or two cycles. The capacitor is placed on this vector's
   * switching level; a settled output sits at this vector's saturation level.
   * False when the state does not carry over (the caller walks from power-up).
   */
  startFrom(start: SteadyStart): boolean {
    if (!start.valid) return false;
    this.t = 0;
    this.logic = start.logic;
    this.target = start.target;
    this.stage = start.stage;
    this.clamp = start.clamp;
    this.diodes = start.diodes;
    // A delay that appears or vanishes changes what a decision instant holds: walk from power-up.
    if (this.delayS > 0 !== start.pendingCount > 0) return false;
    this.rate = start.rateAt(this.slewVPerS);
    this.s = start.sourceAt(this.lowV, this.highV, this.rate);
    this.pendingCount = start.pendingCount;
    this.pendingHead = 0;
    for (let k = 0; k < start.pendingCount; k++) this.pending[k] = Math.min(start.pendingRelS[k], this.delayS);
    // The decision that starts the cycle queued its own flip a full delay ahead.
    if (this.pendingCount > 0) this.pending[this.pendingCount - 1] = this.delayS;
    // The start state's flips are taken at the floor delay (an overdrive-dependent delay settles within the walk).
    for (let k = 0; k < this.pendingCount; k++) this.pendingDelay[k] = this.delayS; // a loop: one or two entries
    this.motionFlipS = start.motionFlipRelS;
    const cfg = this.cache.tryGet(this.key);
    if (!cfg || !(cfg.hV !== 0)) return false;
    if (cfg.dyn) {
      // More capacitive nodes: P and the pin keep the other vector's voltages (their fast RCs forget them
      // within the cycle), N goes on the switching line h(x, s) = 0 of this vector.
      const h = cfg.dyn.row(QUANTITY.h);
      if (!(h[R_X + SLOT.N] !== 0)) return false;
      this.xP = start.xP;
      this.xO = cfg.dyn.oPinned ? this.s : start.xO;
      this.v = (h[R_C] + h[R_S] * this.s + h[R_X + SLOT.P] * this.xP + h[R_X + SLOT.O] * this.xO) / -h[R_X + SLOT.N];
    } else {
      // On the switching line: h = hC + hV·v + hS·s = 0.
      this.v = (cfg.hC + cfg.hS * this.s) / -cfg.hV;
    }
    this.log.clear();
    this.steady = undefined;
    this.rec[0].valid = this.rec[1].valid = false;
    this.accCount = 0;
    this.extrapolatedAtS = Number.NaN;
    this.events = 0;
    this.cycles = 0;
    this.riseS = this.fallS = this.upperV = Number.NaN;
    this.lastRiseT = this.lastRiseV = this.lastFallT = this.riseDoneT = this.fallDoneT = Number.NaN;
    if (this.logic) {
      this.lastRiseT = 0;
      this.lastRiseV = this.v;
    } else {
      this.lastFallT = 0;
      this.upperV = this.v;
    }
    this.flippedNow = false;
    this.recordDecision();
    return true;
  }

  /** Walk until the cycle repeats. */
  runToSteadyState(): SteadyCycle {
    const maxEvents = MAX_CYCLES * MAX_EVENTS_PER_CYCLE;
    while (!this.steady) {
      if (++this.events > maxEvents) {
        throw new CoreError(
          'not-converged',
          `The time-domain walk took ${maxEvents} events without settling into a repeating cycle (the output chatters)`,
          undefined,
          { events: maxEvents },
        );
      }
      this.step();
    }
    return this.steady;
  }

  private step(): void {
    const cfg = this.cache.get(this.key);
    if (cfg.dyn) {
      this.stepDynamic(cfg, cfg.dyn);
      return;
    }
    const kin = this.kin;
    kin.set(cfg.a, cfg.b0 + cfg.bS * this.s, cfg.bS * this.rate, this.v, this.s, this.rate);
    this.nextTimeEvent();
    let best = this.timeEventDt;
    let kind = this.timeEventKind;
    let index = 0;
    const ends = this.ends;
    // A linear capacitor's piece that ends at a time event: its far end is needed anyway (it usually runs
    // there), and with it the exit tests of a plain exponential piece skip their logarithm.
    ends.fill(kin, best, !kin.nonlinear);
    const sg = this.logic ? 1 : -1;
    const probe = this.probe;
    // Internal hysteresis moves the decision h/2 beyond P + offset in the direction of travel.
    let te = firstExit(probe, ends, sg * cfg.hC + this.halfHystV, sg * cfg.hV, sg * cfg.hS, this.vTol);
    if (te < best) {
      best = te;
      kind = EVENT.threshold;
    }
    for (let k = 0; k < cfg.eventCount; k++) {
      te = firstExit(probe, ends, cfg.evC[k], cfg.evV[k], cfg.evS[k], cfg.evTol[k]);
      if (te < best) {
        best = te;
        kind = cfg.evKind[k];
        index = cfg.evIndex[k];
      }
    }
    if (best === Infinity) this.latch(cfg);
    if (best > 0) {
      let vEnd: number;
      let integralV: number;
      if (best === ends.durationS && !Number.isNaN(ends.integralV)) {
        // The piece runs to the time event whose far end the probe already evaluated.
        vEnd = ends.vT;
        integralV = ends.integralV;
      } else {
        const out = this.endScratch;
        kin.endAndIntegral(best, out);
        vEnd = out[0];
        integralV = out[1];
      }
      const i = this.log.append();
      const d = this.log.data;
      d[i + LOG_START] = this.t;
      d[i + LOG_DURATION] = best;
      d[i + LOG_V0] = this.v;
      d[i + LOG_S0] = this.s;
      d[i + LOG_RATE] = this.rate;
      d[i + LOG_KEY] = cfg.key;
      d[i + LOG_LOGIC] = this.logic;
      d[i + LOG_TARGET] = this.target;
      d[i + LOG_VEND] = vEnd;
      d[i + LOG_INTEGRAL] = integralV;
      d[i + LOG_END] = kind;
      this.v = vEnd;
      this.s = kin.s(best);
      this.t += best;
    }
    this.apply(kind, index);
    this.resolve();
    if (this.flippedNow) {
      this.flippedNow = false;
      this.recordDecision();
    }
  }

  /**
   * A stiff stage holding a capacitive pin also drives its capacitance, Co·ds/dt while it slews: the
   * current-limit events (limit − i, limit + i) see it as an offset of their rows. 0 for every other event.
   */
  private pinnedChargeCurrent(cfg: ConfigModel, dyn: DynamicModel, k: number): number {
    if (!(dyn.pinnedCapF > 0) || this.rate === 0) return 0;
    const kind = cfg.evKind[k];
    const i = dyn.pinnedCapF * this.rate;
    return kind === EVENT.limitSource ? -i : kind === EVENT.limitSink ? i : 0;
  }

  /** The state of the capacitive nodes now (the pin follows a stiff source that holds it). */
  private stateNow(dyn: DynamicModel): Float64Array {
    if (dyn.oPinned) this.xO = this.s;
    const x = this.xScratch;
    x[SLOT.N] = this.v;
    x[SLOT.P] = this.xP;
    x[SLOT.O] = this.xO;
    return x;
  }

  /**
   * The piece's earliest time event, whatever the capacitors do: a pending delay target or the end
   * of the output's slew ramp (timeEventDt, s from now; Infinity and kind 0 when there is none).
   * Written to fields, not returned as an object, so the hot path allocates nothing.
   */
  private nextTimeEvent(): void {
    let best = Infinity;
    let kind = 0;
    if (this.pendingCount > 0) {
      best = Math.max(0, this.pending[this.pendingHead] - this.t);
      kind = TIME_TARGET;
    }
    if (this.rate !== 0) {
      const dt = Math.max(0, (this.targetLevel() - this.s) / this.rate);
      if (dt < best) {
        best = dt;
        kind = TIME_SLEW_END;
      }
    }
    this.timeEventDt = best;
    this.timeEventKind = kind;
  }

  /** step() for a piece with more than one capacitive node: the same events, found on the multi-state motion. */
  private stepDynamic(cfg: ConfigModel, dyn: DynamicModel): void {
    const mk = this.modal;
    const x = this.stateNow(dyn);
    mk.set(dyn, x, this.s, this.rate);
    this.nextTimeEvent();
    let best = this.timeEventDt;
    let kind = this.timeEventKind;
    let index = 0;
    const sg = this.logic ? 1 : -1;
    let te = mk.setRow(dyn.row(QUANTITY.h), sg, this.halfHystV).firstExit(best, this.vTol);
    if (te < best) {
      best = te;
      kind = EVENT.threshold;
    }
    for (let k = 0; k < cfg.eventCount; k++) {
      te = mk.setRow(dyn.row(QUANTITY.event0 + k), 1, this.pinnedChargeCurrent(cfg, dyn, k)).firstExit(best, cfg.evTol[k]);
      if (te < best) {
        best = te;
        kind = cfg.evKind[k];
        index = cfg.evIndex[k];
      }
    }
    if (best === Infinity) this.latch(cfg);
    if (kind === EVENT.threshold) this.refuseChatter(best, dyn);
    if (best > 0) {
      const i = this.log.append();
      const d = this.log.data;
      d[i + LOG_START] = this.t;
      d[i + LOG_DURATION] = best;
      d[i + LOG_V0] = this.v;
      d[i + LOG_S0] = this.s;
      d[i + LOG_RATE] = this.rate;
      d[i + LOG_KEY] = cfg.key;
      d[i + LOG_LOGIC] = this.logic;
      d[i + LOG_TARGET] = this.target;
      d[i + LOG_XP0] = this.xP;
      d[i + LOG_XO0] = this.xO;
      d[i + LOG_END] = kind;
      mk.state(best, x);
      d[i + LOG_VEND] = x[SLOT.N];
      d[i + LOG_INTEGRAL] = mk.integralState(SLOT.N, best);
      this.v = x[SLOT.N];
      this.xP = x[SLOT.P];
      this.xO = x[SLOT.O];
      this.s = mk.s(best);
      this.t += best;
    }
    this.apply(kind, index);
    this.resolve();
    if (this.flippedNow) {
      this.flippedNow = false;
      this.recordDecision();
    }
  }

  /**
   * With capacitance at P the positive feedback is no longer instant: when the output switches, P
   * follows through its own RC while N moves at once, and if N runs ahead the comparator switches
   * straight back — an ideal comparator then chatters at no time scale at all. A decision that comes
   * within 1e-9 of the previous interval is that, and is refused instead of reported as a period.
   */
  private refuseChatter(afterS: number, dyn: DynamicModel): void {
    // "Within no time": a billionth of the piece's fastest time constant, after a decision as close.
    let fastest = 0;
    for (let i = 0; i < dyn.modeCount; i++) fastest = Math.max(fastest, dyn.lambda[i]);
    const instantS = fastest > 0 ? 1e-9 / fastest : 0;
    const last = Number.isNaN(this.lastRiseT) ? this.lastFallT : Number.isNaN(this.lastFallT) ? this.lastRiseT : Math.max(this.lastRiseT, this.lastFallT);
    if (!(afterS <= instantS && this.t - last <= instantS)) return;
    throw new CoreError(
      'no-oscillation',
      'The capacitance at the threshold node P (or at the output pin) delays the positive feedback so much that, when the output switches, the timing node runs ahead of the threshold and the comparator switches straight back: the output chatters instead of oscillating',
      undefined,
      { stuckState: this.logic ? 'high' : 'low', model: 'time-domain' },
    );
  }

  private targetLevel(): number {
    return this.target ? this.highV : this.lowV;
  }

  private apply(kind: number, index: number): void {
    switch (kind) {
      case TIME_TARGET: {
        const delayS = this.pendingDelay[this.pendingHead];
        this.pendingHead = (this.pendingHead + 1) % PENDING_CAPACITY;
        this.pendingCount--;
        this.changeTarget(delayS);
        break;
      }
      case TIME_SLEW_END:
        this.s = this.targetLevel();
        this.rate = 0;
        this.motionDone();
        break;
      case EVENT.threshold:
        this.flipDecision();
        break;
      case EVENT.diode:
        this.diodes ^= 1 << index;
        break;
      case EVENT.clampOnPAboveN:
        this.clamp = CLAMP.pAboveN;
        break;
      case EVENT.clampOnNAboveP:
        this.clamp = CLAMP.nAboveP;
        break;
      case EVENT.clampOff:
        this.clamp = CLAMP.off;
        break;
      case EVENT.limitSource:
        this.stage = STAGE.limitedSource;
        break;
      case EVENT.limitSink:
        this.stage = STAGE.limitedSink;
        break;
      case EVENT.limitLeave:
        this.stage = STAGE.driven;
        break;
    }
  }

  private flipDecision(): void {
    this.logic ^= 1;
    // The steady-state record is taken once the instant is fully resolved.
    this.flippedNow = true;
    if (this.logic === 0) {
      this.upperV = this.v;
      this.lastFallT = this.t;
    } else {
      this.lastRiseT = this.t;
      this.lastRiseV = this.v;
    }
    const delayS = this.decisionDelayS();
    if (delayS > 0) {
      if (this.pendingCount === PENDING_CAPACITY) {
        throw new CoreError('not-converged', 'The comparator flips faster than its recovery delay lets the output follow', undefined, {
          recoveryDelayS: this.delayS,
        });
      }
      const slot = (this.pendingHead + this.pendingCount) % PENDING_CAPACITY;
      this.pending[slot] = this.t + delayS;
      this.pendingDelay[slot] = delayS;
      this.pendingCount++;
    } else {
      this.changeTarget(0);
    }
  }

  /** The delayed decision reaches the output stage. */
  /**
   * Delay from this decision to the output moving: the recovery/propagation
   * delay, plus for a comparator whose delay follows overdrive the
   * charge-control term √(2k/S) at the slope S with which N − P crosses its
   * threshold now (amplifiers/propagation-delay.ts).
   */
  private decisionDelayS(): number {
    if (!(this.delayChargeVS > 0)) return this.delayS;
    const cfg = this.cache.get(this.key);
    let slope: number;
    if (cfg.dyn) {
      slope = Math.abs(cfg.dyn.rowRate(cfg.dyn.row(QUANTITY.h), this.stateNow(cfg.dyn), this.s, this.rate));
    } else {
      const dv = (cfg.b0 + cfg.bS * this.s - cfg.a * this.v) / this.kin.shape.ratio(this.v);
      slope = Math.abs(cfg.hV * dv + cfg.hS * this.rate);
    }
    return slope > 0 ? delayForRampS({ floorS: this.delayS, chargeVS: this.delayChargeVS }, slope) : this.delayS;
  }

  private changeTarget(delayS: number): void {
    this.target ^= 1;
    this.motionFlipS = this.t - delayS;
    if (this.cache.openDrain) {
      if (this.target) {
        // Released: no drive and (without pin capacitance) no slew.
        this.s = this.pinV();
        this.stage = STAGE.released;
        this.rate = 0;
        this.motionDone();
        return;
      }
      if (this.stage === STAGE.released) {
        // The transistor starts pulling down from where the pin is.
        this.s = this.pinV();
        this.stage = STAGE.driven;
      }
    }
    const level = this.targetLevel();
    if (!Number.isFinite(this.slewVPerS) || this.s === level) {
      this.s = level;
      this.rate = 0;
      this.motionDone();
    } else {
      this.rate = level > this.s ? this.slewVPerS : -this.slewVPerS;
    }
  }

  private pinV(): number {
    const cfg = this.cache.get(this.key);
    if (cfg.dyn) return rowAt(cfg.dyn.row(QUANTITY.o), this.stateNow(cfg.dyn), this.s);
    return cfg.oC + cfg.oV * this.v + cfg.oS * this.s;
  }

  private motionDone(): void {
    const d = this.t - this.motionFlipS;
    if (this.target) {
      this.riseS = d;
      this.riseDoneT = this.t;
    } else {
      this.fallS = d;
      this.fallDoneT = this.t;
    }
  }

  /**
   * After any discrete change, make the configuration consistent at this
   * instant: flip whatever is already clearly violated (most violated first),
   * e.g. a jump of the output that turns a diode or the clamp on at once.
   */
  private resolve(): void {
    for (let step = 0; step < MAX_RESOLUTION_STEPS; step++) {
      const cfg = this.cache.get(this.key);
      const v = this.v;
      const s = this.s;
      const sg = this.logic ? 1 : -1;
      const dyn = cfg.dyn;
      const x = dyn ? this.stateNow(dyn) : this.xScratch;
      let worst = (sg * (dyn ? rowAt(dyn.row(QUANTITY.h), x, s) : cfg.hC + cfg.hV * v + cfg.hS * s) + this.halfHystV) / this.vTol;
      let kind: number = EVENT.threshold;
      let index = 0;
      for (let k = 0; k < cfg.eventCount; k++) {
        const r = (dyn ? rowAt(dyn.row(QUANTITY.event0 + k), x, s) + this.pinnedChargeCurrent(cfg, dyn, k) : cfg.evC[k] + cfg.evV[k] * v + cfg.evS[k] * s) / cfg.evTol[k];
        if (r < worst) {
          worst = r;
          kind = cfg.evKind[k];
          index = cfg.evIndex[k];
        }
      }
      if (!(worst < -1)) return;
      this.apply(kind, index);
    }
    throw new CoreError('not-converged', 'No consistent circuit configuration at a switching instant (the diodes, clamp or current limit chatter)', undefined, {
      timeS: this.t,
    });
  }

  /**
   * At every decision (once the instant is resolved), compare the full switching
   * state with the one at the previous decision of the same direction: equal
   * within the tolerance means the cycle in between repeats for ever. Checking
   * both directions finds the repeat half a cycle sooner after power-up.
   */
  private recordDecision(): void {
    if (this.cache.get(this.key).dyn?.oPinned) this.xO = this.s;
    const pendingRelS = this.pendingCount > 0 ? this.pending[this.pendingHead] - this.t : 0;
    const key = this.key;
    const r = this.rec[this.logic];
    if (
      r.valid &&
      this.t > r.t &&
      key === r.key &&
      this.target === r.target &&
      this.pendingCount === r.pending &&
      Math.abs(this.v - r.v) <= this.steadyTolV &&
      Math.abs(this.xP - r.xP) <= this.steadyTolV &&
      Math.abs(this.xO - r.xO) <= this.steadyTolV &&
      Math.abs(this.s - r.s) <= this.steadyTolV &&
      Math.abs(pendingRelS - r.pendingRelS) <= STEADY_STATE_TOLERANCE * (this.t - r.t)
    ) {
      const periodS = this.t - r.t;
      const startS = r.t;
      // Inside the cycle lies exactly one decision of the other direction: the latest one.
      const decisionHighS = this.logic === 1 ? this.lastFallT - startS : this.t - this.lastRiseT;
      this.steady = {
        startIndex: r.logIndex,
        endIndex: this.log.count,
        startS,
        periodS,
        risingS: this.logic === 1 ? startS : this.lastRiseT,
        lowerV: this.lastRiseV,
        upperV: this.upperV,
        decisionHighS,
        // A motion that did not complete inside this cycle does not describe it.
        riseS: this.riseDoneT >= startS ? this.riseS : Number.NaN,
        fallS: this.fallDoneT >= startS ? this.fallS : Number.NaN,
        cycles: this.cycles,
      };
      return;
    }
    if (this.logic === 1) {
      if (++this.cycles > MAX_CYCLES) {
        throw new CoreError('not-converged', `The oscillation did not repeat within ${MAX_CYCLES} cycles`, undefined, { cycles: MAX_CYCLES });
      }
      if (this.accelerate(key, pendingRelS)) this.rec[0].valid = false; // the state jumped: the falling record is stale
    }
    r.valid = true;
    r.t = this.t;
    r.v = this.v;
    r.xP = this.xP;
    r.xO = this.xO;
    r.s = this.s;
    r.key = key;
    r.target = this.target;
    r.pending = this.pendingCount;
    r.pendingRelS = pendingRelS;
    r.logIndex = this.log.count;
  }

  /**
   * Slew-limited circuits whose output never reaches its saturation level
   * approach their limit cycle geometrically, sometimes with a ratio close to 1
   * (thousands of cycles). When three successive rising decisions show a
   * geometric sequence of source voltages, jump to its limit (Aitken's Δ²) and
   * let the walk confirm it; in the usual, settled case the state repeats
   * exactly after one cycle and this never runs.
   */
  private accelerate(key: number, pendingRelS: number): boolean {
    const h = this.accHistory;
    const same = this.accCount > 0 && key === this.accKey && this.target === this.accTarget && this.pendingCount === this.accPending && Math.abs(pendingRelS - this.accPendingRelS) <= 1e-9 * Math.abs(pendingRelS) + 1e-15;
    if (!same) this.accCount = 0;
    this.accKey = key;
    this.accTarget = this.target;
    this.accPending = this.pendingCount;
    this.accPendingRelS = pendingRelS;
    h[0] = h[1];
    h[1] = h[2];
    h[2] = this.s;
    // The extrapolation places N on the switching line from s alone: one capacitive node only.
    if (++this.accCount < 3 || this.shape.dynamic) return false;
    const d1 = h[1] - h[0];
    const d2 = h[2] - h[1];
    const ratio = d2 / d1;
    this.accCount = 0;
    if (!(Math.abs(ratio) < 1 - 1e-9) || !(Math.abs(d2) > this.steadyTolV)) return false;
    const sLimit = h[2] + (d2 * ratio) / (1 - ratio);
    const cfg = this.cache.get(key);
    if (!(cfg.hV !== 0) || !Number.isFinite(sLimit)) return false;
    // A rising decision happens on the threshold (h/2 of internal hysteresis below it): v follows from s there.
    this.s = sLimit;
    this.v = (cfg.hC + cfg.hS * sLimit - this.halfHystV) / -cfg.hV;
    this.lastRiseV = this.v;
    if (Number.isNaN(this.extrapolatedAtS)) this.extrapolatedAtS = this.t;
    return true;
  }

  /** No event ever ends the piece: the circuit sits in one state for good. */
  private latch(cfg: ConfigModel): never {
    const state = this.target ? 'high' : 'low';
    const s = this.s;
    const thresholdV = (cfg.hC + cfg.hS * s + (this.logic ? 1 : -1) * this.halfHystV) / -cfg.hV;
    const where = this.target ? 'reach the upper' : 'fall to the lower';
    const detail: string[] = [];
    if (cfg.clamp !== CLAMP.off) detail.push('the input clamp conducting');
    if (cfg.stage === STAGE.limitedSource || cfg.stage === STAGE.limitedSink) detail.push('the output in current limit');
    const note = detail.length ? ` (with ${detail.join(' and ')})` : '';
    if (!(cfg.a > 0)) {
      throw new CoreError(
        'no-oscillation',
        `The output latches ${state}: in the ${state} state the timing capacitor has no resistive path${note}, so it never reaches the switching level ${formatVolts(thresholdV)}`,
        undefined,
        { stuckState: state, thresholdV, model: 'time-domain' },
      );
    }
    const asymptoteV = (cfg.b0 + cfg.bS * s) / cfg.a;
    throw new CoreError(
      'no-oscillation',
      `The output latches ${state}: in the ${state} state${note} the capacitor settles at ${formatVolts(asymptoteV)}, which does not ${where} threshold ${formatVolts(thresholdV)}`,
      undefined,
      { stuckState: state, asymptoteV, thresholdV, model: 'time-domain' },
    );
  }
}
