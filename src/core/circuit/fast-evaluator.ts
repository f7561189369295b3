/**
 * A compiled closed-form evaluator for sweeps (Monte Carlo, corners,
 * sensitivities). The network STRUCTURE of a circuit is fixed by its topology,
 * output stage and load; only values change between samples. So we validate
 * once, record which value feeds each branch, rail and source, and then redo
 * exactly the nodal solve of network.ts / state-model.ts / closed-form.ts on
 * preallocated scratch buffers: no objects, no allocation per call.
 *
 * The arithmetic follows solveNetwork step for step (same stamping order, same
 * Gauss–Jordan with partial pivoting); only the probe column (Thevenin
 * resistance at P, not needed for timing) is dropped — columns of a
 * Gauss–Jordan elimination never mix, so the others are unchanged.
 *
 * When a topology computes a branch resistance from the parts in a way the
 * compiler cannot map (anything but "one role, plus a constant"), the evaluator
 * falls back to calling closedFormFigures per evaluation: slower, same answer.
 */
import type { AmplifierModel } from '../amplifiers/model.ts';
import { CoreError } from '../errors.ts';
import { closedFormFigures, getTopology, prepareCircuit } from './analyze.ts';
import { validateCircuit } from './validate.ts';
import { dwellTimeS } from './exponential.ts';
import { NODE } from './nodes.ts';
import { gaussJordan, type Branch } from './network.ts';
import type { TopologyDefinition } from './topologies/topology.ts';
import type { Circuit, OutputState, PieceConfig } from './types.ts';

/** Result status of one evaluation (0 = oscillates; the figures are then in the output). */
export const EVALUATION_STATUS = {
  ok: 0,
  /** A value is non-physical (resistance or capacitance <= 0, not finite). */
  invalidValue: 1,
  /** The capacitor has no charging path or a node floats. */
  noPath: 2,
  /** No hysteresis, or a state whose asymptote does not reach its threshold: the output latches. */
  latched: 3,
} as const;
export type EvaluationStatus = (typeof EVALUATION_STATUS)[keyof typeof EVALUATION_STATUS];

/** Slots of the output buffer `evaluate` writes. */
export const OUTPUT_SLOT = { periodS: 0, dutyCycle: 1, timeHighS: 2, timeLowS: 3 } as const;
export const OUTPUT_LENGTH = 4;

/** Circuit-level figures that follow the part roles in the value vector (present always, load ones only with a load). */
export const CIRCUIT_PARAMETERS = [
  'supplyPositiveV',
  'supplyNegativeV',
  'outputHeadroomHighV',
  'outputHeadroomLowV',
  'outputResistanceOhm',
  'inputOffsetV',
  'inputBiasCurrentA',
] as const;
export const LOAD_PARAMETERS = ['loadResistanceOhm', 'loadReturnV'] as const;

export type ParameterKind = 'resistor' | 'capacitor' | 'supply' | 'amplifier' | 'load';

export interface ParameterInfo {
  name: string;
  kind: ParameterKind;
}

export interface ClosedFormEvaluator {
  /** Value-vector layout: the topology's roles present in the circuit (role order), then CIRCUIT_PARAMETERS, then LOAD_PARAMETERS when loaded. */
  readonly parameters: readonly ParameterInfo[];
  /** The circuit's own values in that layout (a fresh copy per access is NOT made: do not write into it). */
  readonly nominal: Float64Array;
  /** True when the compiled (allocation-free) path is used, false for the per-call fallback. */
  readonly compiled: boolean;
  indexOf(name: string): number;
  /** Writes periodS, dutyCycle, timeHighS, timeLowS into out (see OUTPUT_SLOT); on failure writes NaN and returns the status. */
  evaluate(values: Float64Array, out: Float64Array): EvaluationStatus;
  /** The circuit these values describe (for slower paths that need a whole Circuit). */
  circuitAt(values: Float64Array): Circuit;
}

/** One branch of a compiled state: resistance = values[valueIndex] + offsetOhm (valueIndex −1: constant offsetOhm). */
interface CompiledBranch {
  from: number;
  to: number;
  valueIndex: number;
  offsetOhm: number;
  emfV: number;
}

/** Kinds of stamp operation: how a branch conductance g enters one matrix cell. */
const OP_ADD_G = 0; // a += g
const OP_SUB_G = 1; // a −= g
const OP_ADD_G_SCALE = 2; // a += g·scale (series emf)
const OP_ADD_G_VALUE = 3; // a += g·values[slot] (a rail held at a value-vector voltage)

interface CompiledState {
  state: OutputState;
  driven: boolean;
  /** Node used as the source (−1 when not driven). */
  sourceNode: number;
  m: number;
  width: number;
  /** Matrix rows: node of each row (row r is node rowNode[r]). */
  rowNode: Int32Array;
  /** Row of the decision node (its KCL row receives the bias current). */
  decisionRow: number;
  branchValue: Int32Array;
  branchOffset: Float64Array;
  /** How many of the branches come from the topology (they lead; output resistance and load follow). */
  topologyBranchCount: number;
  /** Ends and emf of the topology branches, to recognise a circuit of the same structure (ClosedFormCompileCache). */
  topologyFrom: Int32Array;
  topologyTo: Int32Array;
  topologyEmf: Float64Array;
  /** The stamping program, in solveNetwork's order (stampEnd from→to, then to→from, branch by branch). */
  opBranch: Int32Array;
  opCell: Int32Array;
  opKind: Uint8Array;
  opScale: Float64Array;
  opSlot: Int32Array;
  /** Branches touching the capacitor node, with the far end and the emf seen from N. */
  capBranches: Int32Array;
  capOther: Int32Array;
  capEmf: Float64Array;
  matrix: Float64Array;
  /** Affine coefficients per node (stride 4 as network.ts; the probe column stays 0). */
  coeff: Float64Array;
}

const STRIDE = 4;

function nominalPiece(topology: TopologyDefinition, state: OutputState): PieceConfig {
  return {
    state,
    outputDriven: !(topology.needsOpenDrain && state === 'high'),
    diodesOn: topology.nominalDiodes?.(state),
  };
}

function layoutFor(circuit: Circuit, topology: TopologyDefinition): ParameterInfo[] {
  const params: ParameterInfo[] = [];
  for (const [role, spec] of Object.entries(topology.roles)) {
    if (circuit.parts[role] !== undefined) params.push({ name: role, kind: spec.kind });
  }
  params.push({ name: 'supplyPositiveV', kind: 'supply' }, { name: 'supplyNegativeV', kind: 'supply' });
  for (const name of CIRCUIT_PARAMETERS.slice(2)) params.push({ name, kind: 'amplifier' });
  if (circuit.load) for (const name of LOAD_PARAMETERS) params.push({ name, kind: 'load' });
  return params;
}

function nominalValues(circuit: Circuit, params: readonly ParameterInfo[]): Float64Array {
  const v = new Float64Array(params.length);
  const amp = circuit.amplifier;
  params.forEach((p, i) => {
    switch (p.name) {
      case 'supplyPositiveV': v[i] = circuit.supply.positiveV; break;
      case 'supplyNegativeV': v[i] = circuit.supply.negativeV; break;
      case 'outputHeadroomHighV': v[i] = amp.outputHeadroomHighV; break;
      case 'outputHeadroomLowV': v[i] = amp.outputHeadroomLowV; break;
      case 'outputResistanceOhm': v[i] = amp.outputResistanceOhm; break;
      case 'inputOffsetV': v[i] = amp.inputOffsetV; break;
      case 'inputBiasCurrentA': v[i] = amp.inputBiasCurrentA; break;
      case 'loadResistanceOhm': v[i] = circuit.load!.resistanceOhm; break;
      case 'loadReturnV': v[i] = circuit.load!.returnV; break;
      default: v[i] = circuit.parts[p.name];
    }
  });
  return v;
}

/**
 * Finds, for each topology branch of a piece, which role drives its resistance,
 * by rebuilding the branches with each role doubled. Returns undefined when the
 * dependence is not "one role plus a constant" (then the fallback path is used).
 */
function mapTopologyBranches(
  topology: TopologyDefinition,
  circuit: Circuit,
  piece: PieceConfig,
  roleIndex: ReadonlyMap<string, number>,
): CompiledBranch[] | undefined {
  const parts = circuit.parts;
  const base = topology.branches(parts, piece, circuit.diode);
  const dependsOn: number[] = base.map(() => -1);
  for (const [role, index] of roleIndex) {
    const scaled = { ...parts, [role]: parts[role] * 2 };
    const probe = topology.branches(scaled, piece, circuit.diode);
    if (probe.length !== base.length) return undefined;
    for (let j = 0; j < base.length; j++) {
      const b0 = base[j];
      const b1 = probe[j];
      if (b0.from !== b1.from || b0.to !== b1.to || b0.emfV !== b1.emfV) return undefined;
      if (b1.resistanceOhm === b0.resistanceOhm) continue;
      const delta = b1.resistanceOhm - b0.resistanceOhm;
      if (dependsOn[j] !== -1 || Math.abs(delta - parts[role]) > 1e-12 * Math.abs(b1.resistanceOhm)) return undefined;
      dependsOn[j] = index;
    }
  }
  return base.map((b: Branch, j) => {
    const valueIndex = dependsOn[j];
    const role = valueIndex >= 0 ? [...roleIndex].find(([, i]) => i === valueIndex)![0] : undefined;
    return {
      from: b.from,
      to: b.to,
      valueIndex,
      offsetOhm: role === undefined ? b.resistanceOhm : b.resistanceOhm - parts[role],
      emfV: b.emfV,
    };
  });
}

function compileState(
  topology: TopologyDefinition,
  circuit: Circuit,
  state: OutputState,
  topologyBranches: CompiledBranch[],
  index: (name: string) => number,
): CompiledState {
  const piece = nominalPiece(topology, state);
  const nodeCount = NODE.firstInternal + topology.internalNodeCount;
  const branches = [...topologyBranches];
  let sourceNode: number;
  // Which nodes are held is structural: rails, ground and the load return always; the source node when it is parked.
  const fixed = new Uint8Array(nodeCount);
  fixed[NODE.ground] = 1;
  fixed[NODE.positiveRail] = 1;
  fixed[NODE.negativeRail] = 1;
  fixed[NODE.loadReturn] = 1;
  if (!piece.outputDriven) {
    sourceNode = -1;
    fixed[NODE.source] = 1;
  } else if (circuit.amplifier.outputResistanceOhm > 0) {
    sourceNode = NODE.source;
    branches.push({ from: NODE.source, to: NODE.output, valueIndex: index('outputResistanceOhm'), offsetOhm: 0, emfV: 0 });
  } else {
    sourceNode = NODE.output;
    fixed[NODE.source] = 1;
  }
  if (circuit.load) {
    branches.push({ from: NODE.output, to: NODE.loadReturn, valueIndex: index('loadResistanceOhm'), offsetOhm: 0, emfV: 0 });
  }
  const row = new Int32Array(nodeCount).fill(-1);
  const rowNode: number[] = [];
  for (let k = 0; k < nodeCount; k++) {
    if (k === NODE.capacitor || k === sourceNode) continue;
    if (!fixed[k]) {
      row[k] = rowNode.length;
      rowNode.push(k);
    }
  }
  const m = rowNode.length;
  const width = m + 3;
  // Rails held at value-vector voltages; other held nodes (ground, a parked source) are 0 V.
  const railSlot = new Map<number, number>([
    [NODE.positiveRail, index('supplyPositiveV')],
    [NODE.negativeRail, index('supplyNegativeV')],
  ]);
  if (circuit.load) railSlot.set(NODE.loadReturn, index('loadReturnV'));
  const ops: { branch: number; cell: number; kind: number; scale: number; slot: number }[] = [];
  const stampEnd = (j: number, p: number, q: number, emf: number) => {
    const rp = row[p];
    if (rp < 0) return;
    const base = rp * width;
    ops.push({ branch: j, cell: base + rp, kind: OP_ADD_G, scale: 0, slot: -1 });
    if (emf !== 0) ops.push({ branch: j, cell: base + m, kind: OP_ADD_G_SCALE, scale: emf, slot: -1 });
    const rq = row[q];
    if (rq >= 0) ops.push({ branch: j, cell: base + rq, kind: OP_SUB_G, scale: 0, slot: -1 });
    else if (q === NODE.capacitor) ops.push({ branch: j, cell: base + m + 1, kind: OP_ADD_G, scale: 0, slot: -1 });
    else if (q === sourceNode) ops.push({ branch: j, cell: base + m + 2, kind: OP_ADD_G, scale: 0, slot: -1 });
    else if (railSlot.has(q)) ops.push({ branch: j, cell: base + m, kind: OP_ADD_G_VALUE, scale: 0, slot: railSlot.get(q)! });
  };
  const capB: number[] = [];
  const capO: number[] = [];
  const capE: number[] = [];
  branches.forEach((b, j) => {
    stampEnd(j, b.from, b.to, b.emfV);
    stampEnd(j, b.to, b.from, -b.emfV);
    if (b.from === NODE.capacitor) {
      capB.push(j);
      capO.push(b.to);
      capE.push(b.emfV);
    } else if (b.to === NODE.capacitor) {
      capB.push(j);
      capO.push(b.from);
      capE.push(-b.emfV);
    }
  });
  const coeff = new Float64Array(nodeCount * STRIDE);
  coeff[NODE.capacitor * STRIDE + 1] = 1;
  if (sourceNode >= 0) coeff[sourceNode * STRIDE + 2] = 1;
  return {
    state,
    driven: piece.outputDriven,
    sourceNode,
    m,
    width,
    rowNode: Int32Array.from(rowNode),
    decisionRow: row[NODE.decision],
    branchValue: Int32Array.from(branches, (b) => b.valueIndex),
    branchOffset: Float64Array.from(branches, (b) => b.offsetOhm),
    topologyBranchCount: topologyBranches.length,
    topologyFrom: Int32Array.from(topologyBranches, (b) => b.from),
    topologyTo: Int32Array.from(topologyBranches, (b) => b.to),
    topologyEmf: Float64Array.from(topologyBranches, (b) => b.emfV),
    opBranch: Int32Array.from(ops, (o) => o.branch),
    opCell: Int32Array.from(ops, (o) => o.cell),
    opKind: Uint8Array.from(ops, (o) => o.kind),
    opScale: Float64Array.from(ops, (o) => o.scale),
    opSlot: Int32Array.from(ops, (o) => o.slot),
    capBranches: Int32Array.from(capB),
    capOther: Int32Array.from(capO),
    capEmf: Float64Array.from(capE),
    matrix: new Float64Array(m * width),
    coeff,
  };
}

/** Validates the circuit once and returns an allocation-free evaluator of its period and duty cycle. */
export function compileClosedForm(circuit: Circuit): ClosedFormEvaluator {
  const topology = getTopology(circuit.topology);
  // Full validation and one real solve: bad input fails here, with its pointer, not per sample.
  prepareCircuit(circuit);
  const parameters = layoutFor(circuit, topology);
  const nominal = nominalValues(circuit, parameters);
  const indexMap = new Map(parameters.map((p, i) => [p.name, i]));
  const indexOf = (name: string): number => indexMap.get(name) ?? -1;
  const roleIndex = new Map(parameters.filter((p) => p.kind === 'resistor' || p.kind === 'capacitor').map((p) => [p.name, indexOf(p.name)]));
  const circuitAt = (values: Float64Array): Circuit => rebuildCircuit(circuit, parameters, values);

  const highBranches = mapTopologyBranches(topology, circuit, nominalPiece(topology, 'high'), roleIndex);
  const lowBranches = mapTopologyBranches(topology, circuit, nominalPiece(topology, 'low'), roleIndex);
  if (!highBranches || !lowBranches) {
    const evaluate = fallbackEvaluate(circuitAt);
    return { parameters, nominal, compiled: false, indexOf, circuitAt, evaluate };
  }
  const high = compileState(topology, circuit, 'high', highBranches, indexOf);
  const low = compileState(topology, circuit, 'low', lowBranches, indexOf);
  return new CompiledEvaluator(parameters, nominal, indexOf, circuitAt, high, low, topology, Int32Array.from(roleIndex.values()));
}

/** What fixes a compiled evaluator's structure besides the topology's own branch ends: roles present, output resistance, load. */
function shapeKey(circuit: Circuit, topology: TopologyDefinition): string {
  let key = topology.id;
  for (const role of Object.keys(topology.roles)) if (circuit.parts[role] !== undefined) key += `|${role}`;
  return `${key}|rOut:${circuit.amplifier.outputResistanceOhm > 0 ? 1 : 0}|load:${circuit.load ? 1 : 0}`;
}

/** Shapes one ClosedFormCompileCache keeps before it starts over (a batch rarely has more than a handful). */
export const DEFAULT_COMPILE_CACHE_SHAPES = 64;

/**
 * Compiled evaluators reused across circuits that differ only in values: a BOM
 * batch checks thousands of assemblies of one topology and amplifier, each with
 * its own part values, and compiling (validation, the probe solves that map
 * each branch to its role, the stamping program) costs more than the worst-case
 * corners themselves. A hit binds the cached program to the new circuit's
 * nominal values and recomputes the topology branches' constant offsets (a
 * diode's resistance), so the evaluator computes bit for bit what
 * compileClosedForm would; a circuit whose branches differ in ends or emf (say
 * another diode drop) is compiled afresh and replaces the entry.
 *
 * The assumption, true of every built-in topology: which role feeds a branch
 * depends only on which roles are present, not on their values.
 *
 * The evaluators it returns share scratch buffers, which is safe because an
 * evaluation never calls another evaluator (and each worker thread has its own
 * module state). Give one cache per batch or per worker.
 */
export class ClosedFormCompileCache {
  private readonly templates = new Map<string, CompiledEvaluator>();
  private readonly out = new Float64Array(OUTPUT_LENGTH);
  private reusedCount = 0;

  constructor(readonly maxShapes: number = DEFAULT_COMPILE_CACHE_SHAPES) {}

  /** Circuits answered from a cached shape so far (for tests and benchmarks). */
  get reused(): number {
    return this.reusedCount;
  }

  /** The same evaluator as compileClosedForm(circuit) gives (same values, same errors), compiled at most once per shape. */
  compile(circuit: Circuit): ClosedFormEvaluator {
    const topology = getTopology(circuit.topology);
    const key = shapeKey(circuit, topology);
    const template = this.templates.get(key);
    if (template) {
      // compileClosedForm validates first: same checks, same errors and pointers.
      validateCircuit(circuit, topology);
      const bound = template.rebind(circuit);
      if (bound) {
        // An evaluable nominal means the reference solve succeeds too (the arithmetic is the same);
        // otherwise let the reference solve throw its own error, as compileClosedForm would.
        if (bound.evaluate(bound.nominal, this.out) !== EVALUATION_STATUS.ok) prepareCircuit(circuit);
        this.reusedCount++;
        return bound;
      }
    }
    const fresh = compileClosedForm(circuit);
    if (fresh instanceof CompiledEvaluator) {
      if (!template && this.templates.size >= this.maxShapes) this.templates.clear();
      this.templates.set(key, fresh);
    }
    return fresh;
  }
}

/** A compiled state with the offsets of another circuit's topology branches; undefined when their ends or emf differ. */
function rebindState(topology: TopologyDefinition, circuit: Circuit, s: CompiledState, parameters: readonly ParameterInfo[]): CompiledState | undefined {
  const branches = topology.branches(circuit.parts, nominalPiece(topology, s.state), circuit.diode);
  const n = s.topologyBranchCount;
  if (branches.length !== n) return undefined;
  const offset = Float64Array.from(s.branchOffset);
  for (let j = 0; j < n; j++) {
    const b = branches[j];
    if (b.from !== s.topologyFrom[j] || b.to !== s.topologyTo[j] || b.emfV !== s.topologyEmf[j]) return undefined;
    const vi = s.branchValue[j];
    // Same subtraction as mapTopologyBranches, so the offset is the one a fresh compile would record.
    offset[j] = vi >= 0 ? b.resistanceOhm - circuit.parts[parameters[vi].name] : b.resistanceOhm;
  }
  return { ...s, branchOffset: offset };
}

/**
 * The compiled path as a class rather than closures: every evaluator then
 * shares one hidden class and one set of methods, so the sampling loops stay
 * monomorphic and optimised across requests (closures re-created per request
 * would not be).
 */
class CompiledEvaluator implements ClosedFormEvaluator {
  readonly compiled = true;
  private readonly conductance: Float64Array;
  private readonly stateOut = new Float64Array(3); // tauS, asymptoteV, switchingV
  private readonly capIndex: number;
  private readonly iPos: number;
  private readonly iNeg: number;
  private readonly iHeadHigh: number;
  private readonly iHeadLow: number;
  private readonly iOffset: number;
  private readonly iBias: number;
  private readonly iLoadReturn: number;
  private readonly roleSlots: Int32Array;

  constructor(
    readonly parameters: readonly ParameterInfo[],
    readonly nominal: Float64Array,
    readonly indexOf: (name: string) => number,
    readonly circuitAt: (values: Float64Array) => Circuit,
    private readonly high: CompiledState,
    private readonly low: CompiledState,
    private readonly topology: TopologyDefinition,
    roleSlots: Int32Array,
  ) {
    this.conductance = new Float64Array(Math.max(high.branchValue.length, low.branchValue.length));
    this.capIndex = indexOf(topology.capacitorRole);
    this.iPos = indexOf('supplyPositiveV');
    this.iNeg = indexOf('supplyNegativeV');
    this.iHeadHigh = indexOf('outputHeadroomHighV');
    this.iHeadLow = indexOf('outputHeadroomLowV');
    this.iOffset = indexOf('inputOffsetV');
    this.iBias = indexOf('inputBiasCurrentA');
    this.iLoadReturn = indexOf('loadReturnV');
    this.roleSlots = roleSlots;
  }

  /**
   * This stamping program bound to another circuit of the same shape (see ClosedFormCompileCache; the
   * caller has validated the circuit). Undefined when its topology branches differ in ends or emf.
   */
  rebind(circuit: Circuit): CompiledEvaluator | undefined {
    const high = rebindState(this.topology, circuit, this.high, this.parameters);
    const low = high && rebindState(this.topology, circuit, this.low, this.parameters);
    if (!high || !low) return undefined;
    const parameters = this.parameters;
    const circuitAt = (values: Float64Array): Circuit => rebuildCircuit(circuit, parameters, values);
    return new CompiledEvaluator(parameters, nominalValues(circuit, parameters), this.indexOf, circuitAt, high, low, this.topology, this.roleSlots);
  }

  /** solveNetwork + solveState for one state; writes tau, asymptote, switching level into this.stateOut. */
  private solve(s: CompiledState, values: Float64Array): EvaluationStatus {
    // Fields into locals once per call: the loops below then read registers, not properties.
    const { conductance, stateOut, capIndex, iPos, iNeg, iHeadHigh, iHeadLow, iOffset, iBias, iLoadReturn } = this;
    const { m, width, matrix: a, coeff, rowNode } = s;
    coeff[NODE.positiveRail * STRIDE] = values[iPos];
    coeff[NODE.negativeRail * STRIDE] = values[iNeg];
    coeff[NODE.loadReturn * STRIDE] = iLoadReturn >= 0 ? values[iLoadReturn] : 0;
    const bias = values[iBias];
    a.fill(0);
    // Bias current flows into the input pins, i.e. out of N and P (state-network.ts).
    if (s.decisionRow >= 0) a[s.decisionRow * width + m] = -bias;
    const nb = s.branchValue.length;
    for (let j = 0; j < nb; j++) {
      const vi = s.branchValue[j];
      const rOhm = vi >= 0 ? values[vi] + s.branchOffset[j] : s.branchOffset[j];
      if (!(rOhm > 0) || rOhm === Infinity) return EVALUATION_STATUS.invalidValue;
      conductance[j] = 1 / rOhm;
    }
    const ops = s.opKind.length;
    for (let o = 0; o < ops; o++) {
      const g = conductance[s.opBranch[o]];
      const cell = s.opCell[o];
      switch (s.opKind[o]) {
        case OP_ADD_G: a[cell] += g; break;
        case OP_SUB_G: a[cell] -= g; break;
        case OP_ADD_G_SCALE: a[cell] += g * s.opScale[o]; break;
        default: a[cell] += g * values[s.opSlot[o]];
      }
    }
    // Gauss–Jordan with partial pivoting: the same routine as network.ts, so results agree bit for bit.
    if (!gaussJordan(a, m, width)) return EVALUATION_STATUS.noPath;
    for (let r = 0; r < m; r++) {
      const k = rowNode[r] * STRIDE;
      coeff[k] = a[r * width + m];
      coeff[k + 1] = a[r * width + m + 1];
      coeff[k + 2] = a[r * width + m + 2];
    }
    let q0 = -bias;
    let qv = 0;
    let qs = 0;
    for (let t = 0; t < s.capBranches.length; t++) {
      const g = conductance[s.capBranches[t]];
      const other = s.capOther[t] * STRIDE;
      q0 -= g * (-coeff[other] - s.capEmf[t]);
      qv -= g * (1 - coeff[other + 1]);
      qs -= g * -coeff[other + 2];
    }
    const sourceV = s.driven ? (s.state === 'high' ? values[iPos] - values[iHeadHigh] : values[iNeg] + values[iHeadLow]) : 0;
    const capG = -qv;
    if (!(capG > 0)) return EVALUATION_STATUS.noPath;
    const pc = NODE.decision * STRIDE;
    const decisionConst = coeff[pc] + coeff[pc + 2] * sourceV;
    const slopeMargin = 1 - coeff[pc + 1];
    if (!(slopeMargin > 0)) return EVALUATION_STATUS.latched;
    stateOut[0] = values[capIndex] / capG;
    stateOut[1] = (q0 + qs * sourceV) / capG;
    stateOut[2] = (decisionConst + values[iOffset]) / slopeMargin;
    return EVALUATION_STATUS.ok;
  }

  private fail(out: Float64Array, status: EvaluationStatus): EvaluationStatus {
    out[0] = out[1] = out[2] = out[3] = Number.NaN;
    return status;
  }

  evaluate(values: Float64Array, out: Float64Array): EvaluationStatus {
    for (let i = 0; i < this.roleSlots.length; i++) {
      const v = values[this.roleSlots[i]];
      if (!(v > 0) || v === Infinity) return this.fail(out, EVALUATION_STATUS.invalidValue);
    }
    let status = this.solve(this.high, values);
    if (status !== EVALUATION_STATUS.ok) return this.fail(out, status);
    const tauHigh = this.stateOut[0];
    const asymHigh = this.stateOut[1];
    const upperV = this.stateOut[2];
    status = this.solve(this.low, values);
    if (status !== EVALUATION_STATUS.ok) return this.fail(out, status);
    const tauLow = this.stateOut[0];
    const asymLow = this.stateOut[1];
    const lowerV = this.stateOut[2];
    // requireOscillation: hysteresis, and each asymptote beyond its threshold.
    if (!(upperV > lowerV) || !(asymHigh > upperV) || !(asymLow < lowerV)) return this.fail(out, EVALUATION_STATUS.latched);
    const timeHighS = dwellTimeS(tauHigh, asymHigh, lowerV, upperV);
    const timeLowS = dwellTimeS(tauLow, asymLow, upperV, lowerV);
    const periodS = timeHighS + timeLowS;
    out[0] = periodS;
    out[1] = timeHighS / periodS;
    out[2] = timeHighS;
    out[3] = timeLowS;
    return EVALUATION_STATUS.ok;
  }

}

function fallbackEvaluate(circuitAt: (values: Float64Array) => Circuit) {
  return (values: Float64Array, out: Float64Array): EvaluationStatus => {
    try {
      const f = closedFormFigures(circuitAt(values));
      out[0] = f.periodS;
      out[1] = f.dutyCycle;
      out[2] = f.timeHighS;
      out[3] = f.timeLowS;
      return EVALUATION_STATUS.ok;
    } catch (err) {
      out[0] = out[1] = out[2] = out[3] = Number.NaN;
      if (err instanceof CoreError) return err.code === 'no-oscillation' ? EVALUATION_STATUS.latched : EVALUATION_STATUS.invalidValue;
      throw err;
    }
  };
}

function rebuildCircuit(circuit: Circuit, parameters: readonly ParameterInfo[], values: Float64Array): Circuit {
  const parts: Record<string, number> = {};
  const amplifier: AmplifierModel = { ...circuit.amplifier };
  const supply = { ...circuit.supply };
  const load = circuit.load ? { ...circuit.load } : undefined;
  parameters.forEach((p, i) => {
    const v = values[i];
    switch (p.name) {
      case 'supplyPositiveV': supply.positiveV = v; break;
      case 'supplyNegativeV': supply.negativeV = v; break;
      case 'outputHeadroomHighV': amplifier.outputHeadroomHighV = v; break;
      case 'outputHeadroomLowV': amplifier.outputHeadroomLowV = v; break;
      case 'outputResistanceOhm': amplifier.outputResistanceOhm = v; break;
      case 'inputOffsetV': amplifier.inputOffsetV = v; break;
      case 'inputBiasCurrentA': amplifier.inputBiasCurrentA = v; break;
      case 'loadResistanceOhm': load!.resistanceOhm = v; break;
      case 'loadReturnV': load!.returnV = v; break;
      default: parts[p.name] = v;
    }
  });
  const out: Circuit = { ...circuit, supply, amplifier, parts };
  if (load) out.load = load;
  return out;
}
