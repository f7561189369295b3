/**
 * Ranked one- and two-cause explanations. Each candidate frees one parameter
 * (or a pair), holds the rest at nominal and is fitted by MAP. Candidates are
 * compared by their Laplace-approximated evidence
 *     ln Z = −½(χ²_data + χ²_prior) − ½·ln det(JᵀJ + I) + |S|·ln(priorOdds),
 * the Bayesian model comparison of MacKay (Information Theory, Inference and
 * Learning Algorithms, ch. 28): a good fit scores, a shift far outside the
 * tolerance costs through χ²_prior, and a parameter the data pin down tightly
 * pays its Occam factor. Each cause carries a prior odds of
 * CAUSE_PRIOR_ODDS against "this parameter is at nominal" (our choice: one
 * part in five notably off), so a second cause must earn its place. Scores
 * are posterior probabilities normalised over the nominal circuit and every
 * candidate considered; a pair is considered only when it beats both of its
 * single causes.
 */
import { describeEstimate, type ParameterEstimate } from '../estimate/estimate.ts';
import { fitSubset, nominalChiSquare, type FitSetup } from '../estimate/setup.ts';
import { chiSquareQuantile95 } from './chi-square.ts';
import { describeShift } from './wording.ts';

export const CAUSE_PRIOR_ODDS = 0.25;

export interface Cause extends ParameterEstimate {
  /** |shift| within the tolerance band (3σ of the prior). */
  withinTolerance: boolean;
  text: string;
}

export interface ResidualEntry {
  measurement: string;
  measured: number;
  predicted: number;
  uncertainty: number;
  /** (predicted − measured)/uncertainty. */
  normalized: number;
}

export interface Explanation {
  rank: number;
  causes: Cause[];
  /** Posterior probability among the candidates considered, 0..1. */
  score: number;
  logEvidence: number;
  /** χ² of the measurements this explanation leaves. */
  residualChiSquare: number;
  measurementCount: number;
  /** True when the residual χ² is within the 95 % bound for the measurement count. */
  accountsForMeasurements: boolean;
  residuals: ResidualEntry[];
  summary: string;
}

export interface Verdict {
  agreesWithNominal: boolean;
  nominalChiSquare: number;
  measurementCount: number;
  /** 95 % upper bound of χ² for that many measurements (Wilson–Hilferty). */
  chiSquareBound95: number;
  /** Posterior probability that nothing is off, among the candidates considered. */
  nominalScore: number;
  statement: string;
}

export interface Diagnosis {
  verdict: Verdict;
  explanations: Explanation[];
  candidateCount: number;
}

export interface DiagnoseOptions {
  /** 1: single causes only; 2 (default): pairs too. */
  maxCauses?: 1 | 2;
  /** How many explanations to return (default 8). */
  maxExplanations?: number;
}

interface Candidate {
  active: number[];
  x: Float64Array;
  dataChiSquare: number;
  logEvidence: number;
  /** Posterior covariance of the active parameters (fitted space). */
  covariance: Float64Array;
}

export function residualEntries(setup: FitSetup, x: Float64Array): ResidualEntry[] {
  const fig = setup.figuresAt(x);
  return setup.measurements.map((m) => {
    const predicted = fig[m.name];
    return { measurement: m.name, measured: m.value, predicted, uncertainty: m.uncertainty, normalized: (predicted - m.value) / m.uncertainty };
  });
}

export function diagnose(setup: FitSetup, options: DiagnoseOptions = {}): Diagnosis {
  const n = setup.parameters.length;
  const maxCauses = options.maxCauses ?? 2;
  const maxExplanations = options.maxExplanations ?? 8;
  const subsets: number[][] = [];
  for (let a = 0; a < n; a++) subsets.push([a]);
  if (maxCauses >= 2) for (let a = 0; a < n; a++) for (let b = a + 1; b < n; b++) subsets.push([a, b]);

  const chiNominal = nominalChiSquare(setup);
  const logNominal = -0.5 * chiNominal;
  const candidates: Candidate[] = [];
  for (const active of subsets) {
    const fit = fitSubset(setup, active);
    const s = fit.solution;
    candidates.push({
      active,
      x: fit.x,
      dataChiSquare: s.dataChiSquare,
      covariance: s.covariance,
      logEvidence: -0.5 * (s.dataChiSquare + s.priorChiSquare) - 0.5 * s.logDetNormal + active.length * Math.log(CAUSE_PRIOR_ODDS),
    });
  }
  // A pair is kept only when it beats both of its single causes: otherwise the
  // second cause adds nothing the data ask for, and listing it would crowd the ranking.
  const singleEvidence = new Map(candidates.filter((c) => c.active.length === 1).map((c) => [c.active[0], c.logEvidence]));
  const considered = candidates.filter(
    (c) => c.active.length === 1 || c.active.every((j) => c.logEvidence > (singleEvidence.get(j) ?? -Infinity)),
  );
  const top = Math.max(logNominal, ...considered.map((c) => c.logEvidence));
  const total = Math.exp(logNominal - top) + considered.reduce((acc, c) => acc + Math.exp(c.logEvidence - top), 0);
  const score = (logZ: number) => Math.exp(logZ - top) / total;
  const m = setup.measurements.length;
  const bound = chiSquareQuantile95(m);

  const ranked = [...considered].sort((p, q) => q.logEvidence - p.logEvidence).slice(0, maxExplanations);
  const explanations: Explanation[] = ranked.map((c, k) => {
    const k2 = c.active.length;
    const causes: Cause[] = c.active.map((j, i) => {
      const p = setup.parameters[j];
      const e = describeEstimate(p, c.x[j], Math.sqrt(Math.max(0, c.covariance[i * k2 + i])));
      return { ...e, withinTolerance: Math.abs(e.shiftInTolerances) <= 1, text: describeShift(e, p.label) };
    });
    const entries = residualEntries(setup, c.x);
    const accounts = c.dataChiSquare <= bound;
    const words = causes.map((x) => x.text).join('; and ');
    return {
      rank: k + 1,
      causes,
      score: score(c.logEvidence),
      logEvidence: c.logEvidence,
      residualChiSquare: c.dataChiSquare,
      measurementCount: m,
      accountsForMeasurements: accounts,
      residuals: entries,
      summary: accounts
        ? `${words}: accounts for the measurements (χ² ${c.dataChiSquare.toPrecision(3)} for ${m})`
        : `${words}: leaves χ² ${c.dataChiSquare.toPrecision(3)} for ${m} measurements (95 % bound ${bound.toPrecision(3)})`,
    };
  });
  const agrees = chiNominal <= bound;
  const best = explanations[0];
  let statement: string;
  if (agrees) {
    statement = `The measurements agree with the nominal circuit within their uncertainty (χ² ${chiNominal.toPrecision(3)} for ${m} measurement${m === 1 ? '' : 's'}, 95 % bound ${bound.toPrecision(3)}).`;
  } else if (best === undefined) {
    statement = `The measurements depart from the nominal circuit (χ² ${chiNominal.toPrecision(3)} for ${m}), and there is no parameter to explain it.`;
  } else {
    const tail = best.accountsForMeasurements
      ? ''
      : ' No one- or two-cause explanation accounts for every measurement: look for a further effect (wiring, a different part, a model limit).';
    statement =
      `The measurements depart from the nominal circuit (χ² ${chiNominal.toPrecision(3)} for ${m} measurement${m === 1 ? '' : 's'}, 95 % bound ${bound.toPrecision(3)}). ` +
      `Most plausible: ${best.causes.map((c) => c.text).join('; and ')} (score ${best.score.toPrecision(2)}).${tail}`;
  }
  return {
    verdict: { agreesWithNominal: agrees, nominalChiSquare: chiNominal, measurementCount: m, chiSquareBound95: bound, nominalScore: score(logNominal), statement },
    explanations,
    candidateCount: considered.length,
  };
}
