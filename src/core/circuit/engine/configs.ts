/**
 * The linear pieces an oscillator can be in, and what the engine needs from
 * each: one nodal solve per network configuration (output stage mode × input
 * clamp × steering diodes), reduced to a handful of affine coefficients in
 * (v, s) — v the capacitor voltage, s the output-stage source voltage — and the
 * list of functions whose sign change ends the piece. A configuration is solved
 * the first time the walk enters it and cached for the rest of the analysis; the
 * two nominal ones reuse the solves the analysis already made, so a typical
 * push-pull circuit needs no extra network solve at all.
 */
import { NODE } from '../nodes.ts';
import { solveNetwork, type Branch, type NetworkSolution } from '../network.ts';
import { buildStateNetwork } from '../state-network.ts';
import type { PreparedCircuit } from '../analyze.ts';
import type { PieceConfig } from '../types.ts';

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

/**
 * Resistance of a conducting differential-input clamp, ohm. Amplifier models
 * carry only the clamp voltage; 10 Ω stands for the incremental resistance of a
 * small-signal diode pair at milliamperes (common practice, a value from memory).
 * It is small against any threshold network, so the clamp holds |P − N| close to
 * its voltage, which is what matters for timing.
 */
export const CLAMP_RESISTANCE_OHM = 10;

/** Relative tolerance (of the supply span, or of the current limit) for "on a boundary". */
export const BOUNDARY_TOLERANCE = 1e-9;

export function configKey(stage: number, clamp: number, diodes: number): number {
  return stage + 4 * clamp + 12 * diodes;
}

/** Most non-threshold event functions one configuration can have (2 diodes + 2 clamp + 2 limit). */
const MAX_EVENTS = 8;
/** Configuration keys: 4 stage modes × 3 clamp modes × up to 4 diode combinations. */
const KEY_SPACE = 4 * 3 * 4;

export class ConfigModel {
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

interface DiodeTerminal {
  from: number;
  to: number;
  emfV: number;
}

const STRIDE = 4; // NetworkSolution.coeff layout: const, per v, per s, probe
/** Shared by every circuit without steering diodes (never written). */
const NO_DIODES: readonly DiodeTerminal[] = [];

/**
 * Per-analysis cache of configuration models. The object is reusable: reset()
 * retargets it to another circuit and recycles the model objects, so a steady
 * stream of analyses allocates almost nothing.
 */
export class ConfigCache {
  private readonly slot = new Int16Array(KEY_SPACE).fill(-1);
  private readonly pool: ConfigModel[] = [];
  private used = 0;
  private diodeTerminals: readonly DiodeTerminal[] = NO_DIODES;
  prepared!: PreparedCircuit;
  capacitanceF = 0;
  spanV = 0;
  clampV = Infinity;
  limitA = Infinity;
  outputResistanceOhm = 0;
  openDrain = false;
  offsetV = 0;

  reset(prepared: PreparedCircuit): void {
    this.prepared = prepared;
    const { circuit, topology } = prepared;
    this.capacitanceF = circuit.parts[topology.capacitorRole];
    this.spanV = circuit.supply.positiveV - circuit.supply.negativeV;
    this.clampV = circuit.amplifier.differentialClampV;
    this.limitA = circuit.amplifier.outputCurrentLimitA;
    this.outputResistanceOhm = circuit.amplifier.outputResistanceOhm;
    this.openDrain = topology.needsOpenDrain;
    this.offsetV = circuit.amplifier.inputOffsetV;
    this.diodeTerminals = topology.diodeCount ? findDiodeTerminals(prepared) : NO_DIODES;
    // Only the slots the previous circuit filled need clearing.
    for (let i = 0; i < this.used; i++) this.slot[this.pool[i].key] = -1;
    this.used = 0;
    // The nominal solves of the analysis are the diodes-nominal, clamp-off, not-limited pieces.
    this.adoptNominal(prepared.high.solution, 'high');
    this.adoptNominal(prepared.low.solution, 'low');
  }

  private adoptNominal(sol: NetworkSolution, state: 'high' | 'low'): void {
    const { topology } = this.prepared;
    const stage = topology.needsOpenDrain && state === 'high' ? STAGE.released : STAGE.driven;
    const diodes = diodeBits(topology.nominalDiodes?.(state));
    const key = configKey(stage, CLAMP.off, diodes);
    if (this.slot[key] < 0) this.reduce(key, stage, CLAMP.off, diodes, sol);
  }

  get(key: number): ConfigModel {
    const i = this.slot[key];
    if (i >= 0) return this.pool[i];
    const stage = key % 4;
    const clamp = Math.floor(key / 4) % 3;
    const diodes = Math.floor(key / 12);
    return this.reduce(key, stage, clamp, diodes, this.solve(stage, clamp, diodes));
  }

  private solve(stage: number, clamp: number, diodes: number): NetworkSolution {
    const { circuit, topology } = this.prepared;
    const count = topology.diodeCount;
    const piece: PieceConfig = {
      state: 'high',
      outputDriven: stage === STAGE.driven,
      diodesOn: count > 0 ? Array.from({ length: count }, (_, k) => ((diodes >> k) & 1) === 1) : undefined,
    };
    const spec = buildStateNetwork(topology, circuit, piece);
    const branches = spec.branches as Branch[];
    if (clamp === CLAMP.pAboveN) {
      branches.push({ from: NODE.decision, to: NODE.capacitor, resistanceOhm: CLAMP_RESISTANCE_OHM, emfV: this.clampV, label: 'inputClamp' });
    } else if (clamp === CLAMP.nAboveP) {
      branches.push({ from: NODE.capacitor, to: NODE.decision, resistanceOhm: CLAMP_RESISTANCE_OHM, emfV: this.clampV, label: 'inputClamp' });
    }
    if (stage === STAGE.limitedSource || stage === STAGE.limitedSink) {
      // The output stage becomes a current source into the pin; the pin voltage is whatever the network makes it.
      const injection = spec.injectionA as Float64Array;
      injection[NODE.output] += stage === STAGE.limitedSource ? this.limitA : -this.limitA;
    }
    return solveNetwork(spec);
  }

  private reduce(key: number, stage: number, clamp: number, diodes: number, sol: NetworkSolution): ConfigModel {
    if (this.used === this.pool.length) this.pool.push(new ConfigModel());
    const index = this.used++;
    this.slot[key] = index;
    const m = this.pool[index];
    const c = this.capacitanceF;
    const k = sol.coeff;
    const p = NODE.decision * STRIDE;
    const o = NODE.output * STRIDE;
    m.key = key;
    m.stage = stage;
    m.clamp = clamp;
    m.diodes = diodes;
    m.a = -sol.capPerVoltV / c;
    m.b0 = sol.capConstA / c;
    m.bS = sol.capPerSourceV / c;
    m.pC = k[p];
    m.pV = k[p + 1];
    m.pS = k[p + 2];
    m.oC = k[o];
    m.oV = k[o + 1];
    m.oS = k[o + 2];
    m.hC = m.pC + this.offsetV;
    m.hV = m.pV - 1;
    m.hS = m.pS;
    m.iC = m.iV = m.iS = 0;
    if (stage === STAGE.driven) {
      currentLeaving(sol, sol.spec.sourceNode, m, 0);
    } else if (stage === STAGE.limitedSource) m.iC = this.limitA;
    else if (stage === STAGE.limitedSink) m.iC = -this.limitA;
    currentLeaving(sol, NODE.positiveRail, m, 1);
    m.eventCount = 0;
    this.addEvents(m, sol);
    return m;
  }

  private addEvents(m: ConfigModel, sol: NetworkSolution): void {
    const vTol = BOUNDARY_TOLERANCE * this.spanV;
    const k = sol.coeff;
    // Diodes: forward voltage beyond the drop f = V_from − V_to − Vf; off: f <= 0, on: current (= f/R) >= 0.
    for (let d = 0; d < this.diodeTerminals.length; d++) {
      const t = this.diodeTerminals[d];
      const a = t.from * STRIDE;
      const b = t.to * STRIDE;
      const sign = (m.diodes >> d) & 1 ? 1 : -1;
      m.pushEvent(EVENT.diode, d, sign * (k[a] - k[b] - t.emfV), sign * (k[a + 1] - k[b + 1]), sign * (k[a + 2] - k[b + 2]), vTol);
    }
    if (Number.isFinite(this.clampV)) {
      // d = P − N
      const dC = m.pC;
      const dV = m.pV - 1;
      const dS = m.pS;
      const vc = this.clampV;
      if (m.clamp === CLAMP.off) {
        m.pushEvent(EVENT.clampOnPAboveN, 0, vc - dC, -dV, -dS, vTol);
        m.pushEvent(EVENT.clampOnNAboveP, 0, vc + dC, dV, dS, vTol);
      } else if (m.clamp === CLAMP.pAboveN) {
        m.pushEvent(EVENT.clampOff, 0, dC - vc, dV, dS, vTol);
      } else {
        m.pushEvent(EVENT.clampOff, 0, -dC - vc, -dV, -dS, vTol);
      }
    }
    if (Number.isFinite(this.limitA)) {
      const iTol = BOUNDARY_TOLERANCE * this.limitA;
      const drop = this.limitA * this.outputResistanceOhm;
      if (m.stage === STAGE.driven) {
        // An open-drain transistor only sinks; a push-pull stage limits both ways.
        if (!this.openDrain) m.pushEvent(EVENT.limitSource, 0, this.limitA - m.iC, -m.iV, -m.iS, iTol);
        m.pushEvent(EVENT.limitSink, 0, this.limitA + m.iC, m.iV, m.iS, iTol);
      } else if (m.stage === STAGE.limitedSource) {
        // Stays limited while the source would push more than the limit: s >= pin + limit·rOut.
        m.pushEvent(EVENT.limitLeave, 0, -m.oC - drop, -m.oV, 1 - m.oS, vTol);
      } else if (m.stage === STAGE.limitedSink) {
        m.pushEvent(EVENT.limitLeave, 0, m.oC - drop, m.oV, m.oS - 1, vTol);
      }
    }
  }
}

/** Sum of branch currents leaving a node, written into the output (which 0) or rail (which 1) fields of m. */
function currentLeaving(sol: NetworkSolution, node: number, m: ConfigModel, which: 0 | 1): void {
  let c = 0;
  let v = 0;
  let s = 0;
  if (node >= 0) {
    const k = sol.coeff;
    const branches = sol.spec.branches;
    for (let n = 0; n < branches.length; n++) {
      const b = branches[n];
      if (b.from !== node && b.to !== node) continue;
      const g = (b.from === node ? 1 : -1) / b.resistanceOhm;
      const f = b.from * STRIDE;
      const t = b.to * STRIDE;
      c += g * (k[f] - k[t] - b.emfV);
      v += g * (k[f + 1] - k[t + 1]);
      s += g * (k[f + 2] - k[t + 2]);
    }
  }
  if (which === 0) {
    m.iC = c;
    m.iV = v;
    m.iS = s;
  } else {
    m.railC = c;
    m.railV = v;
    m.railS = s;
  }
}

function diodeBits(on: readonly boolean[] | undefined): number {
  let bits = 0;
  if (on) for (let k = 0; k < on.length; k++) if (on[k]) bits |= 1 << k;
  return bits;
}

/** Terminals and drop of each steering diode, from the all-conducting branch list. */
function findDiodeTerminals(prepared: PreparedCircuit): DiodeTerminal[] {
  const { topology, circuit } = prepared;
  if (!topology.diodeCount || !topology.diodeLabels) return [];
  const all = topology.branches(circuit.parts, { state: 'high', outputDriven: true, diodesOn: topology.diodeLabels.map(() => true) }, circuit.diode);
  return topology.diodeLabels.map((label) => {
    const b = all.find((x) => x.label === label);
    if (!b) throw new Error(`topology ${topology.id} lists diode branch ${label} but does not produce it`);
    return { from: b.from, to: b.to, emfV: b.emfV };
  });
}
