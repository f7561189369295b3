/**
 * The prepared (compiled) model (docs/model.md §4): a circuit's shape compiled
 * once, then evaluated for many parameter vectors without allocation. It is the
 * walk itself — the same pieces, events and root solves analyzeCircuit uses —
 * not a second model; what makes it fast is
 * - the compiled network solve (compiled-network.ts) instead of building branch lists,
 * - starting each vector's walk at the nominal's steady switching state
 *   (OscillatorWalk.startFrom) instead of at power-up: near the nominal the
 *   cycle repeats after one or two cycles (a settled output repeats exactly
 *   after one; a slew-limited one that never settles converges geometrically
 *   and the walk's Aitken step on the return map closes it). When that walk
 *   does not converge, or the state does not carry over, the vector is walked
 *   from power-up like any analysis;
 * - replaying the nominal's cycle where its piece sequence compiles
 *   (cycle-replay.ts): the same pieces and arithmetic without the general
 *   walk's bookkeeping, handing any vector that leaves the sequence to the walk;
 * - reading only the timing figures (period, scope levels, 50 % crossings,
 *   optionally the 10–90 % transitions) off the cycle.
 * The closed form is the special case `dynamics = false`: no slew, delay, clamp
 * or current-limit pieces, one exponential piece per state.
 */
import { CoreError } from '../../errors.ts';
import type { Circuit } from '../types.ts';
import type { ModelEffect, ModelName } from '../result.ts';
import { CLAMP, configKey, NetworkCoefficients, STAGE, type CompiledShape, type ParameterInfo } from './compiled-network.ts';
import { diodeBits, timingNodeStrayF } from './configs.ts';
import { durationBetween as durationBetweenImported, REFERENCE_FRACTION, referenceLevelV as referenceLevelVImported } from '../../scope/ieee181.ts';
import { CycleReplay } from './cycle-replay.ts';
import { cycleLevels as cycleLevelsImported, CyclePins, pinCrossings as pinCrossingsImported, transitionDurations as transitionDurationsImported } from './figures.ts';
import { exponentialExit as exponentialExitImported } from './root-solve.ts';
import { OscillatorWalk, saturationHighV, saturationLowV, SteadyStart, type SteadyCycle } from './walker.ts';

// Module-local bindings: every evaluation calls these, and must not pay a live import binding's accessor per
// call (some loaders compile one to a getter call).
const cycleLevels = cycleLevelsImported;
const pinCrossings = pinCrossingsImported;
const transitionDurations = transitionDurationsImported;
const durationBetween = durationBetweenImported;
const referenceLevelV = referenceLevelVImported;
const exponentialExit = exponentialExitImported;
const FRACTION_LOWER = REFERENCE_FRACTION.lower;
const FRACTION_MID = REFERENCE_FRACTION.mid;
const FRACTION_UPPER = REFERENCE_FRACTION.upper;

/** Result status of one evaluation (0 = oscillates; the figures are then in the output). */
export const EVALUATION_STATUS = {
  ok: 0,
  /** A value is non-physical (resistance or capacitance <= 0, not finite). */
  invalidValue: 1,
  /** The capacitor has no charging path, a node floats, or the walk found no repeating cycle. */
  noPath: 2,
  /** No hysteresis, or a state that never reaches its threshold: the output latches. */
  latched: 3,
} as const;
export type EvaluationStatus = (typeof EVALUATION_STATUS)[keyof typeof EVALUATION_STATUS];

/** Slots of the output buffer `evaluate` writes (levels and transitions as figures.ts defines them). */
export const OUTPUT_SLOT = { periodS: 0, dutyCycle: 1, timeHighS: 2, timeLowS: 3, highV: 4, lowV: 5, riseTimeS: 6, fallTimeS: 7 } as const;
export const OUTPUT_LENGTH = 8;

/** The effects a model with these amplifier figures includes (dynamics off: none). */
export function effectsOf(values: ArrayLike<number>, shape: CompiledShape, dynamics: boolean): ModelEffect[] {
  if (!dynamics) return [];
  const l = shape.layout;
  const out: ModelEffect[] = [];
  if (Number.isFinite(values[l.indexOf('slewRateVPerS')])) out.push('slew-rate');
  if (values[l.indexOf('recoveryDelayS')] > 0) out.push('recovery-delay');
  if (Number.isFinite(values[l.indexOf('outputCurrentLimitA')])) out.push('current-limit');
  if (Number.isFinite(values[l.indexOf('differentialClampV')])) out.push('input-clamp');
  return out;
}

/** Key of a state's nominal configuration (open drain released when high, the topology's nominal diodes). */
export function nominalKey(shape: CompiledShape, state: 'high' | 'low'): number {
  const stage = shape.openDrain && state === 'high' ? STAGE.released : STAGE.driven;
  return configKey(stage, CLAMP.off, diodeBits(shape.topology.nominalDiodes?.(state)));
}

/**
 * One walk shared by every evaluation in this thread: evaluations are
 * synchronous and never re-entered, so recycling its buffers keeps a stream of
 * them allocation-free (each worker thread has its own module state).
 */
export const sharedWalk = new OscillatorWalk();
const levels = new Float64Array(2);
const crossings = new Float64Array(2);
const transitions = new Float64Array(2);

/** Walks from power-up whose steady start is kept (WalkedStarts). */
const WALKED_STARTS = 16;

/**
 * The steady starts of the latest full walks from power-up (an analysis' walk, currents included), by
 * shape, dynamics and the vector bit for bit. A PreparedModel of a vector just analysed — a BOM check
 * prepares the very circuit its nominal-supply analysis walked — takes its start from here instead of
 * walking the same vector the same way again: the same walk, so the same start. Every recorded walk came
 * after prepareCircuit accepted the same vector (analyzeCircuit, prepareModel), so a hit also stands for
 * its nominal state models (prepareModel). Each start is handed over once (its new owner keeps it).
 */
class WalkedStarts {
  private readonly shapes: (CompiledShape | undefined)[] = new Array<CompiledShape | undefined>(WALKED_STARTS);
  private readonly dynamics = new Uint8Array(WALKED_STARTS);
  private readonly values: Float64Array[] = [];
  private readonly starts: SteadyStart[] = [];
  private next = 0;

  record(walk: OscillatorWalk, shape: CompiledShape, values: ArrayLike<number>, dynamics: boolean): void {
    const k = this.next;
    this.next = (k + 1) % WALKED_STARTS;
    if (this.starts.length <= k) this.starts.push(new SteadyStart());
    let copy = this.values[k];
    if (!copy || copy.length !== values.length) copy = this.values[k] = new Float64Array(values.length);
    for (let i = 0; i < values.length; i++) copy[i] = values[i];
    walk.snapshot(this.starts[k]);
    this.shapes[k] = shape;
    this.dynamics[k] = dynamics ? 1 : 0;
  }

  /** The recorded start of this vector, removed from the record (undefined: none). */
  take(shape: CompiledShape, values: ArrayLike<number>, dynamics: boolean): SteadyStart | undefined {
    for (let k = 0; k < WALKED_STARTS; k++) {
      if (this.shapes[k] !== shape || this.dynamics[k] !== (dynamics ? 1 : 0)) continue;
      const recorded = this.values[k];
      if (recorded.length !== values.length) continue;
      let same = true;
      for (let i = 0; i < values.length && same; i++) same = Object.is(recorded[i], values[i]);
      if (!same) continue;
      const start = this.starts[k];
      this.starts[k] = new SteadyStart();
      this.shapes[k] = undefined;
      return start;
    }
    return undefined;
  }
}

export const walkedStarts = new WalkedStarts();

/**
 * Walk `values` to its steady cycle: from `start` when given and it converges,
 * else from power-up. Throws CoreError like an analysis would. A walk from power-up
 * with currents (an analysis') leaves its steady start in walkedStarts.
 */
export function walkToCycle(walk: OscillatorWalk, shape: CompiledShape, values: ArrayLike<number>, dynamics: boolean, start?: SteadyStart, currents = true): SteadyCycle {
  walk.reset(shape, values, dynamics, currents);
  const high = walk.cache.get(shape.nominalHighKey);
  const low = walk.cache.get(shape.nominalLowKey);
  // Switching levels of the nominal states (requireHysteresis and powerUpState on the same numbers).
  const upperV = (high.hC + high.hS * (shape.openDrain ? 0 : walk.highV)) / -high.hV;
  const lowerV = (low.hC + low.hS * walk.lowV) / -low.hV;
  if (!(upperV > lowerV)) {
    throw new CoreError('no-oscillation', 'No hysteresis: the upper threshold is not above the lower one, so the output cannot hold a state', undefined, {
      upperThresholdV: upperV,
      lowerThresholdV: lowerV,
    });
  }
  if (start?.valid && walk.startFrom(start)) {
    try {
      return walk.runToSteadyState();
    } catch (err) {
      if (!(err instanceof CoreError)) throw err;
      walk.reset(shape, values, dynamics, currents); // and walk from power-up below
    }
  }
  walk.powerUp(0 < upperV ? 'high' : 'low');
  const cycle = walk.runToSteadyState();
  if (currents && !start) walkedStarts.record(walk, shape, values, dynamics);
  return cycle;
}

export interface PrepareModelOptions {
  /** False: the closed-form special case (no slew, delay, clamp or current-limit pieces). */
  dynamics?: boolean;
  /** Also compute the 10–90 % transition durations (two more crossing searches per edge). */
  transitions?: boolean;
}

/**
 * A circuit prepared for many evaluations: the shape's parameter layout, the
 * circuit's own values (nominal) and the nominal's steady switching state.
 * Create it with prepareModel (circuit/analyze.ts), which validates first.
 */
export class PreparedModel {
  readonly parameters: readonly ParameterInfo[];
  readonly nominal: Float64Array;
  readonly dynamics: boolean;
  readonly effects: readonly ModelEffect[];
  readonly model: ModelName;
  private readonly start: SteadyStart;
  /** The nominal's steady cycle compiled for replay (undefined: not replayable, the walk answers). */
  private readonly replay: CycleReplay | undefined;
  private readonly twoPiece: boolean;
  private readonly wantTransitions: boolean;
  private readonly roleSlots: Int32Array;
  /** Stray capacitances and leakages the vector carries (each must stay a finite value >= 0). */
  private readonly straySlots: Int32Array;
  private readonly slewSlot: number;
  private readonly delaySlot: number;
  private readonly limitSlot: number;
  private readonly clampSlot: number;

  /**
   * `nominal`: the circuit's vector when the caller has it; `walked`: the steady start of that vector's
   * walk from power-up when one was just made (walkedStarts), else the nominal is walked here.
   */
  constructor(
    readonly shape: CompiledShape,
    readonly circuit: Circuit,
    options: PrepareModelOptions = {},
    nominal: Float64Array = shape.layout.valuesOf(circuit),
    walked?: SteadyStart,
  ) {
    const layout = shape.layout;
    this.parameters = layout.parameters;
    this.nominal = nominal;
    this.dynamics = options.dynamics ?? true;
    this.wantTransitions = options.transitions ?? false;
    this.effects = effectsOf(this.nominal, shape, this.dynamics);
    this.model = this.effects.length > 0 ? 'time-domain' : 'closed-form';
    // No amplifier effect can add a piece: the two-piece program applies (it still checks for event functions).
    // A C(v) capacitor's pieces are not exponentials: the full walk (its non-linear piece kinds) answers.
    // Capacitance at P or at the output pin: multi-state pieces, never one exponential per state.
    this.twoPiece = (!this.dynamics || this.effects.length === 0) && this.shape.biasShape.kind === 'flat' && !this.shape.dynamic;
    this.roleSlots = layout.roleSlots;
    this.straySlots = Int32Array.from(layout.parameters.flatMap((p, i) => (p.kind === 'stray' ? [i] : [])));
    this.slewSlot = layout.indexOf('slewRateVPerS');
    this.delaySlot = layout.indexOf('recoveryDelayS');
    this.limitSlot = layout.indexOf('outputCurrentLimitA');
    this.clampSlot = layout.indexOf('differentialClampV');
    // The nominal's steady state, the start of every later walk (a circuit that does not oscillate has none).
    if (walked) {
      this.start = walked;
    } else {
      this.start = new SteadyStart();
      try {
        walkToCycle(sharedWalk, shape, this.nominal, this.dynamics);
        sharedWalk.snapshot(this.start);
      } catch (err) {
        if (!(err instanceof CoreError)) throw err;
        this.start.valid = false;
      }
    }
    this.replay = compileCycleReplay(sharedWalk, shape, this.nominal, this.dynamics, this.start);
  }

  indexOf(name: string): number {
    return this.shape.layout.indexOf(name);
  }

  /** The circuit these values describe. */
  circuitAt(values: ArrayLike<number>): Circuit {
    return this.shape.layout.circuitAt(this.circuit, values);
  }

  private valid(values: ArrayLike<number>): boolean {
    for (let i = 0; i < this.roleSlots.length; i++) {
      const v = values[this.roleSlots[i]];
      if (!(v > 0) || v === Infinity) return false;
    }
    for (let i = 0; i < this.straySlots.length; i++) {
      const v = values[this.straySlots[i]];
      if (!(v >= 0) || v === Infinity) return false;
    }
    if (this.dynamics) {
      if (!(values[this.slewSlot] > 0) || !(values[this.delaySlot] >= 0) || !(values[this.limitSlot] > 0) || !(values[this.clampSlot] > 0)) return false;
    }
    return true;
  }

  /**
   * Timing figures for one parameter vector into out (OUTPUT_SLOT order); on
   * failure NaN and the status. Allocation-free.
   */
  evaluate(values: ArrayLike<number>, out: Float64Array): EvaluationStatus {
    if (!this.valid(values)) return fail(out, EVALUATION_STATUS.invalidValue);
    const walk = sharedWalk;
    if (this.twoPiece) {
      const status = twoPieceCycle(this.shape, values, this.dynamics, this.wantTransitions, out);
      if (status === EVALUATION_STATUS.ok) return status;
      if (status !== undefined) return fail(out, status);
    }
    if (this.replay) {
      // The nominal's cycle replayed; a vector that leaves its piece sequence is walked below.
      const replayed = this.replay.run(walk, values, this.start);
      if (replayed) {
        readTiming(walk, replayed, out, this.wantTransitions, this.replay.pins);
        return EVALUATION_STATUS.ok;
      }
    }
    let cycle: SteadyCycle;
    try {
      cycle = walkToCycle(walk, this.shape, values, this.dynamics, this.start, false);
    } catch (err) {
      if (!(err instanceof CoreError)) throw err;
      if (err.code === 'no-oscillation') return fail(out, err.message.startsWith('The network has a floating node') ? EVALUATION_STATUS.noPath : EVALUATION_STATUS.latched);
      if (err.code === 'not-converged') return fail(out, EVALUATION_STATUS.noPath);
      return fail(out, EVALUATION_STATUS.invalidValue);
    }
    readTiming(walk, cycle, out, this.wantTransitions);
    return EVALUATION_STATUS.ok;
  }
}

/**
 * The cycle every evaluation's walk meets first, compiled: the nominal walked once
 * more from its own steady start (as an evaluation walks) and, if that closes after
 * one cycle of replayable pieces, that cycle (cycle-replay.ts).
 */
export function compileCycleReplay(walk: OscillatorWalk, shape: CompiledShape, nominal: ArrayLike<number>, dynamics: boolean, start: SteadyStart): CycleReplay | undefined {
  if (!start.valid) return undefined;
  walk.reset(shape, nominal, dynamics, false);
  if (!walk.startFrom(start)) return undefined;
  try {
    return CycleReplay.compile(walk, walk.runToSteadyState(), start);
  } catch (err) {
    if (!(err instanceof CoreError)) throw err;
    return undefined;
  }
}

const twoPieceHigh = new NetworkCoefficients();
const twoPieceLow = new NetworkCoefficients();

/**
 * The walk's first steps when no piece but the two nominal ones can occur (no
 * amplifier effect, no event function in either configuration): from the
 * lower switching level the high piece runs until its threshold function
 * leaves zero — the same exit search OscillatorWalk.step makes — and the low
 * piece back. The output jumps at the decisions, so the 50 % crossings are the
 * decisions and the state levels are the pin at each piece's end. Returns
 * undefined when the shape's pieces can end otherwise (the full walk answers).
 */
function twoPieceCycle(shape: CompiledShape, values: ArrayLike<number>, dynamics: boolean, withTransitions: boolean, out: Float64Array): EvaluationStatus | undefined {
  if (shape.dynamic) return undefined; // multi-state pieces: the walk answers
  // The two nominal configurations solved as the walk's ConfigCache would solve them (same arguments; the
  // current sums are not needed), without its per-evaluation bookkeeping: only these two are ever entered.
  const slot = shape.slot;
  const capacitanceF = values[shape.layout.capacitorSlot] + timingNodeStrayF(shape, values);
  const biasA = values[slot.bias];
  const limitA = dynamics ? values[slot.limit] : Infinity;
  const high = twoPieceHigh;
  if (!shape.config(shape.nominalHighKey).solve(values, capacitanceF, biasA, limitA, high, false)) return EVALUATION_STATUS.noPath;
  const low = shape.nominalLowKey === shape.nominalHighKey ? high : twoPieceLow;
  if (low !== high && !shape.config(shape.nominalLowKey).solve(values, capacitanceF, biasA, limitA, low, false)) return EVALUATION_STATUS.noPath;
  // ConfigCache.addEvents would give the pieces event functions (a steering diode, a finite input clamp or
  // current limit): those can end a piece early, and the walk answers.
  if (shape.diodeTerminals.length > 0) return undefined;
  if (dynamics && (Number.isFinite(values[slot.clamp]) || Number.isFinite(limitA))) return undefined;
  // A vector that gives the amplifier a slew rate or a delay its nominal lacks needs the walk.
  if (dynamics && (Number.isFinite(values[slot.slew]) || values[slot.delay] > 0)) return undefined;
  // The threshold function h = P + offset − v (ConfigCache.tryGet's hC, hV, hS).
  const offsetV = values[slot.offset];
  const highHC = high.pC + offsetV;
  const highHV = high.pV - 1;
  const highHS = high.pS;
  const lowHC = low.pC + offsetV;
  const lowHV = low.pV - 1;
  const lowHS = low.pS;
  const sHigh = shape.openDrain ? 0 : saturationHighV(shape, values);
  const sLow = saturationLowV(shape, values);
  const upperV = (highHC + highHS * sHigh) / -highHV;
  const lowerV = (lowHC + lowHS * sLow) / -lowHV;
  if (!(upperV > lowerV)) return EVALUATION_STATUS.latched;
  // High piece: h = hC + hV·v + hS·s must stay >= 0 (logic high); the low piece watches −h. Each is
  // OscillatorWalk.step's threshold exit on a source at rest (root-solve.ts firstExit with no boundary
  // tolerance, then its closed-form exponential exit), called here without the probe and piece ends.
  const gHigh = highHC + highHV * lowerV + highHS * sHigh;
  const timeHighS = gHigh < 0 ? 0 : exponentialExit(high.a, high.b0 + high.bS * sHigh, lowerV, gHigh, highHC + highHS * sHigh, highHV, Infinity);
  const gLow = -lowHC + -lowHV * upperV + -lowHS * sLow;
  const timeLowS = gLow < 0 ? 0 : exponentialExit(low.a, low.b0 + low.bS * sLow, upperV, gLow, -lowHC + -lowHS * sLow, -lowHV, Infinity);
  if (!(timeHighS > 0 && timeHighS < Infinity && timeLowS > 0 && timeLowS < Infinity)) return EVALUATION_STATUS.latched;
  const periodS = timeHighS + timeLowS;
  // The pin jumps at each decision and then moves monotonically (an exponential piece). The reference
  // levels must be crossed BY the jumps, or a crossing lies inside a piece and the walk's reading applies.
  const highV = high.oC + high.oV * upperV + high.oS * sHigh;
  const lowV = low.oC + low.oV * lowerV + low.oS * sLow;
  const riseTopV = high.oC + high.oV * lowerV + high.oS * sHigh;
  const fallBottomV = low.oC + low.oV * upperV + low.oS * sLow;
  // A reference level is crossed by both jumps when it lies above lowV and fallBottomV and at or below highV and riseTopV.
  const jumpsFromV = Math.max(lowV, fallBottomV);
  const jumpsToV = Math.min(highV, riseTopV);
  const midV = referenceLevelV(lowV, highV, FRACTION_MID);
  if (!(jumpsFromV < midV && midV <= jumpsToV)) return undefined;
  if (withTransitions) {
    const tenV = referenceLevelV(lowV, highV, FRACTION_LOWER);
    const ninetyV = referenceLevelV(lowV, highV, FRACTION_UPPER);
    if (!(jumpsFromV < tenV && tenV <= jumpsToV && jumpsFromV < ninetyV && ninetyV <= jumpsToV)) return undefined;
  }
  out[0] = periodS;
  out[1] = timeHighS / periodS;
  out[2] = timeHighS;
  out[3] = timeLowS;
  out[4] = highV;
  out[5] = lowV;
  out[6] = out[7] = withTransitions ? 0 : Number.NaN;
  return EVALUATION_STATUS.ok;
}

/**
 * Timing figures of one vector without a prepared nominal (the two-piece program where it applies, else the
 * walk from power-up): the cheap screen of searches that meet every candidate once.
 */
export function evaluateOnce(shape: CompiledShape, values: ArrayLike<number>, dynamics: boolean, out: Float64Array): EvaluationStatus {
  const walk = sharedWalk;
  const status = twoPieceCycle(shape, values, dynamics, false, out);
  if (status === EVALUATION_STATUS.ok) return status;
  if (status !== undefined) return fail(out, status);
  try {
    readTiming(walk, walkToCycle(walk, shape, values, dynamics, undefined, false), out, false);
    return EVALUATION_STATUS.ok;
  } catch (err) {
    if (!(err instanceof CoreError)) throw err;
    return fail(out, err.code === 'no-oscillation' || err.code === 'not-converged' ? EVALUATION_STATUS.latched : EVALUATION_STATUS.invalidValue);
  }
}

function fail(out: Float64Array, status: EvaluationStatus): EvaluationStatus {
  out.fill(Number.NaN);
  return status;
}

const timingPins = new CyclePins();

/**
 * Period, duty, scope levels and (optionally) transitions of a walked cycle into out (OUTPUT_SLOT order);
 * `pins`: the cycle's pins when the caller has them (the cycle replay records them as it logs).
 */
export function readTiming(walk: OscillatorWalk, cycle: SteadyCycle, out: Float64Array, withTransitions: boolean, pins: CyclePins = timingPins.of(walk, cycle)): void {
  const periodS = cycle.periodS;
  cycleLevels(walk, cycle, levels, pins);
  const highV = levels[0];
  const lowV = levels[1];
  let timeHighS = Number.NaN;
  if (!Number.isNaN(highV) && !Number.isNaN(lowV)) {
    pinCrossings(walk, cycle, referenceLevelV(lowV, highV, FRACTION_MID), crossings, pins);
    if (!Number.isNaN(crossings[0]) && !Number.isNaN(crossings[1])) timeHighS = durationBetween(crossings[0], crossings[1], periodS);
  }
  if (Number.isNaN(timeHighS)) timeHighS = cycle.decisionHighS; // the pin never crosses its midpoint: the decision intervals
  out[0] = periodS;
  out[1] = timeHighS / periodS;
  out[2] = timeHighS;
  out[3] = periodS - timeHighS;
  out[4] = highV;
  out[5] = lowV;
  if (withTransitions && !Number.isNaN(highV) && !Number.isNaN(lowV)) {
    transitionDurations(walk, cycle, highV, lowV, transitions, pins);
    out[6] = transitions[0];
    out[7] = transitions[1];
  } else {
    out[6] = out[7] = Number.NaN;
  }
}
