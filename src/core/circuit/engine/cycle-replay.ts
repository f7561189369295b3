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
 *   region first;
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
import { LOG, LOG_STRIDE } from './piece-log.ts';
import { AffineProbe, exitAtRest, firstExit, PieceEnds } from './root-solve.ts';
import type { CompiledShape } from './compiled-network.ts';
import { saturationHighV, saturationLowV, STEADY_STATE_TOLERANCE, TIME_EVENT, type OscillatorWalk, type SteadyCycle, type SteadyStart } from './walker.ts';

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
    const halfHystV = values[slot.hysteresis] / 2;
    const vTol = BOUNDARY_TOLERANCE * cache.spanV;
    const steadyTolV = STEADY_STATE_TOLERANCE * cache.spanV;
    const highV = saturationHighV(shape, values);
    const lowV = saturationLowV(shape, values);
    // walkToCycle's hysteresis test (both states are this configuration).
    if (!((cfg.hC + cfg.hS * highV) / -cfg.hV > (cfg.hC + cfg.hS * lowV) / -cfg.hV)) return undefined;
    // The start state as OscillatorWalk.startFrom places it (the decision's own flip due a full delay ahead).
    if (delayS > 0 !== start.pendingCount > 0) return undefined;
    let t = 0;
    let rate = start.rateAt(slewVPerS);
    let s = start.sourceAt(lowV, highV, rate);
    let v = (cfg.hC + cfg.hS * s) / -cfg.hV;
    let logic = start.logic;
    let target = start.target;
    let pendingAtS = start.pendingCount > 0 ? delayS : Number.NaN;
    let motionFlipS = start.motionFlipRelS;
    const startV = v;
    const startS = s;
    const startLogic = logic;
    const startTarget = target;
    const startPendingRelS = start.pendingCount > 0 ? delayS : 0;
    // What the cycle's figures need (OscillatorWalk.startFrom / flipDecision / motionDone).
    let lastRiseT = Number.NaN;
    let lastRiseV = Number.NaN;
    let lastFallT = Number.NaN;
    let upperV = Number.NaN;
    let riseS = Number.NaN;
    let fallS = Number.NaN;
    let riseDoneT = Number.NaN;
    let fallDoneT = Number.NaN;
    if (logic) {
      lastRiseT = 0;
      lastRiseV = v;
    } else {
      lastFallT = 0;
      upperV = v;
    }
    const log = walk.log;
    log.clear();
    const pins = this.pins;
    pins.reserve(this.endings.length);
    const kin = this.kin;
    const ends = this.ends;
    const endings = this.endings;
    for (let p = 0; p < endings.length; p++) {
      // OscillatorWalk.step on this configuration: the earliest time event, then the function exits.
      kin.set(cfg.a, cfg.b0 + cfg.bS * s, cfg.bS * rate, v, s, rate);
      let best = Infinity;
      let kind = 0;
      if (!Number.isNaN(pendingAtS)) {
        best = Math.max(0, pendingAtS - t);
        kind = TIME_TARGET;
      }
      if (rate !== 0) {
        const dt = Math.max(0, ((target ? highV : lowV) - s) / rate);
        if (dt < best) {
          best = dt;
          kind = TIME_SLEW_END;
        }
      }
      // The far end as PieceEnds.fill computes it for a piece with a time event (∫v dt left out); a ramp's
      // exit search reads both ends, a piece at rest decides from them at once (exitTime).
      const horizonS = best;
      const vT = horizonS < Infinity ? kin.vAtEnd(horizonS) : Number.NaN;
      if (rate !== 0) ends.fillWithEnd(kin, horizonS, vT);
      // The threshold (k = −1: h, signed for the decision) and each event function of the configuration,
      // watched as OscillatorWalk.step watches them; an event function that would end the piece first
      // leaves the nominal's sequence.
      const sg = logic ? 1 : -1;
      for (let k = -1; k < cfg.eventCount; k++) {
        const threshold = k < 0;
        const c0 = threshold ? sg * cfg.hC + halfHystV : cfg.evC[k];
        const cv = threshold ? sg * cfg.hV : cfg.evV[k];
        const cs = threshold ? sg * cfg.hS : cfg.evS[k];
        const te = this.exitTime(c0, cv, cs, threshold ? vTol : cfg.evTol[k], horizonS, vT);
        if (!(te < best)) continue;
        if (!threshold) return undefined;
        best = te;
        kind = THRESHOLD;
      }
      if (kind !== endings[p] || !(best > 0 && best < Infinity)) return undefined;
      const vEnd = kind === THRESHOLD ? kin.vAtEnd(best) : vT;
      // The walk's log record (OscillatorWalk.step writes the same fields; ∫v dt is left out: NaN).
      const i = log.append();
      const d = log.data;
      d[i + LOG_START] = t;
      d[i + LOG_DURATION] = best;
      d[i + LOG_V0] = v;
      d[i + LOG_S0] = s;
      d[i + LOG_RATE] = rate;
      d[i + LOG_KEY] = cfg.key;
      d[i + LOG_LOGIC] = logic;
      d[i + LOG_TARGET] = target;
      d[i + LOG_VEND] = vEnd;
      d[i + LOG_INTEGRAL] = Number.NaN;
      d[i + LOG_END] = kind;
      const sEnd = kin.s(best);
      pins.setPiece(p, cfg, v, s, vEnd, sEnd);
      v = vEnd;
      s = sEnd;
      t += best;
      // The event (OscillatorWalk.apply, changeTarget, flipDecision, motionDone for a push-pull stage).
      let motionDone = false;
      if (kind === THRESHOLD) {
        logic ^= 1;
        if (logic === 0) {
          upperV = v;
          lastFallT = t;
        } else {
          lastRiseT = t;
          lastRiseV = v;
        }
        if (delayS > 0) pendingAtS = t + delayS;
      }
      if (kind === TIME_TARGET || (kind === THRESHOLD && !(delayS > 0))) {
        if (kind === TIME_TARGET) pendingAtS = Number.NaN;
        target ^= 1;
        motionFlipS = t - (kind === TIME_TARGET ? delayS : 0);
        const level = target ? highV : lowV;
        if (!Number.isFinite(slewVPerS) || s === level) {
          s = level;
          rate = 0;
          motionDone = true;
        } else {
          rate = level > s ? slewVPerS : -slewVPerS;
        }
      } else if (kind === TIME_SLEW_END) {
        s = target ? highV : lowV;
        rate = 0;
        motionDone = true;
      }
      if (motionDone) {
        if (target) {
          riseS = t - motionFlipS;
          riseDoneT = t;
        } else {
          fallS = t - motionFlipS;
          fallDoneT = t;
        }
      }
      // OscillatorWalk.resolve would flip whatever the event left violated: not the nominal's sequence.
      if (violated(cfg, v, s, logic ? 1 : -1, halfHystV, vTol)) return undefined;
    }
    // OscillatorWalk.recordDecision: back at the start's decision, the switching state must repeat.
    const pendingRelS = Number.isNaN(pendingAtS) ? 0 : pendingAtS - t;
    if (
      logic !== startLogic ||
      target !== startTarget ||
      Number.isNaN(pendingAtS) !== !(start.pendingCount > 0) ||
      !(Math.abs(v - startV) <= steadyTolV) ||
      !(Math.abs(s - startS) <= steadyTolV) ||
      !(Math.abs(pendingRelS - startPendingRelS) <= STEADY_STATE_TOLERANCE * t)
    ) {
      return undefined;
    }
    const c = this.cycle;
    c.endIndex = log.count;
    c.periodS = t;
    c.risingS = logic === 1 ? 0 : lastRiseT;
    c.lowerV = lastRiseV;
    c.upperV = upperV;
    c.decisionHighS = logic === 1 ? lastFallT : t - lastRiseT;
    c.riseS = riseDoneT >= 0 ? riseS : Number.NaN;
    c.fallS = fallDoneT >= 0 ? fallS : Number.NaN;
    return c;
  }

  /**
   * firstExit of g = c0 + cv·v + cs·s from the piece set in kin (horizon T, far end vT): the walk's exit
   * search, with a piece at rest decided at once by the closed form it would reach (exitOfProbe's branch).
   */
  private exitTime(c0: number, cv: number, cs: number, tolerance: number, horizonS: number, vT: number): number {
    const kin = this.kin;
    if (kin.r !== 0) return firstExit(this.probe, this.ends, c0, cv, cs, tolerance);
    const g0 = c0 + cv * kin.v0 + cs * kin.s0;
    if (g0 < -tolerance) return 0;
    return exitAtRest(kin.a, kin.k0, kin.v0, g0, c0 + cv * vT + cs * kin.s(horizonS), c0 + cs * kin.s0, cv, horizonS);
  }
}

/** OscillatorWalk.resolve's test: is any function of the configuration beyond its boundary tolerance now? */
function violated(cfg: ConfigModel, v: number, s: number, sg: number, halfHystV: number, vTol: number): boolean {
  if ((sg * (cfg.hC + cfg.hV * v + cfg.hS * s) + halfHystV) / vTol < -1) return true;
  for (let k = 0; k < cfg.eventCount; k++) {
    if ((cfg.evC[k] + cfg.evV[k] * v + cfg.evS[k] * s) / cfg.evTol[k] < -1) return true;
  }
  return false;
}
