import { CoreError } from '../../errors.ts';

/**
 * Least-squares fit of one exponential segment
 *     v(t) = vInf + (v0 - vInf) · exp(-(t - t0) / tau)
 * (the capacitor voltage of an RC charging towards vInf).
 *
 * Method: variable projection. For a fixed tau the model is linear in
 * (vInf, v0 - vInf), so those two come from a closed-form 2x2 linear least
 * squares; what is left is a one-dimensional search of the residual sum of
 * squares over tau. We scan ln(tau) on a grid from 1e-3 to 1e3 segment
 * lengths (an RC segment between two switching levels spans a fraction to a
 * few time constants, so the true tau is well inside) and then shrink the
 * bracket around the best grid point by golden-section search. This cannot
 * diverge and needs no starting guess, unlike Gauss-Newton.
 */
export interface ExponentialFit {
  /** Time constant, s. */
  tauS: number;
  /** Asymptote vInf the segment heads for, V. */
  asymptoteV: number;
  /** Time origin of the fit (first point's time), s. */
  originS: number;
  /** Model value at originS, V. */
  initialV: number;
  /** Root-mean-square residual over the fitted points, V. */
  rmsResidualV: number;
  /** Points the fit used. */
  pointCount: number;
  /** True when the best tau sits at the edge of the search range (segment nearly linear or nearly a step). */
  tauAtSearchBound: boolean;
}

export interface FitExponentialOptions {
  /** Fit on at most this many evenly chosen points (default 2000). */
  maxPoints?: number;
}

export const DEFAULT_MAX_FIT_POINTS = 2000;

const LN_TAU_MIN = Math.log(1e-3);
const LN_TAU_MAX = Math.log(1e3);
const GRID_STEPS = 48;
const GOLDEN_TOLERANCE = 1e-10;
const INV_PHI = (Math.sqrt(5) - 1) / 2;

/** Model value of a fit at time tS. */
export function exponentialValueAt(fit: ExponentialFit, tS: number): number {
  return fit.asymptoteV + (fit.initialV - fit.asymptoteV) * Math.exp(-(tS - fit.originS) / fit.tauS);
}

interface LinearSolution {
  sse: number;
  /** vInf and v0 in volts. */
  asymptoteV: number;
  initialV: number;
}

/**
 * Best (vInf, v0) and residual for a given normalised time constant s = tau/T,
 * over points [0, count) of t and v. One pass. Sums are shifted (v by its mean,
 * the exponential by its mid-segment value) to keep cancellation small.
 */
function solveForTau(t: Float64Array, v: Float64Array, count: number, t0: number, invSpan: number, vMean: number, s: number): LinearSolution {
  const q = -invSpan / s;
  const eMid = Math.exp(-0.5 / s);
  let se = 0;
  let see = 0;
  let sv = 0;
  let sev = 0;
  let svv = 0;
  for (let k = 0; k < count; k++) {
    const e = Math.exp((t[k] - t0) * q) - eMid;
    const y = v[k] - vMean;
    se += e;
    see += e * e;
    sv += y;
    sev += e * y;
    svv += y * y;
  }
  const covEE = see - (se * se) / count;
  const covEV = sev - (se * sv) / count;
  const varV = svv - (sv * sv) / count;
  if (!(covEE > 0)) return { sse: varV, asymptoteV: vMean, initialV: vMean };
  const b = covEV / covEE;
  const a = (sv - b * se) / count;
  const asymptoteV = vMean + a - b * eMid;
  return { sse: Math.max(0, varV - b * covEV), asymptoteV, initialV: asymptoteV + b };
}

/** Fit every one of the first `count` points of t/v (t increasing). */
function fitPoints(t: Float64Array, v: Float64Array, count: number): ExponentialFit {
  if (count < 4) {
    throw new CoreError('bad-capture', `an exponential segment needs at least 4 samples to fit 3 parameters, got ${count}`, undefined, {
      reason: 'segment-too-short',
    });
  }
  const t0 = t[0];
  const spanS = t[count - 1] - t0;
  if (!(spanS > 0)) {
    throw new CoreError('bad-capture', 'an exponential segment must span a positive time', undefined, { reason: 'segment-too-short' });
  }
  const invSpan = 1 / spanS;
  let vSum = 0;
  for (let k = 0; k < count; k++) vSum += v[k];
  const vMean = vSum / count;
  const sseAt = (lnS: number): number => solveForTau(t, v, count, t0, invSpan, vMean, Math.exp(lnS)).sse;

  const step = (LN_TAU_MAX - LN_TAU_MIN) / GRID_STEPS;
  let bestK = 0;
  let bestSse = Infinity;
  for (let k = 0; k <= GRID_STEPS; k++) {
    const sse = sseAt(LN_TAU_MIN + k * step);
    if (sse < bestSse) {
      bestSse = sse;
      bestK = k;
    }
  }
  let lo = LN_TAU_MIN + Math.max(0, bestK - 1) * step;
  let hi = LN_TAU_MIN + Math.min(GRID_STEPS, bestK + 1) * step;
  let x1 = hi - INV_PHI * (hi - lo);
  let x2 = lo + INV_PHI * (hi - lo);
  let f1 = sseAt(x1);
  let f2 = sseAt(x2);
  while (hi - lo > GOLDEN_TOLERANCE) {
    if (f1 <= f2) {
      hi = x2;
      x2 = x1;
      f2 = f1;
      x1 = hi - INV_PHI * (hi - lo);
      f1 = sseAt(x1);
    } else {
      lo = x1;
      x1 = x2;
      f1 = f2;
      x2 = lo + INV_PHI * (hi - lo);
      f2 = sseAt(x2);
    }
  }
  const lnS = 0.5 * (lo + hi);
  const s = Math.exp(lnS);
  const sol = solveForTau(t, v, count, t0, invSpan, vMean, s);
  const boundMargin = 1e-6;
  return {
    tauS: s * spanS,
    asymptoteV: sol.asymptoteV,
    originS: t0,
    initialV: sol.initialV,
    rmsResidualV: Math.sqrt(sol.sse / count),
    pointCount: count,
    tauAtSearchBound: lnS - LN_TAU_MIN < step * boundMargin + GOLDEN_TOLERANCE || LN_TAU_MAX - lnS < step * boundMargin + GOLDEN_TOLERANCE,
  };
}

function checkPair(tS: Float64Array, v: Float64Array): void {
  if (tS.length !== v.length) {
    throw new CoreError('bad-capture', `time and value arrays differ in length (${tS.length} vs ${v.length})`, undefined, {
      reason: 'length-mismatch',
    });
  }
}

/** Fit using every sample (reference path; cost grows with the sample count). */
export function fitExponentialFull(tS: Float64Array, v: Float64Array): ExponentialFit {
  checkPair(tS, v);
  return fitPoints(tS, v, tS.length);
}

/**
 * Index of the k-th of `count` points chosen evenly over [first, last] (both
 * ends included). Even spacing keeps the fit's weighting the
 * same as the full record's for a uniformly sampled segment.
 */
export function evenIndex(first: number, last: number, k: number, count: number): number {
  return count === 1 ? first : first + Math.round((k * (last - first)) / (count - 1));
}

/**
 * Fit on at most `maxPoints` evenly chosen samples: the residual surface of a
 * smooth exponential is already well defined by a few thousand points, and
 * this bounds the cost per segment whatever the capture length.
 */
export function fitExponential(tS: Float64Array, v: Float64Array, options: FitExponentialOptions = {}): ExponentialFit {
  checkPair(tS, v);
  const maxPoints = options.maxPoints ?? DEFAULT_MAX_FIT_POINTS;
  if (!Number.isInteger(maxPoints) || maxPoints < 4) {
    throw new CoreError('invalid-value', `maxPoints must be an integer >= 4, got ${maxPoints}`);
  }
  const n = tS.length;
  if (n <= maxPoints) return fitPoints(tS, v, n);
  const bt = new Float64Array(maxPoints);
  const bv = new Float64Array(maxPoints);
  for (let k = 0; k < maxPoints; k++) {
    const i = evenIndex(0, n - 1, k, maxPoints);
    bt[k] = tS[i];
    bv[k] = v[i];
  }
  return fitPoints(bt, bv, maxPoints);
}

/** Fit the first `count` points of caller-owned buffers (lets segment code reuse scratch arrays). */
export function fitExponentialBuffers(tS: Float64Array, v: Float64Array, count: number): ExponentialFit {
  return fitPoints(tS, v, count);
}
