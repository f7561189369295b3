/**
 * Maximum a-posteriori least squares by Levenberg–Marquardt, with Gaussian
 * priors. The unknowns are handled in prior-standardised form
 * z = (x − priorMean)/priorSd, so every prior residual is simply z and the
 * normal matrix is JᵀJ + I: well conditioned even when the data say nothing
 * about some direction (the prior then holds it), and the posterior covariance
 * in z is (JᵀJ + I)⁻¹ at the optimum.
 *
 * Data residuals come from the caller already divided by their standard
 * uncertainty. The Jacobian is by forward differences (the forward model is a
 * closed form costing microseconds, so analytic derivatives buy nothing).
 * Trial points where the model cannot be evaluated (the circuit would not
 * oscillate) are treated as rejected steps.
 */
import { CoreError } from '../../errors.ts';
import { cholesky, choleskyInverse, choleskyLogDet, choleskySolve } from './linalg.ts';

export interface MapProblem {
  /** Number of unknowns. */
  size: number;
  priorMean: ArrayLike<number>;
  /** Prior standard deviations, > 0. */
  priorSd: ArrayLike<number>;
  /** Optional bounds on x (not z); NaN or ±Infinity = none. */
  lower?: ArrayLike<number>;
  upper?: ArrayLike<number>;
  /** Normalised data residuals (model − measured)/uncertainty at x; throw CoreError when x is infeasible. */
  residuals(x: Float64Array): Float64Array;
  /** Start point in x (default: the prior mean). */
  start?: ArrayLike<number>;
}

export interface MapOptions {
  maxIterations?: number;
  /** Convergence: a step below this many posterior widths ends the search. */
  stepTolerance?: number;
  /** Forward-difference step, in posterior widths (the first pass: prior widths). */
  differenceStep?: number;
  /**
   * Convergence: two accepted steps in a row that each lower the cost by less
   * than this (absolute, in the cost's units) end the search. Default 0: only
   * the relative test applies. With residuals in standard uncertainties the
   * cost is a χ², and a gain far below 1 changes nothing a caller reads off it.
   */
  costTolerance?: number;
}

export interface MapSolution {
  x: Float64Array;
  /** Posterior covariance of x (Laplace approximation at the optimum), row-major size×size. */
  covariance: Float64Array;
  /** Σ data residual² at the optimum. */
  dataChiSquare: number;
  /** Σ z² at the optimum (the prior's share of the cost). */
  priorChiSquare: number;
  /** ln det(JᵀJ + I) in z space: the Occam term of the Laplace evidence. */
  logDetNormal: number;
  /** Data residuals at the optimum. */
  residuals: Float64Array;
  /** Jacobian of the data residuals with respect to x at the optimum (rows = residuals). */
  jacobian: Float64Array;
  iterations: number;
  converged: boolean;
}

const DEFAULTS = { maxIterations: 200, stepTolerance: 1e-10, differenceStep: 1e-6, costTolerance: 0 } as const;
/** An accepted step that lowers the cost by less than this share ends the search. */
const RELATIVE_GAIN_TOLERANCE = 1e-14;

function sumSquares(v: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < v.length; i++) s += v[i] * v[i];
  return s;
}

export function solveMap(problem: MapProblem, options: MapOptions = {}): MapSolution {
  const n = problem.size;
  const maxIterations = options.maxIterations ?? DEFAULTS.maxIterations;
  const stepTolerance = options.stepTolerance ?? DEFAULTS.stepTolerance;
  const h = options.differenceStep ?? DEFAULTS.differenceStep;
  const costTolerance = options.costTolerance ?? DEFAULTS.costTolerance;
  const mean = Float64Array.from(problem.priorMean);
  const sd = Float64Array.from(problem.priorSd);
  for (let j = 0; j < n; j++) {
    if (!(sd[j] > 0) || !Number.isFinite(sd[j])) throw new CoreError('invalid-value', `prior standard deviation ${j} must be finite and > 0`);
  }
  const zLow = new Float64Array(n).fill(-Infinity);
  const zHigh = new Float64Array(n).fill(Infinity);
  for (let j = 0; j < n; j++) {
    const lo = problem.lower?.[j];
    const hi = problem.upper?.[j];
    if (lo !== undefined && Number.isFinite(lo)) zLow[j] = (lo - mean[j]) / sd[j];
    if (hi !== undefined && Number.isFinite(hi)) zHigh[j] = (hi - mean[j]) / sd[j];
  }
  const toX = (z: Float64Array): Float64Array => {
    const x = new Float64Array(n);
    for (let j = 0; j < n; j++) x[j] = mean[j] + sd[j] * z[j];
    return x;
  };
  const clampZ = (z: Float64Array): Float64Array => {
    for (let j = 0; j < n; j++) z[j] = Math.min(zHigh[j], Math.max(zLow[j], z[j]));
    return z;
  };
  const tryResiduals = (z: Float64Array): Float64Array | undefined => {
    try {
      const r = problem.residuals(toX(z));
      // Squares must stay finite too: a residual of 1e200 is as useless to the step as Infinity.
      for (let i = 0; i < r.length; i++) if (!(Math.abs(r[i]) < 1e150)) return undefined;
      return r;
    } catch (err) {
      if (err instanceof CoreError) return undefined;
      throw err;
    }
  };

  let z: Float64Array = new Float64Array(n);
  if (problem.start) for (let j = 0; j < n; j++) z[j] = (problem.start[j] - mean[j]) / sd[j];
  clampZ(z);
  let r: Float64Array | undefined = tryResiduals(z);
  if (r === undefined) {
    // The caller's start (normally the nominal circuit) must be evaluable: that error is the caller's to see.
    problem.residuals(toX(z));
    throw new CoreError('not-converged', 'the measurements are so far from the model (or so precise) that the fit cannot take a step: check their values and uncertainties');
  }
  const m = r.length;
  let cost = sumSquares(r) + sumSquares(z);

  // Difference steps on the scale of the posterior width 1/√A_jj (first pass: the prior's),
  // so a parameter the data pin far tighter than its prior still gets an accurate slope.
  const hz = new Float64Array(n).fill(h);
  const jacobianZ = (z0: Float64Array, r0: Float64Array): Float64Array => {
    // Rows = residuals, columns = unknowns; steps go inward at an upper bound.
    const jac = new Float64Array(m * n);
    for (let j = 0; j < n; j++) {
      const step = z0[j] + hz[j] > zHigh[j] ? -hz[j] : hz[j];
      const zp = Float64Array.from(z0);
      zp[j] += step;
      const rp = tryResiduals(zp);
      if (rp === undefined) continue; // no slope information at an infeasible neighbour: leave it to the prior
      let diag = 1;
      for (let i = 0; i < m; i++) {
        jac[i * n + j] = (rp[i] - r0[i]) / step;
        diag += jac[i * n + j] ** 2;
      }
      hz[j] = Math.max(h / Math.sqrt(diag), 1e-9 * h);
    }
    return jac;
  };
  const normal = (jac: Float64Array): Float64Array => {
    const a = new Float64Array(n * n);
    for (let p = 0; p < n; p++) {
      for (let q = 0; q <= p; q++) {
        let s = 0;
        for (let i = 0; i < m; i++) s += jac[i * n + p] * jac[i * n + q];
        a[p * n + q] = s;
        a[q * n + p] = s;
      }
      a[p * n + p] += 1; // the prior
    }
    return a;
  };

  let lambda = 1e-3;
  let iterations = 0;
  let smallGains = 0;
  let converged = n === 0;
  let jac = jacobianZ(z, r);
  while (!converged && iterations < maxIterations) {
    iterations++;
    const a = normal(jac);
    const g = new Float64Array(n);
    for (let p = 0; p < n; p++) {
      let s = z[p];
      for (let i = 0; i < m; i++) s += jac[i * n + p] * r[i];
      g[p] = -s;
    }
    let accepted = false;
    for (let attempt = 0; attempt < 30 && !accepted; attempt++) {
      const damped = Float64Array.from(a);
      for (let p = 0; p < n; p++) damped[p * n + p] += lambda * a[p * n + p];
      const l = cholesky(damped, n);
      if (l === undefined) {
        lambda *= 10;
        continue;
      }
      const step = choleskySolve(l, n, g);
      const trial = clampZ(Float64Array.from(z, (v, j) => v + step[j]));
      // Step size in posterior widths (√A_jj), so the stop test does not depend on how wide the prior is.
      let largest = 0;
      for (let j = 0; j < n; j++) largest = Math.max(largest, Math.abs(trial[j] - z[j]) * Math.sqrt(a[j * n + j]));
      const rt = tryResiduals(trial);
      const trialCost = rt === undefined ? Infinity : sumSquares(rt) + sumSquares(trial);
      if (rt !== undefined && trialCost <= cost) {
        const relativeGain = (cost - trialCost) / Math.max(cost, 1e-300);
        smallGains = cost - trialCost < costTolerance ? smallGains + 1 : 0;
        z = trial;
        r = rt!;
        cost = trialCost;
        lambda = Math.max(lambda / 3, 1e-12);
        accepted = true;
        // Judged on the cost, not on the step: a step small in prior units can still be large in the data's.
        if (relativeGain < RELATIVE_GAIN_TOLERANCE || largest < stepTolerance || smallGains >= 2) converged = true;
        else jac = jacobianZ(z, r);
      } else {
        lambda *= 4;
        if (largest < stepTolerance) {
          // The step has shrunk to nothing without gain: we are at the minimum to working precision.
          converged = true;
          break;
        }
      }
    }
    if (!accepted && !converged) break;
  }
  jac = jacobianZ(z, r); // the covariance needs the slopes at the final point

  const a = normal(jac);
  const l = cholesky(a, n);
  // JᵀJ + I is positive definite in exact arithmetic; only non-finite slopes can break it.
  if (l === undefined) throw new CoreError('not-converged', 'the fit met slopes it cannot use (non-finite); check the measurement values and uncertainties');
  const covZ = choleskyInverse(l, n);
  const covariance = new Float64Array(n * n);
  for (let p = 0; p < n; p++) for (let q = 0; q < n; q++) covariance[p * n + q] = covZ[p * n + q] * sd[p] * sd[q];
  const jacobian = new Float64Array(m * n);
  for (let i = 0; i < m; i++) for (let j = 0; j < n; j++) jacobian[i * n + j] = jac[i * n + j] / sd[j];
  return {
    x: toX(z),
    covariance,
    dataChiSquare: sumSquares(r),
    priorChiSquare: sumSquares(z),
    logDetNormal: n === 0 ? 0 : choleskyLogDet(l, n),
    residuals: r,
    jacobian,
    iterations,
    converged,
  };
}
