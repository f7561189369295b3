/**
 * Multi-state pieces beside a C(v) timing capacitor (docs/model.md, "strays and
 * leakage", "more than one capacitive node with a C(v) capacitor"): a class II/III
 * timing capacitor at N and a linear capacitance at P and/or the output pin. In a
 * piece the network is
 *
 *     diag(C_N·r(x_N), C_P, C_O)·dx/dt = Q·x + q0 + qS·s(t),      s(t) = s0 + r·t,
 *
 * the linear system of modal.ts with the timing node's capacitance following its
 * curve. It is not separable and its modes move with r(x_N), so it is solved as a
 * whole-interval spectral collocation, the vector form of the one-state slew piece
 * (parts/capacitor/chebyshev-piece.ts, the same Chebyshev basis and split step):
 *
 * - per sub-interval, the system with the capacitance frozen at its start, r_A, is
 *   decomposed into modes (modal.ts) and each mode's decay −λ_i·z_i is carried on the
 *   implicit side of the Picard step, P_i = (I + (λ_i·h/2)·M)⁻¹; the only explicit
 *   term is the curve's correction, a current i_N·(r_A/r(x_N) − 1) into N, so the
 *   iteration contracts with the change of C(v) over the sub-interval, not with λ·h;
 * - it starts from the frozen system's exact motion (the φ-function modes), and the
 *   fixed point is the collocation polynomial of degree 12 per state; a sub-interval
 *   is accepted when the last two Chebyshev coefficients of every state are below
 *   1e-13 of the supply span (else halved). Its first length is predicted from each
 *   mode's transient amplitude a (coefficients of e^(−κx) fall as (κ/4)^k/k!), so the
 *   fast RC of a stray is resolved at the piece's start and the sub-intervals grow as
 *   it decays;
 * - the answer is a polynomial per sub-interval and state, so every quantity affine in
 *   (s, x) is a Chebyshev series there. Its zeros are isolated exactly (up to rounding)
 *   by enclosure: |c0| > Σ|c_k| proves no zero, the same test on the derivative proves
 *   monotony (one zero at most); otherwise the series is re-expanded on two halves.
 *   Each monotone part's sign change is then a bracketed root solve — event-driven,
 *   no time stepping;
 * - a piece without a time event (the source at rest, T = ∞) that does not cross is
 *   proven never to cross by the network's energy E = Σ ∫ C_k(u)·(u − x∞_k) du, which
 *   never grows (dE/dt = −(x − x∞)ᵀ·G·(x − x∞), G symmetric positive semi-definite):
 *   |x_k − x∞_k| ≤ √(2E/C_k,min) bounds the quantity's distance from its limit.
 *
 * With a flat curve the frozen system is the exact one and the walk never comes here
 * (modal.ts solves it in closed form); the solved pieces are pooled, so the walk, the
 * figures and the samples that meet the same piece share one solve.
 */
import { CoreError } from '../../errors.ts';
import * as basis from '../../parts/capacitor/chebyshev-basis.ts';
import type { BiasShape } from '../../parts/capacitor/index.ts';
import { Kinematics } from './kinematics.ts';
import { solveBracket, type BracketProbe } from './root-solve.ts';
import { DynamicModel } from './modal.ts';
import { MAX_STATES, SLOT } from './modal-slots.ts';

// The basis read through module-local bindings: the hot loops below must not pay a live import binding's
// accessor per read (some loaders compile one to a getter call).
const N = basis.CHEBYSHEV_DEGREE;
const NODE_X = basis.NODE_X;
const antiderivative = basis.antiderivative;
const clenshaw = basis.clenshaw;
const coefficients = basis.coefficients;
const derivative = basis.derivative;

// The slots as module-local numbers (modal-slots.ts: modal.ts imports this module, so they live apart).
const STATES = MAX_STATES;
const N_SLOT = SLOT.N;
const O_SLOT = SLOT.O;

/** Coefficients per state and sub-interval (degree N), and of its antiderivative (degree N + 1). */
const NC = N + 1;
const NI = N + 2;
/** Sub-intervals one piece may take (a stray's transient, then the slow charge: a few dozen in practice). */
const MAX_SEGMENTS = 1024;
const MAX_TRIES = 60;
const MAX_PICARD = 60;
/** Converged when the node values change by less than this, relative to the voltage scale (as the one-state piece). */
const PICARD_TOLERANCE = 1e-14;
/** Accepted when the last two coefficients of every state are below this, relative to the voltage scale. */
const TAIL_TOLERANCE = 1e-13;
/** N! for the step prediction. */
const FACTORIAL_N = (() => {
  let f = 1;
  for (let k = 2; k <= N; k++) f *= k;
  return f;
})();
/** Largest predicted λ·h of a mode with no transient left. */
const KAPPA_MAX = 32;
/** Halvings of a sub-interval the zero isolation may take (2^−40 of it: below any event's resolution). */
const MAX_DEPTH = 40;
/** Monotone parts one sub-interval may be cut into (a safety bound; a degree-12 series has at most 12 zeros). */
const MAX_PARTS = 256;

/**
 * The implicit step of a mode, per level κ_q = 2^(k/8) ≤ λ·h (the rest of λ explicit, as the one-state
 * slew piece carries its frozen decay): built once per level and kept, so a sub-interval builds nothing.
 * Below 1/16 plain Picard (κ_q = 0); from EXPONENTIAL_STEP_KAPPA the exponential step.
 */
interface ModeStep {
  readonly kappa: number;
  readonly pm: Float64Array;
  readonly u: Float64Array;
}
const LEVELS_PER_OCTAVE = 8;
const PLAIN_LEVEL_KAPPA = 1 / 16;
const STEP_LEVELS = new Map<number, ModeStep>();
const PLAIN_STEP: ModeStep = { kappa: 0, pm: basis.INTEGRATE, u: new Float64Array(N + 1).fill(1) };
const STEP_SCRATCH = new Float64Array((N + 1) * (2 * N + 3));

function modeStep(kappa: number): ModeStep {
  if (!(kappa >= PLAIN_LEVEL_KAPPA)) return PLAIN_STEP;
  const level = Math.floor(LEVELS_PER_OCTAVE * Math.log2(kappa));
  let step = STEP_LEVELS.get(level);
  if (!step) {
    const kq = 2 ** (level / LEVELS_PER_OCTAVE);
    const pm = new Float64Array((N + 1) * (N + 1));
    const u = new Float64Array(N + 1);
    // A fast mode over a long sub-interval: solved exactly for the interpolated forcing (its transient decays).
    if (kq >= basis.EXPONENTIAL_STEP_KAPPA) basis.buildExponentialStep(kq, pm, u, STEP_SCRATCH);
    else basis.buildSplitStep(kq, pm, u, STEP_SCRATCH);
    step = { kappa: kq, pm, u };
    STEP_LEVELS.set(level, step);
  }
  return step;
}

/** A quantity of the piece: constant + perSourceV·s + Σ w[k]·x_k (modal.ts rows, the pinned pin's share moved to s). */
export interface CurvedRow {
  c: number;
  s: number;
  readonly w: Float64Array;
}

/** A Chebyshev series on one sub-interval as a bracket probe in the piece's own time. */
class SeriesProbe implements BracketProbe {
  readonly coef = new Float64Array(NC);
  readonly deriv = new Float64Array(NC);
  tA = 0;
  h = 1;
  value = 0;
  slope = 0;

  /** Target a series (coefficients c over the sub-interval [tA, tA + h]) and derive its derivative's. */
  set(c: Float64Array, tA: number, h: number): void {
    this.coef.set(c);
    derivative(this.coef, this.deriv);
    this.tA = tA;
    this.h = h;
  }

  local(t: number): number {
    const u = (2 * (t - this.tA)) / this.h - 1;
    return u < -1 ? -1 : u > 1 ? 1 : u;
  }

  at(t: number): number {
    return clenshaw(this.coef, N, this.local(t));
  }

  eval(t: number): void {
    const u = this.local(t);
    this.value = clenshaw(this.coef, N, u);
    this.slope = (clenshaw(this.deriv, N, u) * 2) / this.h;
  }
}

/** Re-expand a series on [−1, 1] over its part [a, b] (coefficients in the part's own variable). */
function restrict(c: Float64Array, a: number, b: number, out: Float64Array, nodes: Float64Array): void {
  for (let j = 0; j <= N; j++) nodes[j] = clenshaw(c, N, a + ((NODE_X[j] + 1) * (b - a)) / 2);
  coefficients(nodes, out);
}

/** |c0| > Σ|c_k|: the series keeps one sign (proven, to rounding). A series that is zero throughout counts too. */
function oneSigned(c: Float64Array): boolean {
  let rest = 0;
  for (let k = 1; k <= N; k++) rest += Math.abs(c[k]);
  const c0 = Math.abs(c[0]);
  return c0 > rest * (1 + 1e-12) || c0 + rest === 0;
}

export class CurvedModalPiece {
  /** ModalKinematics objects using this piece now (a pooled piece is only re-used when none is). */
  holders = 0;
  private dyn!: DynamicModel;
  private generation = -1;
  private curve!: BiasShape;
  private readonly x0 = new Float64Array(STATES);
  s0 = 0;
  r = 0;
  private scaleV = 1;
  private segments = 0;
  private capacity = 0;
  private segStart = new Float64Array(1);
  private segLen = new Float64Array(0);
  /** Per sub-interval m and state k: coefficients at (m·STATES + k)·NC, antiderivative at (m·STATES + k)·NI. */
  private cx = new Float64Array(0);
  private ci = new Float64Array(0);
  /** ∫ x_k dt from the piece start to the start of each sub-interval, at m·STATES + k. */
  private integralAtStart = new Float64Array(STATES);
  /** Equilibrium of the piece (the source at rest; NaN when a mode has no decay) and the curve's bounds for the energy argument. */
  private readonly xInf = new Float64Array(STATES);

  // Solve scratch.
  private readonly frozen = new DynamicModel();
  private readonly modes = [new Kinematics(), new Kinematics(), new Kinematics()];
  private readonly steps: ModeStep[] = [PLAIN_STEP, PLAIN_STEP, PLAIN_STEP];
  private readonly zNodes = new Float64Array(STATES * NC);
  private readonly xNodes = new Float64Array(STATES * NC);
  private readonly sNodes = new Float64Array(NC);
  private readonly dNodes = new Float64Array(NC);
  private readonly g = new Float64Array(NC);
  private readonly c = new Float64Array(NC);
  private readonly b = new Float64Array(NI);
  private readonly xA = new Float64Array(STATES);
  private readonly zA = new Float64Array(STATES);
  private readonly xEnd = new Float64Array(STATES);
  /** Tail (last two coefficients, largest over the states) of the last accepted sub-interval, V. */
  private lastTail = 0;

  // Zero-isolation scratch.
  private readonly series = new Float64Array(NC);
  private readonly levels = Array.from({ length: MAX_DEPTH + 1 }, () => new Float64Array(NC));
  private readonly levelDeriv = new Float64Array(NC);
  private readonly restrictNodes = new Float64Array(NC);
  private readonly parts = new Float64Array(MAX_PARTS + 2);
  private partCount = 0;
  private readonly probe = new SeriesProbe();

  holds(dyn: DynamicModel, x: ArrayLike<number>, s0: number, r: number): boolean {
    return this.dyn === dyn && this.generation === dyn.generation && this.s0 === s0 && this.r === r && this.x0[0] === x[0] && this.x0[1] === x[1] && this.x0[2] === x[2];
  }

  set(dyn: DynamicModel, x: ArrayLike<number>, s0: number, r: number): void {
    this.dyn = dyn;
    this.generation = dyn.generation;
    this.curve = dyn.curve;
    this.scaleV = Math.max(dyn.scaleV, 1e-300);
    for (let k = 0; k < STATES; k++) this.x0[k] = x[k];
    this.s0 = s0;
    this.r = r;
    this.segments = 0;
    this.segStart[0] = 0;
    this.integralAtStart.fill(0, 0, STATES);
    // The equilibrium does not depend on the capacitances: the modes at 0 V give it.
    this.xInf.fill(0);
    for (let i = 0; i < dyn.modeCount; i++) {
      const lambda = dyn.lambda[i];
      const zInf = lambda > 0 ? (dyn.f0[i] + dyn.fS[i] * s0) / lambda : Number.NaN;
      for (let k = 0; k < STATES; k++) if (dyn.active[k]) this.xInf[k] += dyn.T[k * STATES + i] * zInf;
    }
  }

  s(t: number): number {
    return this.s0 + this.r * t;
  }

  // ——— the solve ———

  private grow(): void {
    const cap = this.capacity === 0 ? 16 : this.capacity * 2;
    const segStart = new Float64Array(cap + 1);
    segStart.set(this.segStart.subarray(0, this.segments + 1));
    const segLen = new Float64Array(cap);
    segLen.set(this.segLen.subarray(0, this.segments));
    const cx = new Float64Array(cap * STATES * NC);
    cx.set(this.cx.subarray(0, this.segments * STATES * NC));
    const ci = new Float64Array(cap * STATES * NI);
    ci.set(this.ci.subarray(0, this.segments * STATES * NI));
    const integralAtStart = new Float64Array((cap + 1) * STATES);
    integralAtStart.set(this.integralAtStart.subarray(0, (this.segments + 1) * STATES));
    this.segStart = segStart;
    this.segLen = segLen;
    this.cx = cx;
    this.ci = ci;
    this.integralAtStart = integralAtStart;
    this.capacity = cap;
  }

  /** Solve sub-intervals until t is covered. */
  private cover(t: number): void {
    while (this.segStart[this.segments] < t) this.extend(t);
  }

  /** Solve the next sub-interval (wantT: the time the caller needs, for a piece without any decay). */
  private extend(wantT: number): void {
    if (this.segments === MAX_SEGMENTS) {
      throw new CoreError(
        'limit-exceeded',
        `the non-linear timing capacitor with the capacitance at P or at the output pin: one piece would need more than ${MAX_SEGMENTS} solution segments (their time constants are too far apart for this capacitor); use a linear (class I / film) capacitor or less stray capacitance`,
        '/parts/cTiming',
      );
    }
    if (this.segments === this.capacity) this.grow();
    this.solveSegment(this.segments, wantT);
    this.segments++;
  }

  /** The state at the start of sub-interval m into out. */
  private startState(m: number, out: Float64Array): void {
    if (m === 0) {
      out.set(this.x0);
      return;
    }
    const base = (m - 1) * STATES;
    for (let k = 0; k < STATES; k++) out[k] = this.dyn.active[k] ? clenshaw(this.cx, N, 1, (base + k) * NC) : 0;
  }

  private solveSegment(m: number, wantT: number): void {
    const dyn = this.dyn;
    const fz = this.frozen;
    const tA = this.segStart[m];
    const xA = this.xA;
    this.startState(m, xA);
    const sA = this.s0 + this.r * tA;
    // The system with the timing node's capacitance frozen at the start of the sub-interval, in modes.
    fz.copyEquations(dyn);
    const rA = this.curve.ratio(xA[N_SLOT]);
    fz.capF[N_SLOT] = dyn.capF[N_SLOT] * rA;
    if (!fz.decompose()) throw new CoreError('no-oscillation', 'The network has a capacitance that is not positive in a configuration of the walk');
    const n = fz.modeCount;
    const tailTol = TAIL_TOLERANCE * this.scaleV;
    // First length: each mode's transient a·e^(−λt) resolved to the tail tolerance, κ = 4·(tol·N!/a)^(1/N).
    let h = Infinity;
    for (let i = 0; i < n; i++) {
      let z = 0;
      for (let k = 0; k < STATES; k++) if (fz.active[k]) z += fz.Ti[i * STATES + k] * xA[k];
      this.zA[i] = z;
      const lambda = fz.lambda[i];
      const k0 = fz.f0[i] + fz.fS[i] * sA;
      const k1 = fz.fS[i] * this.r;
      this.modes[i].set(lambda, k0, k1, z, 0, 0);
      if (!(lambda > 0)) continue;
      // Transient part of the exact frozen motion: z − (k0 − k1/λ)/λ at the start.
      let weight = 0;
      for (let k = 0; k < STATES; k++) weight = Math.max(weight, Math.abs(fz.T[k * STATES + i]));
      const amplitude = Math.abs(z - (k0 - k1 / lambda) / lambda) * weight;
      const kappa = amplitude > 0 ? Math.min(KAPPA_MAX, 4 * ((tailTol * FACTORIAL_N) / amplitude) ** (1 / N)) : KAPPA_MAX;
      h = Math.min(h, kappa / lambda);
    }
    // Later sub-intervals: grown from the previous one by the tail it showed. The prediction above would count
    // the fast modes' quasi-static share of the slow motion as a transient (the frozen modes change with r_A from
    // one sub-interval to the next), and a tail at the rounding floor says nothing of h: far below the tolerance
    // the step doubles, near it the h^N law of a resolved series sets the growth.
    if (m > 0) h = this.segLen[m - 1] * growthFor(this.lastTail / tailTol);
    // No mode decays (no resistive path at all): one sub-interval to the time asked for.
    if (!Number.isFinite(h)) h = Math.max(wantT - tA, 1e-300);
    let accepted = false;
    for (let tries = 0; tries < MAX_TRIES && !accepted; tries++) {
      accepted = this.picard(h, sA, rA, tailTol);
      if (!accepted) h *= 0.5;
    }
    if (!accepted) {
      throw new CoreError('not-converged', 'The collocation of a piece with the non-linear timing capacitor and the capacitance at P or at the output pin did not converge', '/parts/cTiming');
    }
    this.segLen[m] = h;
    this.segStart[m + 1] = tA + h;
    const { b, c } = this;
    for (let k = 0; k < STATES; k++) {
      const base = (m * STATES + k) * NC;
      const baseI = (m * STATES + k) * NI;
      if (!dyn.active[k]) {
        this.cx.fill(0, base, base + NC);
        this.ci.fill(0, baseI, baseI + NI);
        this.integralAtStart[(m + 1) * STATES + k] = 0;
        continue;
      }
      for (let j = 0; j <= N; j++) c[j] = this.cx[base + j];
      antiderivative(c, b);
      for (let j = 0; j <= N + 1; j++) this.ci[baseI + j] = b[j];
      this.integralAtStart[(m + 1) * STATES + k] = this.integralAtStart[m * STATES + k] + 0.5 * h * clenshaw(b, N + 1, 1);
    }
  }

  /**
   * The split Picard iteration on one sub-interval of length h (start state in xA, modes of the frozen
   * system set up): each mode's decay on the implicit side, the curve's correction current explicit.
   * Leaves the states' coefficients in cx for sub-interval `segments`; true when converged and resolved.
   */
  private picard(h: number, sA: number, rA: number, tailTol: number): boolean {
    const dyn = this.dyn;
    const fz = this.frozen;
    const n = fz.modeCount;
    const { zNodes, xNodes, sNodes, dNodes, g, c } = this;
    const steps = this.steps;
    for (let i = 0; i < n; i++) steps[i] = modeStep(fz.lambda[i] * h);
    for (let j = 0; j <= N; j++) sNodes[j] = sA + (this.r * (NODE_X[j] + 1) * h) / 2;
    // Start: the frozen system's exact motion.
    for (let i = 0; i < n; i++) for (let j = 0; j <= N; j++) zNodes[i * NC + j] = this.modes[i].v(((NODE_X[j] + 1) * h) / 2);
    this.toStates(n);
    const q0 = dyn.q0[N_SLOT];
    const qS = dyn.qS[N_SLOT];
    const qN0 = dyn.active[0] ? dyn.Q[N_SLOT * STATES] : 0;
    const qN1 = dyn.active[1] ? dyn.Q[N_SLOT * STATES + 1] : 0;
    const qN2 = dyn.active[2] ? dyn.Q[N_SLOT * STATES + 2] : 0;
    const tol = PICARD_TOLERANCE * this.scaleV;
    const curve = this.curve;
    let converged = false;
    for (let it = 0; it < MAX_PICARD && !converged; it++) {
      // The curve's correction: the current into N that the frozen capacitance does not carry.
      for (let j = 0; j <= N; j++) {
        const xN = xNodes[j];
        const iN = q0 + qS * sNodes[j] + qN0 * xN + qN1 * xNodes[NC + j] + qN2 * xNodes[2 * NC + j];
        dNodes[j] = iN * (rA / curve.ratio(xN) - 1);
      }
      for (let i = 0; i < n; i++) {
        const wN = fz.T[N_SLOT * STATES + i];
        const f0 = fz.f0[i];
        const fS = fz.fS[i];
        const { pm, u, kappa } = steps[i];
        // The decay beyond the step's level stays explicit: (α_q − λ)·z with α_q = κ_q/h.
        const rest = kappa / h - fz.lambda[i];
        const base = i * NC;
        for (let j = 0; j <= N; j++) g[j] = f0 + fS * sNodes[j] + wN * dNodes[j] + rest * zNodes[base + j];
        const zAi = this.zA[i];
        for (let j = 0; j <= N; j++) {
          let s = 0;
          const row = j * NC;
          for (let l = 0; l <= N; l++) s += pm[row + l] * g[l];
          zNodes[base + j] = zAi * u[j] + 0.5 * h * s;
        }
      }
      converged = this.toStates(n) <= tol;
    }
    if (!converged) return false;
    const m = this.segments;
    let worst = 0;
    for (let k = 0; k < STATES; k++) {
      if (!dyn.active[k]) continue;
      coefficients(xNodes.subarray(k * NC, (k + 1) * NC), c);
      const tail = Math.abs(c[N]) + Math.abs(c[N - 1]);
      if (!(tail <= tailTol)) return false;
      if (tail > worst) worst = tail;
      this.cx.set(c, (m * STATES + k) * NC);
    }
    this.lastTail = worst;
    return true;
  }

  /** Node values of the states from the modes' (x = T·z); returns the largest change. */
  private toStates(n: number): number {
    const fz = this.frozen;
    const { zNodes, xNodes } = this;
    let change = 0;
    for (let k = 0; k < STATES; k++) {
      if (!fz.active[k]) continue;
      for (let j = 0; j <= N; j++) {
        let x = 0;
        for (let i = 0; i < n; i++) x += fz.T[k * STATES + i] * zNodes[i * NC + j];
        const d = Math.abs(x - xNodes[k * NC + j]);
        if (!(d <= change)) change = d; // NaN propagates as "not converged"
        xNodes[k * NC + j] = x;
      }
    }
    return change;
  }

  // ——— dense evaluation ———

  private locM = 0;
  private locU = 0;
  /** Sub-interval and local coordinate of t (t ≥ 0). */
  private locate(t: number): void {
    this.cover(t);
    let lo = 0;
    let hi = this.segments - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (this.segStart[mid] <= t) lo = mid;
      else hi = mid - 1;
    }
    const u = (2 * (t - this.segStart[lo])) / this.segLen[lo] - 1;
    this.locM = lo;
    this.locU = u < -1 ? -1 : u > 1 ? 1 : u;
  }

  /** The node voltages of the state slots at t into out (x_O = s while the stiff output holds the pin). */
  state(t: number, out: Float64Array | number[]): void {
    const dyn = this.dyn;
    if (t <= 0) {
      for (let k = 0; k < STATES; k++) out[k] = dyn.active[k] ? this.x0[k] : k === O_SLOT && dyn.oPinned ? this.s0 : 0;
      return;
    }
    this.locate(t);
    const base = this.locM * STATES;
    for (let k = 0; k < STATES; k++) {
      if (dyn.active[k]) out[k] = clenshaw(this.cx, N, this.locU, (base + k) * NC);
      else out[k] = k === O_SLOT && dyn.oPinned ? this.s(t) : 0;
    }
  }

  /** ∫₀ᵗ x_slot dt. */
  integralState(slot: number, t: number): number {
    const dyn = this.dyn;
    if (!dyn.active[slot]) return slot === O_SLOT && dyn.oPinned ? this.s0 * t + 0.5 * this.r * t * t : 0;
    if (t <= 0) return 0;
    this.locate(t);
    const m = this.locM;
    return this.integralAtStart[m * STATES + slot] + 0.5 * this.segLen[m] * clenshaw(this.ci, N + 1, this.locU, (m * STATES + slot) * NI);
  }

  rowAt(row: CurvedRow, t: number): number {
    const x = this.xEnd;
    this.state(t, x);
    return row.c + row.s * this.s(t) + row.w[0] * x[0] + row.w[1] * x[1] + row.w[2] * x[2];
  }

  /** ∫₀ᵗ of a row. */
  rowIntegral(row: CurvedRow, t: number): number {
    let g = row.c * t + row.s * (this.s0 * t + 0.5 * this.r * t * t);
    for (let k = 0; k < STATES; k++) if (row.w[k] !== 0 && this.dyn.active[k]) g += row.w[k] * this.integralState(k, t);
    return g;
  }

  /** The row as a Chebyshev series over sub-interval m (into this.series). */
  private rowSeries(row: CurvedRow, m: number): void {
    const out = this.series;
    out.fill(0);
    for (let k = 0; k < STATES; k++) {
      const w = row.w[k];
      if (w === 0 || !this.dyn.active[k]) continue;
      const base = (m * STATES + k) * NC;
      for (let j = 0; j <= N; j++) out[j] += w * this.cx[base + j];
    }
    const h = this.segLen[m];
    out[0] += row.c + row.s * (this.s0 + this.r * (this.segStart[m] + 0.5 * h));
    out[1] += row.s * this.r * 0.5 * h;
  }

  /**
   * Cut [−1, uEnd] of the series in `level0` into parts on each of which it keeps one sign or is
   * monotone (so it changes sign at most once there): their ends, local coordinates, into parts.
   */
  private partition(uEnd: number): void {
    const top = this.levels[0];
    if (uEnd < 1) {
      restrict(this.series, -1, uEnd, top, this.restrictNodes);
    } else {
      top.set(this.series);
    }
    this.partCount = 0;
    this.parts[this.partCount++] = -1;
    this.split(0, -1, uEnd);
    this.parts[this.partCount++] = uEnd;
  }

  private split(depth: number, a: number, b: number): void {
    const c = this.levels[depth];
    if (oneSigned(c)) return;
    derivative(c, this.levelDeriv);
    if (oneSigned(this.levelDeriv)) return;
    if (depth === MAX_DEPTH || this.partCount >= MAX_PARTS) return;
    const next = this.levels[depth + 1];
    const mid = 0.5 * (a + b);
    restrict(c, -1, 0, next, this.restrictNodes);
    this.split(depth + 1, a, mid);
    this.parts[this.partCount++] = mid;
    restrict(c, 0, 1, next, this.restrictNodes);
    this.split(depth + 1, mid, b);
  }

  /**
   * Sign changes of the row in (0, T] (T finite): times and directions (+1 rising, −1 falling).
   * With `firstExitTolerance` ≥ 0 instead: the first time the row leaves g ≥ 0 (firstExit's rule for a
   * start just outside), returned as outT[0] with count 1, or count 0 when it does not within T.
   */
  private scan(row: CurvedRow, T: number, outT: Float64Array | undefined, outDir: Int8Array | undefined, max: number, exitMode: boolean): number {
    let count = 0;
    let ga = this.rowAt(row, 0);
    const probe = this.probe;
    for (let m = 0; ; m++) {
      if (m >= this.segments) this.extend(T);
      const tA = this.segStart[m];
      const h = this.segLen[m];
      const tB = tA + h;
      const uEnd = tB <= T ? 1 : Math.max(-1, Math.min(1, (2 * (T - tA)) / h - 1));
      this.rowSeries(row, m);
      probe.set(this.series, tA, h);
      this.partition(uEnd);
      for (let p = 1; p < this.partCount; p++) {
        const tb = p === this.partCount - 1 && uEnd < 1 ? T : tA + ((this.parts[p] + 1) * h) / 2;
        const gb = probe.at(tb);
        const ta = tA + ((this.parts[p - 1] + 1) * h) / 2;
        if (exitMode) {
          if (ga < 0) {
            // Only the start can be (just) outside: leaving means moving outward from it.
            if (gb < ga) {
              outT![0] = 0;
              return 1;
            }
          } else if (gb < 0) {
            outT![0] = solveBracket(probe, ta, tb, ga, gb);
            return 1;
          }
        } else if (ga < 0 !== gb < 0 && count < max) {
          // Oriented non-negative at lo for the solver.
          if (ga >= 0) {
            outT![count] = solveBracket(probe, ta, tb, ga, gb);
            outDir![count++] = -1;
          } else {
            flipSeries(probe);
            outT![count] = solveBracket(probe, ta, tb, -ga, -gb);
            flipSeries(probe);
            outDir![count++] = 1;
          }
        }
        ga = gb;
      }
      if (tB >= T) break;
      if (exitMode && T === Infinity && this.provenInside(row)) break;
    }
    return count;
  }

  /**
   * With the source at rest and every mode decaying: whether the row provably never goes below zero
   * after the last solved sub-interval (the energy bound; docs/model.md). False when it cannot tell yet.
   */
  private provenInside(row: CurvedRow): boolean {
    if (this.r !== 0) return false;
    const dyn = this.dyn;
    const xInf = this.xInf;
    let gInf = row.c + row.s * this.s0;
    for (let k = 0; k < STATES; k++) if (dyn.active[k]) gInf += row.w[k] * xInf[k];
    if (!(gInf > 0)) return false;
    const x = this.xEnd;
    this.startState(this.segments, x);
    // The timing node's capacitance over every voltage it can reach: |u| ≤ R (checked below).
    const devN = Math.abs(x[N_SLOT] - xInf[N_SLOT]);
    const reach = Math.abs(xInf[N_SLOT]) + 4 * (this.scaleV + devN);
    const { min, max } = curveBounds(this.curve, reach);
    let energy = 0;
    for (let k = 0; k < STATES; k++) {
      if (!dyn.active[k]) continue;
      const ck = k === N_SLOT ? dyn.capF[k] * max : dyn.capF[k];
      const d = x[k] - xInf[k];
      energy += 0.5 * ck * d * d;
    }
    // The reach assumed for the curve must hold the motion the energy allows.
    const capNMin = dyn.capF[N_SLOT] * min;
    if (!(Math.sqrt((2 * energy) / capNMin) <= reach - Math.abs(xInf[N_SLOT]))) return false;
    let bound = 0;
    for (let k = 0; k < STATES; k++) {
      if (!dyn.active[k] || row.w[k] === 0) continue;
      const ck = k === N_SLOT ? capNMin : dyn.capF[k];
      bound += Math.abs(row.w[k]) * Math.sqrt((2 * energy) / ck);
    }
    return bound < gInf;
  }

  /** First time in [0, T] at which the row leaves g ≥ 0 (Infinity when it does not); as ModalKinematics.firstExit. */
  rowExit(row: CurvedRow, T: number, tolerance: number): number {
    if (this.rowAt(row, 0) < -tolerance) return 0;
    const out = EXIT_SCRATCH;
    return this.scan(row, T, out, undefined, 1, true) > 0 ? out[0] : Infinity;
  }

  /** Crossings of the row through zero in (0, T]: times and directions; returns the count. */
  rowCrossings(row: CurvedRow, T: number, outT: Float64Array, outDir: Int8Array, max: number): number {
    return this.scan(row, T, outT, outDir, max, false);
  }

  /** Minimum and maximum of the row over [0, T] into out. */
  rowRange(row: CurvedRow, T: number, out: Float64Array): void {
    let lo = Math.min(this.rowAt(row, 0), this.rowAt(row, T));
    let hi = Math.max(lo, this.rowAt(row, 0), this.rowAt(row, T));
    this.cover(T);
    const probe = this.probe;
    for (let m = 0; m < this.segments && this.segStart[m] < T; m++) {
      const tA = this.segStart[m];
      const h = this.segLen[m];
      const uEnd = tA + h <= T ? 1 : Math.max(-1, Math.min(1, (2 * (T - tA)) / h - 1));
      this.rowSeries(row, m);
      const g = this.g;
      g.set(this.series);
      // Critical points: sign changes of the derivative's series.
      derivative(g, this.series);
      probe.set(this.series, tA, h);
      this.partition(uEnd);
      let da = probe.at(tA);
      for (let p = 1; p < this.partCount; p++) {
        const tb = tA + ((this.parts[p] + 1) * h) / 2;
        const db = probe.at(tb);
        if (da < 0 !== db < 0) {
          const ta = tA + ((this.parts[p - 1] + 1) * h) / 2;
          let t: number;
          if (da >= 0) t = solveBracket(probe, ta, tb, da, db);
          else {
            flipSeries(probe);
            t = solveBracket(probe, ta, tb, -da, -db);
            flipSeries(probe);
          }
          const v = clenshaw(g, N, probe.local(t));
          lo = Math.min(lo, v);
          hi = Math.max(hi, v);
        }
        da = db;
      }
    }
    out[0] = lo;
    out[1] = hi;
  }
}

const EXIT_SCRATCH = new Float64Array(1);

/** Length of the next sub-interval per unit of the last, from the last one's tail per unit of the tolerance. */
function growthFor(tailRatio: number): number {
  if (tailRatio < 0.05) return 2;
  return Math.min(2, Math.max(0.5, 0.8 * tailRatio ** (-1 / N)));
}

function flipSeries(probe: SeriesProbe): void {
  for (let k = 0; k <= N; k++) {
    probe.coef[k] = -probe.coef[k];
    probe.deriv[k] = -probe.deriv[k];
  }
}

/** Least and largest C(v)/C(0) over |v| ≤ reach: at 0, at the curve's knees or at the reach (piecewise linear or monotone in |v|). */
function curveBounds(curve: BiasShape, reach: number): { min: number; max: number } {
  let min = Math.min(curve.ratio(0), curve.ratio(reach));
  let max = Math.max(curve.ratio(0), curve.ratio(reach));
  for (const knee of curve.kneesV) {
    if (!(knee < reach)) continue;
    const r = curve.ratio(knee);
    min = Math.min(min, r);
    max = Math.max(max, r);
  }
  return { min, max };
}

/** Solved pieces, shared by every walk, evaluator and figure pass of the thread (evaluations are synchronous). */
const POOL: CurvedModalPiece[] = [];
const POOL_SIZE = 8;
let poolNext = 0;

/** The solved piece for these inputs (solved lazily as it is read), held until released. */
export function acquireCurvedPiece(dyn: DynamicModel, x: ArrayLike<number>, s0: number, r: number): CurvedModalPiece {
  for (const piece of POOL) {
    if (piece.holds(dyn, x, s0, r)) {
      piece.holders++;
      return piece;
    }
  }
  let piece: CurvedModalPiece | undefined;
  if (POOL.length >= POOL_SIZE) {
    // Full: the next piece nobody holds (round robin), else one more.
    for (let k = 0; k < POOL.length && !piece; k++) {
      const candidate = POOL[(poolNext + k) % POOL.length];
      if (candidate.holders === 0) {
        piece = candidate;
        poolNext = (poolNext + k + 1) % POOL.length;
      }
    }
  }
  if (!piece) {
    piece = new CurvedModalPiece();
    POOL.push(piece);
  }
  piece.set(dyn, x, s0, r);
  piece.holders++;
  return piece;
}

export function releaseCurvedPiece(piece: CurvedModalPiece): void {
  piece.holders--;
}
