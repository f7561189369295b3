/**
 * Ranked explanations by evidence. Every hypothesis (hypotheses.ts) is scored
 * by its marginal likelihood times its prior, the Bayesian model comparison of
 * MacKay (Information Theory, Inference and Learning Algorithms, ch. 28):
 *
 * - the effects a hypothesis does not free still wander within their
 *   tolerances (the `nuisance` priors of parameters.ts); they are marginalised
 *   in the linear approximation around the nominal circuit (around its own
 *   circuit for a wrong part that moves a value far, LOCAL_COLUMNS_RATIO): with
 *   J the measurements' sensitivity to them (in prior σ), the measurements are
 *   Gaussian with covariance C = I + J·Jᵀ (in measurement σ), so residuals are
 *   whitened by C's Cholesky factor and ln det C enters the evidence;
 * - the freed effects are fitted by MAP (map-lm.ts) in their bounded spaces
 *   with their `off` priors; the Laplace approximation around the MAP gives
 *       ln Z = ln P(H) − ½(χ²_data + χ²_prior) − ½ ln det(JᵀJ + I) − ½ ln det C;
 * - a hypothesis whose whitened χ² fails the goodness-of-fit test at the 1e-3
 *   level never outranks one that passes: its evidence is capped at 1/1000 of
 *   the weakest passing one (our rule), so ranks and scores agree;
 * - scores are posterior probabilities normalised over the nominal circuit and
 *   the explanations listed.
 * When the leading hypotheses predict the measured figures alike, or the
 * record leaves the part to rework undecided (UNDECIDED_ODDS), the diagnosis
 * says so and computes which further measurement separates them.
 */
import { findTopology } from '../../circuit/topologies/index.ts';
import { CoreError } from '../../errors.ts';
import { defaultUncertainty, OBSERVABLES, type ObservableName } from '../estimate/measurements.ts';
import { describeEstimate, type ParameterEstimate } from '../estimate/estimate.ts';
import type { PredictedFigures } from '../estimate/forward.ts';
import { cholesky, choleskyLogDet } from '../estimate/linalg.ts';
import { naturalSd, naturalValue, TOLERANCE_SIGMAS } from '../estimate/parameters.ts';
import { FLAT_SHAPE } from '../../parts/capacitor/dc-bias.ts';
import { solveMap } from '../estimate/map-lm.ts';
import { FIT_SEARCH, fitSubset, nominalChiSquare, type CircuitVariant, type FitSetup } from '../estimate/setup.ts';
import { chiSquareQuantile95, chiSquareQuantile999 } from './chi-square.ts';
import { buildHypotheses, pairHypothesis, type Hypothesis, type WrongPartKind } from './hypotheses.ts';
import { describeShift, formatNatural } from './wording.ts';

/** 'stray': a capacitance or leakage at a node that the circuit does not declare (stray-hypotheses.ts). */
export type FaultKind = 'off' | WrongPartKind | 'stray';

export interface Cause extends ParameterEstimate {
  /** |shift| within the tolerance band (parts) or the 3σ nuisance spread (others). */
  withinTolerance: boolean;
  fault: FaultKind;
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
  hypothesis: string;
  causes: Cause[];
  /** Posterior probability among the nominal circuit and the explanations listed, 0..1. */
  score: number;
  logEvidence: number;
  /** χ² this explanation leaves, allowing the other effects their tolerances. */
  residualChiSquare: number;
  measurementCount: number;
  /** Residual χ² within its 95 % bound. */
  accountsForMeasurements: boolean;
  /** Residual χ² within the 1e-3 goodness-of-fit bound. */
  passesGoodnessOfFit: boolean;
  residuals: ResidualEntry[];
  summary: string;
}

export interface SeparatingMeasurement {
  /** What to do, in words. */
  action: string;
  /** The figure that would separate them (an observable, a switching level, or the frequency after a part swap). */
  figure: string;
  /** What each hypothesis predicts for it. */
  predictions: { hypothesis: string; value: number }[];
  /** The predictions' difference over a typical bench uncertainty of that figure. */
  separationSigma: number;
}

export interface Ambiguity {
  /** Hypotheses the measurements cannot tell apart (the leader first). */
  hypotheses: string[];
  /** Largest distance of their predictions on the measured figures, in σ (other effects allowed their tolerances). */
  measuredSeparationSigma: number;
  statement: string;
  separatingMeasurement?: SeparatingMeasurement;
}

export interface Verdict {
  agreesWithNominal: boolean;
  /** χ² of the nominal circuit with every part at its nominal value. */
  nominalChiSquare: number;
  /** χ² of the nominal circuit allowing every effect its tolerance (what the verdict tests). */
  toleranceChiSquare: number;
  measurementCount: number;
  /** 95 % upper bound of χ² for that many measurements (Wilson–Hilferty). */
  chiSquareBound95: number;
  /** Posterior probability that nothing is off, among the hypotheses listed. */
  nominalScore: number;
  statement: string;
}

export interface Diagnosis {
  verdict: Verdict;
  explanations: Explanation[];
  /** Leading hypotheses the measurements cannot separate, with the measurement that would. */
  ambiguities: Ambiguity[];
  candidateCount: number;
}

export interface DiagnoseOptions {
  /** 1: single causes only; 2 (default): pairs too. */
  maxCauses?: 1 | 2;
  /** How many explanations to return (default 8). */
  maxExplanations?: number;
}

/** Single `off` causes combined into pairs: the best this many (our bound on the cost). */
const PAIR_POOL = 6;
/** Nuisance sensitivities by a step of this many prior σ. */
const NUISANCE_STEP = 0.3;
/**
 * The in-tolerance spread of the other effects is marginalised in the linear
 * approximation (the columns of J). Around the nominal circuit that is right
 * for every hypothesis that stays near it, but a figure's sensitivity to a
 * part (in measurement σ) moves with the circuit: a timing part a decade off
 * makes a tenfold frequency, and the same 1 % spread of the other timing part
 * then moves it by ten times as many hertz. Weighed with the nominal's
 * columns, a wrong part that is exactly what was fitted leaves a residual its
 * in-tolerance neighbours would explain (hundreds of σ on the frequency), and
 * a continuous `off` cause that absorbs the scatter in its free value wins
 * instead — the Laplace approximation must be taken where the hypothesis puts
 * the circuit (MacKay, ch. 27–28). A wrong part that moves a value by more
 * than this factor is therefore marginalised with the columns of its own
 * circuit; below it (the neighbouring values of the stocked series, steps of
 * 5–21 %) the columns change by about the step, a second-order change of χ²
 * not worth a further walk per effect.
 */
const LOCAL_COLUMNS_RATIO = 1.5;
/** A hypothesis counts as a contender at this share of the leader's posterior (our choice). */
const CONTENDER_SHARE = 0.2;
/**
 * A hypothesis that fits the measurements as well as the leader (residual χ²
 * at most this much above it) is a contender too, whatever its prior: a sharp
 * wrong-part hypothesis can outscore a part that is off by the same amount on
 * priors and Occam factors alone, and then only another measurement decides.
 */
const CONTENDER_CHI_SQUARE = 1;
/** Predictions closer than this on every measured figure, in σ, cannot be told apart (our choice). */
const SEPARABLE_SIGMA = 1;
/**
 * Posterior odds of the leader over a contender that blames another part,
 * below which the measurements have not decided which part to rework:
 * Jeffreys' scale (Theory of Probability, 3rd ed., appendix B) calls a Bayes
 * factor under √10 "barely worth mentioning". Their predictions may lie a
 * little over SEPARABLE_SIGMA apart (a decade slip of the timing resistor
 * loads the output a few tens of millivolts more than one of the capacitor),
 * yet with the board's noise the record sits between them; naming the leader
 * alone would send the engineer to one joint on odds near even.
 */
const UNDECIDED_ODDS = Math.sqrt(10);
const LN_GOF_CAP = Math.log(1000);

interface Scored {
  h: Hypothesis;
  x: Float64Array;
  /** The circuit variant the hypothesis was weighed on (a stray hypothesis: with its fitted stray). */
  variant?: CircuitVariant;
  /** A scalar hypothesis' fitted value (fitted space of its parameter: a stray, a dielectric's C(V) scale). */
  scalarX?: number;
  /** Posterior covariance of the active parameters (fitted space). */
  covariance: Float64Array;
  chiSquare: number;
  logEvidence: number;
  passes: boolean;
  /**
   * The nuisance whitening of the hypothesis' circuit, every effect's spread allowed for: distances to it are
   * read in it. The nominal's (`all`) unless a wrong part moves the circuit far (LOCAL_COLUMNS_RATIO): then its own.
   */
  whiten: (r: Float64Array) => Float64Array;
}

export function residualEntries(setup: FitSetup, fig: PredictedFigures): ResidualEntry[] {
  return setup.measurements.map((m) => {
    const predicted = fig[m.name];
    return { measurement: m.name, measured: m.value, predicted, uncertainty: m.uncertainty, normalized: (predicted - m.value) / m.uncertainty };
  });
}

/** Whitening by C = I + Σ_{j∈S} J_j J_jᵀ: returns the transform and ln det C. */
function whitener(columns: readonly Float64Array[], m: number, excluded: readonly number[]): { whiten: (r: Float64Array) => Float64Array; logDet: number } | undefined {
  const c = new Float64Array(m * m);
  for (let i = 0; i < m; i++) c[i * m + i] = 1;
  columns.forEach((col, j) => {
    if (excluded.includes(j)) return;
    for (let p = 0; p < m; p++) for (let q = 0; q < m; q++) c[p * m + q] += col[p] * col[q];
  });
  const l = cholesky(c, m);
  if (!l) return undefined; // columns that overflow (a circuit at the edge of oscillating): no covariance to whiten by
  const whiten = (r: Float64Array) => {
    const y = new Float64Array(m);
    for (let i = 0; i < m; i++) {
      let s = r[i];
      for (let k = 0; k < i; k++) s -= l[i * m + k] * y[k];
      y[i] = s / l[i * m + i];
    }
    return y;
  };
  return { whiten, logDet: choleskyLogDet(l, m) };
}

const sumSq = (v: ArrayLike<number>) => {
  let s = 0;
  for (let i = 0; i < v.length; i++) s += v[i] * v[i];
  return s;
};

export function diagnose(setup: FitSetup, options: DiagnoseOptions = {}): Diagnosis {
  return diagnoseWithLeader(setup, options).diagnosis;
}

/**
 * The diagnosis and the leading hypothesis' parameter vector (fitted space;
 * a wrong part enters as its log ratio to the nominal): the full estimate
 * starts there, next to its optimum, instead of at the nominal.
 */
export function diagnoseWithLeader(setup: FitSetup, options: DiagnoseOptions = {}): { diagnosis: Diagnosis; leaderX: Float64Array } {
  const params = setup.parameters;
  const m = setup.measurements.length;
  const maxCauses = options.maxCauses ?? 2;
  const maxExplanations = options.maxExplanations ?? 8;

  // Sensitivity of the normalised residuals to each effect's nuisance spread (one prior σ), at a parameter
  // vector and circuit variant (the nominal circuit unless a hypothesis places another part).
  const nuisanceColumns = (at: Float64Array, variant?: CircuitVariant, r0 = setup.residualsAt(at, variant)): Float64Array[] => {
    return params.map((p, j) => {
      const x = Float64Array.from(at);
      x[j] += NUISANCE_STEP * p.priorSd;
      let rp: Float64Array;
      try {
        rp = setup.residualsAt(x, variant);
      } catch {
        return new Float64Array(m);
      }
      return Float64Array.from(rp, (v, i) => (Number.isFinite(v) ? (v - r0[i]) / NUISANCE_STEP : 0));
    });
  };
  const columns = nuisanceColumns(setup.nominalX);
  const movesFar = (variant: CircuitVariant) =>
    Object.entries(variant.parts ?? {}).some(([role, value]) => Math.abs(Math.log(value / setup.circuit.parts[role])) > Math.log(LOCAL_COLUMNS_RATIO));
  const all = whitener(columns, m, [])!;

  const score = (h: Hypothesis): Scored | undefined => {
    // A hypothesis that widens a nuisance (another part's tolerance) is whitened by its own covariance.
    const widened = h.nuisanceSd;
    const widen = (base: readonly Float64Array[]) => (widened ? base.map((c, j) => (widened[j] === undefined ? c : c.map((v) => (v * widened[j]) / params[j].priorSd))) : base);
    // A wrong part far from the nominal value is marginalised around its own circuit (LOCAL_COLUMNS_RATIO); where
    // its circuit's sensitivities overflow (it barely oscillates) the nominal's columns stand in, as before.
    const whitenerOf = (r0?: Float64Array): { w: NonNullable<ReturnType<typeof whitener>>; local: boolean } => {
      if (h.variant && movesFar(h.variant)) {
        const local = whitener(widen(nuisanceColumns(setup.nominalX, h.variant, r0)), m, []);
        if (local) return { w: local, local: true };
      }
      return { w: widened ? whitener(widen(columns), m, [])! : all, local: false };
    };
    if (h.scalar) return scoreScalar(setup, h, whitenerOf().w, m, all.whiten);
    if (h.kind !== 'off' && h.active.length === 0) {
      let r: Float64Array;
      try {
        r = setup.residualsAt(setup.nominalX, h.variant);
      } catch {
        return undefined; // the wrong part stops the oscillation: not what was measured
      }
      const { w, local } = whitenerOf(r);
      const chi = sumSq(w.whiten(r));
      if (!Number.isFinite(chi)) return undefined;
      return { h, x: setup.nominalX, ...(h.variant ? { variant: h.variant } : {}), covariance: new Float64Array(0), chiSquare: chi, logEvidence: h.logPrior - 0.5 * chi - 0.5 * w.logDet, passes: chi <= chiSquareQuantile999(m), whiten: local ? w.whiten : all.whiten };
    }
    const w = whitener(columns, m, h.active)!;
    try {
      const fit = fitSubset(setup, h.active, { priorSd: h.active.map((j) => params[j].offSd), transform: w.whiten, maxIterations: 30, ...(h.variant ? { variant: h.variant } : {}) });
      const s = fit.solution;
      const logEvidence = h.logPrior - 0.5 * (s.dataChiSquare + s.priorChiSquare) - 0.5 * s.logDetNormal - 0.5 * w.logDet;
      return { h, x: fit.x, ...(h.variant ? { variant: h.variant } : {}), covariance: s.covariance, chiSquare: s.dataChiSquare, logEvidence, passes: s.dataChiSquare <= chiSquareQuantile999(Math.max(1, m - h.active.length)), whiten: all.whiten };
    } catch {
      return undefined;
    }
  };

  const hypotheses = buildHypotheses(setup.circuit, params);
  const scored: Scored[] = [];
  for (const h of hypotheses) {
    const s = score(h);
    if (s) scored.push(s);
  }
  // A second cause must earn its place: pairs are weighed only when no single hypothesis accounts for the measurements.
  const singleAccounts = scored.some((s) => s.chiSquare <= chiSquareQuantile95(Math.max(1, m - s.h.active.length)));
  if (maxCauses >= 2 && !singleAccounts) {
    const singles = scored.filter((s) => s.h.kind === 'off').sort((a, b) => b.logEvidence - a.logEvidence).slice(0, PAIR_POOL);
    for (let a = 0; a < singles.length; a++) {
      for (let b = a + 1; b < singles.length; b++) {
        const s = score(pairHypothesis(singles[a].h, singles[b].h, params));
        if (s) scored.push(s);
      }
    }
  }
  // Goodness of fit first: a failing hypothesis gets at most 1/1000 of the weakest passing one's evidence.
  const passing = scored.filter((s) => s.passes);
  if (passing.length > 0) {
    const floor = Math.min(...passing.map((s) => s.logEvidence)) - LN_GOF_CAP;
    for (const s of scored) if (!s.passes) s.logEvidence = Math.min(s.logEvidence, floor);
  }
  scored.sort((a, b) => b.logEvidence - a.logEvidence);
  const nominal = scored.find((s) => s.h.kind === 'nominal');
  if (!nominal) {
    // The nominal circuit could not even be weighed: a measured figure so far from any oscillator this
    // circuit can be (e.g. a frequency of 1e-300 Hz) that its normalised residual overflows.
    throw new CoreError(
      'invalid-value',
      'The measurements are too far from the circuit to be weighed (the nominal χ² is not finite): check the measured figures and their units',
      '/measurements',
    );
  }
  const faults = scored.filter((s) => s.h.kind !== 'nominal').slice(0, maxExplanations);
  const listed = [nominal, ...faults];
  const top = Math.max(...listed.map((s) => s.logEvidence));
  const total = listed.reduce((acc, s) => acc + Math.exp(s.logEvidence - top), 0);
  const posterior = (s: Scored) => Math.exp(s.logEvidence - top) / total;

  const bound95 = chiSquareQuantile95(m);
  const figuresOf = (s: Scored) => setup.figuresAt(s.x, s.variant);
  const figureCache = new Map<Scored, PredictedFigures>();
  const figs = (s: Scored) => {
    let f = figureCache.get(s);
    if (!f) figureCache.set(s, (f = figuresOf(s)));
    return f;
  };

  const explanations: Explanation[] = faults.map((s, k) => {
    const causes = causesOf(setup, s);
    const words = causes.map((c) => c.text).join('; and ');
    const dof = Math.max(1, m - s.h.active.length);
    const accounts = s.chiSquare <= chiSquareQuantile95(dof);
    return {
      rank: k + 1,
      hypothesis: s.h.id,
      causes,
      score: posterior(s),
      logEvidence: s.logEvidence,
      residualChiSquare: s.chiSquare,
      measurementCount: m,
      accountsForMeasurements: accounts,
      passesGoodnessOfFit: s.passes,
      residuals: residualEntries(setup, figs(s)),
      summary: accounts
        ? `${words}: accounts for the measurements (χ² ${s.chiSquare.toPrecision(3)} for ${m}, other parts within their tolerances)`
        : `${words}: leaves χ² ${s.chiSquare.toPrecision(3)} for ${m} measurements (95 % bound ${chiSquareQuantile95(dof).toPrecision(3)})${s.passes ? '' : ', failing the goodness-of-fit test at the 1e-3 level'}`,
    };
  });

  // Contenders the measured figures cannot separate from the leader.
  const ambiguities: Ambiguity[] = [];
  const leader = listed.reduce((a, b) => (b.logEvidence > a.logEvidence ? b : a));
  const contenders = listed.filter((s) => s !== leader && (posterior(s) >= CONTENDER_SHARE * posterior(leader) || (leader.h.kind !== 'nominal' && s.passes && s.chiSquare <= leader.chiSquare + CONTENDER_CHI_SQUARE)));
  if (contenders.length > 0) {
    // Distance of two hypotheses' predictions on the measured figures, in σ, the in-tolerance
    // spread of the other effects allowed for (whitened by the same covariance as the evidence).
    const residualsOf = (s: Scored) => setup.residualsAt(s.x, s.variant);
    const rl = residualsOf(leader);
    const alike: { s: Scored; sep: number; otherPart: boolean }[] = [];
    const leaderRoles = new Set(params.filter((p) => p.kind === 'part' && blames(setup, leader, p.name)).map((p) => p.name));
    for (const c of contenders) {
      const rc = residualsOf(c);
      const sep = Math.sqrt(sumSq(leader.whiten(Float64Array.from(rl, (v, i) => v - rc[i]))));
      const otherPart = leader.h.kind !== 'nominal' && params.some((p) => p.kind === 'part' && !leaderRoles.has(p.name) && blames(setup, c, p.name));
      const undecided = otherPart && c.passes && posterior(c) * UNDECIDED_ODDS >= posterior(leader);
      if (sep < SEPARABLE_SIGMA || undecided) alike.push({ s: c, sep, otherPart });
    }
    // A look-alike that blames another part first: the measurement that tells which joint to rework matters more
    // than one that tells how far the same part is off (the separating measurement is sought for the first).
    alike.sort((a, b) => Number(b.otherPart) - Number(a.otherPart));
    if (alike.length > 0) {
      const names = [leader, ...alike.map((a) => a.s)].map((s) => s.h.id);
      const best = separatingMeasurement(setup, leader, alike[0].s, figs);
      const label = (s: Scored) => (s.h.kind === 'nominal' ? 'nothing off' : causesOf(setup, s).map((c) => c.parameter + (c.fault === 'off' ? '' : ` (${c.fault})`)).join(' + '));
      const group = [leader, ...alike.map((a) => a.s)];
      // The odds against the strongest look-alike that is told apart by the evidence only (not by its predictions).
      const apart = alike.filter((a) => a.sep >= SEPARABLE_SIGMA);
      const undecidedOdds = apart.length === 0 ? undefined : posterior(leader) / Math.max(...apart.map((a) => posterior(a.s)));
      const statement =
        `The measured figures cannot tell ${label(leader)} from ${alike.map((a) => label(a.s)).join(', ')} (their predictions differ by at most ${Math.max(...alike.map((a) => a.sep)).toPrecision(2)} σ` +
        (undecidedOdds === undefined ? ').' : `; the record favours ${label(leader)} by odds of only ${undecidedOdds.toPrecision(2)} : 1).`) +
        whyAlike(setup, group) +
        (best ? ` To separate them: ${separationWords(best)}.` : '');
      const amb: Ambiguity = { hypotheses: names, measuredSeparationSigma: Math.max(...alike.map((a) => a.sep)), statement };
      if (best) amb.separatingMeasurement = best;
      ambiguities.push(amb);
      // A stray at N among them: the experiment that tells it from the timing capacitor, as an ambiguity of its own.
      const strayAtN = group.find((s) => s.h.stray?.field === 'timingNodeF');
      const capacitor = group.find((s) => s !== strayAtN && blames(setup, s, capacitorRoleOf(setup)));
      if (strayAtN && capacitor && !(best && [leader, alike[0].s].includes(strayAtN) && [leader, alike[0].s].includes(capacitor))) {
        const pair = separatingMeasurement(setup, capacitor, strayAtN, figs);
        const sep = Math.sqrt(sumSq(capacitor.whiten(Float64Array.from(residualsOf(capacitor), (v, i) => v - residualsOf(strayAtN)[i]))));
        const words = `The measured figures cannot tell ${label(capacitor)} from ${label(strayAtN)}.${whyAlike(setup, [capacitor, strayAtN])}${pair ? ` To separate them: ${separationWords(pair)}.` : ''}`;
        const extra: Ambiguity = { hypotheses: [capacitor.h.id, strayAtN.h.id], measuredSeparationSigma: sep, statement: words };
        if (pair) extra.separatingMeasurement = pair;
        ambiguities.push(extra);
      }
    }
    // The timing pair as a product: the leader blames one timing part (a value off, a wrong part) and a
    // contender that fits as well blames the other. When the two parts merely off predict alike, the
    // figures fix their product only, whatever the leader's sharper prior made of it: declared, with the
    // swap that tells them apart (the leader's own group above may not hold the contender: a wrong part's
    // fixed value predicts a little apart from both).
    const product = productAmbiguity(setup, leader, contenders, scored, alike.map((a) => a.s), residualsOf, leader.whiten, figs);
    if (product) ambiguities.push(product);
  }

  const tolChi = nominal.chiSquare;
  const agrees = leader === nominal && nominal.passes;
  const chiRaw = nominalChiSquare(setup);
  const best = explanations[0];
  let statement: string;
  if (agrees) {
    statement = `The measurements agree with the nominal circuit within its tolerances (χ² ${tolChi.toPrecision(3)} for ${m} measurement${m === 1 ? '' : 's'}, 95 % bound ${bound95.toPrecision(3)}).`;
  } else if (best === undefined) {
    statement = `The measurements depart from the nominal circuit (χ² ${tolChi.toPrecision(3)} for ${m}), and no hypothesis explains it.`;
  } else {
    const tail = best.passesGoodnessOfFit ? '' : ' No hypothesis passes the goodness-of-fit test: look for a further effect (wiring, a different part, a model limit).';
    statement =
      `The measurements depart from the nominal circuit (χ² ${tolChi.toPrecision(3)} for ${m} measurement${m === 1 ? '' : 's'} allowing the tolerances, 95 % bound ${bound95.toPrecision(3)}). ` +
      `Most plausible: ${best.causes.map((c) => c.text).join('; and ')} (probability ${best.score.toPrecision(2)}).${tail}` +
      (ambiguities.length > 0 ? ` ${ambiguities[0].statement}` : '');
  }
  const leaderX = Float64Array.from(leader.x);
  for (const [role, value] of Object.entries(leader.h.variant?.parts ?? {})) {
    const j = params.findIndex((p) => p.name === role);
    if (j >= 0) leaderX[j] = Math.log(value / params[j].nominal);
  }
  const diagnosis: Diagnosis = {
    verdict: {
      agreesWithNominal: agrees,
      nominalChiSquare: chiRaw,
      toleranceChiSquare: tolChi,
      measurementCount: m,
      chiSquareBound95: bound95,
      nominalScore: posterior(nominal),
      statement,
    },
    explanations,
    ambiguities,
    candidateCount: scored.length,
  };
  return { diagnosis, leaderX };
}

function causesOf(setup: FitSetup, s: Scored): Cause[] {
  const params = setup.parameters;
  if (s.h.kind === 'stray') {
    const stray = s.h.stray!;
    const p = stray.parameter;
    const e = describeEstimate(p, s.scalarX!, Math.sqrt(Math.max(0, s.covariance[0])));
    const found = e.estimate;
    // The estimate is the node's whole figure: what the circuit declares with the stray found added (a leakage in parallel).
    e.estimate = stray.strays(setup.circuit, found)[stray.field];
    // A leakage's nominal is no leakage (an infinite resistance): its shift is in conductance, as a slew rate's is in its reciprocal.
    e.shift = Number.isFinite(e.nominal) ? e.estimate - e.nominal : 1 / e.estimate;
    return [{ ...e, withinTolerance: false, fault: 'stray', text: stray.words(found) }];
  }
  if (s.h.kind === 'wrong-part') {
    const wp = s.h.wrongPart!;
    return wp.roles.map((role) => {
      const j = params.findIndex((p) => p.name === role);
      const p = params[j];
      const value = s.h.variant?.parts?.[role];
      if (value === undefined) {
        // A part of another kind, same marked value (another dielectric), its tolerance allowed for.
        const widened = s.h.nuisanceSd?.[j] ?? p.priorSd;
        const e = describeEstimate(p, 0, naturalSd(p, 0, widened));
        e.posteriorToPriorSd = 1;
        const what = s.h.scalar && s.scalarX !== undefined ? s.h.scalar.words(naturalValue(s.h.scalar.parameter, s.scalarX)) : wp.words;
        return { ...e, withinTolerance: false, fault: wp.kind, text: `${what}: ${formatNatural(p.unit, p.nominal)} marked, ±${Math.round(100 * (Math.exp(TOLERANCE_SIGMAS * widened) - 1))} % allowed` };
      }
      const e = describeEstimate(p, Math.log(value / p.nominal), 0);
      e.standardDeviation = naturalSd(p, Math.log(value / p.nominal), p.priorSd);
      e.posteriorToPriorSd = 1;
      return { ...e, withinTolerance: false, fault: wp.kind, text: `${wp.words}: ${formatNatural(p.unit, value)} instead of ${formatNatural(p.unit, p.nominal)}` };
    });
  }
  const k = s.h.active.length;
  return s.h.active.map((j, i) => {
    const p = params[j];
    const e = describeEstimate(p, s.x[j], Math.sqrt(Math.max(0, s.covariance[i * k + i])));
    return { ...e, withinTolerance: Math.abs(e.shiftInTolerances) <= 1, fault: 'off' as const, text: describeShift(e, p.label) };
  });
}

/** The topology's timing capacitor role. */
function capacitorRoleOf(setup: FitSetup): string {
  return findTopology(setup.circuit.topology)!.capacitorRole;
}

/** Whether a hypothesis blames a role (off, or a wrong part in it). */
function blames(setup: FitSetup, s: Scored, role: string): boolean {
  return (s.h.kind === 'off' && s.h.active.some((j) => setup.parameters[j].name === role)) || (s.h.wrongPart?.roles.includes(role) ?? false);
}

/**
 * Why alike, when the physics says so (not only the numbers): a capacitance at N
 * parallels the timing capacitor; a timing resistor and the capacitor meet
 * only as their product in every charging time constant; a capacitance at P
 * makes the capacitor turn before P reaches its new level (docs/model.md,
 * strays and leakage), a narrower hysteresis as a threshold resistor gives.
 */
function whyAlike(setup: FitSetup, group: readonly Scored[]): string {
  const topology = findTopology(setup.circuit.topology)!;
  const cap = topology.capacitorRole;
  const timingResistors = Object.entries(topology.roles).filter(([, r]) => r.kind === 'resistor' && r.purpose === 'timing').map(([name]) => name);
  const out: string[] = [];
  const hasCap = group.some((s) => blames(setup, s, cap));
  if (hasCap && group.some((s) => s.h.stray?.field === 'timingNodeF')) {
    out.push(`A capacitance at the timing node N is in parallel with ${cap}: no timing or waveform figure tells it from a larger ${cap}`);
  }
  const thresholdRole = Object.entries(topology.roles).find(([name, r]) => r.purpose === 'thresholds' && group.some((s) => blames(setup, s, name)))?.[0];
  if (thresholdRole && group.some((s) => s.h.stray?.field === 'thresholdNodeF')) {
    out.push(
      `A capacitance at the threshold node P delays P after each switch, so the capacitor turns before P reaches its new level: the hysteresis it sees narrows as with another ${thresholdRole}, and the figures measured on this board do not tell the two apart`,
    );
  }
  const resistor = timingResistors.find((r) => group.some((s) => blames(setup, s, r)));
  if (hasCap && resistor) out.push(`The timing follows the product ${resistor}·${cap} only: the waveform fixes the product, not the two values`);
  return out.length > 0 ? ` ${out.join('. ')}.` : '';
}

/** See the call: the product rTiming·cTiming (or a steered pair's resistor with the capacitor) when the leader's group misses it. */
function productAmbiguity(
  setup: FitSetup,
  leader: Scored,
  contenders: readonly Scored[],
  scored: readonly Scored[],
  alreadyAlike: readonly Scored[],
  residualsOf: (s: Scored) => Float64Array,
  whiten: (r: Float64Array) => Float64Array,
  figs: (s: Scored) => PredictedFigures,
): Ambiguity | undefined {
  if (leader.h.kind === 'nominal') return undefined;
  const topology = findTopology(setup.circuit.topology)!;
  const timingRoles = [topology.capacitorRole, ...Object.entries(topology.roles).filter(([, r]) => r.kind === 'resistor' && r.purpose === 'timing').map(([name]) => name)];
  const blamed = timingRoles.filter((r) => blames(setup, leader, r));
  if (blamed.length !== 1) return undefined;
  const own = scored.find((x) => x.h.id === `off:${blamed[0]}`);
  if (!own) return undefined;
  const distance = (a: Scored, b: Scored) => {
    const ra = residualsOf(a);
    const rb = residualsOf(b);
    return Math.sqrt(sumSq(whiten(Float64Array.from(ra, (v, i) => v - rb[i]))));
  };
  const other = contenders.find(
    (c) =>
      !alreadyAlike.includes(c) &&
      c.h.kind === 'off' &&
      c.h.active.length === 1 &&
      c.passes &&
      c.chiSquare <= leader.chiSquare + CONTENDER_CHI_SQUARE &&
      timingRoles.some((r) => r !== blamed[0] && blames(setup, c, r)) &&
      distance(own, c) < SEPARABLE_SIGMA,
  );
  if (!other) return undefined;
  const otherRole = timingRoles.find((r) => r !== blamed[0] && blames(setup, other, r))!;
  const best = separatingMeasurement(setup, leader, other, figs);
  const statement =
    `The measured figures fix the product ${blamed[0]}·${otherRole}, not which of the two is off: they cannot tell ${leader.h.id} from ${other.h.id} ` +
    `(${own.h.id} and ${other.h.id} predict them alike).` +
    (best ? ` To separate them: ${separationWords(best)}.` : '');
  const out: Ambiguity = { hypotheses: [leader.h.id, other.h.id, own.h.id].filter((id, i, all) => all.indexOf(id) === i), measuredSeparationSigma: distance(leader, other), statement };
  if (best) out.separatingMeasurement = best;
  return out;
}

function separationWords(best: SeparatingMeasurement): string {
  return `${best.action} — ${best.predictions.map((p) => `${p.hypothesis} predicts ${formatFigure(best.figure, p.value)}`).join(', ')} (${best.separationSigma.toPrecision(2)} σ apart)`;
}

const PROBE_FIGURES: Record<string, string> = {
  upperThresholdV: 'probe node P (the non-inverting input) and read its upper switching level',
  lowerThresholdV: 'probe node P (the non-inverting input) and read its lower switching level',
};

function formatFigure(figure: string, value: number): string {
  if (figure.endsWith('V')) return formatNatural('V', value);
  if (figure.endsWith('S')) return formatNatural('s', value);
  if (figure.startsWith('frequencyHz')) return `${Number(value.toPrecision(5))} Hz`;
  return Number(value.toPrecision(4)).toString();
}

/**
 * The measurement that best separates two hypotheses: each figure not yet
 * measured (a scope figure, or node P's switching levels), and each "fit a
 * part of known value in role r, then measure the frequency" experiment,
 * scored by the difference of the two predictions over a typical bench
 * uncertainty of that figure (defaultUncertainty: cursor readouts).
 */
function separatingMeasurement(setup: FitSetup, a: Scored, b: Scored, figs: (s: Scored) => PredictedFigures): SeparatingMeasurement | undefined {
  const measured = new Set(setup.measurements.map((m) => m.name));
  const fa = figs(a);
  const fb = figs(b);
  const candidates: SeparatingMeasurement[] = [];
  const nameOf = (s: Scored) => s.h.id;
  for (const name of OBSERVABLES) {
    if (measured.has(name)) continue;
    const u = defaultUncertainty(name as ObservableName, fa[name]);
    if (!(u > 0)) continue;
    candidates.push({
      action: `measure ${name}`,
      figure: name,
      predictions: [{ hypothesis: nameOf(a), value: fa[name] }, { hypothesis: nameOf(b), value: fb[name] }],
      separationSigma: Math.abs(fa[name] - fb[name]) / u,
    });
  }
  for (const name of ['upperThresholdV', 'lowerThresholdV'] as const) {
    const u = defaultUncertainty('capacitorMaxV', fa[name]);
    candidates.push({ action: PROBE_FIGURES[name], figure: name, predictions: [{ hypothesis: nameOf(a), value: fa[name] }, { hypothesis: nameOf(b), value: fb[name] }], separationSigma: Math.abs(fa[name] - fb[name]) / u });
  }
  // Swap experiments: a known part in role r restores what r was blamed for, and nothing else.
  for (const p of setup.parameters) {
    if (p.kind !== 'part') continue;
    const known = { [p.name]: p.nominal };
    // A known capacitor is the part as declared (its own C(V)), whatever the hypothesis says the fitted one is.
    const isCapacitor = p.unit === 'F';
    try {
      const at = (s: Scored) => {
        const x = Float64Array.from(s.x);
        const j = setup.parameters.indexOf(p);
        x[j] = 0;
        const shape = isCapacitor ? (setup.circuit.capacitorShape ?? FLAT_SHAPE) : s.variant?.capacitorShape;
        // A stray stays where it is: the swap changes the part, not the board around it.
        const law = isCapacitor ? undefined : s.variant?.capacitorScaleV;
        return setup.figuresAt(x, {
          parts: { ...s.variant?.parts, ...known },
          ...(shape ? { capacitorShape: shape } : {}),
          ...(law !== undefined ? { capacitorScaleV: law } : {}),
          ...(s.variant?.strays ? { strays: s.variant.strays } : {}),
        }).frequencyHz;
      };
      const va = at(a);
      const vb = at(b);
      const u = defaultUncertainty('frequencyHz', va);
      candidates.push({
        action: `fit a ${p.unit === 'F' ? 'capacitor' : 'resistor'} of known value (${formatNatural(p.unit, p.nominal)}, measured) as ${p.name} and measure the frequency`,
        figure: `frequencyHz with a known ${p.name}`,
        predictions: [{ hypothesis: nameOf(a), value: va }, { hypothesis: nameOf(b), value: vb }],
        separationSigma: Math.abs(va - vb) / u,
      });
    } catch {
      // that swap stops the oscillation under one hypothesis: not a useful experiment
    }
  }
  const finite = candidates.filter((c) => Number.isFinite(c.separationSigma));
  if (finite.length === 0) return undefined;
  const best = finite.reduce((x, y) => (y.separationSigma > x.separationSigma ? y : x));
  return best.separationSigma >= SEPARABLE_SIGMA ? best : undefined;
}


/** Starting points tried across a scalar's window (fitted space) before the search: its response is far from linear there. */
const SCALAR_STARTS = [-4, -2, 0, 2, 4];
/**
 * Search steps of a scalar's fit from the best of its starts. One unknown: a
 * few Newton-like steps from a start within a fifth of the window reach the
 * optimum to well below its posterior width; what the 30 of a many-parameter
 * fit added was creep at a window edge, where the logistic flattens and the
 * evidence no longer moves (and each trial of a C(V) curve is a costly walk).
 */
const SCALAR_ITERATIONS = 4;
/**
 * A scalar's search also ends when a rejected step has shrunk below this many
 * posterior widths: the optimum is then known to far better than its width
 * (the solver's default, 1e-10, spent some 17 more walks per fit halving a
 * step that the walk's own precision kept rejecting).
 */
const SCALAR_STEP_TOLERANCE = 1e-2;

/**
 * A hypothesis with one scalar of its own (a stray at N, a dielectric's C(V)
 * scale): the scalar fitted by MAP within its window (log-logit space, its
 * near-flat prior), every other effect marginalised within its tolerance (the
 * hypothesis' whitener) like any single cause; evidence by the same Laplace formula.
 */
function scoreScalar(setup: FitSetup, h: Hypothesis, w: { whiten: (r: Float64Array) => Float64Array; logDet: number }, m: number, nominalWhiten: (r: Float64Array) => Float64Array): Scored | undefined {
  const scalar = h.scalar!;
  const p = scalar.parameter;
  const variantAt = (x: number): CircuitVariant => scalar.variantAt(naturalValue(p, x));
  // The search's first evaluation is at the best start, already walked while choosing it: kept, not walked again
  // (the same value gives the same walk, so nothing changes but the cost).
  const walked = new Map<number, Float64Array>();
  const residuals = (xs: Float64Array) => {
    const known = walked.get(xs[0]);
    if (known) return known;
    const r = w.whiten(setup.residualsAt(setup.nominalX, variantAt(xs[0])));
    if (walked.size < (scalar.starts ?? SCALAR_STARTS).length) walked.set(xs[0], r);
    return r;
  };
  let start = p.priorMean;
  let best = Infinity;
  for (const x0 of scalar.starts ?? SCALAR_STARTS) {
    try {
      const cost = sumSq(residuals(Float64Array.of(x0))) + ((x0 - p.priorMean) / p.priorSd) ** 2;
      if (cost < best) {
        best = cost;
        start = x0;
      }
    } catch {
      // this value stops the oscillation: not a start
    }
  }
  if (!Number.isFinite(best)) return undefined;
  try {
    const s = solveMap({ size: 1, priorMean: [p.priorMean], priorSd: [p.priorSd], residuals, start: [start] }, { ...FIT_SEARCH, stepTolerance: SCALAR_STEP_TOLERANCE, maxIterations: scalar.iterations ?? SCALAR_ITERATIONS });
    const x = s.x[0];
    const logEvidence = h.logPrior - 0.5 * (s.dataChiSquare + s.priorChiSquare) - 0.5 * s.logDetNormal - 0.5 * w.logDet;
    return { h, x: setup.nominalX, variant: variantAt(x), scalarX: x, covariance: s.covariance, chiSquare: s.dataChiSquare, logEvidence, passes: s.dataChiSquare <= chiSquareQuantile999(Math.max(1, m - 1)), whiten: nominalWhiten };
  } catch {
    return undefined;
  }
}
