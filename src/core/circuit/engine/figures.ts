/**
 * Steady-state figures from a walk's repeating cycle (docs/model.md §5), defined
 * as a scope shows them (IEEE Std 181-2011 terms; the definitions are those of
 * ../../scope/ieee181.ts, which the capture analysis applies to samples):
 * - output state levels (high/low): the level the output settles to in each
 *   state — the pin voltage at the instant the output stage starts to leave the
 *   state (the end of the flat top, where the waveform is flattest; for a
 *   waveform that never settles, its turning point). This is the mode of the
 *   pin's amplitude histogram for a record of the cycle. Time-means over the
 *   drive intervals are reported only as meanHighV/meanLowV;
 * - frequency and duty: from the pin's crossings of the 50 % reference level
 *   between those state levels;
 * - transition durations: between the 10 % and 90 % reference levels;
 * - thresholds: the capacitor voltage at the decisions;
 * - firstEdgeS: first 50 % crossing of the pin after power-up;
 * - peaks and extremes: exact over every piece (interior extrema included).
 */
import { durationBetween as durationBetweenImported, REFERENCE_FRACTION, referenceLevelV as referenceLevelVImported } from '../../scope/ieee181.ts';
import { powerUpState } from '../closed-form.ts';
import type { EdgeTimes } from '../frequency-ceiling.ts';
import type { ModelEffect, OscillationFigures, StateSummary } from '../result.ts';
import type { StateModel } from '../state-model.ts';
import { configKey, STAGE, type ConfigCache, type ConfigModel } from './configs.ts';
import type { PieceEvaluator } from './piece-evaluator.ts';
import { LOG, LOG_STRIDE as LOG_STRIDE_IMPORTED } from './piece-log.ts';
import type { OscillatorWalk, SteadyCycle } from './walker.ts';
import { MAX_STATES, ModalKinematics, QUANTITY, ROW, R_C, R_X, rowAt, SLOT } from './modal.ts';

// Module-local bindings: the per-evaluation reads of the prepared model (levels, crossings) must not pay a
// live import binding's accessor per read (some loaders compile one to a getter call).
const LOG_STRIDE = LOG_STRIDE_IMPORTED;
const durationBetween = durationBetweenImported;
const referenceLevelV = referenceLevelVImported;
const FRACTION_LOWER = REFERENCE_FRACTION.lower;
const FRACTION_MID = REFERENCE_FRACTION.mid;
const FRACTION_UPPER = REFERENCE_FRACTION.upper;

export interface TimeDomainFigures extends OscillationFigures {
  edges: EdgeTimes;
}

/** Figures the analysis result has no field for, handed back on request. */
export interface WalkExtras {
  /** Output 50 % level used for the duty cycle and edges, V. */
  outputMidV: number;
}

/** What the figures need beyond the walk: the nominal state models and the amplifier's own supply current. */
export interface FigureContext {
  high: StateModel;
  low: StateModel;
  quiescentCurrentA: number;
  inputBiasCurrentA: number;
  /** Stand-ins for an edge the cycle did not complete (decision to settled), s. */
  nominalEdges: EdgeTimes;
  /** Effects active in the model that produced the walk (docs/model.md §3). */
  effects: readonly ModelEffect[];
}

let pinEndsBuffer = new Float64Array(32);
let crossingMemoBuffer = new Float64Array(16);

/** Pin voltage at both ends of each cycle piece (reused buffer). */
function pinEndsScratch(pieces: number): Float64Array {
  if (pinEndsBuffer.length < 2 * pieces) pinEndsBuffer = new Float64Array(4 * pieces);
  return pinEndsBuffer;
}

/** Marks a cycle piece whose 50 % crossings have not been searched (any found time is >= 0). */
const NOT_SEARCHED = -1;

/**
 * First 50 % crossing inside each cycle piece, as searched by the duty-cycle
 * pass (NaN: none; NOT_SEARCHED), so that the first-edge search from power-up,
 * which usually ends inside the first cycle, does not solve the same crossing
 * twice. Reused buffer.
 */
function crossingMemoScratch(pieces: number): Float64Array {
  if (crossingMemoBuffer.length < pieces) crossingMemoBuffer = new Float64Array(2 * pieces);
  for (let k = 0; k < pieces; k++) crossingMemoBuffer[k] = NOT_SEARCHED;
  return crossingMemoBuffer;
}
// A multi-state piece can cross a level up to four times (modal.ts); a one-capacitor piece twice.
const scratchT = new Float64Array(4);
const scratchDir = new Int8Array(4);
/** Rows of a multi-state piece: N itself, P − N, rail + output current. */
const rowN = new Float64Array(ROW);
rowN[R_X + SLOT.N] = 1;
const rowDiff = new Float64Array(ROW);
const rowSupply = new Float64Array(ROW);
const rowOut = new Float64Array(ROW);
/** The pin at a logged multi-state piece's end, without disturbing the evaluator's loaded piece. */
const endModal = new ModalKinematics();
const endState = new Float64Array(MAX_STATES);

/**
 * Sums and extremes over the cycle pieces, one piece at a time (a reusable
 * accumulator: figuresFromWalk is synchronous and never re-entered).
 */
class CycleTotals {
  pinHighInt = 0;
  pinHighS = 0;
  pinLowInt = 0;
  pinLowS = 0;
  railCharge = 0;
  sourcedCharge = 0;
  capMin = Infinity;
  capMax = -Infinity;
  pMin = Infinity;
  pMax = -Infinity;
  diffMin = Infinity;
  diffMax = -Infinity;
  iMin = Infinity;
  iMax = -Infinity;
  supplyMax = -Infinity;
  highPiece: ConfigModel | undefined;
  lowPiece: ConfigModel | undefined;
  limitedS = 0;
  demandPeakA = 0;

  clear(): void {
    this.pinHighInt = this.pinHighS = this.pinLowInt = this.pinLowS = 0;
    this.railCharge = this.sourcedCharge = 0;
    this.capMin = this.pMin = this.diffMin = this.iMin = Infinity;
    this.capMax = this.pMax = this.diffMax = this.iMax = this.supplyMax = -Infinity;
    this.highPiece = this.lowPiece = undefined;
    this.limitedS = this.demandPeakA = 0;
  }

  /** Adds the loaded piece; its pin voltage at both ends goes to pinEnds[j], pinEnds[j + 1]. */
  add(ev: PieceEvaluator, cache: ConfigCache, pinEnds: Float64Array, j: number): void {
    if (ev.dynamic) {
      this.addDynamic(ev, cache, pinEnds, j);
      return;
    }
    const cfg = ev.config;
    const T = ev.durationS;
    pinEnds[j] = ev.atStart(cfg.oC, cfg.oV, cfg.oS);
    pinEnds[j + 1] = ev.atEnd(cfg.oC, cfg.oV, cfg.oS);
    const pin = ev.integralFull(cfg.oC, cfg.oV, cfg.oS);
    this.addPinShare(ev, cfg, pin, T);
    this.railCharge += ev.integralFull(cfg.railC, cfg.railV, cfg.railS);
    this.sourcedCharge += ev.positiveIntegral(cfg.iC, cfg.iV, cfg.iS, scratchT, scratchDir);
    this.addRanges(ev, cfg, cache);
  }

  /** The pin's ∫ over a piece (V·s) and its duration (s) into the driven state's sums; the state's last piece. */
  private addPinShare(ev: PieceEvaluator, cfg: ConfigModel, pinIntegralVS: number, durationS: number): void {
    if (ev.target) {
      this.pinHighInt += pinIntegralVS;
      this.pinHighS += durationS;
    } else {
      this.pinLowInt += pinIntegralVS;
      this.pinLowS += durationS;
    }
    if (ev.logic) this.highPiece = cfg;
    else this.lowPiece = cfg;
  }

  /** add() for a multi-state piece: the same sums and extremes, on its rows. */
  private addDynamic(ev: PieceEvaluator, cache: ConfigCache, pinEnds: Float64Array, j: number): void {
    const cfg = ev.config;
    const dyn = cfg.dyn!;
    const T = ev.durationS;
    const o = dyn.row(QUANTITY.o);
    pinEnds[j] = ev.atRow(o, 0);
    pinEnds[j + 1] = ev.atRow(o, T);
    const pin = ev.integralRow(o);
    this.addPinShare(ev, cfg, pin, T);
    const rail = dyn.row(QUANTITY.rail);
    let i = dyn.row(QUANTITY.i);
    if (dyn.pinnedCapF > 0 && ev.modal.r !== 0) {
      // A stiff output holding a capacitive pin also charges it: Co·ds/dt out of the stage while it slews.
      rowOut.set(i);
      rowOut[R_C] += dyn.pinnedCapF * ev.modal.r;
      i = rowOut;
    }
    this.railCharge += ev.integralRow(rail);
    this.sourcedCharge += ev.positiveIntegralRow(i, scratchT, scratchDir);
    ev.rangeRow(rowN);
    this.capMin = Math.min(this.capMin, ev.rangeMin);
    this.capMax = Math.max(this.capMax, ev.rangeMax);
    const p = dyn.row(QUANTITY.p);
    ev.rangeRow(p);
    this.pMin = Math.min(this.pMin, ev.rangeMin);
    this.pMax = Math.max(this.pMax, ev.rangeMax);
    rowDiff.set(p);
    rowDiff[R_X + SLOT.N] -= 1;
    ev.rangeRow(rowDiff);
    this.diffMin = Math.min(this.diffMin, ev.rangeMin);
    this.diffMax = Math.max(this.diffMax, ev.rangeMax);
    ev.rangeRow(i);
    this.iMin = Math.min(this.iMin, ev.rangeMin);
    this.iMax = Math.max(this.iMax, ev.rangeMax);
    if (cfg.stage === STAGE.limitedSource || cfg.stage === STAGE.limitedSink) {
      this.limitedS += T;
      const drive = cache.get(configKey(STAGE.driven, cfg.clamp, cfg.diodes));
      ev.rangeRow(drive.dyn!.row(QUANTITY.i));
      this.demandPeakA = Math.max(this.demandPeakA, Math.abs(ev.rangeMin), Math.abs(ev.rangeMax));
    }
    ev.rangeRow(rail);
    this.supplyMax = Math.max(this.supplyMax, ev.rangeMax);
    for (let c = 0; c < ROW; c++) rowSupply[c] = rail[c] + i[c];
    ev.rangeRow(rowSupply);
    this.supplyMax = Math.max(this.supplyMax, ev.rangeMax);
  }

  /**
   * The extremes of the loaded piece. Kept apart from add, which is already
   * large, so that the optimizing compiler can inline every range call here
   * (measured a few per cent faster than one method).
   */
  private addRanges(ev: PieceEvaluator, cfg: ConfigModel, cache: ConfigCache): void {
    const T = ev.durationS;
    ev.range(0, 1, 0);
    this.capMin = Math.min(this.capMin, ev.rangeMin);
    this.capMax = Math.max(this.capMax, ev.rangeMax);
    ev.range(cfg.pC, cfg.pV, cfg.pS);
    this.pMin = Math.min(this.pMin, ev.rangeMin);
    this.pMax = Math.max(this.pMax, ev.rangeMax);
    ev.range(cfg.pC, cfg.pV - 1, cfg.pS);
    this.diffMin = Math.min(this.diffMin, ev.rangeMin);
    this.diffMax = Math.max(this.diffMax, ev.rangeMax);
    if (cfg.iV !== 0 || cfg.iS !== 0) {
      ev.range(cfg.iC, cfg.iV, cfg.iS);
      this.iMin = Math.min(this.iMin, ev.rangeMin);
      this.iMax = Math.max(this.iMax, ev.rangeMax);
    } else {
      this.iMin = Math.min(this.iMin, cfg.iC);
      this.iMax = Math.max(this.iMax, cfg.iC);
    }
    if (cfg.stage === STAGE.limitedSource || cfg.stage === STAGE.limitedSink) {
      // What the voltage drive would have delivered here (the same network with the stage driving).
      this.limitedS += T;
      const drive = cache.get(configKey(STAGE.driven, cfg.clamp, cfg.diodes));
      ev.range(drive.iC, drive.iV, drive.iS);
      this.demandPeakA = Math.max(this.demandPeakA, Math.abs(ev.rangeMin), Math.abs(ev.rangeMax));
    }
    // Peak draw from V+: the network's share plus whatever the output sources (max(rail, rail + iOut)).
    ev.range(cfg.railC, cfg.railV, cfg.railS);
    this.supplyMax = Math.max(this.supplyMax, ev.rangeMax);
    ev.range(cfg.railC + cfg.iC, cfg.railV + cfg.iV, cfg.railS + cfg.iS);
    this.supplyMax = Math.max(this.supplyMax, ev.rangeMax);
  }
}
const totals = new CycleTotals();

/** The pin of a one-capacitor configuration at capacitor voltage v and source s (its network's affine row), V. */
export function pinVoltage(cfg: ConfigModel, v: number, s: number): number {
  return cfg.oC + cfg.oV * v + cfg.oS * s;
}

/**
 * The pin at the start and at the end of every piece of one cycle (k counted from the cycle's first
 * piece) and each piece's configuration. The levels and every crossing search of a cycle read their pin
 * values here, so each piece's pin is solved once, not once per search, and only when first read (a
 * multi-state piece's pin is a modal evaluation). Reusable.
 */
export class CyclePins {
  private values = new Float64Array(32);
  private solved = new Uint8Array(16);
  readonly configs: ConfigModel[] = [];
  private walk: OscillatorWalk | undefined;
  private firstIndex = 0;

  /** Room for n pieces, none solved yet. */
  reserve(n: number): void {
    if (this.solved.length < n) {
      this.values = new Float64Array(4 * n);
      this.solved = new Uint8Array(2 * n);
    }
    // A loop, not fill(): a cycle has a handful of pieces and the builtin call costs more than clearing them.
    for (let k = 0; k < n; k++) this.solved[k] = 0;
  }

  /** The pins of the walk's cycle, solved off its log as they are read. */
  of(walk: OscillatorWalk, cycle: SteadyCycle): this {
    const n = cycle.endIndex - cycle.startIndex;
    this.reserve(n);
    this.walk = walk;
    this.firstIndex = cycle.startIndex;
    const d = walk.log.data;
    for (let k = 0; k < n; k++) this.configs[k] = walk.cache.get(d[(cycle.startIndex + k) * LOG_STRIDE + LOG_KEY]);
    return this;
  }

  /**
   * Piece k of a one-capacitor configuration from the state at its ends (what pinAtStart/pinAtEnd read
   * off its log record): for a caller that has the numbers at hand as it logs the piece (after reserve).
   */
  setPiece(k: number, cfg: ConfigModel, v0: number, s0: number, vEnd: number, sEnd: number): void {
    this.configs[k] = cfg;
    this.values[2 * k] = pinVoltage(cfg, v0, s0);
    this.values[2 * k + 1] = pinVoltage(cfg, vEnd, sEnd);
    this.solved[k] = 1;
  }

  /** The pin at the start of piece k, V. */
  start(k: number): number {
    if (this.solved[k] === 0) this.solve(k);
    return this.values[2 * k];
  }

  /** The pin at the end of piece k, V. */
  end(k: number): number {
    if (this.solved[k] === 0) this.solve(k);
    return this.values[2 * k + 1];
  }

  private solve(k: number): void {
    const d = this.walk!.log.data;
    const b = (this.firstIndex + k) * LOG_STRIDE;
    const cfg = this.configs[k];
    this.values[2 * k] = pinAtStart(cfg, d, b);
    this.values[2 * k + 1] = pinAtEnd(cfg, d, b);
    this.solved[k] = 1;
  }
}
const figurePins = new CyclePins();

/**
 * State levels of the cycle into out[0] (high), out[1] (low): the pin at the end
 * of the last piece before the output stage's target changes (the stage starts
 * leaving the level there). NaN for a level the cycle never leaves.
 * `pins`: the pins of this cycle.
 */
export function cycleLevels(walk: OscillatorWalk, cycle: SteadyCycle, out: Float64Array, pins: CyclePins): void {
  const d = walk.log.data;
  out[0] = out[1] = Number.NaN;
  const n = cycle.endIndex - cycle.startIndex;
  for (let k = 0; k < n; k++) {
    const i = cycle.startIndex + k;
    const next = cycle.startIndex + ((k + 1) % n);
    const target = d[i * LOG_STRIDE + LOG_TARGET];
    if (target === d[next * LOG_STRIDE + LOG_TARGET]) continue;
    out[target ? 0 : 1] = pins.end(k);
  }
}

const LOG_KEY = LOG.key;
const LOG_V0 = LOG.v0;
const LOG_S0 = LOG.s0;
const LOG_VEND = LOG.vEnd;
const LOG_RATE = LOG.rate;
const LOG_DURATION = LOG.durationS;
const LOG_TARGET = LOG.target;
const LOG_START = LOG.startS;

/** The pin at the end of the logged piece (record offset b) in its configuration. */
function pinAtEnd(cfg: ConfigModel, d: Float64Array, b: number): number {
  if (cfg.dyn) {
    loggedState(d, b, endState);
    endModal.set(cfg.dyn, endState, d[b + LOG_S0], d[b + LOG_RATE]);
    return endModal.setRow(cfg.dyn.row(QUANTITY.o)).at(d[b + LOG_DURATION]);
  }
  return pinVoltage(cfg, d[b + LOG_VEND], d[b + LOG_S0] + d[b + LOG_RATE] * d[b + LOG_DURATION]);
}

/** The capacitive nodes' voltages at the start of logged piece (record offset b). */
function loggedState(d: Float64Array, b: number, out: Float64Array): Float64Array {
  out[SLOT.N] = d[b + LOG_V0];
  out[SLOT.P] = d[b + LOG.xP0];
  out[SLOT.O] = d[b + LOG.xO0];
  return out;
}

/** The pin at the start of logged piece (record offset b). */
function pinAtStart(cfg: ConfigModel, d: Float64Array, b: number): number {
  if (cfg.dyn) return rowAt(cfg.dyn.row(QUANTITY.o), loggedState(d, b, endState), d[b + LOG_S0]);
  return pinVoltage(cfg, d[b + LOG_V0], d[b + LOG_S0]);
}

/**
 * First rising and first falling crossing of the pin through levelV inside the
 * cycle, absolute times, into out[0] (rise) and out[1] (fall); NaN where none.
 * A jump of the pin between pieces (instant edge) crosses at the boundary.
 * `pins`: the pins of this cycle.
 */
export function pinCrossings(walk: OscillatorWalk, cycle: SteadyCycle, levelV: number, out: Float64Array, pins: CyclePins, memo?: Float64Array): void {
  const ev = walk.evaluator;
  const d = walk.log.data;
  let riseAt = Number.NaN;
  let fallAt = Number.NaN;
  const n = cycle.endIndex - cycle.startIndex;
  let prevEnd = pins.end(n - 1) - levelV;
  for (let k = 0; k < n && (Number.isNaN(riseAt) || Number.isNaN(fallAt)); k++) {
    const i = cycle.startIndex + k;
    const b = i * LOG_STRIDE;
    const pc = pins.configs[k];
    const start = pins.start(k) - levelV;
    const end = pins.end(k) - levelV;
    const startS = d[b + LOG_START];
    if (prevEnd < 0 && start >= 0 && Number.isNaN(riseAt)) riseAt = startS;
    else if (prevEnd >= 0 && start < 0 && Number.isNaN(fallAt)) fallAt = startS;
    prevEnd = end;
    // A plain exponential piece is monotone: a crossing inside shows as a sign change of its ends.
    const rate = d[b + LOG_RATE];
    if (!pc.dyn && rate === 0 && start < 0 === end < 0) continue;
    if (!pc.dyn && pc.oV === 0 && rate !== 0) {
      // A pin that does not see the capacitor (a stiff output) follows the source's ramp: a straight line,
      // crossed at most once, where the bracketed solve below would converge to (without loading the piece).
      let t = Number.NaN;
      if (start < 0 !== end < 0) {
        t = Math.min(Math.max(-start / (pc.oS * rate), 0), d[b + LOG_DURATION]);
        if (end >= 0 && Number.isNaN(riseAt)) riseAt = startS + t;
        if (end < 0 && Number.isNaN(fallAt)) fallAt = startS + t;
      }
      if (memo) memo[k] = t;
      continue;
    }
    ev.load(i);
    const cfg = ev.config;
    const found = cfg.dyn ? ev.crossingsRow(cfg.dyn.row(QUANTITY.o), -levelV, scratchT, scratchDir) : ev.crossings(cfg.oC - levelV, cfg.oV, cfg.oS, scratchT, scratchDir);
    if (memo) memo[k] = found > 0 ? scratchT[0] : Number.NaN;
    for (let c = 0; c < found; c++) {
      if (scratchDir[c] > 0 && Number.isNaN(riseAt)) riseAt = startS + scratchT[c];
      if (scratchDir[c] < 0 && Number.isNaN(fallAt)) fallAt = startS + scratchT[c];
    }
  }
  out[0] = riseAt;
  out[1] = fallAt;
}

const levelScratch = new Float64Array(2);
const crossScratch = new Float64Array(2);

/**
 * The 10–90 % transition durations of the cycle into out[0] (rise), out[1] (fall):
 * between the pin's crossings of the 10 % and 90 % reference levels (0 for an
 * instant edge). `pins`: the pins of this cycle. With `arrivals`, the walk times
 * at which each edge ends go there too: the rise's 90 % crossing in [0], the fall's
 * 10 % crossing in [1].
 */
export function transitionDurations(walk: OscillatorWalk, cycle: SteadyCycle, highV: number, lowV: number, out: Float64Array, pins: CyclePins, arrivals?: Float64Array): void {
  pinCrossings(walk, cycle, referenceLevelV(lowV, highV, FRACTION_LOWER), crossScratch, pins);
  const rise10 = crossScratch[0];
  const fall10 = crossScratch[1];
  pinCrossings(walk, cycle, referenceLevelV(lowV, highV, FRACTION_UPPER), crossScratch, pins);
  out[0] = durationBetween(rise10, crossScratch[0], cycle.periodS);
  out[1] = durationBetween(crossScratch[1], fall10, cycle.periodS);
  if (arrivals) {
    arrivals[0] = crossScratch[0];
    arrivals[1] = fall10;
  }
}

const arrivalScratch = new Float64Array(2);

/**
 * Decision to the end of each edge (docs/model.md, strays and leakage): the
 * stage's own motion (delay, slew: `cycle.riseS`/`fallS`) and, with a
 * capacitance on the pin, the pin's RC behind it — the pin reaches the 90 %
 * (rising) or 10 % (falling) reference level of the 10–90 % transition only
 * after the stage is done, e.g. a released open drain charging through its
 * pull-up. Without capacitance on the pin the pin follows the stage and the
 * stage's motion is the edge.
 */
function settleTimes(walk: OscillatorWalk, cycle: SteadyCycle, nominal: EdgeTimes, out: Float64Array): void {
  let rise = Number.isNaN(cycle.riseS) ? nominal.riseSettleS : cycle.riseS;
  let fall = Number.isNaN(cycle.fallS) ? nominal.fallSettleS : cycle.fallS;
  if (walk.shape.capacitiveOutput) {
    const fallingDecisionS = cycle.risingS + cycle.decisionHighS;
    const pinRise = durationBetween(cycle.risingS, arrivalScratch[0], cycle.periodS);
    const pinFall = durationBetween(fallingDecisionS, arrivalScratch[1], cycle.periodS);
    if (pinRise > rise) rise = pinRise;
    if (pinFall > fall) fall = pinFall;
  }
  out[0] = rise;
  out[1] = fall;
}
const settleScratch = new Float64Array(2);

/**
 * Charge a stiff output puts into a capacitive pin when its source jumps (no slew limit): Co·Δs at each
 * upward jump of the cycle, sourced from the stage (the charge of the step, whatever its duration).
 */
function pinnedJumpCharge(walk: OscillatorWalk, cycle: SteadyCycle): number {
  const d = walk.log.data;
  let charge = 0;
  const n = cycle.endIndex - cycle.startIndex;
  for (let k = 0; k < n; k++) {
    const b = (cycle.startIndex + k) * LOG_STRIDE;
    const dyn = walk.cache.get(d[b + LOG_KEY]).dyn;
    if (!dyn || !(dyn.pinnedCapF > 0)) continue;
    const p = (cycle.startIndex + ((k + n - 1) % n)) * LOG_STRIDE;
    if (!walk.cache.get(d[p + LOG_KEY]).dyn?.oPinned) continue;
    const jumpV = d[b + LOG_S0] - (d[p + LOG_S0] + d[p + LOG_RATE] * d[p + LOG_DURATION]);
    if (jumpV > 0) charge += dyn.pinnedCapF * jumpV;
  }
  return charge;
}

/** Figures of the walk's steady cycle (the walk went from power-up: firstEdgeS reads the transient). */
export function figuresFromWalk(walk: OscillatorWalk, cycle: SteadyCycle, ctx: FigureContext, extras?: WalkExtras): TimeDomainFigures {
  const ev = walk.evaluator;
  const periodS = cycle.periodS;

  const pinEnds = pinEndsScratch(cycle.endIndex - cycle.startIndex);
  const sums = totals;
  sums.clear();
  for (let i = cycle.startIndex; i < cycle.endIndex; i++) {
    ev.load(i);
    sums.add(ev, walk.cache, pinEnds, 2 * (i - cycle.startIndex));
  }
  if (walk.shape.capacitiveOutput) sums.sourcedCharge += pinnedJumpCharge(walk, cycle);
  const { pinHighInt, pinHighS, pinLowInt, pinLowS, railCharge, sourcedCharge, capMin, capMax, pMin, pMax, diffMin, diffMax, iMin, iMax, supplyMax, highPiece, lowPiece, limitedS, demandPeakA } = sums;
  // The accumulator is reused: drop its references to this circuit's configurations.
  sums.highPiece = sums.lowPiece = undefined;
  const meanHighV = pinHighS > 0 ? pinHighInt / pinHighS : Number.NaN;
  const meanLowV = pinLowS > 0 ? pinLowInt / pinLowS : Number.NaN;
  const pins = figurePins.of(walk, cycle);
  cycleLevels(walk, cycle, levelScratch, pins);
  const highV = Number.isNaN(levelScratch[0]) ? meanHighV : levelScratch[0];
  const lowV = Number.isNaN(levelScratch[1]) ? meanLowV : levelScratch[1];
  const midV = referenceLevelV(lowV, highV, FRACTION_MID);
  if (extras) extras.outputMidV = midV;

  const pieces = cycle.endIndex - cycle.startIndex;
  const memo = crossingMemoScratch(pieces);
  pinCrossings(walk, cycle, midV, crossScratch, pins, memo);
  const riseAt = crossScratch[0];
  const fallAt = crossScratch[1];
  let timeHighS: number;
  if (!Number.isNaN(riseAt) && !Number.isNaN(fallAt)) {
    timeHighS = durationBetween(riseAt, fallAt, periodS);
  } else {
    timeHighS = pinHighS; // the pin never crosses its midpoint: fall back to the drive intervals
  }
  const timeLowS = periodS - timeHighS;
  const transitions = new Float64Array(2);
  transitionDurations(walk, cycle, highV, lowV, transitions, pins, arrivalScratch);

  const firstEdgeS = firstCrossing(ev, walk.log.count, midV, cycle.startIndex, cycle.endIndex, memo);
  settleTimes(walk, cycle, ctx.nominalEdges, settleScratch);
  const rise = settleScratch[0];
  const fall = settleScratch[1];
  const { high, low } = ctx;

  const figures: TimeDomainFigures = {
    model: ctx.effects.length > 0 ? 'time-domain' : 'closed-form',
    modelEffects: [...ctx.effects],
    frequencyHz: 1 / periodS,
    periodS,
    dutyCycle: timeHighS / periodS,
    timeHighS,
    timeLowS,
    firstEdgeS,
    thresholds: { upperV: cycle.upperV, lowerV: cycle.lowerV, hysteresisV: cycle.upperV - cycle.lowerV },
    output: { highV, lowV, swingV: highV - lowV, meanHighV, meanLowV },
    transitions: { riseTimeS: transitions[0], fallTimeS: transitions[1] },
    capacitor: { minV: capMin, maxV: capMax },
    states: {
      high: stateSummary(high, highPiece, walk.highV, cycle.upperV, cycle.decisionHighS),
      low: stateSummary(low, lowPiece, walk.lowV, cycle.lowerV, periodS - cycle.decisionHighS),
    },
    powerUp: powerUpState(high, low),
    currents: {
      outputPeakSourceA: Math.max(0, iMax),
      outputPeakSinkA: Math.max(0, -iMin),
      supplyAverageA: ctx.quiescentCurrentA + (railCharge + sourcedCharge) / periodS,
      supplyPeakA: ctx.quiescentCurrentA + supplyMax,
    },
    inputs: {
      nonInvertingMinV: pMin,
      nonInvertingMaxV: pMax,
      invertingMinV: capMin,
      invertingMaxV: capMax,
      differentialMaxV: Math.max(Math.abs(diffMin), Math.abs(diffMax)),
    },
    biasThresholdShiftV: Math.abs(ctx.inputBiasCurrentA) * Math.max(high.decisionResistanceOhm, low.decisionResistanceOhm),
    edges: { riseSettleS: rise, fallSettleS: fall },
  };
  if (limitedS > 0) figures.currentLimit = { limitedFraction: limitedS / periodS, demandPeakA };
  return figures;
}

/**
 * First 50 % crossing of the pin from power-up (the log starts at t = 0). Cycle
 * pieces [memoStart, memoEnd) reuse the crossing the duty-cycle pass found
 * (same function, same piece: the same search).
 */
function firstCrossing(ev: PieceEvaluator, count: number, midV: number, memoStart: number, memoEnd: number, memo: Float64Array): number {
  let prevEnd = Number.NaN;
  for (let i = 0; i < count; i++) {
    ev.load(i);
    const cfg = ev.config;
    const c0 = cfg.oC - midV;
    const o = cfg.dyn?.row(QUANTITY.o);
    const start = o ? ev.atRow(o, 0) - midV : ev.atStart(c0, cfg.oV, cfg.oS);
    if (!Number.isNaN(prevEnd) && prevEnd < 0 !== start < 0) return ev.startS;
    const known = i >= memoStart && i < memoEnd ? memo[i - memoStart] : NOT_SEARCHED;
    if (known !== NOT_SEARCHED) {
      if (!Number.isNaN(known)) return ev.startS + known;
    } else {
      const n = o ? ev.crossingsRow(o, -midV, scratchT, scratchDir) : ev.crossings(c0, cfg.oV, cfg.oS, scratchT, scratchDir);
      if (n > 0) return ev.startS + scratchT[0];
    }
    prevEnd = o ? ev.atRow(o, ev.durationS) - midV : ev.atEnd(c0, cfg.oV, cfg.oS);
  }
  return Number.NaN;
}

/** Per-state summary from the piece in force when the state's decision ends (its settled piece). */
function stateSummary(nominal: StateModel, cfg: ConfigModel | undefined, levelV: number, switchingV: number, dwellS: number): StateSummary {
  const released = cfg ? cfg.stage === STAGE.released : Number.isNaN(nominal.sourceV);
  const sourceV = released ? null : levelV;
  if (!cfg || !(cfg.a > 0)) {
    return { tauS: nominal.tauS, asymptoteV: nominal.asymptoteV, switchingV, sourceV, dwellS };
  }
  // With more capacitive nodes the state's settling is its slowest mode; the asymptote is DC (no capacitance in it).
  const slowest = cfg.dyn ? Math.min(...cfg.dyn.lambda.subarray(0, cfg.dyn.modeCount)) : cfg.a;
  // A mode without a DC path (rate 0) has no time constant to report: the nominal state's stands in.
  const tauS = slowest > 0 ? 1 / slowest : nominal.tauS;
  return { tauS, asymptoteV: (cfg.b0 + cfg.bS * levelV) / cfg.a, switchingV, sourceV, dwellS };
}
