/**
 * The full MAP estimate: every parameter free, priors from the nominal values
 * and tolerances, uncertainties from the Jacobian (Laplace approximation),
 * and the pairs of parameters the data cannot tell apart. The pair test works
 * on the data sensitivities rather than on the posterior correlation alone:
 * the correlation between two parameters is diluted when a third shares the
 * same information, and inflated by priors, while "can one mimic the other
 * within the measurement uncertainty" is what an engineer means.
 */
import type { PredictedFigures } from './forward.ts';
import { fitSubset, type FitSetup } from './setup.ts';
import { naturalSd, naturalValue, TOLERANCE_SIGMAS, type FitParameter } from './parameters.ts';

export interface ParameterEstimate {
  parameter: string;
  kind: FitParameter['kind'];
  unit: FitParameter['unit'];
  nominal: number;
  estimate: number;
  /** Posterior standard deviation, natural units (first-order from the fitted space). */
  standardDeviation: number;
  /** Prior standard deviation in natural units at the nominal value. */
  priorStandardDeviation: number;
  /** Part tolerance, fraction (parts only). */
  tolerance?: number;
  /** estimate − nominal, natural units. */
  shift: number;
  /** estimate/nominal − 1 (parts only). */
  relativeShift?: number;
  /** Shift over the tolerance band (parts) or over the 3σ nuisance spread (others), in the fitted space. */
  shiftInTolerances: number;
  /** Posterior/prior standard deviation in the fitted space: near 1 means the data say nothing about it. */
  posteriorToPriorSd: number;
}

export interface IndistinguishablePair {
  parameters: [string, string];
  /** Posterior correlation (diluted when further parameters share the same information). */
  correlation: number;
  /** Cosine between the two parameters' data sensitivities: ±1 = the data respond to both the same way. */
  sensitivityAlignment: number;
  /** What the data could see of the difference between them across a tolerance band, σ (< 1: nothing). */
  distinguishingSigma: number;
}

export interface EstimationResult {
  estimates: ParameterEstimate[];
  /** Pairs whose effects on the data mimic each other to within the measurement uncertainty. */
  indistinguishable: IndistinguishablePair[];
  /** Full correlation matrix, parameter order as estimates. */
  correlation: number[][];
  fitted: PredictedFigures;
  /** Derived, identifiable figure: (upper − lower threshold)/(output swing). */
  hysteresisRatio: { nominal: number; estimate: number; standardDeviation: number };
  dataChiSquare: number;
  priorChiSquare: number;
  residuals: number[];
  iterations: number;
  converged: boolean;
  /** Fitted-space solution vector and covariance (for diagnosis and derived figures). */
  x: Float64Array;
  covariance: Float64Array;
}

/** Posterior/prior width above which the data are said to add nothing (our threshold). */
export const UNINFORMED_RATIO = 0.9;

export function describeEstimate(p: FitParameter, x: number, sdX: number): ParameterEstimate {
  const estimate = naturalValue(p, x);
  const out: ParameterEstimate = {
    parameter: p.name,
    kind: p.kind,
    unit: p.unit,
    nominal: p.nominal,
    estimate,
    standardDeviation: naturalSd(p, x, sdX),
    priorStandardDeviation: naturalSd(p, p.priorMean, p.priorSd),
    shift: estimate - p.nominal,
    shiftInTolerances: (x - p.priorMean) / (TOLERANCE_SIGMAS * p.priorSd),
    posteriorToPriorSd: sdX / p.priorSd,
  };
  if (p.tolerance !== undefined) out.tolerance = p.tolerance;
  if (p.kind === 'part') {
    out.relativeShift = estimate / p.nominal - 1;
    // For parts the plain-words tolerance count is the relative shift over the tolerance.
    out.shiftInTolerances = out.relativeShift / p.tolerance!;
  }
  return out;
}

/** `start`: where the search begins (fitted space; default the nominal), e.g. the diagnosis' leading explanation. */
export function estimateParameters(setup: FitSetup, start?: ArrayLike<number>): EstimationResult {
  const n = setup.parameters.length;
  const all = Array.from({ length: n }, (_, j) => j);
  // Parts keep their tolerance priors; amplifier effects and the supply may sit anywhere in their physical range.
  const fit = fitSubset(setup, all, { priorSd: setup.parameters.map((p) => (p.kind === 'part' ? p.priorSd : p.offSd)), ...(start ? { start } : {}) });
  const cov = fit.solution.covariance;
  const sd = Array.from({ length: n }, (_, j) => Math.sqrt(Math.max(0, cov[j * n + j])));
  const correlation = Array.from({ length: n }, (_, p) => Array.from({ length: n }, (_, q) => (sd[p] > 0 && sd[q] > 0 ? cov[p * n + q] / (sd[p] * sd[q]) : 0)));
  // Two parameters cannot be told apart when whatever one does across its tolerance
  // band (3σ of the prior) the other can mimic to within the measurement uncertainty:
  // the part of its scaled sensitivity column orthogonal to the other's is under 1σ
  // (root-sum-square over the measurements). R and C through τ = RC are the classic case.
  // A parameter whose band moves the data by less than 1σ at all is "uninformed", not confusable.
  const jac = fit.solution.jacobian;
  const m = setup.measurements.length;
  const columns = all.map((j) => Float64Array.from({ length: m }, (_, i) => jac[i * n + j] * TOLERANCE_SIGMAS * setup.parameters[j].priorSd));
  // (the sensitivity columns scale by the nuisance spread: "what a tolerance band of it does to the data")
  const norms = columns.map((c) => Math.sqrt(c.reduce((acc, v) => acc + v * v, 0)));
  const indistinguishable: IndistinguishablePair[] = [];
  for (let p = 0; p < n; p++) {
    for (let q = p + 1; q < n; q++) {
      if (!(norms[p] >= 1 && norms[q] >= 1)) continue;
      let dot = 0;
      for (let i = 0; i < m; i++) dot += columns[p][i] * columns[q][i];
      const alignment = dot / (norms[p] * norms[q]);
      const sine = Math.sqrt(Math.max(0, 1 - alignment * alignment));
      const unmimicked = sine * Math.max(norms[p], norms[q]);
      if (unmimicked < 1) {
        indistinguishable.push({
          parameters: [setup.parameters[p].name, setup.parameters[q].name],
          correlation: correlation[p][q],
          sensitivityAlignment: alignment,
          distinguishingSigma: unmimicked,
        });
      }
    }
  }
  const fitted = setup.figuresAt(fit.x);
  return {
    estimates: setup.parameters.map((p, j) => describeEstimate(p, fit.x[j], sd[j])),
    indistinguishable,
    correlation,
    fitted,
    hysteresisRatio: {
      nominal: setup.nominalFigures.hysteresisRatio,
      estimate: fitted.hysteresisRatio,
      standardDeviation: propagatedSd(setup, fit.x, cov, (f) => f.hysteresisRatio),
    },
    dataChiSquare: fit.solution.dataChiSquare,
    priorChiSquare: fit.solution.priorChiSquare,
    residuals: Array.from(fit.solution.residuals),
    iterations: fit.solution.iterations,
    converged: fit.solution.converged,
    x: fit.x,
    covariance: cov,
  };
}

/** σ of a derived figure g(x): sqrt(∇gᵀ Σ ∇g), gradient by forward differences. */
function propagatedSd(setup: FitSetup, x: Float64Array, cov: Float64Array, g: (f: PredictedFigures) => number): number {
  const n = x.length;
  const g0 = g(setup.figuresAt(x));
  const grad = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const h = 1e-6 * setup.parameters[j].priorSd;
    const xp = Float64Array.from(x);
    xp[j] += h;
    try {
      grad[j] = (g(setup.figuresAt(xp)) - g0) / h;
    } catch {
      grad[j] = 0;
    }
  }
  let v = 0;
  for (let p = 0; p < n; p++) for (let q = 0; q < n; q++) v += grad[p] * cov[p * n + q] * grad[q];
  return Math.sqrt(Math.max(0, v));
}
