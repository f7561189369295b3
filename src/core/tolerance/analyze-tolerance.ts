/**
 * Tolerance, temperature and supply analysis of one circuit: nominal, worst
 * case over the corners, Monte Carlo with percentiles and yield, sensitivities
 * and the first-order variance budget. Pure and synchronous: the HTTP layer
 * runs it in a worker thread.
 */
import { binValues } from '../plot/bin-values.ts';
import { EVALUATION_STATUS, OUTPUT_LENGTH } from '../circuit/engine/prepared.ts';
import { CoreError } from '../errors.ts';
import { checkSigmaPerTolerance, DEFAULT_SIGMA_PER_TOLERANCE, drawSamples } from './monte-carlo.ts';
import { createSampleEvaluator } from './sample-evaluator.ts';
import { parameterSensitivities, varianceBudget } from './sensitivity.ts';
import { summarize, wilsonInterval } from './statistics.ts';
import type { FrequencySpec, MonteCarloResult, PartSensitivity, ToleranceRequest, ToleranceResult, VariationKind } from './types.ts';
import { defaultClock, evaluationCostReason, monteCarloPilot, type AnalysisTimeBudget } from './time-budget.ts';
import { buildVariationModel } from './variation-model.ts';
import { worstCaseSearch } from './worst-case.ts';

/** Most Monte Carlo samples one request may ask for, whatever the model (the prepared walk keeps 1e6 within seconds). */
export const MONTE_CARLO_SAMPLE_CAP = 1_000_000;
export const DEFAULT_MONTE_CARLO = { samples: 10_000, seed: 1, distribution: 'normal' as const };
export const MAX_HISTOGRAM_BINS = 1000;

/** Sources that belong to one part alone (they make up that part's variance share). */
const OWN_KINDS: ReadonlySet<VariationKind> = new Set(['part-tolerance', 'tracking-residual', 'tempco-spread', 'dielectric-band', 'ageing']);

function checkSpec(spec: FrequencySpec): void {
  if (!(spec.frequencyHz > 0) || !Number.isFinite(spec.frequencyHz)) throw new CoreError('invalid-value', 'spec.frequencyHz must be > 0', '/spec/frequencyHz');
  if (!(spec.frequencyTolerance >= 0 && spec.frequencyTolerance < 1)) {
    throw new CoreError('invalid-value', 'spec.frequencyTolerance is a fraction from 0 up to 1', '/spec/frequencyTolerance');
  }
  const lo = spec.dutyMin ?? 0;
  const hi = spec.dutyMax ?? 1;
  if (!(lo >= 0 && lo <= 1)) throw new CoreError('invalid-value', 'spec.dutyMin is a fraction 0..1', '/spec/dutyMin');
  if (!(hi >= 0 && hi <= 1)) throw new CoreError('invalid-value', 'spec.dutyMax is a fraction 0..1', '/spec/dutyMax');
  if (!(hi >= lo)) throw new CoreError('invalid-value', 'spec.dutyMax must not be below dutyMin', '/spec/dutyMax');
}

/** Options after defaults; exported so callers (and the route) can refuse a request before queuing it. */
export function monteCarloOptions(request: ToleranceRequest) {
  const mc: NonNullable<ToleranceRequest['monteCarlo']> = request.monteCarlo ?? DEFAULT_MONTE_CARLO;
  const samples = mc.samples;
  const cap = MONTE_CARLO_SAMPLE_CAP;
  if (!Number.isInteger(samples) || samples < 1) throw new CoreError('invalid-value', 'monteCarlo.samples must be a positive integer', '/monteCarlo/samples');
  if (samples > cap) {
    throw new CoreError(
      'limit-exceeded',
      `monteCarlo.samples is limited to ${cap}`,
      '/monteCarlo/samples',
      { limit: cap, requested: samples },
    );
  }
  const seed = mc.seed ?? DEFAULT_MONTE_CARLO.seed;
  if (!Number.isSafeInteger(seed)) throw new CoreError('invalid-value', 'monteCarlo.seed must be an integer', '/monteCarlo/seed');
  const distribution = mc.distribution ?? DEFAULT_MONTE_CARLO.distribution;
  const sigmaPerTolerance = mc.sigmaPerTolerance ?? DEFAULT_SIGMA_PER_TOLERANCE;
  return { samples, seed, distribution, sigmaPerTolerance };
}

/**
 * Which parts of the analysis to compute. Nominal and worst case always run; each part left out
 * (false) is skipped with its inputs: its fields are absent from the result, and its request
 * options are neither used nor checked (monteCarlo.samples/seed and histogramBins for Monte Carlo).
 * A part left out changes nothing in the others: each runs on its own buffers, so the worst case
 * of a worst-case-only run is the full run's, number for number.
 */
export interface ToleranceParts {
  /** Monte Carlo: samples, percentiles, yield, the histogram and the samples-latch note (default true). */
  monteCarlo?: boolean;
  /** Per-part sensitivities, the first-order variance budget and linearEstimate (default true). */
  sensitivities?: boolean;
}

export interface ToleranceRunOptions {
  /** Keep the raw samples in the result (tests and benchmarks; never sent over HTTP). */
  keepSamples?: boolean;
  /** Parts to compute (default: all). With this option the result type marks them optional. */
  parts?: ToleranceParts;
  /**
   * Time the caller allows the analysis (time-budget.ts): Monte Carlo times its first samples and refuses
   * with limit-exceeded at /monteCarlo/samples when the projected run would not fit. Absent: no limit.
   */
  budget?: AnalysisTimeBudget;
}

export interface ToleranceRun extends ToleranceResult {
  samples?: { frequencyHz: Float64Array; dutyCycle: Float64Array };
}

/** Fields that belong to a part that may be left out (ToleranceParts). */
type OptionalPartFields = 'monteCarlo' | 'sensitivities' | 'varianceSources' | 'linearEstimate';

/** A run with `parts` given: the parts' fields are present exactly when the part ran. */
export type PartialToleranceRun = Omit<ToleranceRun, OptionalPartFields> & Partial<Pick<ToleranceRun, OptionalPartFields>>;

/** The variance budget's distribution when Monte Carlo is left out (its sample options are then not checked). */
function budgetDistribution(request: ToleranceRequest) {
  const distribution = request.monteCarlo?.distribution ?? DEFAULT_MONTE_CARLO.distribution;
  const sigmaPerTolerance = request.monteCarlo?.sigmaPerTolerance ?? DEFAULT_SIGMA_PER_TOLERANCE;
  checkSigmaPerTolerance(sigmaPerTolerance);
  return { distribution, sigmaPerTolerance };
}

export function runToleranceAnalysis(request: ToleranceRequest, options?: ToleranceRunOptions & { parts?: undefined }): ToleranceRun;
export function runToleranceAnalysis(request: ToleranceRequest, options: ToleranceRunOptions): PartialToleranceRun;
export function runToleranceAnalysis(request: ToleranceRequest, options: ToleranceRunOptions = {}): PartialToleranceRun {
  const wantMonteCarlo = options.parts?.monteCarlo ?? true;
  const wantSensitivities = options.parts?.sensitivities ?? true;
  const clock = options.budget?.clock ?? defaultClock;
  const startedMs = clock();
  const evaluator = withPrefix('/circuit', () => createSampleEvaluator(request.circuit, request.model ?? 'auto'));
  const model = buildVariationModel(request, evaluator.parameters, evaluator.nominal, evaluator.model);
  if (request.spec) checkSpec(request.spec);
  const mcOptions = wantMonteCarlo ? monteCarloOptions(request) : undefined;
  if (wantMonteCarlo && request.histogramBins !== undefined && !(Number.isInteger(request.histogramBins) && request.histogramBins >= 1 && request.histogramBins <= MAX_HISTOGRAM_BINS)) {
    throw new CoreError('invalid-value', `histogramBins must be an integer 1..${MAX_HISTOGRAM_BINS}`, '/histogramBins');
  }

  const out = new Float64Array(OUTPUT_LENGTH);
  const values = new Float64Array(model.nominal.length);
  model.apply(model.referencePoint(), values);
  if (evaluator.evaluate(values, out) !== EVALUATION_STATUS.ok) {
    throw new CoreError('no-oscillation', 'The nominal circuit does not oscillate with this model', '/circuit');
  }
  const nominal = { frequencyHz: 1 / out[0], dutyCycle: out[1] };

  const worstCase = worstCaseSearch(model, evaluator, request.spec);
  const timeBudget = options.budget;
  const pilot = timeBudget && mcOptions
    ? monteCarloPilot(
        {
          requestedSamples: mcOptions.samples,
          // parameterSensitivities: two per parameter; varianceBudget: two per dimension.
          laterEvaluations: wantSensitivities ? 2 * (model.parameters.length + model.dimensions.length) : 0,
          limitMs: timeBudget.limitMs,
          costReason: evaluationCostReason(request.circuit, evaluator.model === 'time-domain'),
          ...(timeBudget.alternative ? { alternative: timeBudget.alternative } : {}),
        },
        () => clock() - startedMs,
      )
    : undefined;
  const drawn = mcOptions ? drawSamples(model, evaluator, mcOptions, pilot, clock) : undefined;
  const monteCarlo = drawn && mcOptions ? monteCarloResult(drawn, mcOptions, request.spec) : undefined;

  let sensitivities: PartSensitivity[] | undefined;
  let budget: ReturnType<typeof varianceBudget> | undefined;
  if (wantSensitivities) {
    const { distribution, sigmaPerTolerance } = mcOptions ?? budgetDistribution(request);
    const b = varianceBudget(evaluator, model, distribution, sigmaPerTolerance);
    budget = b;
    sensitivities = parameterSensitivities(evaluator, model).map((s) => {
      const i = evaluator.indexOf(s.role);
      const own = b.sources.filter((src) => {
        const dim = model.dimensions.find((d) => d.name === src.source)!;
        return OWN_KINDS.has(dim.kind) && dim.targets.length === 1 && dim.targets[0] === i;
      });
      return { ...s, varianceShare: own.reduce((a, c) => a + c.share, 0) };
    });
    sensitivities.sort((a, c) => Math.abs(c.sensitivity) - Math.abs(a.sensitivity));
  }

  const notes = [...model.notes];
  if (worstCase.latchedCorners > 0) {
    notes.push({ code: 'corners-latch', message: `${worstCase.latchedCorners} corner(s) of the tolerance box do not oscillate: the design has no margin there` });
  }
  if (drawn && mcOptions && drawn.latched > 0) {
    notes.push({ code: 'samples-latch', message: `${drawn.latched} of ${mcOptions.samples} Monte Carlo samples do not oscillate (counted as failing)` });
  }
  if (model.dimensions.length === 0) notes.push({ code: 'nothing-varies', message: 'No tolerance, temperature, supply or amplifier spread was given: every sample is the nominal circuit' });

  // Field order as before (model, nominal, worstCase, monteCarlo, sensitivities, ...): JSON answers keep their shape.
  const result: PartialToleranceRun = {
    model: evaluator.model,
    modelEffects: [...evaluator.effects],
    nominal,
    worstCase,
    ...(monteCarlo ? { monteCarlo } : {}),
    ...(sensitivities && budget
      ? { sensitivities, varianceSources: budget.sources, linearEstimate: { frequencyRelativeStd: budget.relativeStd } }
      : {}),
    temperatureModels: model.temperatureModels,
    temperatureDrifts: model.temperatureDrifts,
    ageing: model.ageing,
    notes,
  };
  if (drawn && monteCarlo && request.histogramBins !== undefined) result.histogram = histogram(drawn.frequencyHz, request.histogramBins, monteCarlo, request.spec);
  if (drawn && options.keepSamples) result.samples = { frequencyHz: drawn.frequencyHz, dutyCycle: drawn.dutyCycle };
  return result;
}

function monteCarloResult(
  drawn: ReturnType<typeof drawSamples>,
  options: ReturnType<typeof monteCarloOptions>,
  spec: FrequencySpec | undefined,
): MonteCarloResult {
  const n = options.samples;
  let yieldValue: number | null = null;
  let yieldDetail: MonteCarloResult['yieldDetail'] = null;
  if (spec) {
    let passing = 0;
    let frequencyPass = 0;
    let dutyPass = 0;
    const allowedHz = spec.frequencyHz * spec.frequencyTolerance;
    const dutyMin = spec.dutyMin ?? 0;
    const dutyMax = spec.dutyMax ?? 1;
    for (let i = 0; i < n; i++) {
      // Same tests as meetsSpec; NaN (a latched sample) fails both.
      const fOk = Math.abs(drawn.frequencyHz[i] - spec.frequencyHz) <= allowedHz;
      const d = drawn.dutyCycle[i];
      const dOk = d >= dutyMin && d <= dutyMax;
      if (fOk) frequencyPass++;
      if (dOk) dutyPass++;
      if (fOk && dOk) passing++;
    }
    yieldValue = passing / n;
    yieldDetail = {
      passing,
      failing: n - passing,
      standardError: Math.sqrt((yieldValue * (1 - yieldValue)) / n),
      interval95: wilsonInterval(passing, n),
      frequencyPassFraction: frequencyPass / n,
      dutyPassFraction: dutyPass / n,
    };
  }
  return {
    samples: n,
    seed: options.seed,
    distribution: options.distribution,
    sigmaPerTolerance: options.distribution === 'normal' ? options.sigmaPerTolerance : null,
    oscillating: n - drawn.latched,
    latched: drawn.latched,
    frequencyHz: summarize(drawn.frequencyHz),
    dutyCycle: summarize(drawn.dutyCycle),
    yield: yieldValue,
    yieldDetail,
    elapsedS: drawn.elapsedS,
    samplesPerSecond: drawn.elapsedS > 0 ? n / drawn.elapsedS : 0,
  };
}

/** Frequency histogram over the samples, widened to show the spec limits when they lie near the data. */
function histogram(frequencyHz: Float64Array, bins: number, mc: MonteCarloResult, spec: FrequencySpec | undefined) {
  const summary = mc.frequencyHz;
  if (!summary) return { edges: [], counts: [] };
  let min = summary.min;
  let max = summary.max;
  if (spec) {
    const span = Math.max(max - min, summary.mean * 1e-9);
    const lo = spec.frequencyHz * (1 - spec.frequencyTolerance);
    const hi = spec.frequencyHz * (1 + spec.frequencyTolerance);
    // Show a limit only when it is within a few data spans; otherwise the bars would shrink to a sliver.
    if (lo < min && min - lo <= 3 * span) min = lo - 0.02 * span;
    if (hi > max && hi - max <= 3 * span) max = hi + 0.02 * span;
  }
  const b = binValues(frequencyHz, bins, { min, max });
  return { edges: Array.from(b.edges), counts: Array.from(b.counts) };
}

function withPrefix<T>(prefix: string, fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    if (err instanceof CoreError && err.pointer !== undefined && !err.pointer.startsWith(prefix + '/')) {
      throw new CoreError(err.code, err.message, prefix + err.pointer, err.details);
    }
    throw err;
  }
}
