/**
 * The nominal's steady cycle compiled into a fixed piece sequence (docs/model.md §4,
 * "Cycle replay"): for a vector near the nominal, the walk started at the
 * nominal's steady state (OscillatorWalk.startFrom) usually meets the very same
 * pieces — recovery delay, slew ramp, exponential, per state — ended by the same
 * events, and closes after one cycle. The replay walks exactly that sequence with
 * the walk's own arithmetic (the same kinematics, the same exit searches on the
 * same numbers, the same transitions), without the general walk's bookkeeping
 * (configuration look-ups per piece, resolution loop, decision records per
 * decision), and checks at every piece what the general walk would check:
 * - the piece ends by the event that ended the nominal's piece, after a time > 0,
 *   and no other function (threshold, diode, clamp, current limit) leaves its
 *   region first (an event function that stays clear of its boundary over the
 *   cycle's whole range of v and s is cleared once per vector: quietEvents);
 * - after the event nothing is violated at once (the walk would resolve it);
 * - after the cycle the switching state repeats within the walk's steady-state
 *   tolerance.
 * Any other outcome returns undefined and the general walk answers from the same
 * start. The pieces it logs are the ones the walk would log, bit for bit, so the
 * timing figures are read off them unchanged (test/core/circuit/cycle-replay.test.ts);
 * only ∫v dt is left out (NaN): the prepared model reads no integral figure, and
 * it saves a φ3 per piece.
 *
 * Replayable: one capacitive node with a linear capacitor, a push-pull stage
 * (the open drain's release changes configuration), a recovery delay that does
 * not follow overdrive, pieces ended only by the threshold and the two time
 * events (so the configuration stays the same through the cycle) and at most
 * one flip waiting for the delay.
 */
import { BOUNDARY_TOLERANCE, EVENT, type ConfigModel } from './configs.ts';
import { CyclePins } from './figures.ts';
import { Kinematics } from './kinematics.ts';
import { LOG, LOG_STRIDE, type PieceLog } from './piece-log.ts';
import { AffineProbe, exitAtRest as exitAtRestImported, firstExit as firstExitImported, PieceEnds } from './root-solve.ts';
import type { CompiledShape } from './compiled-network.ts';
import { saturationHighV as saturationHighVImported, saturationLowV as saturationLowVImported, STEADY_STATE_TOLERANCE, TIME_EVENT, type OscillatorWalk, type SteadyCycle, type SteadyStart } from './walker.ts';

// The log record's fields as plain numbers (as walker.ts reads them).
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
const LOG_END = LOG.end;
const TIME_TARGET = TIME_EVENT.target;
const TIME_SLEW_END = TIME_EVENT.slewEnd;
const THRESHOLD = EVENT.threshold;
// The functions and constants of the other modules as module-local bindings too: each sample's replay must
// not pay a live import binding's accessor per call (some loaders compile one to a getter call).
const firstExit = firstExitImported;
const exitAtRest = exitAtRestImported;
const saturationHighV = saturationHighVImported;
const saturationLowV = saturationLowVImported;
const STEADY_TOLERANCE = STEADY_STATE_TOLERANCE;
const BOUNDARY_TOL = BOUNDARY_TOLERANCE;

export class CycleReplay {
  private readonly kin = new Kinematics();
  private readonly probe = new AffineProbe(this.kin);
  private readonly ends = new PieceEnds();
  /** The pins of the replayed cycle's pieces (figures.ts), recorded as they are logged. */
  readonly pins = new CyclePins();
  /** The cycle handed back (reused: read it before the next evaluation, like the walk's log). */
  private readonly cycle: SteadyCycle = {
    startIndex: 0,
    endIndex: 0,
    startS: 0,
    periodS: 0,
    risingS: 0,
    lowerV: 0,
    upperV: 0,
    decisionHighS: 0,
    riseS: 0,
    fallS: 0,
    cycles: 1,
  };

  private constructor(
    private readonly shape: CompiledShape,
    /** What ended each piece of the nominal's cycle, in order. */
    private readonly endings: Int8Array,
    /** The one configuration the cycle stays in (both states' nominal configuration). */
    private readonly key: number,
  ) {}

  /**
   * The replay of a cycle the walk has just found from `start` (undefined when the
   * cycle is not replayable: see the module note).
   */
  static compile(walk: OscillatorWalk, cycle: SteadyCycle, start: SteadyStart): CycleReplay | undefined {
    const shape = walk.shape;
    // A stray at the timing node with a C(v) capacitor makes the node non-linear too (ConfigCache.biasShape).
    if (shape.dynamic || shape.openDrain || walk.cache.biasShape.kind !== 'flat' || shape.biasShape.kind !== 'flat' || !walk.dynamics) return undefined;
    // The walk from the start closed after its first cycle: that cycle is the sequence every vector repeats.
    if (cycle.startIndex !== 0 || cycle.endIndex < 2 || start.pendingCount > 1) return undefined;
    const d = walk.log.data;
    const key = d[LOG.key];
    if (key !== shape.nominalHighKey || key !== shape.nominalLowKey) return undefined;
    const endings = new Int8Array(cycle.endIndex);
    let pending = start.pendingCount;
    for (let i = 0; i < endings.length; i++) {
      const b = i * LOG_STRIDE;
      const end = d[b + LOG.end];
      if (d[b + LOG.key] !== key || (end !== TIME_TARGET && end !== TIME_SLEW_END && end !== THRESHOLD)) return undefined;
      if (end === THRESHOLD && walk.values[shape.slot.delay] > 0) pending++;
      if (end === TIME_TARGET) pending--;
      if (pending > 1) return undefined;
      endings[i] = end;
    }
    return new CycleReplay(shape, endings, key);
  }

  // The replay's state between pieces, in fields: run() and the per-piece steps below are separate
  // compilation units (each with its own inlining budget: one function held the budget's worth of callees,
  // so the exit searches and φ evaluations were called out of line with their numbers boxed), and fields
  // hand the numbers over without boxing them.
  private slewVPerS = 0.5;
  private delayS = 0.5;
  private halfHystV = 0.5;
  private vTol = 0.5;
  private highV = 0.5;
  private lowV = 0.5;
  private t = 0.5;
  private v = 0.5;
  private s = 0.5;
  private rate = 0.5;
  private logic = 0;
  private target = 0;
  private pendingAtS = 0.5;
  private motionFlipS = 0.5;
  private lastRiseT = 0.5;
  private lastRiseV = 0.5;
  private lastFallT = 0.5;
  private upperV = 0.5;
  private riseS = 0.5;
  private fallS = 0.5;
  private riseDoneT = 0.5;
  private fallDoneT = 0.5;
  /** The piece just searched (pieceEnd): its duration, what ends it and the capacitor voltage at its horizon. */
  private pieceS = 0.5;
  private pieceKind = 0;
  /** Event functions to watch in this vector's cycle: the configuration's, or 0 when none can reach its boundary (quietEvents). */
  private events = 0;
  private pieceVEnd = 0.5;

  /**
   * Replay the cycle for `values` from the nominal's steady `start`, in the walk's
   * configuration cache and log (the walk's own switching state is left alone).
   * Returns the cycle, or undefined when the vector leaves the sequence (the
   * general walk then answers: it resets the cache and the log itself).
   */
  run(walk: OscillatorWalk, values: ArrayLike<number>, start: SteadyStart): SteadyCycle | undefined {
    const shape = this.shape;
    const slot = shape.slot;
    // The walk's per-vector constants (OscillatorWalk.reset), read from the same values.
    if (!(values[slot.delayCharge] <= 0)) return undefined; // the delay follows the input slope: the walk answers
    const cache = walk.cache;
    cache.reset(shape, values, true, false);
    const cfg = cache.tryGet(this.key);
    if (!cfg || !(cfg.hV !== 0)) return undefined;
    const slewVPerS = values[slot.slew];
    const delayS = values[slot.delay];
    const steadyTolV = STEADY_TOLERANCE * cache.spanV;
    const highV = saturationHighV(shape, values);
    const lowV = saturationLowV(shape, values);
    // walkToCycle's hysteresis test (both states are this configuration).
    if (!((cfg.hC + cfg.hS * highV) / -cfg.hV > (cfg.hC + cfg.hS * lowV) / -cfg.hV)) return undefined;
    // The start state as OscillatorWalk.startFrom places it (the decision's own flip due a full delay ahead).
    if (delayS > 0 !== start.pendingCount > 0) return undefined;
    this.slewVPerS = slewVPerS;
    this.delayS = delayS;
    this.halfHystV = values[slot.hysteresis] / 2;
    this.vTol = BOUNDARY_TOL * cache.spanV;
    this.highV = highV;
    this.lowV = lowV;
    const rate = start.rateAt(slewVPerS);
    const s = start.sourceAt(lowV, highV, rate);
    const v = (cfg.hC + cfg.hS * s) / -cfg.hV;
    this.events = quietEvents(cfg, v, lowV, highV) ? 0 : cfg.eventCount;
    this.t = 0;
    this.rate = rate;
    this.s = s;
    this.v = v;
    this.logic = start.logic;
    this.target = start.target;
    this.pendingAtS = start.pendingCount > 0 ? delayS : Number.NaN;
    this.motionFlipS = start.motionFlipRelS;
    const startLogic = start.logic;
    const startTarget = start.target;
    const startPendingRelS = start.pendingCount > 0 ? delayS : 0;
    // What the cycle's figures need (OscillatorWalk.startFrom / flipDecision / motionDone).
    this.lastRiseT = this.lastRiseV = this.lastFallT = this.upperV = Number.NaN;
    this.riseS = this.fallS = this.riseDoneT = this.fallDoneT = Number.NaN;
    if (startLogic) {
      this.lastRiseT = 0;
      this.lastRiseV = v;
    } else {
      this.lastFallT = 0;
      this.upperV = v;
    }
    const log = walk.log;
    log.clear();
    const endings = this.endings;
    this.pins.reserve(endings.length);
    for (let p = 0; p < endings.length; p++) {
      if (!this.pieceEnd(cfg, endings[p])) return undefined;
      if (!this.logAndApply(log, cfg, p)) return undefined;
    }
    // OscillatorWalk.recordDecision: back at the start's decision, the switching state must repeat.
    const t = this.t;
    const pendingAtS = this.pendingAtS;
    const pendingRelS = Number.isNaN(pendingAtS) ? 0 : pendingAtS - t;
    if (
      this.logic !== startLogic ||
      this.target !== startTarget ||
      Number.isNaN(pendingAtS) !== !(start.pendingCount > 0) ||
      !(Math.abs(this.v - v) <= steadyTolV) ||
      !(Math.abs(this.s - s) <= steadyTolV) ||
      !(Math.abs(pendingRelS - startPendingRelS) <= STEADY_TOLERANCE * t)
    ) {
      return undefined;
    }
    const c = this.cycle;
    c.endIndex = log.count;
    c.periodS = t;
    c.risingS = this.logic === 1 ? 0 : this.lastRiseT;
    c.lowerV = this.lastRiseV;
    c.upperV = this.upperV;
    c.decisionHighS = this.logic === 1 ? this.lastFallT : t - this.lastRiseT;
    c.riseS = this.riseDoneT >= 0 ? this.riseS : Number.NaN;
    c.fallS = this.fallDoneT >= 0 ? this.fallS : Number.NaN;
    return c;
  }

  /**
   * OscillatorWalk.step on this configuration from the replay's state: the earliest time event, then the
   * function exits. Leaves the piece's duration, end and the voltage at its horizon in pieceS, pieceKind, pieceVEnd;
   * false when the piece does not end as the nominal's did (`expected`). A ramp and a piece at rest take
   * separate steps (the same arithmetic): each is its own compilation unit, whose inlining budget then holds
   * all of its exit searches (one step for both called the closed-form exit and the φ series out of line,
   * boxing their numbers).
   */
  private pieceEnd(cfg: ConfigModel, expected: number): boolean {
    return this.rate !== 0 ? this.rampEnd(cfg, expected) : this.restEnd(cfg, expected);
  }

  /** pieceEnd for a source at rest (a plain exponential piece). */
  private restEnd(cfg: ConfigModel, expected: number): boolean {
    const kin = this.kin;
    const s = this.s;
    kin.set(cfg.a, cfg.b0 + cfg.bS * s, cfg.bS * 0, this.v, s, 0);
    let best = Infinity;
    let kind = 0;
    const pendingAtS = this.pendingAtS;
    if (!Number.isNaN(pendingAtS)) {
      best = Math.max(0, pendingAtS - this.t);
      kind = TIME_TARGET;
    }
    // The far end as PieceEnds.fill computes it for a piece with a time event (∫v dt left out); a piece at
    // rest decides from its ends at once (exitTime's at-rest branch).
    const horizonS = best;
    const vT = horizonS < Infinity ? kin.vAtEnd(horizonS) : Number.NaN;
    // The threshold (k = −1: h, signed for the decision) and each event function of the configuration,
    // watched as OscillatorWalk.step watches them; an event function that would end the piece first
    // leaves the nominal's sequence.
    const sg = this.logic ? 1 : -1;
    const thresholdS = this.exitAtRestOf(sg * cfg.hC + this.halfHystV, sg * cfg.hV, sg * cfg.hS, this.vTol, horizonS, vT);
    if (thresholdS < best) {
      best = thresholdS;
      kind = THRESHOLD;
    }
    for (let k = 0; k < this.events; k++) {
      if (this.exitAtRestOf(cfg.evC[k], cfg.evV[k], cfg.evS[k], cfg.evTol[k], horizonS, vT) < best) return false;
    }
    return this.pieceFound(expected, best, kind, vT);
  }

  /** pieceEnd for a source on its slew ramp. */
  private rampEnd(cfg: ConfigModel, expected: number): boolean {
    const kin = this.kin;
    const s = this.s;
    const rate = this.rate;
    kin.set(cfg.a, cfg.b0 + cfg.bS * s, cfg.bS * rate, this.v, s, rate);
    let best = Infinity;
    let kind = 0;
    const pendingAtS = this.pendingAtS;
    if (!Number.isNaN(pendingAtS)) {
      best = Math.max(0, pendingAtS - this.t);
      kind = TIME_TARGET;
    }
    const dt = Math.max(0, ((this.target ? this.highV : this.lowV) - s) / rate);
    if (dt < best) {
      best = dt;
      kind = TIME_SLEW_END;
    }
    // The far end as PieceEnds.fill computes it for a piece with a time event (∫v dt left out); the
    // exit search reads both ends.
    const horizonS = best;
    const vT = horizonS < Infinity ? kin.vAtEnd(horizonS) : Number.NaN;
    this.ends.fillWithEnd(kin, horizonS, vT);
    const sg = this.logic ? 1 : -1;
    const thresholdS = firstExit(this.probe, this.ends, sg * cfg.hC + this.halfHystV, sg * cfg.hV, sg * cfg.hS, this.vTol);
    if (thresholdS < best) {
      best = thresholdS;
      kind = THRESHOLD;
    }
    for (let k = 0; k < this.events; k++) {
      if (firstExit(this.probe, this.ends, cfg.evC[k], cfg.evV[k], cfg.evS[k], cfg.evTol[k]) < best) return false;
    }
    return this.pieceFound(expected, best, kind, vT);
  }

  /** The searched piece's end kept for logAndApply; false when it is not the nominal's (`expected`). */
  private pieceFound(expected: number, best: number, kind: number, vT: number): boolean {
    if (kind !== expected || !(best > 0 && best < Infinity)) return false;
    this.pieceS = best;
    this.pieceKind = kind;
    // A threshold ends the piece before its horizon: logAndApply evaluates v there (keeping this function's
    // inlining budget for the exit searches); a time event ends it at the horizon, whose v is known.
    this.pieceVEnd = vT;
    return true;
  }

  /**
   * The searched piece logged as piece p (the walk's record, its pins), then its event applied
   * (OscillatorWalk.apply, changeTarget, flipDecision, motionDone for a push-pull stage); false when the
   * event leaves something violated (OscillatorWalk.resolve would flip it: not the nominal's sequence).
   */
  private logAndApply(log: PieceLog, cfg: ConfigModel, p: number): boolean {
    const best = this.pieceS;
    const kind = this.pieceKind;
    const vEnd = kind === THRESHOLD ? this.kin.vAtEnd(best) : this.pieceVEnd;
    const v0 = this.v;
    const s0 = this.s;
    const rate0 = this.rate;
    // The walk's log record (OscillatorWalk.step writes the same fields; ∫v dt is left out: NaN).
    const i = log.append();
    const d = log.data;
    d[i + LOG_START] = this.t;
    d[i + LOG_DURATION] = best;
    d[i + LOG_V0] = v0;
    d[i + LOG_S0] = s0;
    d[i + LOG_RATE] = rate0;
    d[i + LOG_KEY] = cfg.key;
    d[i + LOG_LOGIC] = this.logic;
    d[i + LOG_TARGET] = this.target;
    d[i + LOG_VEND] = vEnd;
    d[i + LOG_INTEGRAL] = Number.NaN;
    d[i + LOG_END] = kind;
    let s = s0 + rate0 * best; // Kinematics.s at the piece's end
    this.pins.setPiece(p, cfg, v0, s0, vEnd, s);
    const v = vEnd;
    const t = this.t + best;
    this.v = v;
    this.t = t;
    const delayS = this.delayS;
    let rate = rate0;
    let target = this.target;
    let logic = this.logic;
    let motionDone = false;
    if (kind === THRESHOLD) {
      logic ^= 1;
      this.logic = logic;
      if (logic === 0) {
        this.upperV = v;
        this.lastFallT = t;
      } else {
        this.lastRiseT = t;
        this.lastRiseV = v;
      }
      if (delayS > 0) this.pendingAtS = t + delayS;
    }
    if (kind === TIME_TARGET || (kind === THRESHOLD && !(delayS > 0))) {
      if (kind === TIME_TARGET) this.pendingAtS = Number.NaN;
      target ^= 1;
      this.target = target;
      this.motionFlipS = t - (kind === TIME_TARGET ? delayS : 0);
      const level = target ? this.highV : this.lowV;
      const slewVPerS = this.slewVPerS;
      if (!Number.isFinite(slewVPerS) || s === level) {
        s = level;
        rate = 0;
        motionDone = true;
      } else {
        rate = level > s ? slewVPerS : -slewVPerS;
      }
    } else if (kind === TIME_SLEW_END) {
      s = target ? this.highV : this.lowV;
      rate = 0;
      motionDone = true;
    }
    this.s = s;
    this.rate = rate;
    if (motionDone) {
      if (target) {
        this.riseS = t - this.motionFlipS;
        this.riseDoneT = t;
      } else {
        this.fallS = t - this.motionFlipS;
        this.fallDoneT = t;
      }
    }
    return !violated(cfg, v, s, logic ? 1 : -1, this.halfHystV, this.vTol, this.events);
  }

  /**
   * firstExit of g = c0 + cv·v + cs·s from the piece at rest set in kin (horizon T, far end vT): the walk's
   * exit search decided at once by the closed form it would reach (exitOfProbe's branch for a source at rest).
   */
  private exitAtRestOf(c0: number, cv: number, cs: number, tolerance: number, horizonS: number, vT: number): number {
    const kin = this.kin;
    const g0 = c0 + cv * kin.v0 + cs * kin.s0;
    if (g0 < -tolerance) return 0;
    return exitAtRest(kin.a, kin.k0, kin.v0, g0, c0 + cv * vT + cs * kin.s(horizonS), c0 + cs * kin.s0, cv, horizonS);
  }
}

/**
 * OscillatorWalk.resolve's test: is any function of the configuration beyond its boundary tolerance now?
 * (`events`: the event functions to test, 0 when quietEvents cleared them for the cycle.)
 */
function violated(cfg: ConfigModel, v: number, s: number, sg: number, halfHystV: number, vTol: number, events: number): boolean {
  if ((sg * (cfg.hC + cfg.hV * v + cfg.hS * s) + halfHystV) / vTol < -1) return true;
  for (let k = 0; k < events; k++) {
    if ((cfg.evC[k] + cfg.evV[k] * v + cfg.evS[k] * s) / cfg.evTol[k] < -1) return true;
  }
  return false;
}

/**
 * Relative margin, against the size of its terms, by which every event function must stay positive over the
 * cycle's whole (v, s) box for quietEvents to clear it: far above the rounding of any value the exit
 * searches compute (a few ulps of those terms) and of the box's own corners.
 */
const QUIET_MARGIN = 1e-6;

/**
 * True when no event function of the configuration (current limit, input clamp) can leave its region
 * anywhere in this vector's cycle, so the exit searches and the resolve test would find nothing for them in
 * any piece: the replay's one configuration moves v by dv/dt = b0 + bS·s − a·v with the source s between the
 * saturation levels, so v never leaves the hull of its start and the asymptotes (b0 + bS·s)/a at both
 * levels (at v's ends of the hull dv/dt points inward); an affine function positive over that box by a
 * margin far above rounding is positive at every value the searches compute (their closed-form asymptote
 * and interior extremum included), and each of them then answers "never" (Infinity) exactly as when
 * evaluated. Otherwise (no resistive path, a function near its boundary) the replay watches them all.
 */
function quietEvents(cfg: ConfigModel, vStart: number, lowV: number, highV: number): boolean {
  const n = cfg.eventCount;
  if (n === 0) return true;
  if (!(cfg.a > 0)) return false;
  const vAtLow = (cfg.b0 + cfg.bS * lowV) / cfg.a;
  const vAtHigh = (cfg.b0 + cfg.bS * highV) / cfg.a;
  const vLo = Math.min(vStart, vAtLow, vAtHigh);
  const vHi = Math.max(vStart, vAtLow, vAtHigh);
  const sLo = Math.min(lowV, highV);
  const sHi = Math.max(lowV, highV);
  const vMag = Math.max(Math.abs(vLo), Math.abs(vHi));
  const sMag = Math.max(Math.abs(sLo), Math.abs(sHi));
  for (let k = 0; k < n; k++) {
    const c = cfg.evC[k];
    const cv = cfg.evV[k];
    const cs = cfg.evS[k];
    const least = c + Math.min(cv * vLo, cv * vHi) + Math.min(cs * sLo, cs * sHi);
    const size = Math.abs(c) + Math.abs(cv) * vMag + Math.abs(cs) * sMag;
    if (!(least > QUIET_MARGIN * size)) return false;
  }
  return true;
}
