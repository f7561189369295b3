/**
 * The per-piece nodal solve, compiled (docs/model.md §1, §3). A circuit's SHAPE
 * — topology, which roles are present, whether the output stage has its own
 * resistance, a load, the steering-diode model — fixes every network the walk
 * can meet: each configuration (output-stage mode × input clamp × diodes) is a
 * list of branches whose ends never change; only their values do. So a shape
 * compiles each configuration once into a stamping program (which parameter
 * slot feeds which matrix cell) and then solves it for any parameter vector on
 * preallocated buffers: no objects, no allocation per solve.
 *
 * Node voltages and the capacitor current come out affine in the capacitor
 * voltage v and the output-stage source voltage s (stride 4 per node: constant,
 * per v, per s, per unit current injected at the decision node — the Thevenin
 * resistance used for the bias-current figure):
 *
 *     V_k = c0[k] + cv[k]·v + cs[k]·s          iCap = q0 + qv·v + qs·s
 *
 * reduced at once to the coefficients the walk needs (ConfigModel). This is the
 * only network solve in the service; there is no second, object-based copy.
 */
import { FLAT_SHAPE, type BiasShape } from '../../parts/capacitor/index.ts';
import { MAX_STATES, QUANTITY, ROW, R_C, R_S, R_X, SLOT, type DynamicModel } from './modal.ts';
import { WALK_FIGURES, type WalkFigureName } from '../../amplifiers/figures-table.ts';
import type { AmplifierModel } from '../../amplifiers/model.ts';
import { NODE as NODE_IMPORTED } from '../nodes.ts';
import { DEFAULT_STEERING_DIODE } from '../topologies/diode-steered.ts';
import type { Branch } from '../network.ts';
import type { TopologyDefinition } from '../topologies/topology.ts';
import type { Circuit, PieceConfig } from '../types.ts';

// Module-local binding: every solve reads the node numbers, and must not pay a live import binding's accessor
// per read (some loaders compile one to a getter call).
const NODE = NODE_IMPORTED;

/** Kinds of entry in a parameter vector. */
export type ParameterKind = 'resistor' | 'capacitor' | 'supply' | 'amplifier' | 'load' | 'diode' | 'stray';

export interface ParameterInfo {
  name: string;
  kind: ParameterKind;
}

/**
 * Amplifier figures the model reads, in vector order: the figure table's entries with a `walk` slot
 * (amplifiers/figures-table.ts; the first five shape the static network).
 */
export const AMPLIFIER_PARAMETERS: readonly AmplifierParameter[] = WALK_FIGURES;
export type AmplifierParameter = WalkFigureName;
export const SUPPLY_PARAMETERS = ['supplyPositiveV', 'supplyNegativeV'] as const;
export const LOAD_PARAMETERS = ['loadResistanceOhm', 'loadReturnV'] as const;
/**
 * The steering diodes' forward drop, one value for every diode of the topology (they are one part
 * type at one board temperature): a slot, not a shape constant, so temperature corners and Monte
 * Carlo can move it (about −2 mV/K, parts/diode-drift.ts).
 */
export const DIODE_PARAMETERS = ['diodeForwardDropV'] as const;
/**
 * Strays the model solves (circuit/strays.ts), named as in Circuit.strays: the
 * stray at the timing node (present whenever the circuit gives strays) and each
 * leakage resistor the circuit has (a branch, so part of the shape).
 */
export const STRAY_PARAMETERS = ['timingNodeF', 'timingLeakageOhm', 'thresholdLeakageOhm', 'thresholdNodeF', 'outputNodeF'] as const;
export type StrayParameter = (typeof STRAY_PARAMETERS)[number];

/**
 * The stray parameters a circuit's shape carries (none without `strays`: the vector of a plain circuit is
 * unchanged): the timing-node stray, each leakage resistor, and a capacitance at P or at the output pin
 * when it is not zero (it makes that node a state of its own: docs/model.md, strays and leakage).
 */
export function strayParametersOf(circuit: Circuit): StrayParameter[] {
  const strays = circuit.strays;
  if (!strays) return [];
  return STRAY_PARAMETERS.filter((name) => {
    if (name === 'timingNodeF') return true;
    if (name === 'thresholdNodeF' || name === 'outputNodeF') return strays[name] > 0;
    return Number.isFinite(strays[name]);
  });
}

/** Which nodes besides N carry capacitance (a state each): P (board stray or input capacitance) and the output pin. */
export function capacitiveNodesOf(circuit: Circuit): { threshold: boolean; output: boolean } {
  const input = circuit.amplifier.inputCapacitanceF;
  return { threshold: (circuit.strays?.thresholdNodeF ?? 0) > 0 || input > 0, output: (circuit.strays?.outputNodeF ?? 0) > 0 };
}

/** Output-stage modes. */
export const STAGE = {
  /** A voltage source (moving or settled) behind the output resistance. */
  driven: 0,
  /** Open drain released: nothing drives the pin (the pull-up sets it). */
  released: 1,
  /** Current limit while sourcing: a current source of +limit into the pin. */
  limitedSource: 2,
  /** Current limit while sinking: −limit. */
  limitedSink: 3,
} as const;

/** Differential-input clamp modes. */
export const CLAMP = { off: 0, pAboveN: 1, nAboveP: 2 } as const;

/**
 * Resistance of a conducting differential-input clamp, ohm. Amplifier models
 * carry only the clamp voltage; 10 Ω stands for the incremental resistance of a
 * small-signal diode pair at milliamperes (common practice, a value from memory).
 * It is small against any threshold network, so the clamp holds |P − N| close to
 * its voltage, which is what matters for timing.
 */
export const CLAMP_RESISTANCE_OHM = 10;

export function configKey(stage: number, clamp: number, diodes: number): number {
  return stage + 4 * clamp + 12 * diodes;
}
/** Configuration keys: 4 stage modes × 3 clamp modes × up to 4 diode combinations. */
export const KEY_SPACE = 4 * 3 * 4;

const STRIDE = 4;
/** Coefficient columns of a dynamic configuration: constant, N, s, probe, then the states P and O. */
const STRIDE_DYNAMIC = 6;
const COLUMN_P = 4;
const COLUMN_O = 5;

/**
 * What one configuration solve yields (filled in place by CompiledConfig.solve;
 * the walk's ConfigModel extends it with its event functions).
 */
export class NetworkCoefficients {
  key = 0;
  stage = 0;
  clamp = 0;
  diodes = 0;
  /** dv/dt = b0 + bS·s − a·v (a = G/C, 1/s; b0 V/s; bS 1/s). */
  a = 0;
  b0 = 0;
  bS = 0;
  /** Decision node P = pC + pV·v + pS·s. */
  pC = 0;
  pV = 0;
  pS = 0;
  /** Thevenin resistance at the decision node, ohm. */
  pR = 0;
  /** Output pin. */
  oC = 0;
  oV = 0;
  oS = 0;
  /** Current out of the output stage into the pin, A (positive = sourcing). */
  iC = 0;
  iV = 0;
  iS = 0;
  /** Current the passive network draws from V+, A. */
  railC = 0;
  railV = 0;
  railS = 0;
  /** Steering-diode forward functions f = V_from − V_to − Vf, per diode (c, v, s triples). */
  readonly diodeF = new Float64Array(6);
}

/** Where a layout slot's value is read from in a circuit (ParameterLayout.valuesOf). */
const SOURCE = { part: 0, supplyPositive: 1, supplyNegative: 2, loadResistance: 3, loadReturn: 4, diodeDrop: 5, stray: 6, amplifier: 7 } as const;

function sourceOf(p: ParameterInfo): number {
  if (p.kind === 'resistor' || p.kind === 'capacitor') return SOURCE.part;
  if (p.name === 'supplyPositiveV') return SOURCE.supplyPositive;
  if (p.name === 'supplyNegativeV') return SOURCE.supplyNegative;
  if (p.name === 'loadResistanceOhm') return SOURCE.loadResistance;
  if (p.name === 'loadReturnV') return SOURCE.loadReturn;
  if (p.name === 'diodeForwardDropV') return SOURCE.diodeDrop;
  if (p.kind === 'stray') return SOURCE.stray;
  return SOURCE.amplifier;
}

/** The parameter vector of a shape: roles present (role order), supply, amplifier figures, load, diode drop. */
export class ParameterLayout {
  readonly parameters: readonly ParameterInfo[];
  private readonly index = new Map<string, number>();
  /** Slots of the part values (each must stay > 0). */
  readonly roleSlots: Int32Array;
  readonly capacitorSlot: number;

  /** Slot of the steering diodes' forward drop, −1 for a topology without diodes. */
  readonly diodeDropSlot: number;

  /** Where each slot's value comes from in a circuit (SOURCE), decided once here rather than per vector. */
  private readonly sources: Uint8Array;

  constructor(topology: TopologyDefinition, rolesPresent: readonly string[], hasLoad: boolean, strays: readonly StrayParameter[] = []) {
    const params: ParameterInfo[] = [];
    for (const role of rolesPresent) params.push({ name: role, kind: topology.roles[role].kind });
    for (const name of SUPPLY_PARAMETERS) params.push({ name, kind: 'supply' });
    for (const name of AMPLIFIER_PARAMETERS) params.push({ name, kind: 'amplifier' });
    if (hasLoad) for (const name of LOAD_PARAMETERS) params.push({ name, kind: 'load' });
    if (topology.diodeCount > 0) for (const name of DIODE_PARAMETERS) params.push({ name, kind: 'diode' });
    for (const name of strays) params.push({ name, kind: 'stray' });
    this.parameters = params;
    params.forEach((p, i) => this.index.set(p.name, i));
    this.sources = Uint8Array.from(params, sourceOf);
    this.roleSlots = Int32Array.from(rolesPresent, (r) => this.index.get(r)!);
    this.capacitorSlot = this.indexOf(topology.capacitorRole);
    this.diodeDropSlot = this.indexOf('diodeForwardDropV');
  }

  get length(): number {
    return this.parameters.length;
  }

  /** Slot of a parameter, −1 when the shape has none of that name. */
  indexOf(name: string): number {
    return this.index.get(name) ?? -1;
  }

  /** The circuit's own values in this layout (a fresh vector). */
  valuesOf(circuit: Circuit): Float64Array {
    const parameters = this.parameters;
    const sources = this.sources;
    const v = new Float64Array(parameters.length);
    const amp = circuit.amplifier;
    for (let i = 0; i < parameters.length; i++) {
      const name = parameters[i].name;
      switch (sources[i]) {
        case SOURCE.part: v[i] = circuit.parts[name]; break;
        case SOURCE.supplyPositive: v[i] = circuit.supply.positiveV; break;
        case SOURCE.supplyNegative: v[i] = circuit.supply.negativeV; break;
        case SOURCE.loadResistance: v[i] = circuit.load!.resistanceOhm; break;
        case SOURCE.loadReturn: v[i] = circuit.load!.returnV; break;
        case SOURCE.diodeDrop: v[i] = (circuit.diode ?? DEFAULT_STEERING_DIODE).forwardDropV; break;
        case SOURCE.stray: v[i] = circuit.strays![name as StrayParameter]; break;
        default: v[i] = amp[name as AmplifierParameter];
      }
    }
    return v;
  }

  /** The circuit these values describe: `base` with every parameter of the layout replaced. */
  circuitAt(base: Circuit, values: ArrayLike<number>): Circuit {
    const parts: Record<string, number> = {};
    const amplifier: AmplifierModel = { ...base.amplifier };
    const supply = { ...base.supply };
    const load = base.load ? { ...base.load } : undefined;
    let diode = base.diode;
    const strays = base.strays ? { ...base.strays } : undefined;
    this.parameters.forEach((p, i) => {
      const v = values[i];
      if (p.kind === 'resistor' || p.kind === 'capacitor') parts[p.name] = v;
      else if (p.name === 'supplyPositiveV') supply.positiveV = v;
      else if (p.name === 'supplyNegativeV') supply.negativeV = v;
      else if (p.name === 'loadResistanceOhm') load!.resistanceOhm = v;
      else if (p.name === 'loadReturnV') load!.returnV = v;
      else if (p.name === 'diodeForwardDropV') {
        if (v !== (diode ?? DEFAULT_STEERING_DIODE).forwardDropV) diode = { ...(diode ?? DEFAULT_STEERING_DIODE), forwardDropV: v };
      } else if (p.kind === 'stray') strays![p.name as StrayParameter] = v;
      else amplifier[p.name as AmplifierParameter] = v;
    });
    const out: Circuit = { ...base, supply, amplifier, parts };
    if (load) out.load = load;
    if (diode) out.diode = diode;
    if (strays) out.strays = strays;
    return out;
  }
}

/** One branch of a compiled configuration: resistance = values[slot] + offset (slot −1: offset alone). */
interface CompiledBranch {
  from: number;
  to: number;
  slot: number;
  offsetOhm: number;
  /** Series EMF = emfV + emfSign·values[emfSlot] (emfSlot −1: emfV alone). */
  emfV: number;
  emfSlot: number;
  emfSign: number;
}

/** Op kinds: a[cell] += g·k  /  a[cell] += g·k·values[slot]. */
const OP_G = 0;
const OP_G_VALUE = 1;

/** One configuration's stamping program and buffers. */
class CompiledConfig {
  readonly m: number;
  readonly width: number;
  readonly nodeCount: number;
  readonly rowNode: Int32Array;
  readonly decisionRow: number;
  readonly outputRow: number;
  readonly sourceNode: number;
  readonly stage: number;
  readonly branchSlot: Int32Array;
  readonly branchOffset: Float64Array;
  readonly branchFrom: Int32Array;
  readonly branchTo: Int32Array;
  readonly branchEmf: Float64Array;
  readonly branchEmfSlot: Int32Array;
  readonly branchEmfSign: Float64Array;
  readonly opBranch: Int32Array;
  readonly opCell: Int32Array;
  readonly opKind: Uint8Array;
  readonly opScale: Float64Array;
  readonly opSlot: Int32Array;
  /** Branches touching N, the source node and V+ (current sums). */
  readonly capBranches: Int32Array;
  /** Branches touching P and the output pin (the currents into their capacitances in a dynamic configuration). */
  readonly decisionBranches: Int32Array;
  readonly outputBranches: Int32Array;
  /** Coefficient columns per node (4; 6 in a dynamic configuration). */
  readonly stride: number;
  /** P and the output pin are states of this (dynamic) configuration. */
  readonly stateP: boolean;
  readonly stateO: boolean;
  /** The shape has a capacitance at the output pin (pinned to the source in a stiff driven configuration). */
  readonly shapeCapacitiveOutput: boolean;
  readonly sourceBranches: Int32Array;
  readonly railBranches: Int32Array;
  readonly matrix: Float64Array;
  readonly coeff: Float64Array;
  readonly conductance: Float64Array;
  readonly fixedSlot: Int32Array;
  /** Nodes held at a parameter's voltage (rails, load return). */
  readonly fixedNodes: Int32Array;

  constructor(
    shape: CompiledShape,
    readonly key: number,
    branches: CompiledBranch[],
    readonly diodeTerminals: readonly DiodeTerminal[],
    /** A dynamic configuration: P and/or the output pin are states (columns) like N, not rows. */
    dynamic = false,
  ) {
    const stage = key % 4;
    this.stage = stage;
    const layout = shape.layout;
    const nodeCount = NODE.firstInternal + shape.topology.internalNodeCount;
    this.nodeCount = nodeCount;
    const driven = stage === STAGE.driven;
    let sourceNode: number;
    const fixed = new Uint8Array(nodeCount);
    fixed[NODE.ground] = fixed[NODE.positiveRail] = fixed[NODE.negativeRail] = fixed[NODE.loadReturn] = 1;
    if (!driven) {
      // Released or current-limited: no voltage source; the unused source node is parked at 0 V.
      sourceNode = -1;
      fixed[NODE.source] = 1;
    } else if (shape.outputResistanceSeparate) {
      sourceNode = NODE.source;
      branches.push({ from: NODE.source, to: NODE.output, slot: layout.indexOf('outputResistanceOhm'), offsetOhm: 0, emfV: 0, emfSlot: -1, emfSign: 0 });
    } else {
      // A stiff output: the pin itself is the source.
      sourceNode = NODE.output;
      fixed[NODE.source] = 1;
    }
    this.sourceNode = sourceNode;
    if (shape.hasLoad) {
      branches.push({ from: NODE.output, to: NODE.loadReturn, slot: layout.indexOf('loadResistanceOhm'), offsetOhm: 0, emfV: 0, emfSlot: -1, emfSign: 0 });
    }
    // Leakage (circuit/strays.ts): plain resistors to ground at N and at P, present in every configuration.
    const timingLeakageSlot = layout.indexOf('timingLeakageOhm');
    if (timingLeakageSlot >= 0) branches.push({ from: NODE.capacitor, to: NODE.ground, slot: timingLeakageSlot, offsetOhm: 0, emfV: 0, emfSlot: -1, emfSign: 0 });
    const thresholdLeakageSlot = layout.indexOf('thresholdLeakageOhm');
    if (thresholdLeakageSlot >= 0) branches.push({ from: NODE.decision, to: NODE.ground, slot: thresholdLeakageSlot, offsetOhm: 0, emfV: 0, emfSlot: -1, emfSign: 0 });
    const clamp = Math.floor(key / 4) % 3;
    const clampSlot = layout.indexOf('differentialClampV');
    if (clamp === CLAMP.pAboveN) {
      branches.push({ from: NODE.decision, to: NODE.capacitor, slot: -1, offsetOhm: CLAMP_RESISTANCE_OHM, emfV: 0, emfSlot: clampSlot, emfSign: 1 });
    } else if (clamp === CLAMP.nAboveP) {
      branches.push({ from: NODE.capacitor, to: NODE.decision, slot: -1, offsetOhm: CLAMP_RESISTANCE_OHM, emfV: 0, emfSlot: clampSlot, emfSign: 1 });
    }
    // Columns of the nodes given as inputs: N always; in a dynamic configuration P and O when they are states.
    const stride = dynamic ? STRIDE_DYNAMIC : STRIDE;
    this.stride = stride;
    const column = new Int8Array(nodeCount).fill(-1);
    column[NODE.capacitor] = 1;
    this.stateP = dynamic && shape.capacitiveThreshold;
    this.stateO = dynamic && shape.capacitiveOutput && sourceNode !== NODE.output;
    this.shapeCapacitiveOutput = dynamic && shape.capacitiveOutput;
    if (this.stateP) column[NODE.decision] = COLUMN_P;
    if (this.stateO) column[NODE.output] = COLUMN_O;
    const row = new Int32Array(nodeCount).fill(-1);
    const rowNode: number[] = [];
    for (let k = 0; k < nodeCount; k++) {
      if (column[k] >= 0 || k === sourceNode || fixed[k]) continue;
      row[k] = rowNode.length;
      rowNode.push(k);
    }
    const m = rowNode.length;
    const width = m + stride;
    this.m = m;
    this.width = width;
    this.rowNode = Int32Array.from(rowNode);
    this.decisionRow = row[NODE.decision];
    this.outputRow = row[NODE.output];
    const fixedSlot = new Int32Array(nodeCount).fill(-1);
    fixedSlot[NODE.positiveRail] = layout.indexOf('supplyPositiveV');
    fixedSlot[NODE.negativeRail] = layout.indexOf('supplyNegativeV');
    if (shape.hasLoad) fixedSlot[NODE.loadReturn] = layout.indexOf('loadReturnV');
    this.fixedSlot = fixedSlot;

    const ops: { branch: number; cell: number; kind: number; scale: number; slot: number }[] = [];
    // KCL row of p for a branch p→q with series EMF e (current (V_p − V_q − e)·g leaves p).
    const stampEnd = (j: number, p: number, q: number, sign: number) => {
      const rp = row[p];
      if (rp < 0) return;
      const b = branches[j];
      const base = rp * width;
      ops.push({ branch: j, cell: base + rp, kind: OP_G, scale: 1, slot: -1 });
      if (b.emfV !== 0) ops.push({ branch: j, cell: base + m, kind: OP_G, scale: sign * b.emfV, slot: -1 });
      if (b.emfSlot >= 0) ops.push({ branch: j, cell: base + m, kind: OP_G_VALUE, scale: sign * b.emfSign, slot: b.emfSlot });
      const rq = row[q];
      if (rq >= 0) ops.push({ branch: j, cell: base + rq, kind: OP_G, scale: -1, slot: -1 });
      else if (column[q] >= 0) ops.push({ branch: j, cell: base + m + column[q], kind: OP_G, scale: 1, slot: -1 });
      else if (q === sourceNode) ops.push({ branch: j, cell: base + m + 2, kind: OP_G, scale: 1, slot: -1 });
      else if (fixedSlot[q] >= 0) ops.push({ branch: j, cell: base + m, kind: OP_G_VALUE, scale: 1, slot: fixedSlot[q] });
    };
    const capB: number[] = [];
    const srcB: number[] = [];
    const railB: number[] = [];
    const pB: number[] = [];
    const oB: number[] = [];
    branches.forEach((b, j) => {
      stampEnd(j, b.from, b.to, 1);
      stampEnd(j, b.to, b.from, -1);
      if (b.from === NODE.capacitor || b.to === NODE.capacitor) capB.push(j);
      if (b.from === NODE.decision || b.to === NODE.decision) pB.push(j);
      if (b.from === NODE.output || b.to === NODE.output) oB.push(j);
      if (sourceNode >= 0 && (b.from === sourceNode || b.to === sourceNode)) srcB.push(j);
      if (b.from === NODE.positiveRail || b.to === NODE.positiveRail) railB.push(j);
    });
    this.branchSlot = Int32Array.from(branches, (b) => b.slot);
    this.branchOffset = Float64Array.from(branches, (b) => b.offsetOhm);
    this.branchFrom = Int32Array.from(branches, (b) => b.from);
    this.branchTo = Int32Array.from(branches, (b) => b.to);
    this.branchEmf = Float64Array.from(branches, (b) => b.emfV);
    this.branchEmfSlot = Int32Array.from(branches, (b) => b.emfSlot);
    this.branchEmfSign = Float64Array.from(branches, (b) => b.emfSign);
    this.opBranch = Int32Array.from(ops, (o) => o.branch);
    this.opCell = Int32Array.from(ops, (o) => o.cell);
    this.opKind = Uint8Array.from(ops, (o) => o.kind);
    this.opScale = Float64Array.from(ops, (o) => o.scale);
    this.opSlot = Int32Array.from(ops, (o) => o.slot);
    this.capBranches = Int32Array.from(capB);
    this.decisionBranches = Int32Array.from(pB);
    this.outputBranches = Int32Array.from(oB);
    this.sourceBranches = Int32Array.from(srcB);
    this.railBranches = Int32Array.from(railB);
    this.matrix = new Float64Array(m * width);
    this.coeff = new Float64Array(nodeCount * stride);
    this.coeff[NODE.capacitor * stride + 1] = 1;
    if (sourceNode >= 0) this.coeff[sourceNode * stride + 2] = 1;
    if (this.stateP) this.coeff[NODE.decision * stride + COLUMN_P] = 1;
    if (this.stateO) this.coeff[NODE.output * stride + COLUMN_O] = 1;
    this.fixedNodes = Int32Array.from([...fixedSlot.keys()].filter((k) => fixedSlot[k] >= 0));
    this.conductance = new Float64Array(branches.length);
  }

  private emfOf(j: number, values: ArrayLike<number>): number {
    const slot = this.branchEmfSlot[j];
    return slot >= 0 ? this.branchEmf[j] + this.branchEmfSign[j] * values[slot] : this.branchEmf[j];
  }

  /**
   * Solve for `values` and write the reduced coefficients into `out`. False when
   * a node floats (no DC path) or a resistance is not a positive finite value.
   */
  solve(values: ArrayLike<number>, capacitanceF: number, biasA: number, limitA: number, out: NetworkCoefficients, currents = true): boolean {
    if (!this.eliminate(values, biasA, limitA)) return false;
    const { coeff, conductance } = this;
    // Current into the capacitor: the bias current drawn at N, minus what leaves N through branches.
    let q0 = -biasA;
    let qv = 0;
    let qs = 0;
    const N = NODE.capacitor;
    for (let t = 0; t < this.capBranches.length; t++) {
      const j = this.capBranches[t];
      const g = conductance[j];
      const from = this.branchFrom[j];
      const other = (from === N ? this.branchTo[j] : from) * STRIDE;
      const slot = this.branchEmfSlot[j];
      const e = slot >= 0 ? this.branchEmf[j] + this.branchEmfSign[j] * values[slot] : this.branchEmf[j];
      const emf = from === N ? e : -e;
      q0 -= g * (-coeff[other] - emf);
      qv -= g * (1 - coeff[other + 1]);
      qs -= g * -coeff[other + 2];
    }
    out.a = -qv / capacitanceF;
    out.b0 = q0 / capacitanceF;
    out.bS = qs / capacitanceF;
    const p = NODE.decision * STRIDE;
    out.pC = coeff[p];
    out.pV = coeff[p + 1];
    out.pS = coeff[p + 2];
    out.pR = coeff[p + 3];
    const o = NODE.output * STRIDE;
    out.oC = coeff[o];
    out.oV = coeff[o + 1];
    out.oS = coeff[o + 2];
    out.iC = out.iV = out.iS = 0;
    out.railC = out.railV = out.railS = 0;
    // Currents only when asked (figures) or when the current limit watches them: timing needs neither.
    if (currents || limitA !== Infinity) {
      if (this.stage === STAGE.driven) this.leaving(this.sourceBranches, this.sourceNode, values, out, 0);
      else if (this.stage === STAGE.limitedSource) out.iC = limitA;
      else if (this.stage === STAGE.limitedSink) out.iC = -limitA;
    }
    if (currents) this.leaving(this.railBranches, NODE.positiveRail, values, out, 1);
    const dt = this.diodeTerminals;
    for (let d = 0; d < dt.length; d++) {
      const f = dt[d].from * STRIDE;
      const t = dt[d].to * STRIDE;
      const drop = dt[d].emfSlot >= 0 ? dt[d].emfV + dt[d].emfSign * values[dt[d].emfSlot] : dt[d].emfV;
      out.diodeF[3 * d] = coeff[f] - coeff[t] - drop;
      out.diodeF[3 * d + 1] = coeff[f + 1] - coeff[t + 1];
      out.diodeF[3 * d + 2] = coeff[f + 2] - coeff[t + 2];
    }
    return true;
  }

  /**
   * Stamp the network for `values` and eliminate: every node voltage affine in the input columns
   * (coeff). False when a node floats or a resistance is not a positive finite value.
   */
  private eliminate(values: ArrayLike<number>, biasA: number, limitA: number): boolean {
    const { m, width, matrix: a, coeff, rowNode, conductance, fixedSlot, branchSlot, branchOffset } = this;
    const nb = conductance.length;
    for (let j = 0; j < nb; j++) {
      const slot = branchSlot[j];
      const r = slot >= 0 ? values[slot] + branchOffset[j] : branchOffset[j];
      if (!(r > 0) || r === Infinity) return false;
      conductance[j] = 1 / r;
    }
    // A loop, not fill(): the matrix has a handful of cells and the builtin call costs more than clearing them.
    for (let c = 0; c < a.length; c++) a[c] = 0;
    // Only the held nodes' voltages and the rows change between solves (the rest was set once, in the constructor).
    for (let k = 0; k < this.fixedNodes.length; k++) {
      const node = this.fixedNodes[k];
      coeff[node * this.stride] = values[fixedSlot[node]];
    }
    // Bias current flows into the input pins, i.e. out of the network at P and N.
    if (this.decisionRow >= 0) {
      a[this.decisionRow * width + m] = -biasA;
      a[this.decisionRow * width + m + 3] = 1; // unit probe current: the Thevenin resistance at P
    }
    if (this.outputRow >= 0 && (this.stage === STAGE.limitedSource || this.stage === STAGE.limitedSink)) {
      // The stage is a current source into the pin while limited.
      a[this.outputRow * width + m] += this.stage === STAGE.limitedSource ? limitA : -limitA;
    }
    const { opKind, opBranch, opCell, opScale, opSlot } = this;
    const ops = opKind.length;
    for (let o = 0; o < ops; o++) {
      const g = conductance[opBranch[o]];
      if (opKind[o] === OP_G) a[opCell[o]] += g * opScale[o];
      else a[opCell[o]] += g * opScale[o] * values[opSlot[o]];
    }
    if (!gaussJordan(a, m, width)) return false;
    const stride = this.stride;
    for (let r = 0; r < m; r++) {
      const k = rowNode[r] * stride;
      const src = r * width + m;
      coeff[k] = a[src];
      coeff[k + 1] = a[src + 1];
      coeff[k + 2] = a[src + 2];
      coeff[k + 3] = a[src + 3];
      if (stride === STRIDE_DYNAMIC) {
        coeff[k + COLUMN_P] = a[src + COLUMN_P];
        coeff[k + COLUMN_O] = a[src + COLUMN_O];
      }
    }
    return true;
  }

  /**
   * Solve a dynamic configuration (P and/or the output pin are states beside N; docs/model.md, strays
   * and leakage) for `values`: the currents into the state capacitors and the rows of every quantity
   * the walk watches, affine in (s, x_N, x_P, x_O), into `dyn`; then its modes. False as solve().
   */
  solveDynamic(values: ArrayLike<number>, capF: ArrayLike<number>, biasA: number, limitA: number, offsetV: number, dyn: DynamicModel): boolean {
    if (!this.eliminate(values, biasA, limitA)) return false;
    const stateP = this.stateP;
    const stateO = this.stateO;
    dyn.active[SLOT.N] = 1;
    dyn.active[SLOT.P] = stateP ? 1 : 0;
    dyn.active[SLOT.O] = stateO ? 1 : 0;
    dyn.oPinned = this.shapeCapacitiveOutput && !stateO;
    dyn.pinnedCapF = dyn.oPinned ? capF[SLOT.O] : 0;
    dyn.capF[SLOT.N] = capF[SLOT.N];
    dyn.capF[SLOT.P] = stateP ? capF[SLOT.P] : 0;
    dyn.capF[SLOT.O] = stateO ? capF[SLOT.O] : 0;
    dyn.Q.fill(0);
    const limited = this.stage === STAGE.limitedSource ? limitA : this.stage === STAGE.limitedSink ? -limitA : 0;
    this.stateCurrent(this.capBranches, NODE.capacitor, values, -biasA, dyn, SLOT.N);
    if (stateP) this.stateCurrent(this.decisionBranches, NODE.decision, values, -biasA, dyn, SLOT.P);
    else dyn.q0[SLOT.P] = dyn.qS[SLOT.P] = 0;
    // A current-limited stage is a current source into the pin.
    if (stateO) this.stateCurrent(this.outputBranches, NODE.output, values, limited, dyn, SLOT.O);
    else dyn.q0[SLOT.O] = dyn.qS[SLOT.O] = 0;
    const stride = this.stride;
    const coeff = this.coeff;
    const rowOf = (node: number, row: Float64Array) => {
      const k = node * stride;
      row[R_C] = coeff[k];
      row[R_S] = coeff[k + 2];
      row[R_X + SLOT.N] = coeff[k + 1];
      row[R_X + SLOT.P] = coeff[k + COLUMN_P];
      row[R_X + SLOT.O] = coeff[k + COLUMN_O];
    };
    const p = dyn.row(QUANTITY.p);
    rowOf(NODE.decision, p);
    rowOf(NODE.output, dyn.row(QUANTITY.o));
    // h = P + Vos − N
    const h = dyn.row(QUANTITY.h);
    h.set(p);
    h[R_C] += offsetV;
    h[R_X + SLOT.N] -= 1;
    const i = dyn.row(QUANTITY.i);
    i.fill(0);
    if (this.stage === STAGE.driven) this.leavingRow(this.sourceBranches, this.sourceNode, values, i);
    else i[R_C] = limited;
    this.leavingRow(this.railBranches, NODE.positiveRail, values, dyn.row(QUANTITY.rail));
    const dt = this.diodeTerminals;
    const from = new Float64Array(ROW);
    const to = new Float64Array(ROW);
    for (let d = 0; d < dt.length; d++) {
      const row = dyn.row(QUANTITY.diode0 + d);
      rowOf(dt[d].from, from);
      rowOf(dt[d].to, to);
      for (let c = 0; c < ROW; c++) row[c] = from[c] - to[c];
      row[R_C] -= dt[d].emfSlot >= 0 ? dt[d].emfV + dt[d].emfSign * values[dt[d].emfSlot] : dt[d].emfV;
    }
    return dyn.decompose();
  }

  /** The current into a state node's capacitor: `injectedA` minus what leaves the node through its branches. */
  private stateCurrent(list: Int32Array, node: number, values: ArrayLike<number>, injectedA: number, dyn: DynamicModel, slot: number): void {
    const row = this.scratchRow;
    this.leavingRow(list, node, values, row);
    dyn.q0[slot] = injectedA - row[R_C];
    dyn.qS[slot] = -row[R_S];
    for (let k = 0; k < MAX_STATES; k++) dyn.Q[slot * MAX_STATES + k] = -row[R_X + k];
  }

  /** Sum of branch currents leaving `node`, as a row over (s, x_N, x_P, x_O). */
  private leavingRow(list: Int32Array, node: number, values: ArrayLike<number>, row: Float64Array): void {
    const k = this.coeff;
    const stride = this.stride;
    row.fill(0);
    for (let n = 0; n < list.length; n++) {
      const j = list[n];
      const g = (this.branchFrom[j] === node ? 1 : -1) * this.conductance[j];
      const f = this.branchFrom[j] * stride;
      const t = this.branchTo[j] * stride;
      row[R_C] += g * (k[f] - k[t] - this.emfOf(j, values));
      row[R_S] += g * (k[f + 2] - k[t + 2]);
      row[R_X + SLOT.N] += g * (k[f + 1] - k[t + 1]);
      row[R_X + SLOT.P] += g * (k[f + COLUMN_P] - k[t + COLUMN_P]);
      row[R_X + SLOT.O] += g * (k[f + COLUMN_O] - k[t + COLUMN_O]);
    }
  }
  private readonly scratchRow = new Float64Array(ROW);

  /** Sum of branch currents leaving `node`, into the output (which 0) or rail (which 1) fields. */
  private leaving(list: Int32Array, node: number, values: ArrayLike<number>, out: NetworkCoefficients, which: 0 | 1): void {
    const k = this.coeff;
    let c = 0;
    let v = 0;
    let s = 0;
    for (let n = 0; n < list.length; n++) {
      const j = list[n];
      const g = (this.branchFrom[j] === node ? 1 : -1) * this.conductance[j];
      const f = this.branchFrom[j] * STRIDE;
      const t = this.branchTo[j] * STRIDE;
      c += g * (k[f] - k[t] - this.emfOf(j, values));
      v += g * (k[f + 1] - k[t + 1]);
      s += g * (k[f + 2] - k[t + 2]);
    }
    if (which === 0) {
      out.iC = c;
      out.iV = v;
      out.iS = s;
    } else {
      out.railC = c;
      out.railV = v;
      out.railS = s;
    }
  }
}

/**
 * Gauss–Jordan elimination with partial pivoting, in place, on an m×m system
 * stored row-major with `width − m` right-hand sides after the matrix. False
 * when a column has no pivot (a node without a DC path).
 */
export function gaussJordan(a: Float64Array, m: number, width: number): boolean {
  if (m === 2) return gaussJordan2(a, width);
  for (let col = 0; col < m; col++) {
    let pivot = col;
    let best = Math.abs(a[col * width + col]);
    for (let r = col + 1; r < m; r++) {
      const v = Math.abs(a[r * width + col]);
      if (v > best) {
        best = v;
        pivot = r;
      }
    }
    if (!(best > 0)) return false;
    if (pivot !== col) {
      for (let c = 0; c < width; c++) {
        const t = a[col * width + c];
        a[col * width + c] = a[pivot * width + c];
        a[pivot * width + c] = t;
      }
    }
    const inv = 1 / a[col * width + col];
    for (let c = col; c < width; c++) a[col * width + c] *= inv;
    for (let r = 0; r < m; r++) {
      if (r === col) continue;
      const f = a[r * width + col];
      if (f === 0) continue;
      for (let c = col; c < width; c++) a[r * width + c] -= f * a[col * width + c];
    }
  }
  return true;
}

/**
 * gaussJordan for m = 2 (the two unknown nodes of the commonest networks: the threshold node and the
 * output pin behind the output resistance), written out: the same pivot choice and the same operations in
 * the same order as the loops, so the same numbers bit for bit, without their index bookkeeping.
 */
function gaussJordan2(a: Float64Array, width: number): boolean {
  // Column 0: pivot between rows 0 and 1, scale row 0, eliminate row 1.
  let best = Math.abs(a[0]);
  const other = Math.abs(a[width]);
  if (other > best) {
    best = other;
    for (let c = 0; c < width; c++) {
      const t = a[c];
      a[c] = a[width + c];
      a[width + c] = t;
    }
  }
  if (!(best > 0)) return false;
  let inv = 1 / a[0];
  for (let c = 0; c < width; c++) a[c] *= inv;
  let f = a[width];
  if (f !== 0) for (let c = 0; c < width; c++) a[width + c] -= f * a[c];
  // Column 1: row 1 is the only pivot left; scale it, eliminate row 0.
  best = Math.abs(a[width + 1]);
  if (!(best > 0)) return false;
  inv = 1 / a[width + 1];
  for (let c = 1; c < width; c++) a[width + c] *= inv;
  f = a[1];
  if (f !== 0) for (let c = 1; c < width; c++) a[c] -= f * a[width + c];
  return true;
}

/** The piece configuration a key stands for (state is irrelevant to the network: the source level is s). */
function pieceOf(topology: TopologyDefinition, key: number): PieceConfig {
  const stage = key % 4;
  const diodes = Math.floor(key / 12);
  const count = topology.diodeCount;
  return {
    state: 'high',
    outputDriven: stage === STAGE.driven,
    diodesOn: count > 0 ? Array.from({ length: count }, (_, k) => ((diodes >> k) & 1) === 1) : undefined,
  };
}

/** What fixes a shape besides values: topology, roles present, output resistance > 0, load, diode model. */
export function shapeKey(circuit: Circuit, topology: TopologyDefinition): string {
  let key = topology.id;
  for (const role of Object.keys(topology.roles)) if (circuit.parts[role] !== undefined) key += `|${role}`;
  key += `|r${circuit.amplifier.outputResistanceOhm > 0 ? 1 : 0}|l${circuit.load ? 1 : 0}`;
  // The forward drop is a parameter slot (DIODE_PARAMETERS); only the diode's resistance is structure.
  if (topology.diodeCount > 0) key += `|d${circuit.diode ? circuit.diode.resistanceOhm : '-'}`;
  // A C(v) timing capacitor changes the piece kinds (docs/model.md, non-linear capacitor).
  if (circuit.capacitorShape && circuit.capacitorShape.kind !== 'flat') key += `|c${circuit.capacitorShape.key}`;
  // Strays: which stray parameters the vector carries (a leakage resistor is a branch).
  const strays = strayParametersOf(circuit);
  if (strays.length > 0) key += `|s${strays.join(',')}`;
  // Capacitance at P or at the output pin: that node is a state of the pieces (the input capacitance counts at P).
  const states = capacitiveNodesOf(circuit);
  if (states.threshold || states.output) key += `|x${states.threshold ? 'P' : ''}${states.output ? 'O' : ''}`;
  return key;
}

/**
 * A compiled circuit shape: the parameter layout and, per configuration key,
 * the stamping program (compiled the first time a walk enters it). Shapes carry
 * no values, so one shape serves every circuit with the same key (shapeFor).
 */
export class CompiledShape {
  readonly layout: ParameterLayout;
  readonly hasLoad: boolean;
  readonly outputResistanceSeparate: boolean;
  readonly openDrain: boolean;
  readonly diodeTerminals: readonly DiodeTerminal[];
  /** C(v)/C0 of the timing capacitor (flat: linear; the capacitor slot then holds C, else C at 0 V). */
  readonly biasShape: BiasShape;
  /** Capacitance at P / at the output pin: those nodes are states of the dynamic configurations. */
  readonly capacitiveThreshold: boolean;
  readonly capacitiveOutput: boolean;
  /** More than one capacitive node: the walk solves each piece as a multi-state system (modal.ts). */
  readonly dynamic: boolean;
  private readonly configs: (CompiledConfig | undefined)[] = new Array<CompiledConfig | undefined>(KEY_SPACE);
  private readonly dynamicConfigs: (CompiledConfig | undefined)[] = new Array<CompiledConfig | undefined>(KEY_SPACE);
  /** Parameter slots the walk reads on every evaluation (looked up once here, not per evaluation). */
  readonly slot: Readonly<
    Record<
      | 'positiveV'
      | 'negativeV'
      | 'headroomHigh'
      | 'headroomLow'
      | 'rOut'
      | 'offset'
      | 'bias'
      | 'slew'
      | 'delay'
      | 'limit'
      | 'clamp'
      | 'hysteresis'
      | 'delayCharge'
      | 'inputCapacitance'
      | 'timingNodeStray'
      | 'thresholdNodeStray'
      | 'outputNodeStray',
      number
    >
  >;
  /** Keys of the nominal configuration of each state (high, low). */
  nominalHighKey = 0;
  nominalLowKey = 0;
  /** Per diode combination: the topology's branches mapped to parameter slots. */
  private readonly topologyBranches = new Map<number, CompiledBranch[]>();

  constructor(
    readonly topology: TopologyDefinition,
    /** The circuit the shape was compiled from (only its structure is used: roles present, diode model). */
    private readonly template: Circuit,
  ) {
    const roles = Object.keys(topology.roles).filter((r) => template.parts[r] !== undefined);
    this.hasLoad = template.load !== undefined;
    this.outputResistanceSeparate = template.amplifier.outputResistanceOhm > 0;
    this.openDrain = topology.needsOpenDrain;
    this.layout = new ParameterLayout(topology, roles, this.hasLoad, strayParametersOf(template));
    this.diodeTerminals = findDiodeTerminals(topology, template, this.layout);
    const l = this.layout;
    this.slot = {
      positiveV: l.indexOf('supplyPositiveV'),
      negativeV: l.indexOf('supplyNegativeV'),
      headroomHigh: l.indexOf('outputHeadroomHighV'),
      headroomLow: l.indexOf('outputHeadroomLowV'),
      rOut: l.indexOf('outputResistanceOhm'),
      offset: l.indexOf('inputOffsetV'),
      bias: l.indexOf('inputBiasCurrentA'),
      slew: l.indexOf('slewRateVPerS'),
      delay: l.indexOf('recoveryDelayS'),
      limit: l.indexOf('outputCurrentLimitA'),
      clamp: l.indexOf('differentialClampV'),
      hysteresis: l.indexOf('internalHysteresisV'),
      delayCharge: l.indexOf('overdriveDelayChargeVS'),
      inputCapacitance: l.indexOf('inputCapacitanceF'),
      timingNodeStray: l.indexOf('timingNodeF'),
      thresholdNodeStray: l.indexOf('thresholdNodeF'),
      outputNodeStray: l.indexOf('outputNodeF'),
    };
    const states = capacitiveNodesOf(template);
    this.capacitiveThreshold = states.threshold;
    this.capacitiveOutput = states.output;
    this.dynamic = states.threshold || states.output;
    const bits = (on: readonly boolean[] | undefined) => (on ?? []).reduce((acc, x, k) => acc | (x ? 1 << k : 0), 0);
    this.nominalHighKey = configKey(this.openDrain ? STAGE.released : STAGE.driven, CLAMP.off, bits(topology.nominalDiodes?.('high')));
    this.nominalLowKey = configKey(STAGE.driven, CLAMP.off, bits(topology.nominalDiodes?.('low')));
    this.biasShape = template.capacitorShape ?? FLAT_SHAPE;
  }

  config(key: number): CompiledConfig {
    let c = this.configs[key];
    if (!c) {
      const diodes = Math.floor(key / 12);
      let mapped = this.topologyBranches.get(diodes);
      if (!mapped) {
        mapped = mapTopologyBranches(this.topology, this.template, pieceOf(this.topology, key), this.layout);
        this.topologyBranches.set(diodes, mapped);
      }
      c = new CompiledConfig(this, key, mapped.slice(), this.diodeTerminals);
      this.configs[key] = c;
    }
    return c;
  }

  /** The configuration with P and/or the output pin as states (a dynamic shape only). */
  dynamicConfig(key: number): CompiledConfig {
    let c = this.dynamicConfigs[key];
    if (!c) {
      this.config(key); // maps the topology's branches for this diode combination
      const mapped = this.topologyBranches.get(Math.floor(key / 12))!;
      c = new CompiledConfig(this, key, mapped.slice(), this.diodeTerminals, true);
      this.dynamicConfigs[key] = c;
    }
    return c;
  }
}

/**
 * Which role feeds each topology branch, found by rebuilding the branches with
 * each role doubled: every built-in topology writes a branch as "one role plus
 * a constant" (a steering diode's resistance). A topology that does anything
 * else is a programming error, reported at once.
 */
function mapTopologyBranches(topology: TopologyDefinition, circuit: Circuit, piece: PieceConfig, layout: ParameterLayout): CompiledBranch[] {
  const parts = circuit.parts;
  const base: Branch[] = topology.branches(parts, piece, circuit.diode);
  const dependsOn: number[] = base.map(() => -1);
  for (const p of layout.parameters) {
    if (p.kind !== 'resistor' && p.kind !== 'capacitor') continue;
    const scaled = { ...parts, [p.name]: parts[p.name] * 2 };
    const probe = topology.branches(scaled, piece, circuit.diode);
    for (let j = 0; j < base.length; j++) {
      const b0 = base[j];
      const b1 = probe[j];
      if (probe.length !== base.length || b0.from !== b1.from || b0.to !== b1.to || b0.emfV !== b1.emfV) {
        throw new Error(`topology ${topology.id}: the branch structure depends on the value of ${p.name}`);
      }
      if (b1.resistanceOhm === b0.resistanceOhm) continue;
      const delta = b1.resistanceOhm - b0.resistanceOhm;
      if (dependsOn[j] !== -1 || Math.abs(delta - parts[p.name]) > 1e-12 * Math.abs(b1.resistanceOhm)) {
        throw new Error(`topology ${topology.id}: branch ${b0.label} is not one role plus a constant`);
      }
      dependsOn[j] = layout.indexOf(p.name);
    }
  }
  const dropSign = diodeDropSigns(topology, circuit, piece, base);
  const drop = (circuit.diode ?? DEFAULT_STEERING_DIODE).forwardDropV;
  return base.map((b, j) => {
    const slot = dependsOn[j];
    const sign = dropSign[j];
    return {
      from: b.from,
      to: b.to,
      slot,
      offsetOhm: slot >= 0 ? b.resistanceOhm - parts[layout.parameters[slot].name] : b.resistanceOhm,
      // A diode branch's EMF is its forward drop: read from the drop's slot (a constant part stays, if any).
      emfV: sign !== 0 ? b.emfV - sign * drop : b.emfV,
      emfSlot: sign !== 0 ? layout.diodeDropSlot : -1,
      emfSign: sign,
    };
  });
}

/**
 * Per branch, how its EMF follows the diodes' forward drop (+1, −1 or 0), found by rebuilding the
 * branches with the drop raised by 1 V (the same probing as the roles).
 */
function diodeDropSigns(topology: TopologyDefinition, circuit: Circuit, piece: PieceConfig, base: readonly Branch[]): number[] {
  if (topology.diodeCount === 0) return base.map(() => 0);
  const diode = circuit.diode ?? DEFAULT_STEERING_DIODE;
  const probe = topology.branches(circuit.parts, piece, { ...diode, forwardDropV: diode.forwardDropV + 1 });
  return base.map((b0, j) => {
    const b1 = probe[j];
    if (probe.length !== base.length || b0.from !== b1.from || b0.to !== b1.to || b0.resistanceOhm !== b1.resistanceOhm) {
      throw new Error(`topology ${topology.id}: the branch structure depends on the diode's forward drop`);
    }
    const delta = b1.emfV - b0.emfV;
    if (delta === 0) return 0;
    if (Math.abs(Math.abs(delta) - 1) > 1e-12) throw new Error(`topology ${topology.id}: branch ${b0.label}'s EMF is not ± the diode drop plus a constant`);
    return Math.sign(delta);
  });
}

/** A steering diode's terminals and drop (drop = emfV + emfSign·values[emfSlot]). */
export interface DiodeTerminal {
  from: number;
  to: number;
  emfV: number;
  emfSlot: number;
  emfSign: number;
}

/** Terminals and drop of each steering diode, from the all-conducting branch list. */
function findDiodeTerminals(topology: TopologyDefinition, circuit: Circuit, layout: ParameterLayout): DiodeTerminal[] {
  if (!topology.diodeCount || !topology.diodeLabels) return [];
  const piece: PieceConfig = { state: 'high', outputDriven: true, diodesOn: topology.diodeLabels.map(() => true) };
  const all = topology.branches(circuit.parts, piece, circuit.diode);
  const signs = diodeDropSigns(topology, circuit, piece, all);
  const drop = (circuit.diode ?? DEFAULT_STEERING_DIODE).forwardDropV;
  return topology.diodeLabels.map((label) => {
    const j = all.findIndex((x) => x.label === label);
    if (j < 0) throw new Error(`topology ${topology.id} lists diode branch ${label} but does not produce it`);
    const b = all[j];
    const sign = signs[j];
    return { from: b.from, to: b.to, emfV: sign !== 0 ? b.emfV - sign * drop : b.emfV, emfSlot: sign !== 0 ? layout.diodeDropSlot : -1, emfSign: sign };
  });
}

/** Shapes kept before the cache starts over (a service meets a handful). */
const SHAPE_CACHE_LIMIT = 256;
const shapes = new Map<string, CompiledShape>();

/** The compiled shape of a (validated) circuit, compiled once per shape key per thread. */
export function shapeFor(circuit: Circuit, topology: TopologyDefinition): CompiledShape {
  const key = shapeKey(circuit, topology);
  let shape = shapes.get(key);
  if (!shape || shape.topology !== topology) {
    if (shapes.size >= SHAPE_CACHE_LIMIT) shapes.clear();
    shape = new CompiledShape(topology, circuit);
    shapes.set(key, shape);
  }
  return shape;
}
