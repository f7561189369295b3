/**
 * Pieces with more than one capacitive node (docs/model.md, "strays and
 * leakage"): a capacitance at the threshold node P or at the output pin gives
 * that node a state of its own beside the timing node N. Inside a piece the
 * network is then the linear system
 *
 *     C·dx/dt = −G·x + b0 + bS·s(t),      s(t) = s0 + r·t,
 *
 * x the node voltages of the capacitive nodes (slots N, P, O), C diagonal and
 * positive, G symmetric positive semi-definite (a resistive network seen from
 * its capacitive nodes: reciprocal). With y = C^½·x the matrix C^−½·G·C^−½ is
 * symmetric; its eigen-decomposition (Jacobi rotations) turns the system into
 * independent modes z' = −λ·z + f0 + fS·s(t), each exactly the one-capacitor
 * motion of kinematics.ts (the same φ-function closed form). Every quantity
 * affine in the node voltages is then a constant plus a ramp plus a sum of
 * exponentials, g(t) = α + β·t + Σ δi·e^(−λi·t): its second derivative is a
 * pure exponential sum, whose sign changes are isolated exactly (Descartes'
 * rule for exponential sums: divide by the slowest term and differentiate,
 * recursively), so g' and g are split into monotone parts and every event is a
 * bracketed root solve — still event-driven, no time stepping.
 *
 * A one-capacitor circuit never comes here: its pieces are the n = 1 case of
 * this decomposition (λ = a), which kinematics.ts and root-solve.ts solve in
 * closed form (the compiled fast path); the convergence of the two is tested.
 */
import { FLAT_SHAPE, type BiasShape } from '../../parts/capacitor/index.ts';
import { Kinematics } from './kinematics.ts';
import { solveBracket, type BracketProbe } from './root-solve.ts';
import { acquireCurvedPiece, releaseCurvedPiece, type CurvedModalPiece, type CurvedRow } from './modal-curved.ts';
import { MAX_STATES, SLOT } from './modal-slots.ts';

/** State slots of the capacitive nodes (modal-slots.ts), for the engine's other modules. */
export { MAX_STATES, SLOT } from './modal-slots.ts';

/**
 * An affine quantity of a dynamic piece: [constant, per volt of s, per volt of x_N, x_P, x_O].
 * The one-capacitor triplet (c0, cv, cs) is the row [c0, cs, cv, 0, 0].
 */
export const ROW = 5;
export const R_C = 0;
export const R_S = 1;
export const R_X = 2;

/** Rows a dynamic configuration carries: P, O, the threshold h, output and rail current, diodes, events. */
export const QUANTITY = { p: 0, o: 1, h: 2, i: 3, rail: 4, diode0: 5, event0: 7 } as const;
const MAX_EVENT_ROWS = 8;
export const QUANTITY_COUNT = QUANTITY.event0 + MAX_EVENT_ROWS;

let generations = 0;
// decompose()'s scratch (small, fixed: the walk's hot path allocates nothing).
const DECOMPOSE_SLOTS = new Int8Array(MAX_STATES);
const DECOMPOSE_A = new Float64Array(MAX_STATES * MAX_STATES);
const DECOMPOSE_D = new Float64Array(MAX_STATES);
const DECOMPOSE_U = new Float64Array(MAX_STATES * MAX_STATES);
const DECOMPOSE_LAMBDA = new Float64Array(MAX_STATES);

/** One configuration's dynamic model: the state equations, their modes and the affine rows. */
export class DynamicModel {
  /** Which slots are states in this configuration (N always; O not while a stiff output drives the pin). */
  readonly active = new Uint8Array(MAX_STATES);
  /** The pin is the stiff source itself in this configuration (x_O follows s). */
  oPinned = false;
  /** The pin's capacitance while pinned, F: the source charges it directly (Co·ds/dt, not in any branch). */
  pinnedCapF = 0;
  /** Capacitance per slot, F (at N: at 0 V, the whole node's C(v) being capF[N]·curve.ratio(v)). */
  readonly capF = new Float64Array(MAX_STATES);
  /**
   * C(v)/C(0) of the timing node (FLAT_SHAPE: a linear capacitor). Not flat: the pieces are the
   * multi-state C(v) pieces of modal-curved.ts; the modes below are then those at 0 V.
   */
  curve: BiasShape = FLAT_SHAPE;
  /** Changes with every decomposition: (object, generation) names the equations exactly. */
  generation = 0;
  /** The voltage scale of the circuit (its supply span), V: the C(v) pieces' tolerances. */
  scaleV = 1;
  /** Current into each slot's capacitor: q0 + Σ Q[k][j]·x_j + qS·s (G = −Q), A. */
  readonly q0 = new Float64Array(MAX_STATES);
  readonly qS = new Float64Array(MAX_STATES);
  readonly Q = new Float64Array(MAX_STATES * MAX_STATES);
  /** Modes: rates λ (1/s), x_slot = Σ_i T[slot][i]·z_i, z_i = Σ_slot Ti[i][slot]·x_slot, forcing z' = −λz + f0 + fS·s. */
  modeCount = 0;
  readonly lambda = new Float64Array(MAX_STATES);
  readonly T = new Float64Array(MAX_STATES * MAX_STATES);
  readonly Ti = new Float64Array(MAX_STATES * MAX_STATES);
  readonly f0 = new Float64Array(MAX_STATES);
  readonly fS = new Float64Array(MAX_STATES);
  readonly rows = new Float64Array(QUANTITY_COUNT * ROW);
  /** One view per quantity, made once (a view per call would allocate on the walk's hot path). */
  private readonly views: Float64Array[] = Array.from({ length: QUANTITY_COUNT }, (_, q) => this.rows.subarray(q * ROW, q * ROW + ROW));

  row(q: number): Float64Array {
    return this.views[q];
  }

  /**
   * The modes from C, Q (call once the currents are filled). False when a
   * capacitance is not positive and finite (then the configuration cannot be solved).
   */
  decompose(): boolean {
    this.generation = ++generations;
    const slots = DECOMPOSE_SLOTS;
    let n = 0;
    for (let k = 0; k < MAX_STATES; k++) if (this.active[k]) slots[n++] = k;
    this.modeCount = n;
    const A = DECOMPOSE_A;
    const d = DECOMPOSE_D;
    for (let a = 0; a < n; a++) {
      const c = this.capF[slots[a]];
      if (!(c > 0) || c === Infinity) return false;
      d[a] = 1 / Math.sqrt(c);
    }
    for (let a = 0; a < n; a++) {
      for (let b = 0; b < n; b++) {
        // G = −Q is symmetric for a reciprocal network; average the two rounding-level different halves.
        const g = -0.5 * (this.Q[slots[a] * MAX_STATES + slots[b]] + this.Q[slots[b] * MAX_STATES + slots[a]]);
        const e = d[a] * g * d[b];
        if (!Number.isFinite(e)) return false;
        A[a * n + b] = e;
      }
    }
    const U = DECOMPOSE_U;
    const lam = DECOMPOSE_LAMBDA;
    jacobiEigen(A, n, lam, U);
    this.T.fill(0);
    this.Ti.fill(0);
    for (let i = 0; i < n; i++) {
      this.lambda[i] = Math.max(0, lam[i]); // PSD: a negative eigenvalue is rounding
      let f0 = 0;
      let fS = 0;
      for (let a = 0; a < n; a++) {
        const slot = slots[a];
        const u = U[a * n + i];
        this.T[slot * MAX_STATES + i] = d[a] * u;
        this.Ti[i * MAX_STATES + slot] = u / d[a];
        f0 += u * d[a] * this.q0[slot];
        fS += u * d[a] * this.qS[slot];
      }
      this.f0[i] = f0;
      this.fS[i] = fS;
    }
    return true;
  }

  /** Copy another configuration's state equations (not its rows), to decompose them with other capacitances. */
  copyEquations(from: DynamicModel): void {
    this.active.set(from.active);
    this.oPinned = from.oPinned;
    this.pinnedCapF = from.pinnedCapF;
    this.capF.set(from.capF);
    this.q0.set(from.q0);
    this.qS.set(from.qS);
    this.Q.set(from.Q);
    this.curve = from.curve;
  }

  /** d/dt of a row's quantity at a state (the ODE itself), for a piece whose source moves at `rate`. */
  rowRate(row: ArrayLike<number>, x: ArrayLike<number>, s: number, rate: number): number {
    let g = row[R_S] * rate;
    for (let k = 0; k < MAX_STATES; k++) {
      if (!this.active[k] || row[R_X + k] === 0) continue;
      let i = this.q0[k] + this.qS[k] * s;
      for (let j = 0; j < MAX_STATES; j++) if (this.active[j]) i += this.Q[k * MAX_STATES + j] * x[j];
      g += (row[R_X + k] * i) / (k === SLOT.N ? this.capF[k] * this.curve.ratio(x[k]) : this.capF[k]);
    }
    if (this.oPinned) g += row[R_X + SLOT.O] * rate;
    return g;
  }
}

/** A row's value at a state. */
export function rowAt(row: ArrayLike<number>, x: ArrayLike<number>, s: number): number {
  return row[R_C] + row[R_S] * s + row[R_X] * x[0] + row[R_X + 1] * x[1] + row[R_X + 2] * x[2];
}

/** Eigen-decomposition of a small symmetric matrix by cyclic Jacobi rotations: A = U·diag(lam)·Uᵀ (A is destroyed). */
export function jacobiEigen(A: Float64Array, n: number, lam: Float64Array, U: Float64Array): void {
  U.fill(0);
  for (let i = 0; i < n; i++) U[i * n + i] = 1;
  for (let sweep = 0; sweep < 50; sweep++) {
    let off = 0;
    let diag = 0;
    for (let p = 0; p < n; p++) {
      diag += A[p * n + p] * A[p * n + p];
      for (let q = p + 1; q < n; q++) off += A[p * n + q] * A[p * n + q];
    }
    if (!(off > 1e-34 * diag)) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = A[p * n + q];
        if (apq === 0) continue;
        const theta = (A[q * n + q] - A[p * n + p]) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = A[k * n + p];
          const akq = A[k * n + q];
          A[k * n + p] = c * akp - s * akq;
          A[k * n + q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = A[p * n + k];
          const aqk = A[q * n + k];
          A[p * n + k] = c * apk - s * aqk;
          A[q * n + k] = s * apk + c * aqk;
        }
        for (let k = 0; k < n; k++) {
          const ukp = U[k * n + p];
          const ukq = U[k * n + q];
          U[k * n + p] = c * ukp - s * ukq;
          U[k * n + q] = s * ukp + c * ukq;
        }
      }
    }
  }
  for (let i = 0; i < n; i++) lam[i] = A[i * n + i];
}

/** Relative bracket width of the isolation steps (the event times themselves go through solveBracket). */
const ISOLATION_TOLERANCE = 1e-15;

/**
 * Sign changes of E(t) = Σ coef_k·e^(−rate_k·t) in (0, T) (T may be Infinity), at most three terms
 * sorted by rate, ascending, rates distinct, coefficients non-zero; sorted times into out, returns the
 * count. Divided by the slowest term, E keeps its sign and its derivative has one term fewer, whose
 * sign changes split (0, T) into parts where E/e^(−rate_0·t) is monotone: at most one sign change
 * each (Descartes' rule for exponential sums; no sign change in the coefficients, no zero). Two terms
 * have their zero in closed form; three, one closed-form split and bracketed solves. Allocation-free.
 */
function expSumZeros(c: Float64Array, r: Float64Array, n: number, T: number, out: Float64Array): number {
  if (n <= 1) return 0;
  let changes = 0;
  for (let k = 1; k < n; k++) if (c[k] < 0 !== c[k - 1] < 0) changes++;
  if (changes === 0) return 0;
  if (n === 2) {
    // c0 + c1·e^(−d·t) = 0  ⇔  t = ln(−c1/c0)/d.
    const t = Math.log(-c[1] / c[0]) / (r[1] - r[0]);
    if (t > 0 && t < T) {
      out[0] = t;
      return 1;
    }
    return 0;
  }
  // Three terms: H = c0 + c1·e^(−d1·t) + c2·e^(−d2·t); H' = 0 at one closed-form instant at most.
  const d1 = r[1] - r[0];
  const d2 = r[2] - r[0];
  let split = Math.log((-c[2] * d2) / (c[1] * d1)) / (d2 - d1);
  if (!(split > 0 && split < T)) split = Number.NaN;
  let count = 0;
  let a = 0;
  let ha = c[0] + c[1] + c[2];
  for (let j = 0; j < 2; j++) {
    let b = j === 0 && !Number.isNaN(split) ? split : T;
    let hb = b === Infinity ? c[0] : expSum3(c, d1, d2, b);
    if (b === Infinity && ha < 0 !== hb < 0) {
      // A finite far end with the limit's sign.
      b = a + 1 / d1;
      for (let k = 0; k < 2000 && expSum3(c, d1, d2, b) < 0 === ha < 0; k++) b = a + (b - a) * 2;
      hb = expSum3(c, d1, d2, b);
    }
    if (ha < 0 !== hb < 0) {
      const t = expSum3Root(c, d1, d2, a, b, ha < 0);
      if (t > 0 && t < T) out[count++] = t;
    }
    if (Number.isNaN(split) || j === 1) break;
    a = b;
    ha = hb;
  }
  return count;
}

function expSum3(c: Float64Array, d1: number, d2: number, t: number): number {
  return c[0] + c[1] * Math.exp(-d1 * t) + c[2] * Math.exp(-d2 * t);
}

/** The sign change of a monotone three-term sum in [lo, hi]: Newton steps kept inside a shrinking bracket. */
function expSum3Root(c: Float64Array, d1: number, d2: number, lo: number, hi: number, negativeAtLo: boolean): number {
  let x = 0.5 * (lo + hi);
  for (let it = 0; it < 200 && hi - lo > ISOLATION_TOLERANCE * hi; it++) {
    const e1 = c[1] * Math.exp(-d1 * x);
    const e2 = c[2] * Math.exp(-d2 * x);
    const h = c[0] + e1 + e2;
    if (h === 0) return x;
    if (h < 0 === negativeAtLo) lo = x;
    else hi = x;
    const next = x - h / (-d1 * e1 - d2 * e2);
    // Newton converged (its step below the tolerance): done; else keep it only inside the bracket.
    if (Math.abs(next - x) <= ISOLATION_TOLERANCE * Math.abs(x)) return next;
    x = next > lo && next < hi ? next : 0.5 * (lo + hi);
  }
  return 0.5 * (lo + hi);
}

/**
 * A piece of a dynamic configuration: the modes set to the piece's start state and source motion;
 * values, derivatives, integrals and events of any row.
 */
export class ModalKinematics implements BracketProbe {
  dyn!: DynamicModel;
  readonly modes: Kinematics[] = [new Kinematics(), new Kinematics(), new Kinematics()];
  s0 = 0;
  r = 0;
  private readonly w = new Float64Array(MAX_STATES);
  private rowC = 0;
  private rowS = 0;
  private order = 0;
  value = 0;
  slope = 0;
  private readonly crit: number[] = [];
  private readonly termC = new Float64Array(MAX_STATES);
  private readonly termR = new Float64Array(MAX_STATES);
  private readonly z2 = new Float64Array(MAX_STATES);
  private readonly split: number[] = [];
  private readonly zeros: number[] = [];
  /** Direction of each zero zerosBetween found (+1 rising through zero, −1 falling). */
  private readonly zeroDir: number[] = [];

  /**
   * A piece beside a C(v) timing capacitor (dyn.curve not flat): the collocation piece of
   * modal-curved.ts answers every method below; undefined for the closed form.
   */
  private curved: CurvedModalPiece | undefined;
  private readonly curvedRow: CurvedRow = { c: 0, s: 0, w: new Float64Array(MAX_STATES) };

  set(dyn: DynamicModel, x: ArrayLike<number>, s0: number, r: number): void {
    this.dyn = dyn;
    this.s0 = s0;
    this.r = r;
    if (this.curved) {
      releaseCurvedPiece(this.curved);
      this.curved = undefined;
    }
    if (dyn.curve.kind !== 'flat') {
      this.curved = acquireCurvedPiece(dyn, x, s0, r);
      return;
    }
    for (let i = 0; i < dyn.modeCount; i++) {
      let z0 = 0;
      for (let k = 0; k < MAX_STATES; k++) if (dyn.active[k]) z0 += dyn.Ti[i * MAX_STATES + k] * x[k];
      this.modes[i].set(dyn.lambda[i], dyn.f0[i] + dyn.fS[i] * s0, dyn.fS[i] * r, z0, 0, 0);
    }
  }

  s(t: number): number {
    return this.s0 + this.r * t;
  }

  /** The node voltages of the state slots at t into out (x_O = s while the stiff output holds the pin). */
  state(t: number, out: Float64Array | number[]): void {
    if (this.curved) {
      this.curved.state(t, out);
      return;
    }
    const dyn = this.dyn;
    const n = dyn.modeCount;
    for (let k = 0; k < MAX_STATES; k++) {
      if (!dyn.active[k]) {
        out[k] = k === SLOT.O && dyn.oPinned ? this.s(t) : 0;
        continue;
      }
      let x = 0;
      for (let i = 0; i < n; i++) x += dyn.T[k * MAX_STATES + i] * this.modes[i].v(t);
      out[k] = x;
    }
  }

  /** ∫₀ᵗ x_slot dt. */
  integralState(slot: number, t: number): number {
    if (this.curved) return this.curved.integralState(slot, t);
    const dyn = this.dyn;
    if (!dyn.active[slot]) return slot === SLOT.O && dyn.oPinned ? this.s0 * t + 0.5 * this.r * t * t : 0;
    let x = 0;
    for (let i = 0; i < dyn.modeCount; i++) x += dyn.T[slot * MAX_STATES + i] * this.modes[i].integralV(t);
    return x;
  }

  /** Target a row: its modal weights (the pinned pin's share goes to s). */
  setRow(row: ArrayLike<number>, scale = 1, offset = 0): this {
    const dyn = this.dyn;
    this.rowC = scale * row[R_C] + offset;
    this.rowS = scale * (row[R_S] + (dyn.oPinned ? row[R_X + SLOT.O] : 0));
    if (this.curved) {
      const target = this.curvedRow;
      target.c = this.rowC;
      target.s = this.rowS;
      for (let k = 0; k < MAX_STATES; k++) target.w[k] = dyn.active[k] ? scale * row[R_X + k] : 0;
      return this;
    }
    for (let i = 0; i < dyn.modeCount; i++) {
      let w = 0;
      for (let k = 0; k < MAX_STATES; k++) if (dyn.active[k]) w += row[R_X + k] * dyn.T[k * MAX_STATES + i];
      this.w[i] = scale * w;
    }
    return this;
  }

  /** Value of the targeted row (order 0), of its derivative (1) or second derivative (2) at t, with the next derivative as slope. */
  eval(t: number): void {
    const n = this.dyn.modeCount;
    let g0 = this.order === 0 ? this.rowC + this.rowS * this.s(t) : this.order === 1 ? this.rowS * this.r : 0;
    let g1 = this.order === 0 ? this.rowS * this.r : 0;
    for (let i = 0; i < n; i++) {
      const m = this.modes[i];
      const w = this.w[i];
      if (w === 0) continue;
      const z = m.v(t);
      const dz = m.dv(t, z);
      const d2z = m.d2v(dz);
      if (this.order === 0) {
        g0 += w * z;
        g1 += w * dz;
      } else if (this.order === 1) {
        g0 += w * dz;
        g1 += w * d2z;
      } else {
        g0 += w * d2z;
        g1 += w * -m.a * d2z;
      }
    }
    this.value = g0;
    this.slope = g1;
  }

  at(t: number): number {
    if (this.curved) return this.curved.rowAt(this.curvedRow, t);
    this.order = 0;
    this.eval(t);
    return this.value;
  }

  /** ∫₀ᵗ of the targeted row. */
  integral(t: number): number {
    if (this.curved) return this.curved.rowIntegral(this.curvedRow, t);
    let g = this.rowC * t + this.rowS * (this.s0 * t + 0.5 * this.r * t * t);
    for (let i = 0; i < this.dyn.modeCount; i++) if (this.w[i] !== 0) g += this.w[i] * this.modes[i].integralV(t);
    return g;
  }

  /**
   * Zeros of the targeted row's derivative of `order` (1: critical points of g, 0: zeros of g) in (0, T),
   * sorted, into out, given the sorted zeros of the next derivative in `split`.
   */
  private zerosBetween(order: number, split: readonly number[], T: number, out: number[]): void {
    out.length = 0;
    this.zeroDir.length = 0;
    let a = 0;
    this.order = order;
    this.eval(0);
    let ga = this.value;
    for (let j = 0; j <= split.length; j++) {
      let b = j < split.length ? split[j] : T;
      let gb: number;
      if (b === Infinity) {
        // A derivative tends to 0 from one side (no sign change left); g itself to its limit.
        gb = this.limit(order);
        if (order > 0 || !(gb !== 0) || ga < 0 === gb < 0) break;
        b = this.farEnd(order, a, ga);
        if (!Number.isFinite(b)) break;
      }
      this.order = order;
      this.eval(b);
      gb = this.value;
      if (ga < 0 !== gb < 0) {
        const t = ga >= 0 ? this.solveSigned(order, a, b, ga, gb, 1) : this.solveSigned(order, a, b, -ga, -gb, -1);
        if (t > 0 && t <= T) {
          out.push(t);
          this.zeroDir.push(ga >= 0 ? -1 : 1);
        }
      }
      a = b;
      ga = gb;
    }
  }

  /** Root of the targeted derivative in a bracket, oriented non-negative at lo (sign −1 flips the row). */
  private solveSigned(order: number, lo: number, hi: number, fLo: number, fHi: number, sign: number): number {
    if (sign < 0) this.flip();
    this.order = order;
    const t = solveBracket(this, lo, hi, fLo, fHi);
    if (sign < 0) this.flip();
    return t;
  }

  private flip(): void {
    this.rowC = -this.rowC;
    this.rowS = -this.rowS;
    for (let i = 0; i < this.dyn.modeCount; i++) this.w[i] = -this.w[i];
  }

  /** The targeted derivative's limit as t → ∞ (a piece without a time event has a source at rest). */
  private limit(order: number): number {
    let g = order === 0 ? this.rowC + this.rowS * this.s0 : 0;
    if (this.r !== 0) return Number.NaN;
    for (let i = 0; i < this.dyn.modeCount; i++) {
      const m = this.modes[i];
      if (this.w[i] === 0) continue;
      if (m.a > 0) {
        if (order === 0) g += (this.w[i] * m.k0) / m.a;
      } else if (m.k0 !== 0) {
        return this.w[i] * m.k0 > 0 ? Infinity : -Infinity;
      } else if (order === 0) {
        g += this.w[i] * m.v0;
      }
    }
    return g;
  }

  /** A finite time beyond `a` where the targeted derivative has its limit's sign. */
  private farEnd(order: number, a: number, ga: number): number {
    let slowest = Infinity;
    for (let i = 0; i < this.dyn.modeCount; i++) if (this.modes[i].a > 0) slowest = Math.min(slowest, this.modes[i].a);
    let b = a + (Number.isFinite(slowest) ? 1 / slowest : 1);
    for (let k = 0; k < 2000; k++) {
      this.order = order;
      this.eval(b);
      if (this.value < 0 !== ga < 0) return b;
      b = a + (b - a) * 2;
    }
    return Infinity;
  }

  /** Critical points of the targeted row in (0, T), sorted (at most one per mode). */
  criticalPoints(T: number, out: number[]): void {
    // g'' = Σ w_i·z_i''(0)·e^(−λ_i t): a pure exponential sum (z''' = −λz'' in every mode); equal rates merged, sorted by rate.
    const n = this.dyn.modeCount;
    const c = this.termC;
    const r = this.termR;
    let m = 0;
    for (let i = 0; i < n; i++) {
      const mode = this.modes[i];
      if (this.w[i] === 0) continue;
      const ci = this.w[i] * mode.d2v(mode.dv(0, mode.v0));
      if (ci === 0) continue;
      let k = 0;
      while (k < m && r[k] !== mode.a) k++;
      if (k < m) {
        c[k] += ci;
        continue;
      }
      // Insertion in rate order.
      k = m++;
      while (k > 0 && r[k - 1] > mode.a) {
        c[k] = c[k - 1];
        r[k] = r[k - 1];
        k--;
      }
      c[k] = ci;
      r[k] = mode.a;
    }
    // Merged terms can cancel to zero: drop them.
    let kept = 0;
    for (let k = 0; k < m; k++) {
      if (c[k] === 0) continue;
      c[kept] = c[k];
      r[kept++] = r[k];
    }
    const count = expSumZeros(c, r, kept, T, this.z2);
    const split = this.split;
    split.length = 0;
    for (let k = 0; k < count; k++) split.push(this.z2[k]);
    this.zerosBetween(1, split, T, out);
  }

  /**
   * First time in [0, T] at which the targeted row leaves g >= 0 (Infinity when it does not); a start
   * within `tolerance` below zero counts as on the boundary (an exit only if g moves outward there),
   * as root-solve.ts firstExit.
   */
  firstExit(T: number, tolerance: number): number {
    if (this.curved) return this.curved.rowExit(this.curvedRow, T, tolerance);
    const g0 = this.at(0);
    if (g0 < -tolerance) return 0;
    const crit = this.crit;
    this.criticalPoints(T, crit);
    let a = 0;
    let ga = g0;
    for (let j = 0; j <= crit.length; j++) {
      let b = j < crit.length ? crit[j] : T;
      let gb: number;
      if (b === Infinity) {
        gb = this.limit(0);
        if (!(gb < 0)) return Infinity;
        b = this.farEnd(0, a, ga >= 0 ? ga : 1);
        if (!Number.isFinite(b)) return Infinity;
      }
      gb = this.at(b);
      if (ga < 0) {
        // Only the start can be (just) negative: leaving means moving outward from it.
        if (gb < ga) return 0;
      } else if (gb < 0) {
        this.order = 0;
        return solveBracket(this, a, b, ga, gb);
      }
      a = b;
      ga = gb;
    }
    return Infinity;
  }

  /** Crossings of the targeted row through zero in (0, T]: times and directions (+1 rising, −1 falling); returns the count. */
  crossings(T: number, outT: Float64Array, outDir: Int8Array, max: number): number {
    if (this.curved) return this.curved.rowCrossings(this.curvedRow, T, outT, outDir, max);
    const crit = this.crit;
    this.criticalPoints(T, crit);
    const zeros = this.zeros;
    this.zerosBetween(0, crit, T, zeros);
    let n = 0;
    for (let k = 0; k < zeros.length && n < max; k++) {
      outT[n] = zeros[k];
      outDir[n++] = this.zeroDir[k];
    }
    return n;
  }

  /** Minimum and maximum of the targeted row over [0, T] into out. */
  range(T: number, out: Float64Array): void {
    if (this.curved) {
      this.curved.rowRange(this.curvedRow, T, out);
      return;
    }
    let lo = Math.min(this.at(0), this.at(T));
    let hi = Math.max(this.at(0), this.at(T));
    const crit = this.crit;
    this.criticalPoints(T, crit);
    for (const t of crit) {
      const g = this.at(t);
      lo = Math.min(lo, g);
      hi = Math.max(hi, g);
    }
    out[0] = lo;
    out[1] = hi;
  }
}
