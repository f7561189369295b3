/**
 * The capacitor voltage inside a piece whose SOURCE MOVES (the output stage
 * slewing) and whose capacitance depends on voltage:
 *
 *     r(v)·dv/dt = k0 + k1·t − a·v        (r = C(v)/C(0); a, k0, k1 per unit C(0))
 *
 * This ODE does not separate (the time appears on the right), so the
 * quadrature of charging.ts does not apply. It is solved as a whole-interval
 * spectral collocation (Picard iteration on Chebyshev–Lobatto nodes with
 * Clenshaw–Curtis integration, the "Picard–Chebyshev" method), started from the
 * exact exponential-plus-ramp solution with the capacitance frozen at its start.
 * The iteration carries the frozen-capacitance decay −(a/r_A)·v on its implicit
 * side (a fixed matrix per step size, built once), so it contracts with the
 * CHANGE of capacitance over a sub-interval rather than with a·h/r itself:
 * sub-intervals are as long as the degree resolves, and the fixed point is the
 * same collocation solution plain Picard converges to. The result is a polynomial per sub-interval, so any time inside
 * the piece is evaluated (and root-solved) without stepping: the same dense
 * answer serves the events, the figures and the waveform samples.
 *
 * Slew pieces are short against the time constant in any working oscillator,
 * so one sub-interval is the usual case.
 */
import { CoreError } from '../../errors.ts';
import type { BiasShape } from './dc-bias.ts';
import * as basis from './chebyshev-basis.ts';

// The basis read through module-local bindings: the hot loops below must not pay a live import binding's
// accessor per read (some loaders compile one to a getter call).
const N = basis.CHEBYSHEV_DEGREE;
const NODE_X = basis.NODE_X;
const INTEGRATE = basis.INTEGRATE;
const antiderivative = basis.antiderivative;
const buildSplitStep = basis.buildSplitStep;
const clenshaw = basis.clenshaw;
const coefficients = basis.coefficients;

/**
 * a·h / r_A of the first try per sub-interval (halved while the tail check fails): the
 * polynomial must resolve e^(−a·t/r) over it, whose Chebyshev coefficients fall as (κ/4)^k/k!.
 * On a slewing class II edge the change of C(v) binds first: 0.5 fails the tail check less
 * often than 1 and cut the Picard sweeps per piece by about a quarter (measured, capacitor bench).
 */
const STEP_KAPPA = 0.5;
const MAX_PICARD = 60;
const MAX_SEGMENTS = 512;
/**
 * Converged when the node values are within this of the fixed point, relative to the voltage scale:
 * the last change, or its geometric continuation change·ρ/(1 − ρ) once the sweeps contract (ρ, the
 * ratio of the last two changes, below 1/2), which saves the sweep that would only confirm it.
 */
const PICARD_TOLERANCE = 1e-14;

/**
 * The split Picard step for the step level κ = α·h (α the frozen decay rate a/r_A):
 * the collocation equations v = v_A + (h/2)·M·f with f = −α·v + g rearrange to
 * v = v_A·P·1 + (h/2)·P·M·g, P = (I + (κ/2)·M)⁻¹. Built once per level (levels are
 * STEP_KAPPA·2^−n, and 0 for plain Picard) and kept: PM row-major, u = P·1.
 */
interface SplitStep {
  readonly kappa: number;
  readonly pm: Float64Array;
  readonly u: Float64Array;
}
const SPLIT_LEVELS: SplitStep[] = [];
const PLAIN_PICARD: SplitStep = { kappa: 0, pm: INTEGRATE, u: new Float64Array(N + 1).fill(1) };

function splitStep(level: number): SplitStep {
  const cached = SPLIT_LEVELS[level];
  if (cached) return cached;
  const kappa = STEP_KAPPA * 2 ** -level;
  const n = N + 1;
  const pm = new Float64Array(n * n);
  const u = new Float64Array(n);
  buildSplitStep(kappa, pm, u, new Float64Array(n * (2 * n + 1)));
  const step = { kappa, pm, u };
  SPLIT_LEVELS[level] = step;
  return step;
}

export class ChebyshevPiece {
  private shape!: BiasShape;
  private a = 0;
  private k0 = 0;
  private k1 = 0;
  private v0 = 0;
  private scaleV = 1;
  /** Length of the current sub-interval; start and length of each solved one (lengths adapt). */
  private h = 0;
  /** Step level of the next sub-interval (κ = STEP_KAPPA·2^−level; halvings stick); first-interval bound. */
  private level = 0;
  private horizonS = Infinity;
  private segments = 0;
  private readonly segStart = new Float64Array(MAX_SEGMENTS + 1);
  private readonly segLen = new Float64Array(MAX_SEGMENTS);
  /** Chebyshev coefficients of v per segment (N+1 each) and of its antiderivative (N+2 each). */
  private readonly cv = new Float64Array(MAX_SEGMENTS * (N + 1));
  private readonly ci = new Float64Array(MAX_SEGMENTS * (N + 2));
  /** ∫ v dt from 0 to the start of each segment. */
  private readonly integralAtStart = new Float64Array(MAX_SEGMENTS + 1);
  private readonly f = new Float64Array(N + 1);
  private readonly drive = new Float64Array(N + 1);
  private readonly vNodes = new Float64Array(N + 1);
  private readonly c = new Float64Array(N + 1);
  private readonly b = new Float64Array(N + 2);

  /**
   * Whether this piece was last set with exactly these inputs: its solved
   * segments are then the answer already (the solve is deterministic), so a walk
   * that meets the same piece again re-uses them instead of solving anew.
   */
  holds(shape: BiasShape, a: number, k0: number, k1: number, v0: number, scaleV: number): boolean {
    return (
      this.curveId === shape.curveId &&
      this.a === a &&
      this.k0 === k0 &&
      this.k1 === k1 &&
      this.v0 === v0 &&
      this.scaleInput === scaleV &&
      this.horizonS === Infinity
    );
  }

  private scaleInput = Number.NaN;
  /** The curve's curveId when the piece was solved (a mutable shape's curve may have changed since). */
  private curveId = -1;
  /** Counts the sets: a holder that remembers it knows whether the piece still answers for its inputs. */
  generation = 0;

  /**
   * r(v)·v' = k0 + k1·t − a·v from v(0) = v0; scaleV sets the convergence tolerance (the supply span);
   * horizonS (when known: the end of the slew) bounds the first sub-interval.
   */
  set(shape: BiasShape, a: number, k0: number, k1: number, v0: number, scaleV: number, horizonS = Infinity): this {
    this.generation++;
    this.shape = shape;
    this.curveId = shape.curveId;
    this.a = a;
    this.k0 = k0;
    this.k1 = k1;
    this.v0 = v0;
    this.scaleInput = scaleV;
    this.scaleV = Math.max(scaleV, Math.abs(v0), 1e-300);
    this.segments = 0;
    this.integralAtStart[0] = 0;
    this.level = 0;
    this.horizonS = horizonS > 0 ? horizonS : Infinity;
    this.h = a > 0 ? 0 : Infinity;
    this.segStart[0] = 0;
    return this;
  }

  /** Solve segments until t is covered. */
  private cover(t: number): void {
    if (!Number.isFinite(this.h)) {
      // No resistive path: r(v)·v' = k0 + k1·t has k1 = 0 too (the source cannot reach the capacitor); one segment to t.
      if (this.segments === 0) this.h = Math.max(t, 1e-300);
    }
    while (this.segStart[this.segments] < t) {
      // A caller can reach this with a capacitance so small against the slew time that one slewing piece
      // needs more collocation segments than the budget: refuse it as a limit, naming the part (never a 500).
      if (this.segments === MAX_SEGMENTS) {
        throw new CoreError(
          'limit-exceeded',
          'the non-linear timing capacitor is too small for this amplifier\'s slew: one output edge would need more than ' +
            `${MAX_SEGMENTS} solution segments; use a larger capacitance or a linear (class I / film) capacitor`,
          '/parts/cTiming',
        );
      }
      this.solveSegment(this.segments);
      this.segments++;
    }
  }

  /**
   * Solve sub-interval m; halve its length while the last Chebyshev coefficients
   * show the polynomial has not resolved v (a large change of C(v) inside it).
   */
  private solveSegment(m: number): void {
    const tA = this.segStart[m];
    const vA = m === 0 ? this.v0 : this.valueIn(m - 1, 1);
    const tailTol = 1e-13 * this.scaleV;
    const plain = !Number.isFinite(this.h);
    // Frozen decay rate at the segment start: the split's implicit part and the step length's scale.
    const alpha = plain ? 0 : this.a / Math.max(this.shape.ratio(vA), 1e-3);
    // Length of a solved try that failed the tail check (0: none): the next, shorter try starts from it.
    let hFailed = 0;
    for (let tries = 0; tries < 40; tries++) {
      let step = PLAIN_PICARD;
      if (!plain) {
        step = splitStep(this.level);
        this.h = step.kappa / alpha;
        if (m === 0 && this.horizonS < this.h) this.h = this.horizonS;
      }
      this.startNodes(m, tA, vA, hFailed);
      // The split needs κ = α·h exactly; a shorter (horizon-bound) h only changes α, never the fixed point.
      const converged = this.picard(tA, vA, step, plain ? 0 : step.kappa / this.h);
      const c = this.c;
      const tail = Math.abs(c[N]) + Math.abs(c[N - 1]);
      // An iteration that did not converge is no answer, whatever its tail says.
      if (converged && tail <= tailTol) break;
      // Only a try that converged to numbers is a start (a first length far past a short slew can overflow).
      hFailed = converged && Number.isFinite(tail) ? this.h : 0;
      if (plain) this.h *= 0.5;
      else this.level++;
    }
    const h = this.h;
    const { b, c } = this;
    this.segLen[m] = h;
    this.segStart[m + 1] = tA + h;
    // Store v's coefficients and its antiderivative's (for ∫v dt) for dense evaluation.
    const cv = this.cv;
    const base = m * (N + 1);
    for (let k = 0; k <= N; k++) cv[base + k] = c[k];
    antiderivative(c, b);
    const ci = this.ci;
    const baseI = m * (N + 2);
    for (let k = 0; k <= N + 1; k++) ci[baseI + k] = b[k];
    this.integralAtStart[m + 1] = this.integralAtStart[m] + 0.5 * h * clenshaw(b, N + 1, 1);
  }

  /**
   * The Picard iteration's start at the nodes of sub-interval m (length h from (tA, vA)). Any start
   * reaches the same fixed point; a closer one saves sweeps (each gains about two digits here):
   * - after a try of this sub-interval that converged but failed the tail check (length hFailed),
   *   that polynomial on the shorter length: good to about its tail;
   * - else the previous sub-interval's polynomial continued past its end, while the new length is
   *   no longer than the previous one (x ≤ 3: the continuation's error grows like T_N(x));
   * - else (the first sub-interval) the frozen-capacitance exact motion (exponential + ramp), good to
   *   the capacitance change over the sub-interval.
   * The converged answers agree with the frozen start's to rounding (the same fixed point, the same
   * stopping tolerance); the first two cut the Picard sweeps of the slewing bench circuit by a third.
   */
  private startNodes(m: number, tA: number, vA: number, hFailed: number): void {
    const h = this.h;
    const vNodes = this.vNodes;
    if (hFailed > 0) {
      for (let j = 0; j <= N; j++) vNodes[j] = clenshaw(this.c, N, -1 + ((NODE_X[j] + 1) * h) / hFailed);
      return;
    }
    const hPrevious = m > 0 ? this.segLen[m - 1] : 0;
    if (m > 0 && h <= hPrevious) {
      const offset = (m - 1) * (N + 1);
      for (let j = 0; j <= N; j++) vNodes[j] = clenshaw(this.cv, N, 1 + ((NODE_X[j] + 1) * h) / hPrevious, offset);
      return;
    }
    const rA = this.shape.ratio(vA);
    const a = this.a / rA;
    const k0 = this.k0 / rA;
    const k1 = this.k1 / rA;
    for (let j = 0; j <= N; j++) {
      const dt = ((NODE_X[j] + 1) * h) / 2;
      vNodes[j] = frozen(a, k0 + k1 * tA, k1, vA, dt);
    }
  }

  /**
   * Split Picard iteration (step level `step`, implicit decay rate alpha = κ/h) on one
   * sub-interval of length h from (tA, vA), started from vNodes; leaves v's Chebyshev
   * coefficients in c. Whether the sweeps converged.
   */
  private picard(tA: number, vA: number, step: SplitStep, alpha: number): boolean {
    const h = this.h;
    const { f, vNodes, c } = this;
    const tol = PICARD_TOLERANCE * this.scaleV;
    let converged = false;
    let previous = 0;
    const { pm, u } = step;
    // The sweep's invariants out of the loop: the drive k0 + k1·t at each node, the curve, a.
    const { drive, shape, a: decay } = this;
    for (let j = 0; j <= N; j++) drive[j] = this.k0 + this.k1 * (tA + ((NODE_X[j] + 1) * h) / 2);
    for (let it = 0; it < MAX_PICARD && !converged; it++) {
      // g = f + α·v: the ODE's right side with the frozen decay moved to the implicit side.
      for (let j = 0; j <= N; j++) {
        const v = vNodes[j];
        f[j] = (drive[j] - decay * v) / shape.ratio(v) + alpha * v;
      }
      let change = 0;
      for (let j = 0; j <= N; j++) {
        let s = 0;
        const row = j * (N + 1);
        for (let i = 0; i <= N; i++) s += pm[row + i] * f[i];
        const next = vA * u[j] + 0.5 * h * s;
        const d = Math.abs(next - vNodes[j]);
        if (d > change) change = d;
        vNodes[j] = next;
      }
      converged = change <= tol || (change < 0.5 * previous && change * change <= tol * (previous - change));
      // Not contracting (or not numbers) after the first sweeps: this length is too long (typically a first
      // length far past a short slew, where the ramp runs away); give it up now instead of after MAX_PICARD.
      if (!converged && it >= 2 && !(change < previous)) break;
      previous = change;
    }
    coefficients(vNodes, c);
    return converged;
  }

  /** v at local coordinate x ∈ [−1, 1] of segment m. */
  private valueIn(m: number, x: number): number {
    return clenshaw(this.cv, N, x, m * (N + 1));
  }

  private locM = 0;
  private locX = 0;
  /** Segment and local coordinate of t (into locM, locX). */
  private locate(t: number): void {
    this.cover(t);
    // Pieces have a handful of sub-intervals: a linear scan from the end is enough.
    let m = this.segments - 1;
    while (m > 0 && this.segStart[m] > t) m--;
    const x = (2 * (t - this.segStart[m])) / this.segLen[m] - 1;
    this.locM = m;
    this.locX = Math.min(1, Math.max(-1, x));
  }

  /** v(t), t ≥ 0 into the piece. */
  v(t: number): number {
    if (t <= 0) return this.v0;
    this.locate(t);
    return this.valueIn(this.locM, this.locX);
  }

  /** dv/dt from the ODE itself at (t, v). */
  dv(t: number, v: number): number {
    return (this.k0 + this.k1 * t - this.a * v) / this.shape.ratio(v);
  }

  /** ∫₀ᵀ v dt. */
  integralV(T: number): number {
    if (T <= 0) return 0;
    this.locate(T);
    const m = this.locM;
    const x = this.locX;
    return this.integralAtStart[m] + 0.5 * this.segLen[m] * clenshaw(this.ci, N + 1, x, m * (N + 2));
  }
}

/** Exact solution of v' = k0 + k1·t − a·v from v0 after dt (the linear capacitor), for the starting guess. */
function frozen(a: number, k0: number, k1: number, v0: number, dt: number): number {
  if (a * dt < 1e-8) return v0 + (k0 - a * v0) * dt + 0.5 * (k1 - a * (k0 - a * v0)) * dt * dt;
  const e = Math.exp(-a * dt);
  // Particular solution of a ramp drive: (k0 − k1/a + k1·t)/a.
  const vp0 = (k0 - k1 / a) / a;
  const vpT = vp0 + (k1 / a) * dt;
  return vpT + (v0 - vp0) * e;
}
