/**
 * An independent reference for the time-domain engine: the same circuit ODE
 * integrated numerically by odex (Hairer & Wanner's ODEX, Gragg–Bulirsch–Stoer
 * extrapolation, from the npm registry), with events located by bisection on
 * the integrator's dense output.
 *
 * Nothing here uses the engine or the core's network solve: the node voltages
 * are found by a dense nodal solve at every right-hand-side evaluation, the
 * capacitor current by KCL, and the amplifier behaviour (decision, recovery
 * delay, slew, current limit, input clamp, steering diodes, open drain) is
 * re-implemented from its description in engine/walker.ts. Only the topology
 * branch lists (the circuit definitions themselves) are shared.
 */
import { createRequire } from 'node:module';
import { NODE } from '../../../src/core/circuit/nodes.ts';
import type { Branch } from '../../../src/core/circuit/network.ts';
import type { Circuit, DiodeModel } from '../../../src/core/circuit/types.ts';
import { findTopology } from '../../../src/core/index.ts';

/** The part of odex's API used here (odex ships TypeScript sources, not declarations: typed locally). */
interface OdexSolver {
  denseOutput: boolean;
  relativeTolerance: number | number[];
  absoluteTolerance: number | number[];
  maxSteps: number;
  maxStepSize: number;
  solve(
    f: (x: number, y: number[]) => number[],
    x0: number,
    y0: number[],
    xEnd: number,
    solOut?: (n: number, xOld: number, x: number, y: number[], dense?: (c: number, x: number) => number) => boolean | void,
  ): { y: number[] };
}
const odex = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver };

const DEFAULT_DIODE: DiodeModel = { forwardDropV: 0.6, resistanceOhm: 10 };
/** Segments without a comparator decision after which the circuit counts as latched. */
const LATCH_SEGMENTS = 10;
/** Must equal the engine's modelling choice for a conducting clamp (a model parameter, not a result). */
const CLAMP_R = 10;

export interface ReferenceResult {
  periodS: number;
  dutyCycle: number;
  upperV: number;
  lowerV: number;
  /**
   * Output state levels as the engine defines them (docs/model.md §5): the pin at the instant the
   * output stage starts to leave the state (when the delayed decision reaches it).
   */
  highV: number;
  lowV: number;
  /** Time-means of the pin over the high and low drive intervals. */
  meanHighV: number;
  meanLowV: number;
  cycles: number;
  rhsEvaluations: number;
  /** Uniform samples from the steady state on (when options.sample asked for them). */
  samples?: { capacitorV: Float64Array; outputV: Float64Array; intervalS: number };
}

export interface ReferenceOptions {
  initialState?: 'high' | 'low';
  tolerance?: number;
  maxCycles?: number;
  /**
   * Also sample the capacitor and the output pin on a uniform grid from the steady state on (synthetic
   * scope records): a given interval and count, or so many samples per period over so many periods.
   */
  sample?: { intervalS: number; count: number } | { perPeriod: number; periods: number };
}

type Stage = 'driven' | 'released' | 'limSrc' | 'limSnk';

interface Discrete {
  logic: number;
  target: number;
  stage: Stage;
  clamp: 0 | 1 | -1;
  diodes: boolean[];
  rate: number;
  pending: number[];
}

/**
 * Voltages of the other capacitive nodes (strays at P and at the output pin), when the circuit has
 * them: then they are integration states like v and held at these values in the nodal solve.
 */
interface ExtraStates {
  p?: number;
  o?: number;
}

/** Node voltages by dense Gaussian elimination for given v (capacitor) and s (source). */
function nodeVoltages(c: Circuit, d: Discrete, v: number, s: number, x: ExtraStates = {}): { V: Float64Array; branches: Branch[] } {
  const topology = findTopology(c.topology)!;
  const n = NODE.firstInternal + topology.internalNodeCount;
  const amp = c.amplifier;
  const branches = topology.branches(c.parts, { state: d.logic ? 'high' : 'low', outputDriven: d.stage === 'driven', diodesOn: topology.diodeCount ? d.diodes : undefined }, c.diode);
  const known = new Array<boolean>(n).fill(false);
  const V = new Float64Array(n);
  const inj = new Float64Array(n);
  const fix = (k: number, x: number) => {
    known[k] = true;
    V[k] = x;
  };
  fix(NODE.ground, 0);
  fix(NODE.positiveRail, c.supply.positiveV);
  fix(NODE.negativeRail, c.supply.negativeV);
  fix(NODE.loadReturn, c.load?.returnV ?? 0);
  fix(NODE.capacitor, v);
  // A capacitive P is a state (its voltage given), like N.
  if (x.p !== undefined) fix(NODE.decision, x.p);
  if (d.stage === 'driven') {
    if (amp.outputResistanceOhm > 0) {
      fix(NODE.source, s);
      branches.push({ from: NODE.source, to: NODE.output, resistanceOhm: amp.outputResistanceOhm, emfV: 0, label: 'rOut' });
      if (x.o !== undefined) fix(NODE.output, x.o);
    } else {
      fix(NODE.output, s);
      fix(NODE.source, 0);
    }
  } else {
    fix(NODE.source, 0);
    if (x.o !== undefined) fix(NODE.output, x.o);
    if (d.stage === 'limSrc') inj[NODE.output] += amp.outputCurrentLimitA;
    if (d.stage === 'limSnk') inj[NODE.output] -= amp.outputCurrentLimitA;
  }
  if (c.load) branches.push({ from: NODE.output, to: NODE.loadReturn, resistanceOhm: c.load.resistanceOhm, emfV: 0, label: 'load' });
  // Leakage (docs/model.md, strays and leakage): resistors from N and from P to ground.
  const leakN = c.strays?.timingLeakageOhm ?? Infinity;
  const leakP = c.strays?.thresholdLeakageOhm ?? Infinity;
  if (Number.isFinite(leakN)) branches.push({ from: NODE.capacitor, to: NODE.ground, resistanceOhm: leakN, emfV: 0, label: 'leakN' });
  if (Number.isFinite(leakP)) branches.push({ from: NODE.decision, to: NODE.ground, resistanceOhm: leakP, emfV: 0, label: 'leakP' });
  if (d.clamp === 1) branches.push({ from: NODE.decision, to: NODE.capacitor, resistanceOhm: CLAMP_R, emfV: amp.differentialClampV, label: 'clamp' });
  if (d.clamp === -1) branches.push({ from: NODE.capacitor, to: NODE.decision, resistanceOhm: CLAMP_R, emfV: amp.differentialClampV, label: 'clamp' });
  inj[NODE.decision] -= amp.inputBiasCurrentA;
  inj[NODE.capacitor] -= amp.inputBiasCurrentA;
  const unknown: number[] = [];
  const idx = new Array<number>(n).fill(-1);
  for (let k = 0; k < n; k++) if (!known[k]) idx[k] = unknown.push(k) - 1;
  const m = unknown.length;
  const A = Array.from({ length: m }, () => new Float64Array(m + 1));
  for (let r = 0; r < m; r++) A[r][m] = inj[unknown[r]];
  for (const b of branches) {
    const g = 1 / b.resistanceOhm;
    // current from -> to: g (Vf - Vt - emf)
    for (const [p, q, sign] of [[b.from, b.to, 1], [b.to, b.from, -1]] as const) {
      const r = idx[p];
      if (r < 0) continue;
      A[r][r] += g;
      A[r][m] -= g * -sign * b.emfV; // leaving p: g(Vp − Vq − sign·emf) → move constants right
      if (idx[q] >= 0) A[r][idx[q]] -= g;
      else A[r][m] += g * V[q];
    }
  }
  for (let col = 0; col < m; col++) {
    let piv = col;
    for (let r = col + 1; r < m; r++) if (Math.abs(A[r][col]) > Math.abs(A[piv][col])) piv = r;
    [A[col], A[piv]] = [A[piv], A[col]];
    for (let r = 0; r < m; r++) {
      if (r === col) continue;
      const f = A[r][col] / A[col][col];
      if (f !== 0) for (let k = col; k <= m; k++) A[r][k] -= f * A[col][k];
    }
  }
  for (let r = 0; r < m; r++) V[unknown[r]] = A[r][m] / A[r][r];
  return { V, branches };
}

function current(b: Branch, V: Float64Array): number {
  return (V[b.from] - V[b.to] - b.emfV) / b.resistanceOhm;
}

/** Current leaving a node through its branches (optionally skipping one label). */
function leaving(node: number, branches: Branch[], V: Float64Array, skip?: string): number {
  let i = 0;
  for (const b of branches) {
    if (b.label === skip) continue;
    if (b.from === node) i += current(b, V);
    else if (b.to === node) i -= current(b, V);
  }
  return i;
}

export function referenceOscillation(c: Circuit, options: ReferenceOptions = {}): ReferenceResult {
  const topology = findTopology(c.topology)!;
  const amp = c.amplifier;
  // Everything at N charges with the capacitor: board stray and the amplifier's input capacitance in parallel.
  const strayAtN = (c.strays?.timingNodeF ?? 0) + (amp.inputCapacitanceF ?? 0);
  const C0 = c.parts[topology.capacitorRole];
  const C = C0 + strayAtN;
  // A C(v) capacitor (class II/III ceramic): C(v) = C·r(v); the same curve the engine uses, nothing else shared.
  const shape = c.capacitorShape;
  const span = c.supply.positiveV - c.supply.negativeV;
  const vHigh = c.supply.positiveV - amp.outputHeadroomHighV;
  const vLow = c.supply.negativeV + amp.outputHeadroomLowV;
  const openDrain = topology.needsOpenDrain;
  const diode = c.diode ?? DEFAULT_DIODE;
  const SR = amp.slewRateVPerS;
  const delay = amp.recoveryDelayS;
  const ilim = amp.outputCurrentLimitA;
  const tol = options.tolerance ?? 1e-12;
  let evals = 0;

  const init = options.initialState ?? 'high';
  const d: Discrete = {
    logic: init === 'high' ? 1 : 0,
    target: init === 'high' ? 1 : 0,
    stage: openDrain && init === 'high' ? 'released' : 'driven',
    clamp: 0,
    diodes: [false, false],
    rate: 0,
    pending: [],
  };
  let t = 0;
  // Capacitance at P (board + input) and at the pin: integration states of their own (y[3], y[4]).
  const CP = (c.strays?.thresholdNodeF ?? 0) + (amp.inputCapacitanceF ?? 0);
  const CO = c.strays?.outputNodeF ?? 0;
  const hasP = CP > 0;
  const hasO = CO > 0;
  /** The pin is held by a stiff driven output (no output resistance): it follows s. */
  const pinned = () => hasO && d.stage === 'driven' && !(amp.outputResistanceOhm > 0);
  const xOf = (get: (k: number) => number): ExtraStates => ({ p: hasP ? get(3) : undefined, o: hasO && !pinned() ? get(4) : undefined });
  let y = [0, init === 'high' ? vHigh : vLow, 0, 0, 0]; // v, s, ∫pin dt, P, pin
  {
    // Power-up: the timing capacitor empty, the strays at P and the pin where the network holds them then.
    const V0 = nodeVoltages(c, d, 0, y[1]).V;
    y[3] = V0[NODE.decision];
    y[4] = V0[NODE.output];
  }
  const X = () => xOf((k) => y[k]);

  const pinOf = (V: Float64Array) => V[NODE.output];
  /** Functions that must stay >= 0, with the action when one goes negative. */
  const guards = (v: number, s: number, x: ExtraStates = X()): { g: number; act: () => void }[] => {
    const { V, branches } = nodeVoltages(c, d, v, s, x);
    const P = V[NODE.decision];
    const N = V[NODE.capacitor];
    const out: { g: number; act: () => void }[] = [];
    // Internal hysteresis: the decision moves h/2 beyond P + offset in the direction of travel.
    out.push({ g: (d.logic ? 1 : -1) * (P + amp.inputOffsetV - N) + (amp.internalHysteresisV ?? 0) / 2, act: flip });
    if (c.topology === 'diode-steered') {
      // charge diode: output -> N; discharge diode: N -> output (forward drop, then resistance)
      const fc = V[NODE.output] - N - diode.forwardDropV;
      const fd = N - V[NODE.output] - diode.forwardDropV;
      out.push({ g: d.diodes[0] ? fc : -fc, act: () => (d.diodes[0] = !d.diodes[0]) });
      out.push({ g: d.diodes[1] ? fd : -fd, act: () => (d.diodes[1] = !d.diodes[1]) });
    }
    if (Number.isFinite(amp.differentialClampV)) {
      const vc = amp.differentialClampV;
      if (d.clamp === 0) {
        out.push({ g: vc - (P - N), act: () => (d.clamp = 1) });
        out.push({ g: vc + (P - N), act: () => (d.clamp = -1) });
      } else if (d.clamp === 1) out.push({ g: P - N - vc, act: () => (d.clamp = 0) });
      else out.push({ g: N - P - vc, act: () => (d.clamp = 0) });
    }
    if (Number.isFinite(ilim)) {
      const pin = pinOf(V);
      if (d.stage === 'driven') {
        // The stage's own current: through its output resistance (a capacitive pin takes its share of it),
        // or, a stiff stage holding a capacitive pin, the network's plus the pin capacitance's C·ds/dt.
        const rOutBranch = branches.find((b) => b.label === 'rOut');
        const iout = rOutBranch ? current(rOutBranch, V) : leaving(NODE.output, branches, V, 'rOut') + (hasO ? CO * d.rate : 0);
        if (!openDrain) out.push({ g: (ilim - iout) / ilim * span, act: () => (d.stage = 'limSrc') });
        out.push({ g: (ilim + iout) / ilim * span, act: () => (d.stage = 'limSnk') });
      } else if (d.stage === 'limSrc') out.push({ g: s - pin - ilim * amp.outputResistanceOhm, act: () => (d.stage = 'driven') });
      else if (d.stage === 'limSnk') out.push({ g: pin - ilim * amp.outputResistanceOhm - s, act: () => (d.stage = 'driven') });
    }
    return out;
  };

  let risingTimes: number[] = [];
  let risingV: number[] = [];
  let upperV = NaN;
  const targetMarks: { t: number; I: number; target: number; pinBefore: number }[] = [];

  /** Delay of this decision: recoveryDelayS plus the charge-control term √(2k/S) at the input slope S = |d(P − N)/dt|. */
  function delayNow(): number {
    const k = amp.overdriveDelayChargeVS ?? 0;
    if (!(k > 0)) return delay;
    const dec = NODE.decision;
    const base = nodeVoltages(c, d, y[0], y[1], X()).V[dec];
    const h = 1e-3;
    const pV = (nodeVoltages(c, d, y[0] + h, y[1], X()).V[dec] - base) / h;
    const pS = (nodeVoltages(c, d, y[0], y[1] + h, X()).V[dec] - base) / h;
    const f = rhs(t, y);
    const dv = f[0];
    // A capacitive P moves by its own equation.
    const slope = hasP ? Math.abs(f[3] - dv) : Math.abs(pV * dv + pS * d.rate - dv);
    return slope > 0 ? delay + Math.sqrt((2 * k) / slope) : delay;
  }
  function flip() {
    lastFlipSegment = segment;
    const thisDelay = delayNow();
    d.logic ^= 1;
    if (d.logic) {
      risingTimes.push(t);
      risingV.push(y[0]);
    } else upperV = y[0];
    if (thisDelay > 0) d.pending.push(t + thisDelay);
    else changeTarget();
  }
  function changeTarget() {
    const pinBefore = pinOf(nodeVoltages(c, d, y[0], y[1], X()).V);
    d.target ^= 1;
    targetMarks.push({ t, I: y[2], target: d.target, pinBefore });
    const level = d.target ? vHigh : vLow;
    if (openDrain) {
      if (d.target) {
        d.stage = 'released';
        d.rate = 0;
        return;
      }
      if (d.stage === 'released') {
        y[1] = pinOf(nodeVoltages(c, d, y[0], y[1], X()).V);
        d.stage = 'driven';
      }
    }
    if (!Number.isFinite(SR)) {
      y[1] = level;
      d.rate = 0;
    } else d.rate = level > y[1] ? SR : level < y[1] ? -SR : 0;
  }
  const resolve = () => {
    for (let k = 0; k < 40; k++) {
      if (pinned()) y[4] = y[1];
      const gs = guards(y[0], y[1]);
      let worst = -1e-9 * span;
      let pick: (() => void) | undefined;
      for (const q of gs) {
        if (q.g < worst) {
          worst = q.g;
          pick = q.act;
        }
      }
      if (!pick) return;
      pick();
    }
    throw new Error('reference: no consistent configuration');
  };

  const solver = new odex.Solver(5);
  solver.denseOutput = true;
  solver.relativeTolerance = tol;
  solver.absoluteTolerance = [tol * span, tol * span, tol * span * 1e-3, tol * span, tol * span];
  solver.maxSteps = 1e6;
  // A bounded step, so that two events inside one step (a sign change and back) are not stepped over.
  const rMin = Math.min(...Object.entries(c.parts).filter(([k]) => k !== topology.capacitorRole).map(([, x]) => x));
  solver.maxStepSize = (rMin * C) / 4;

  const rhs = (_x: number, yy: number[]): number[] => {
    evals++;
    const x = xOf((k) => yy[k]);
    const { V, branches } = nodeVoltages(c, d, yy[0], yy[1], x);
    const iCap = -leaving(NODE.capacitor, branches, V) - amp.inputBiasCurrentA;
    const iP = hasP ? -leaving(NODE.decision, branches, V) - amp.inputBiasCurrentA : 0;
    const limit = d.stage === 'limSrc' ? amp.outputCurrentLimitA : d.stage === 'limSnk' ? -amp.outputCurrentLimitA : 0;
    const dO = x.o !== undefined ? (-leaving(NODE.output, branches, V) + limit) / CO : pinned() ? d.rate : 0;
    return [iCap / (shape ? C0 * shape.ratio(yy[0]) + strayAtN : C), d.rate, pinOf(V), iP / CP || 0, dO];
  };

  const maxCycles = options.maxCycles ?? 300;
  // A grid per period is laid once the period is known (at the steady-state instant).
  const perPeriod = options.sample && 'perPeriod' in options.sample ? options.sample : undefined;
  const recording = options.sample && 'intervalS' in options.sample ? { ...options.sample } : perPeriod ? { intervalS: Number.NaN, count: perPeriod.perPeriod * perPeriod.periods } : undefined;
  let sampleStart = Number.NaN;
  let recorded = 0;
  const sampledCap = new Float64Array(recording?.count ?? 0);
  const sampledPin = new Float64Array(recording?.count ?? 0);
  let observer: { mid: number; rise: number; fall: number; prev: number; hi: number; lo: number; meanHi: number; meanLo: number } | undefined;
  const observe = (tt: number, pin: number) => {
    if (!observer) return;
    const g = pin - observer.mid;
    if (Number.isFinite(observer.prev)) {
      if (observer.prev < 0 && g >= 0 && Number.isNaN(observer.rise)) observer.rise = tt;
      if (observer.prev >= 0 && g < 0 && Number.isNaN(observer.fall)) observer.fall = tt;
    }
    observer.prev = g;
  };
  resolve();
  risingTimes = [];
  risingV = [];
  let converged = -1;
  // A latched circuit never decides again: stop after this many horizon-long segments without a decision
  // (each segment is at most 50 of the shortest time constants, far beyond any half period).
  let segment = 0;
  let lastFlipSegment = 0;
  for (let seg = 0; seg < maxCycles * 40; seg++) {
    segment = seg;
    if (seg - lastFlipSegment > LATCH_SEGMENTS) throw new Error(`reference: no decision for ${LATCH_SEGMENTS} segments: the circuit latches`);
    // next time event
    let tEnd = t + 50 * rMin * C;
    let timeEvent: 'horizon' | 'target' | 'slew' = 'horizon';
    if (d.pending.length && d.pending[0] < tEnd) {
      tEnd = d.pending[0];
      timeEvent = 'target';
    }
    if (d.rate !== 0) {
      const level = d.target ? vHigh : vLow;
      const ts = t + (level - y[1]) / d.rate;
      if (ts < tEnd) {
        tEnd = ts;
        timeEvent = 'slew';
      }
    }
    let hit: { tt: number; yy: number[]; k: number } | undefined;
    let prevG = guards(y[0], y[1]).map((q) => q.g);
    if (observer) observe(t, pinOf(nodeVoltages(c, d, y[0], y[1], X()).V));
    let endY = y;
    if (tEnd > t) {
      endY = solver.solve(rhs, t, y, tEnd, (nr, x0, x1, yy, dense) => {
        if (nr === 1 || x1 <= x0) return;
        const gs = guards(yy[0], yy[1], xOf((k) => yy[k])).map((q) => q.g);
        let first = -1;
        let firstT = Infinity;
        for (let k = 0; k < gs.length; k++) {
          if (prevG[k] >= -1e-9 * span && gs[k] < 0) {
            // bisection on the dense output
            let a = x0;
            let b = x1;
            for (let it = 0; it < 200 && b - a > 1e-15 * Math.abs(b); it++) {
              const mid = 0.5 * (a + b);
              const gm = guards(dense!(0, mid), dense!(1, mid), xOf((j) => dense!(j, mid)))[k].g;
              if (gm >= 0) a = mid;
              else b = mid;
            }
            if (b < firstT) {
              firstT = b;
              first = k;
            }
          }
        }
        if (observer) {
          // pin midpoint crossings inside the step (observers do not stop the integration)
          const pinAt = (x: number) => pinOf(nodeVoltages(c, d, dense!(0, x), dense!(1, x), xOf((j) => dense!(j, x))).V);
          const end = first >= 0 ? firstT : x1;
          const g0 = pinAt(x0) - observer.mid;
          const g1 = pinAt(end) - observer.mid;
          if (g0 < 0 !== g1 < 0) {
            let a = x0;
            let b = end;
            for (let it = 0; it < 200 && b - a > 1e-15 * Math.abs(b); it++) {
              const mid = 0.5 * (a + b);
              if ((pinAt(mid) - observer.mid < 0) === g0 < 0) a = mid;
              else b = mid;
            }
            observe(b, observer.mid + g1);
          }
        }
        if (recording && !Number.isNaN(sampleStart)) {
          // Grid instants inside this step (up to the event that ends it), from the dense output.
          const end = first >= 0 ? firstT : x1;
          while (recorded < recording.count) {
            const tk = sampleStart + recorded * recording.intervalS;
            if (tk > end) break;
            if (tk >= x0) {
              const vk = dense!(0, tk);
              sampledCap[recorded] = vk;
              sampledPin[recorded] = pinOf(nodeVoltages(c, d, vk, dense!(1, tk), xOf((j) => dense!(j, tk))).V);
            }
            recorded++;
          }
        }
        if (first >= 0) {
          hit = { tt: firstT, yy: [0, 1, 2, 3, 4].map((j) => dense!(j, firstT)), k: first };
          return false;
        }
        prevG = gs;
      }).y;
    }
    if (hit) {
      t = hit.tt;
      y = hit.yy;
      guards(y[0], y[1])[hit.k].act();
    } else {
      t = tEnd;
      y = endY.slice();
      if (timeEvent === 'target') {
        d.pending.shift();
        changeTarget();
      } else if (timeEvent === 'slew') {
        y[1] = d.target ? vHigh : vLow;
        d.rate = 0;
      }
    }
    resolve();
    if (observer) observe(t, pinOf(nodeVoltages(c, d, y[0], y[1], X()).V));
    const n = risingTimes.length;
    if (converged < 0 && n >= 3) {
      const p1 = risingTimes[n - 1] - risingTimes[n - 2];
      const p0 = risingTimes[n - 2] - risingTimes[n - 3];
      if (Math.abs(p1 / p0 - 1) < 1e-10 && Math.abs(risingV[n - 1] - risingV[n - 2]) < 1e-9 * span) {
        // levels from the last cycle's target intervals
        // one high and one low drive interval, from the cycle before the last (complete by now)
        const from = risingTimes[n - 3];
        const marks = targetMarks.filter((m) => m.t >= from - 1e-18).slice(0, 3);
        let hiI = 0, hiT = 0, loI = 0, loT = 0;
        let hiLevel = NaN;
        let loLevel = NaN;
        for (const mark of marks) {
          if (mark.target === 0) hiLevel = mark.pinBefore;
          else loLevel = mark.pinBefore;
        }
        for (let k = 0; k + 1 < marks.length; k++) {
          const dI = marks[k + 1].I - marks[k].I;
          const dT = marks[k + 1].t - marks[k].t;
          if (marks[k].target) {
            hiI += dI;
            hiT += dT;
          } else {
            loI += dI;
            loT += dT;
          }
        }
        converged = n;
        sampleStart = t;
        if (perPeriod) recording!.intervalS = p1 / perPeriod.perPeriod;
        observer = { mid: 0.5 * (hiLevel + loLevel), rise: NaN, fall: NaN, prev: NaN, hi: hiLevel, lo: loLevel, meanHi: hiI / hiT, meanLo: loI / loT };
      }
    }
    if (converged > 0 && risingTimes.length >= converged + 2 && observer && !Number.isNaN(observer.rise) && !Number.isNaN(observer.fall) && (!recording || recorded >= recording.count)) {
      const m = risingTimes.length;
      const periodS = risingTimes[m - 1] - risingTimes[m - 2];
      const high = ((((observer.fall - observer.rise) % periodS) + periodS) % periodS) / periodS;
      const o = observer;
      const result: ReferenceResult = { periodS, dutyCycle: high, upperV, lowerV: risingV[m - 1], highV: o.hi, lowV: o.lo, meanHighV: o.meanHi, meanLowV: o.meanLo, cycles: m, rhsEvaluations: evals };
      if (recording) result.samples = { capacitorV: sampledCap, outputV: sampledPin, intervalS: recording.intervalS };
      return result;
    }
  }
  throw new Error(`reference: no steady state; rising ${JSON.stringify(risingTimes.slice(-4))} v ${JSON.stringify(risingV.slice(-3))} t=${t} logic=${d.logic} target=${d.target} stage=${d.stage} pending=${d.pending.join(',')} rate=${d.rate}`);
}
