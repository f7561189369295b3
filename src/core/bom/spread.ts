/**
 * The assembly's tolerance picture from the tolerance analysis
 * (src/core/tolerance, runToleranceAnalysis): worst case over the corners and,
 * when a minimum yield is asked for, Monte Carlo.
 *
 * Temperature is folded into each part's band before the analysis: a part
 * whose value may move by ±t (tolerance) and by ±d over the temperature range
 * enters with the larger of its folded sides, (1 + t)(1 + d↑) − 1 and 1 − (1 − t)(1 − d↓). For the worst case this is exact when each
 * part's temperature drift is an independent spread (resistor tempcos written
 * as ±ppm/K, class I ceramics near 0 ppm/K, class II/III bands) and
 * conservative otherwise (it ignores that a shared board temperature moves
 * parts together, and takes the larger end of the range for every part). It
 * keeps the analysis at one dimension per part plus the supply, so a batch of
 * thousands stays fast; POST /v1/tolerance models temperature faithfully for
 * a single design. The Monte Carlo yield draws each folded band with the
 * analysis' default distribution.
 *
 * Drift d per line over the range (only when the assembly gives one):
 * - capacitor with a dielectric: the largest change the dielectric's figures
 *   allow at either end of the range (EIA-198 class I tempco, class II/III
 *   band, film/electrolytic class-typical, see parts/dielectric.ts);
 * - capacitor with an old tempco code only ("N750"): |tempco| × ΔT;
 * - resistor with a tempco in the text or catalogue ("25ppm"): that × ΔT;
 * - resistor with none: ±100 ppm/K × ΔT, a conservative figure for
 *   general-purpose thick-film chips (common practice, from memory), reported
 *   as tempco-assumed.
 * ΔT is the larger distance of the range's ends from 25 °C (the reference
 * temperature of tempcos and EIA-198 change figures).
 *
 * The board temperature itself still enters as the analysis' temperature range:
 * it drives what is not a part band — the amplifier's drift figures and the
 * steering diodes' forward drop (tolerance/variation-model.ts).
 *
 * The full model, as /v1/tolerance uses it (slew, recovery delay, clamp, current
 * limit, a class II/III timing capacitor's C(V) carried on the circuit): the
 * prepared walk (circuit/engine/prepared.ts) keeps a batch fast.
 */
import type { AmplifierModel } from '../amplifiers/model.ts';
import type { Circuit } from '../circuit/types.ts';
import { CoreError } from '../errors.ts';
import { AGEING_REFERENCE_HOURS, ageingRatePerDecade } from '../parts/capacitor/ageing.ts';
import { capacitanceChangeAt, parseDielectric } from '../parts/dielectric.ts';
import { REFERENCE_TEMPERATURE_C, runToleranceAnalysis, type AnalysisTimeBudget, type ToleranceRequest } from '../tolerance/index.ts';
import { BOM_RULES } from './codes.ts';
import { at, ruleResult } from './rule.ts';
import type { WorstCaseFigures, YieldFigures } from './rules/spec.ts';
import type { BomAssembly, BomCheckOptions, BomLineReading, BomRuleResult, BomTemperatureRange } from './types.ts';

/** Tempco magnitude assumed for a resistor that states none, ppm/K (common practice, from memory). */
export const ASSUMED_RESISTOR_TEMPCO_PPM_PER_K = 100;

/** Largest folded band handed to the tolerance analysis (it needs fractions below 1). */
const MAX_FOLDED_TOLERANCE = 0.99;

/**
 * Samples written into a worst-case-only request. None are drawn (the run leaves Monte Carlo out,
 * ToleranceParts); the figure only keeps the request a valid one for POST /v1/tolerance.
 */
const WORST_CASE_ONLY_SAMPLES = 1;

export interface SpreadFigures {
  worstCase: WorstCaseFigures;
  yield?: YieldFigures;
  /** Why the Monte Carlo was not run although a yield was asked for (too costly for the time budget). */
  yieldRefused?: string;
}

export interface AssemblySpread {
  worstCase?: WorstCaseFigures;
  yield?: YieldFigures;
  yieldSkippedBecause?: string;
  rules: BomRuleResult[];
}

export interface LineDrift {
  /** Largest relative value change over the temperature range, fraction (the larger side). */
  drift: number;
  /** Largest rise and largest fall over the range, fractions ≥ 0 (class II/III bands are lopsided). */
  driftUp: number;
  driftDown: number;
  withinRatedRange: boolean;
  assumedTempco: boolean;
}

function deltaTemperatureK(range: BomTemperatureRange): number {
  return Math.max(Math.abs(range.minC - REFERENCE_TEMPERATURE_C), Math.abs(range.maxC - REFERENCE_TEMPERATURE_C));
}

function lineDrift(line: BomLineReading, range: BomTemperatureRange): LineDrift {
  const dT = deltaTemperatureK(range);
  if (line.kind === 'resistor') {
    const tempco = line.tempcoPpmPerK;
    const drift = Math.abs(tempco ?? ASSUMED_RESISTOR_TEMPCO_PPM_PER_K) * 1e-6 * dT;
    return { drift, driftUp: drift, driftDown: drift, withinRatedRange: true, assumedTempco: tempco === undefined };
  }
  if (line.dielectricCode !== undefined) {
    try {
      const d = parseDielectric(line.dielectricCode);
      const ends = [capacitanceChangeAt(d, range.minC), capacitanceChangeAt(d, range.maxC)];
      const driftUp = Math.max(0, ...ends.map((e) => e.maxFraction));
      const driftDown = Math.max(0, ...ends.map((e) => -e.minFraction));
      return { drift: Math.max(driftUp, driftDown), driftUp, driftDown, withinRatedRange: ends.every((e) => e.withinRatedRange), assumedTempco: false };
    } catch {
      // An unknown code was already reported by the dielectric rule; fall through to the tempco, if any.
    }
  }
  const drift = Math.abs(line.tempcoPpmPerK ?? 0) * 1e-6 * dT;
  return { drift, driftUp: drift, driftDown: drift, withinRatedRange: true, assumedTempco: false };
}

/** Each line's drift over the assembly's temperature range (undefined without a range). */
function lineDrifts(lines: readonly BomLineReading[], range: BomTemperatureRange | undefined): LineDrift[] | undefined {
  return range ? lines.map((line) => lineDrift(line, range)) : undefined;
}

/**
 * The analysis request: one folded band per part, the supply band, the spec. `drifts`: the lines'
 * drifts when the caller has them already (lineDrifts, same order as lines).
 */
export function toleranceRequest(
  circuit: Circuit,
  lines: readonly BomLineReading[],
  assembly: BomAssembly,
  monteCarloSamples: number,
  seed: number,
  drifts: readonly LineDrift[] | undefined = lineDrifts(lines, assembly.temperature),
): ToleranceRequest {
  const tolerances: Record<string, number> = {};
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i];
    const t = line.tolerance ?? 0;
    const d = drifts ? drifts[i] : { driftUp: 0, driftDown: 0 };
    // Fold each side separately: up (1 + t)(1 + d↑) − 1, down 1 − (1 − t)(1 − d↓); the analysis takes one
    // symmetric band, so the larger side. A class III band (−82 %) folds to just under 1; a band beyond
    // that (only absurd inputs) is held below 1, which the analysis requires of a fraction.
    const up = (1 + t) * (1 + d.driftUp) - 1;
    const down = 1 - (1 - t) * (1 - d.driftDown);
    tolerances[line.role] = Math.min(MAX_FOLDED_TOLERANCE, Math.max(up, down));
  }
  return {
    circuit,
    // The full model (slew, recovery delay, clamp, current limit): the verdict /v1/tolerance gives.
    model: 'auto',
    tolerances,
    // The board temperature still drives the active parts (amplifier drift, steering diodes); the
    // parts' own drift is folded into their bands above.
    ...(assembly.temperature ? { temperature: { minC: assembly.temperature.minC, maxC: assembly.temperature.maxC } } : {}),
    supplyTolerance: assembly.supply.tolerance,
    ...serviceLifeOf(lines, assembly),
    monteCarlo: { samples: monteCarloSamples, seed },
    spec: {
      frequencyHz: assembly.spec.frequencyHz,
      frequencyTolerance: assembly.spec.frequencyTolerance,
      ...(assembly.spec.dutyMin !== undefined ? { dutyMin: assembly.spec.dutyMin } : {}),
      ...(assembly.spec.dutyMax !== undefined ? { dutyMax: assembly.spec.dutyMax } : {}),
    },
  };
}

/**
 * The service life and the timing capacitor's ageing law for the analysis: the law of the capacitor
 * line's dielectric (class II/III ceramics age, class I and film do not), from the reference age at
 * which the marked value applies — a BOM line states no hours since de-ageing.
 */
function serviceLifeOf(lines: readonly BomLineReading[], assembly: BomAssembly): Pick<ToleranceRequest, 'serviceLifeYears' | 'timingCapacitor'> {
  const years = assembly.serviceLifeYears ?? 0;
  if (years <= 0) return {};
  const capacitor = lines.find((l) => l.kind === 'capacitor' && l.dielectricCode !== undefined);
  if (!capacitor?.dielectricCode) return { serviceLifeYears: years };
  let rate: number;
  try {
    rate = ageingRatePerDecade(parseDielectric(capacitor.dielectricCode));
  } catch {
    return { serviceLifeYears: years }; // an unknown code is reported by the dielectric rule
  }
  return { serviceLifeYears: years, timingCapacitor: { ageingRatePerDecade: rate, ageHours: AGEING_REFERENCE_HOURS } };
}

function temperatureRules(lines: readonly BomLineReading[], range: BomTemperatureRange | undefined, drifts: readonly LineDrift[] | undefined): BomRuleResult[] {
  if (!range || !drifts) return [];
  const rules: BomRuleResult[] = [];
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i];
    const d = drifts[i];
    if (d.assumedTempco) {
      rules.push(
        ruleResult(
          BOM_RULES.tempcoAssumed,
          `No temperature coefficient is stated for ${line.refdes}; ±${ASSUMED_RESISTOR_TEMPCO_PPM_PER_K} ppm/K is assumed over ${range.minC} to ${range.maxC} °C`,
          { assumedTempcoPpmPerK: ASSUMED_RESISTOR_TEMPCO_PPM_PER_K, driftFraction: d.drift },
          at(line),
        ),
      );
    }
    if (!d.withinRatedRange) {
      rules.push(
        ruleResult(
          BOM_RULES.temperatureBeyondPartRating,
          `${line.dielectricCode} is not rated over the whole ${range.minC} to ${range.maxC} °C range; its figures are extrapolated there`,
          { dielectric: line.dielectricCode ?? null, minC: range.minC, maxC: range.maxC },
          at(line),
        ),
      );
    }
  }
  return rules;
}

/**
 * Figures of one analysis run; identical designs in a batch share them through the cache. Only
 * the parts the rules read are computed: the worst case always, Monte Carlo only for a yield,
 * sensitivities never (so a design whose nominal sits at the edge of latching, where a
 * sensitivity step would stop it, still gets its worst case).
 */
function spreadFigures(request: ToleranceRequest, wantYield: boolean, budget?: AnalysisTimeBudget): SpreadFigures {
  const run = runToleranceAnalysis(request, { parts: { monteCarlo: wantYield, sensitivities: false }, ...(budget ? { budget } : {}) });
  const wc = run.worstCase;
  const figures: SpreadFigures = {
    worstCase: {
      nominalFrequencyHz: run.nominal.frequencyHz,
      nominalDutyCycle: run.nominal.dutyCycle,
      frequencyMinHz: wc.frequencyMinHz,
      frequencyMaxHz: wc.frequencyMaxHz,
      dutyMin: wc.dutyMin,
      dutyMax: wc.dutyMax,
      method: wc.method,
      cornersEvaluated: wc.cornersEvaluated,
      latchedCorners: wc.latchedCorners,
      model: run.model,
      modelEffects: run.modelEffects.join(', '),
    },
  };
  if (wantYield && run.monteCarlo && run.monteCarlo.yield !== null) {
    figures.yield = { yield: run.monteCarlo.yield, samples: run.monteCarlo.samples, failedSamples: run.monteCarlo.latched, seed: run.monteCarlo.seed };
  }
  return figures;
}

/**
 * The figures within options.monteCarloBudgetMs: a Monte Carlo projected past it (time-budget.ts) is
 * refused, and the assembly keeps its worst case (run again without Monte Carlo: the worst case of a
 * worst-case-only run is the full run's, number for number) with the refusal as the yield rule's reason.
 */
function admittedSpreadFigures(request: ToleranceRequest, wantYield: boolean, options: BomCheckOptions, clock?: () => number): SpreadFigures {
  if (!wantYield || options.monteCarloBudgetMs === undefined) return spreadFigures(request, wantYield);
  const budget: AnalysisTimeBudget = {
    limitMs: options.monteCarloBudgetMs,
    alternative: "set options.mode to 'worst-case'",
    ...(clock ? { clock } : {}),
  };
  try {
    return spreadFigures(request, true, budget);
  } catch (error) {
    if (!(error instanceof CoreError && error.code === 'limit-exceeded' && error.pointer === '/monteCarlo/samples')) throw error;
    return { ...spreadFigures(request, false), yieldRefused: `options.monteCarloSamples: ${error.message}` };
  }
}

/**
 * The amplifier's serialisation per object, one memo per spread cache: a batch resolves an id to the
 * same object for every assembly naming it, so its forty-odd figures are written out once per batch
 * rather than once per assembly (a fresh memo per cache: nothing outlives the batch that read it).
 */
const amplifierKeys = new WeakMap<Map<string, SpreadFigures | CoreError>, WeakMap<AmplifierModel, string>>();

function amplifierKey(amplifier: AmplifierModel, cache: Map<string, SpreadFigures | CoreError>): string {
  let memo = amplifierKeys.get(cache);
  if (memo === undefined) amplifierKeys.set(cache, (memo = new WeakMap()));
  let key = memo.get(amplifier);
  if (key === undefined) memo.set(amplifier, (key = JSON.stringify(amplifier)));
  return key;
}

/**
 * What makes two analysis runs identical: the amplifier's figures (a JSON object, so the joined key
 * stays unambiguous) and everything else the request carries.
 */
function cacheKey(request: ToleranceRequest, cache: Map<string, SpreadFigures | CoreError>): string {
  return (
    amplifierKey(request.circuit.amplifier, cache) +
    JSON.stringify([
      request.circuit.topology,
      request.circuit.supply,
      request.circuit.parts,
      request.circuit.capacitorShape?.key ?? 'flat',
      request.circuit.strays ?? null,
      request.tolerances,
      request.temperature ?? null,
      request.supplyTolerance,
      request.serviceLifeYears ?? 0,
      request.timingCapacitor ?? null,
      request.spec,
      request.monteCarlo,
    ])
  );
}

/** Most entries kept by a spread cache before it starts over (bounds a batch's memory). */
export const SPREAD_CACHE_LIMIT = 2000;

export function assemblySpread(
  circuit: Circuit,
  lines: readonly BomLineReading[],
  assembly: BomAssembly,
  options: BomCheckOptions,
  cache?: Map<string, SpreadFigures | CoreError>,
  clock?: () => number,
): AssemblySpread {
  const wantYield = assembly.spec.minimumYield !== undefined && options.mode === 'full';
  const drifts = lineDrifts(lines, assembly.temperature);
  const request = toleranceRequest(circuit, lines, assembly, wantYield ? options.monteCarloSamples : WORST_CASE_ONLY_SAMPLES, options.seed, drifts);
  const rules = temperatureRules(lines, assembly.temperature, drifts);
  const key = cache ? cacheKey(request, cache) : '';
  let figures = cache?.get(key);
  if (figures === undefined) {
    try {
      figures = admittedSpreadFigures(request, wantYield, options, clock);
    } catch (error) {
      if (!(error instanceof CoreError)) throw error;
      figures = error;
    }
    if (cache) {
      if (cache.size >= SPREAD_CACHE_LIMIT) cache.clear();
      cache.set(key, figures);
    }
  }
  if (figures instanceof CoreError) {
    rules.push(
      ruleResult(BOM_RULES.circuitRejected, `The tolerance analysis refused this assembly: ${figures.message}`, {
        coreCode: figures.code,
        pointer: figures.pointer ?? null,
        stage: 'tolerance',
      }),
    );
    return { rules, yieldSkippedBecause: 'the tolerance analysis refused the assembly' };
  }
  const result: AssemblySpread = { rules, worstCase: figures.worstCase };
  if (figures.yield) result.yield = figures.yield;
  else if (figures.yieldRefused) result.yieldSkippedBecause = figures.yieldRefused;
  else result.yieldSkippedBecause = options.mode === 'worst-case' ? 'the request asked for worst case only (options.mode)' : 'not requested';
  return result;
}
