/**
 * The linear pieces an oscillator can be in, and what the engine needs from
 * each: one nodal solve per network configuration (output stage mode × input
 * clamp × steering diodes), reduced to a handful of affine coefficients in
 * (v, s) — v the capacitor voltage, s the output-stage source voltage — and the
 * list of functions whose sign change ends the piece. A configuration is solved
 * (by its compiled stamping program, compiled-network.ts) the first time the
 * walk enters it and cached for the rest of the evaluation (docs/model.md §2).
 */
import { CoreError } from '../../errors.ts';
import { FLAT_SHAPE, type BiasShape } from '../../parts/capacitor/index.ts';
import { CLAMP, KEY_SPACE, NetworkCoefficients, STAGE, type CompiledShape } from './compiled-network.ts';
import { StrayLoadedShape } from '../strays.ts';
import { DynamicModel, MAX_STATES, QUANTITY, ROW, R_C, R_S, R_X, SLOT } from './modal.ts';

export { CLAMP, CLAMP_RESISTANCE_OHM, configKey, STAGE } from './compiled-network.ts';

/** What ends a piece (function events; time events are separate). */
export const EVENT = {
  threshold: 0,
  diode: 1,
  clampOnPAboveN: 2,
  clampOnNAboveP: 3,
  clampOff: 4,
  limitSource: 5,
  limitSink: 6,
  limitLeave: 7,
} as const;

/** Relative tolerance (of the supply span, or of the current limit) for "on a boundary". */
export const BOUNDARY_TOLERANCE = 1e-9;

/** Most non-threshold event functions one configuration can have (2 diodes + 2 clamp + 2 limit). */
const MAX_EVENTS = 8;

export class ConfigModel extends NetworkCoefficients {
  /** Threshold function h = P + Vos − v (>= 0 while the comparator stays high). */
  hC = 0;
  hV = 0;
  hS = 0;
  /** Non-threshold event functions (each must stay >= 0 in this configuration). */
  eventCount = 0;
  readonly evC = new Float64Array(MAX_EVENTS);
  readonly evV = new Float64Array(MAX_EVENTS);
  readonly evS = new Float64Array(MAX_EVENTS);
  readonly evTol = new Float64Array(MAX_EVENTS);
  readonly evKind = new Int8Array(MAX_EVENTS);
  readonly evIndex = new Int8Array(MAX_EVENTS);
  /**
   * A shape with capacitance at P or at the output pin: the multi-state model of this configuration
   * (the scalar fields above are then its quasi-static reduction, those capacitances left out: the
   * DC levels, switching lines and messages; the pieces are walked on this).
   */
  dyn: DynamicModel | undefined;

  pushEvent(kind: number, index: number, c0: number, cv: number, cs: number, tol: number): void {
    const n = this.eventCount++;
    this.evKind[n] = kind;
    this.evIndex[n] = index;
    this.evC[n] = c0;
    this.evV[n] = cv;
    this.evS[n] = cs;
    this.evTol[n] = tol;
  }
}

/**
 * Per-evaluation cache of configuration models. The object is reusable:
 * reset() retargets it to another shape and parameter vector and recycles the
 * model objects, so a steady stream of evaluations allocates nothing.
 */
export class ConfigCache {
  private readonly slot = new Int16Array(KEY_SPACE).fill(-1);
  private readonly pool: ConfigModel[] = [];
  private used = 0;
  shape!: CompiledShape;
  values!: ArrayLike<number>;
  capacitanceF = 0;
  spanV = 0;
  clampV = Infinity;
  limitA = Infinity;
  outputResistanceOhm = 0;
  openDrain = false;
  offsetV = 0;
  biasA = 0;
  /** C(v)/C0 of the timing capacitor (from the compiled shape; flat: a linear capacitor). */
  biasShape: BiasShape = FLAT_SHAPE;
  private readonly strayLoaded = new StrayLoadedShape();
  /** Capacitance per state slot (N, P, O), F, for a dynamic shape. */
  readonly stateCapF = new Float64Array(MAX_STATES);
  /** Models of the dynamic configurations (reused like the pool). */
  private readonly dynPool: DynamicModel[] = [];

  /** False: skip the output and rail current sums (timing-only evaluations; figures need them). */
  currents = true;

  /** `dynamics` false: no clamp and no current limit (the closed-form special case of the model). */
  reset(shape: CompiledShape, values: ArrayLike<number>, dynamics = true, currents = true): void {
    this.shape = shape;
    this.currents = currents;
    this.values = values;
    const slot = shape.slot;
    const capacitorF = values[shape.layout.capacitorSlot];
    const strayF = timingNodeStrayF(shape, values);
    this.capacitanceF = capacitorF + strayF;
    this.spanV = values[slot.positiveV] - values[slot.negativeV];
    this.clampV = dynamics ? values[slot.clamp] : Infinity;
    this.limitA = dynamics ? values[slot.limit] : Infinity;
    this.outputResistanceOhm = shape.outputResistanceSeparate ? values[slot.rOut] : 0;
    this.openDrain = shape.openDrain;
    this.offsetV = values[slot.offset];
    this.biasA = values[slot.bias];
    // A linear stray beside a C(v) capacitor: the node's curve per unit of their sum at 0 V.
    this.biasShape = strayF > 0 && shape.biasShape.kind !== 'flat' ? this.strayLoaded.set(shape.biasShape, strayF / (capacitorF + strayF)) : shape.biasShape;
    if (shape.dynamic) {
      this.stateCapF[SLOT.N] = this.capacitanceF;
      this.stateCapF[SLOT.P] = thresholdNodeCapacitanceF(shape, values);
      this.stateCapF[SLOT.O] = shape.slot.outputNodeStray >= 0 ? values[shape.slot.outputNodeStray] : 0;
    }
    // Only the slots the previous evaluation filled need clearing.
    for (let i = 0; i < this.used; i++) this.slot[this.pool[i].key] = -1;
    this.used = 0;
  }

  /** The configuration's model, solved on first use; undefined when its network cannot be solved (a floating node or a bad value). */
  tryGet(key: number): ConfigModel | undefined {
    const i = this.slot[key];
    if (i >= 0) return this.pool[i];
    if (this.used === this.pool.length) this.pool.push(new ConfigModel());
    const m = this.pool[this.used];
    m.key = key;
    m.stage = key % 4;
    m.clamp = Math.floor(key / 4) % 3;
    m.diodes = Math.floor(key / 12);
    if (!this.shape.config(key).solve(this.values, this.capacitanceF, this.biasA, this.limitA, m, this.currents)) return undefined;
    if (this.shape.dynamic) {
      while (this.dynPool.length <= this.used) this.dynPool.push(new DynamicModel());
      const dyn = this.dynPool[this.used];
      if (!this.shape.dynamicConfig(key).solveDynamic(this.values, this.stateCapF, this.biasA, this.limitA, this.offsetV, dyn)) return undefined;
      // Beside a C(v) capacitor the node's curve makes the pieces the C(v) multi-state kind (modal-curved.ts).
      dyn.curve = this.biasShape;
      dyn.scaleV = this.spanV;
      m.dyn = dyn;
    } else {
      m.dyn = undefined;
    }
    this.slot[key] = this.used++;
    m.hC = m.pC + this.offsetV;
    m.hV = m.pV - 1;
    m.hS = m.pS;
    m.eventCount = 0;
    this.addEvents(m);
    return m;
  }

  get(key: number): ConfigModel {
    const m = this.tryGet(key);
    if (!m) throw new CoreError('no-oscillation', 'The network has a floating node (no DC path) or a part value that is not a positive resistance');
    return m;
  }

  private addEvents(m: ConfigModel): void {
    const vTol = BOUNDARY_TOLERANCE * this.spanV;
    const diodes = this.shape.diodeTerminals.length;
    const dyn = m.dyn;
    // Diodes: forward voltage beyond the drop f = V_from − V_to − Vf; off: f <= 0, on: current (= f/R) >= 0.
    for (let d = 0; d < diodes; d++) {
      const sign = (m.diodes >> d) & 1 ? 1 : -1;
      if (dyn) eventRow(dyn, m.eventCount, dyn.row(QUANTITY.diode0 + d), sign, 0, 0, 0);
      m.pushEvent(EVENT.diode, d, sign * m.diodeF[3 * d], sign * m.diodeF[3 * d + 1], sign * m.diodeF[3 * d + 2], vTol);
    }
    if (Number.isFinite(this.clampV)) {
      // d = P − N
      const dC = m.pC;
      const dV = m.pV - 1;
      const dS = m.pS;
      const vc = this.clampV;
      // The same functions as rows: d = P − N is the threshold row less the offset.
      const h = dyn?.row(QUANTITY.h);
      const off = -this.offsetV;
      if (m.clamp === CLAMP.off) {
        if (dyn) eventRow(dyn, m.eventCount, h!, -1, vc - off, 0, 0);
        m.pushEvent(EVENT.clampOnPAboveN, 0, vc - dC, -dV, -dS, vTol);
        if (dyn) eventRow(dyn, m.eventCount, h!, 1, vc + off, 0, 0);
        m.pushEvent(EVENT.clampOnNAboveP, 0, vc + dC, dV, dS, vTol);
      } else if (m.clamp === CLAMP.pAboveN) {
        if (dyn) eventRow(dyn, m.eventCount, h!, 1, off - vc, 0, 0);
        m.pushEvent(EVENT.clampOff, 0, dC - vc, dV, dS, vTol);
      } else {
        if (dyn) eventRow(dyn, m.eventCount, h!, -1, -off - vc, 0, 0);
        m.pushEvent(EVENT.clampOff, 0, -dC - vc, -dV, -dS, vTol);
      }
    }
    if (Number.isFinite(this.limitA)) {
      const iTol = BOUNDARY_TOLERANCE * this.limitA;
      const drop = this.limitA * this.outputResistanceOhm;
      const i = dyn?.row(QUANTITY.i);
      const o = dyn?.row(QUANTITY.o);
      if (m.stage === STAGE.driven) {
        // An open-drain transistor only sinks; a push-pull stage limits both ways.
        if (!this.openDrain) {
          if (dyn) eventRow(dyn, m.eventCount, i!, -1, this.limitA, 0, 0);
          m.pushEvent(EVENT.limitSource, 0, this.limitA - m.iC, -m.iV, -m.iS, iTol);
        }
        if (dyn) eventRow(dyn, m.eventCount, i!, 1, this.limitA, 0, 0);
        m.pushEvent(EVENT.limitSink, 0, this.limitA + m.iC, m.iV, m.iS, iTol);
      } else if (m.stage === STAGE.limitedSource) {
        // Stays limited while the source would push more than the limit: s >= pin + limit·rOut.
        if (dyn) eventRow(dyn, m.eventCount, o!, -1, -drop, 1, 0);
        m.pushEvent(EVENT.limitLeave, 0, -m.oC - drop, -m.oV, 1 - m.oS, vTol);
      } else if (m.stage === STAGE.limitedSink) {
        if (dyn) eventRow(dyn, m.eventCount, o!, 1, -drop, -1, 0);
        m.pushEvent(EVENT.limitLeave, 0, m.oC - drop, m.oV, m.oS - 1, vTol);
      }
    }
  }
}

/**
 * Capacitance at the timing node besides the timing capacitor, F: the board
 * stray and the amplifier's input capacitance, in parallel with it (circuit/strays.ts).
 * Exactly 0 for a circuit without them, so its pieces stay bit for bit the same.
 */
export function timingNodeStrayF(shape: CompiledShape, values: ArrayLike<number>): number {
  const input = values[shape.slot.inputCapacitance];
  const board = shape.slot.timingNodeStray >= 0 ? values[shape.slot.timingNodeStray] : 0;
  // A stored amplifier from before the figure existed has none (undefined reads as NaN).
  return (input > 0 ? input : 0) + (board > 0 ? board : 0);
}

/**
 * Event row k of a dynamic configuration: scale·source + constant (+ sAdd per volt of s, + nAdd per
 * volt of x_N), the multi-state form of the function pushed beside it.
 */
function eventRow(dyn: DynamicModel, k: number, source: Float64Array, scale: number, constant: number, sAdd: number, nAdd: number): void {
  const row = dyn.row(QUANTITY.event0 + k);
  for (let c = 0; c < ROW; c++) row[c] = scale * source[c];
  row[R_C] += constant;
  row[R_S] += sAdd;
  row[R_X + SLOT.N] += nAdd;
}

/** Capacitance at the threshold node P, F: its board stray and the amplifier's input capacitance. */
export function thresholdNodeCapacitanceF(shape: CompiledShape, values: ArrayLike<number>): number {
  const input = values[shape.slot.inputCapacitance];
  const board = shape.slot.thresholdNodeStray >= 0 ? values[shape.slot.thresholdNodeStray] : 0;
  return (input > 0 ? input : 0) + (board > 0 ? board : 0);
}

export function diodeBits(on: readonly boolean[] | undefined): number {
  let bits = 0;
  if (on) for (let k = 0; k < on.length; k++) if (on[k]) bits |= 1 << k;
  return bits;
}
