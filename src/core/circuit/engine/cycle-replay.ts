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
 * figures are read off them unchanged (test/core/circuit/cycle-replay.test.ts).
 *
 * Replayable: one capacitive node with a linear capacitor, a push-pull stage
 * (the open drain's release changes configuration), a recovery delay that does
 * not follow overdrive, pieces ended only by the threshold and the two time
 * events (so the configuration stays the same through the cycle) and at most
 * one flip waiting for the delay.
 */
import { BOUNDARY_TOLERANCE, EVENT, type ConfigModel } from './configs.ts';
import { Kinematics } from './kinematics.ts';
import { LOG, LOG_STRIDE, type PieceLog } from './piece-log.ts';
import { AffineProbe, firstExit, PieceEnds } from './root-solve.ts';
import type { CompiledShape } from './compiled-network.ts';
import { saturationHighV, saturationLowV, STEADY_STATE_TOLERANCE, TIME_EVENT, type OscillatorWalk, type SteadyCycle, type SteadyStart } from './walker.ts';

const TIME_TARGET = TIME_EVENT.target;
const TIME_SLEW_END = TIME_EVENT.slewEnd;
const THRESHOLD = EVENT.threshold;

export class CycleReplay {
  private readonly kin = new Kinematics();
  private readonly probe = new AffineProbe(this.kin);
  private readonly ends = new PieceEnds();
  private readonly endScratch = new Float64Array(2);
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
      ends.fill(kin, best, true);
      const sg = logic ? 1 : -1;
      const te = firstExit(this.probe, ends, sg * cfg.hC + halfHystV, sg * cfg.hV, sg * cfg.hS, vTol);
      if (te < best) {
        best = te;
        kind = THRESHOLD;
      }
      if (kind !== endings[p] || !(best > 0 && best < Infinity) || this.eventExitsBy(cfg, best)) return undefined;
      let vEnd: number;
      let integralV: number;
      if (best === ends.durationS && !Number.isNaN(ends.integralV)) {
        vEnd = ends.vT;
        integralV = ends.integralV;
      } else {
        kin.endAndIntegral(best, this.endScratch);
        vEnd = this.endScratch[0];
        integralV = this.endScratch[1];
      }
      logPiece(log, t, best, v, s, rate, cfg.key, logic, target, vEnd, integralV, kind);
      v = vEnd;
      s = kin.s(best);
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

  /** True when an event function (diode, clamp, current limit) of the configuration leaves its region within the piece. */
  private eventExitsBy(cfg: ConfigModel, durationS: number): boolean {
    for (let k = 0; k < cfg.eventCount; k++) {
      if (firstExit(this.probe, this.ends, cfg.evC[k], cfg.evV[k], cfg.evS[k], cfg.evTol[k]) <= durationS) return true;
    }
    return false;
  }
}

/** The walk's log record of a piece (OscillatorWalk.step writes the same fields). */
function logPiece(log: PieceLog, startS: number, durationS: number, v0: number, s0: number, rate: number, key: number, logic: number, target: number, vEnd: number, integralV: number, end: number): void {
  const i = log.append();
  const d = log.data;
  d[i + LOG.startS] = startS;
  d[i + LOG.durationS] = durationS;
  d[i + LOG.v0] = v0;
  d[i + LOG.s0] = s0;
  d[i + LOG.rate] = rate;
  d[i + LOG.key] = key;
  d[i + LOG.logic] = logic;
  d[i + LOG.target] = target;
  d[i + LOG.vEnd] = vEnd;
  d[i + LOG.integralV] = integralV;
  d[i + LOG.end] = end;
}

/** OscillatorWalk.resolve's test: is any function of the configuration beyond its boundary tolerance now? */
function violated(cfg: ConfigModel, v: number, s: number, sg: number, halfHystV: number, vTol: number): boolean {
  if ((sg * (cfg.hC + cfg.hV * v + cfg.hS * s) + halfHystV) / vTol < -1) return true;
  for (let k = 0; k < cfg.eventCount; k++) {
    if ((cfg.evC[k] + cfg.evV[k] * v + cfg.evS[k] * s) / cfg.evTol[k] < -1) return true;
  }
  return false;
}
