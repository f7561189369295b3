/**
 * Sensitivities by central differences on the same evaluator the sweeps use:
 * - per parameter, S = d ln f / d ln x at nominal (steps x·e^(±h)), and the
 *   duty cycle's d(duty) / d ln x;
 * - per variation dimension, the slope of ln f at the distribution's mean,
 *   weighted by the dimension's variance: the first-order (linearised) budget
 *   var(ln f) ≈ Σ (∂ln f/∂u_k)²·var(u_k), whose square root is the relative
 *   standard deviation of f. Shares are each term over the sum.
 */
import { EVALUATION_STATUS, OUTPUT_LENGTH } from '../circuit/engine/prepared.ts';
import type { ModelName } from '../circuit/result.ts';
import { CoreError } from '../errors.ts';
import type { SampleEvaluator } from './sample-evaluator.ts';
import { truncatedNormalVariance } from './statistics.ts';
import type { PartSensitivity, ToleranceDistribution, VarianceSource } from './types.ts';
import type { VariationModel } from './variation-model.ts';

/** Relative (log) step: small for the exact closed form, larger where the engine's own accuracy would drown it. */
const LOG_STEP: Record<ModelName, number> = { 'closed-form': 1e-5, 'time-domain': 1e-3 };
/** Step along a dimension, as a fraction of its range. */
const DIMENSION_STEP: Record<ModelName, number> = { 'closed-form': 1e-5, 'time-domain': 1e-2 };

export function parameterSensitivities(evaluator: SampleEvaluator, model: VariationModel): PartSensitivity[] {
  const h = LOG_STEP[evaluator.model];
  const values = Float64Array.from(model.nominal);
  const out = new Float64Array(OUTPUT_LENGTH);
  const at = (i: number, factor: number) => {
    values.set(model.nominal);
    values[i] *= factor;
    if (evaluator.evaluate(values, out) !== EVALUATION_STATUS.ok) {
      throw new CoreError('no-oscillation', `The circuit stops oscillating when ${model.parameters[i].name} moves by ${h}: no sensitivity at this point`);
    }
    return { lnF: -Math.log(out[0]), duty: out[1] };
  };
  const result: PartSensitivity[] = [];
  model.parameters.forEach((p, i) => {
    const x0 = model.nominal[i];
    if (x0 === 0 || !Number.isFinite(x0)) return; // a zero or unlimited figure has no relative sensitivity
    if (p.kind === 'amplifier' && evaluator.model === 'closed-form' && (p.name === 'slewRateVPerS' || p.name === 'recoveryDelayS')) return;
    const up = at(i, Math.exp(h));
    const down = at(i, Math.exp(-h));
    result.push({
      role: p.name,
      kind: p.kind,
      sensitivity: (up.lnF - down.lnF) / (2 * h),
      dutySensitivity: (up.duty - down.duty) / (2 * h),
      varianceShare: 0,
    });
  });
  return result;
}

/** Variance of a dimension's distribution in its own units. */
export function dimensionVariance(sampling: 'spread' | 'uniform', low: number, high: number, distribution: ToleranceDistribution, sigmaPerTolerance: number): number {
  if (sampling === 'spread' && distribution === 'normal') {
    return sigmaPerTolerance * sigmaPerTolerance * truncatedNormalVariance(1 / sigmaPerTolerance);
  }
  return ((high - low) * (high - low)) / 12;
}

export function varianceBudget(
  evaluator: SampleEvaluator,
  model: VariationModel,
  distribution: ToleranceDistribution,
  sigmaPerTolerance: number,
): { sources: VarianceSource[]; relativeStd: number } {
  const center = model.centerPoint();
  const point = Float64Array.from(center);
  const values = new Float64Array(model.nominal.length);
  const out = new Float64Array(OUTPUT_LENGTH);
  const lnF = (k: number, x: number) => {
    point.set(center);
    point[k] = x;
    model.apply(point, values);
    return evaluator.evaluate(values, out) === EVALUATION_STATUS.ok ? -Math.log(out[0]) : Number.NaN;
  };
  const contributions = model.dimensions.map((d, k) => {
    const step = DIMENSION_STEP[evaluator.model] * (d.high - d.low);
    if (!(step > 0)) return 0;
    const slope = (lnF(k, center[k] + step) - lnF(k, center[k] - step)) / (2 * step);
    const variance = dimensionVariance(d.sampling, d.low, d.high, distribution, sigmaPerTolerance);
    const c = slope * slope * variance;
    return Number.isFinite(c) ? c : 0;
  });
  const total = contributions.reduce((a, b) => a + b, 0);
  const sources: VarianceSource[] = model.dimensions.map((d, k) => ({
    source: d.name,
    kind: d.kind,
    share: total > 0 ? contributions[k] / total : 0,
    relativeStd: Math.sqrt(contributions[k]),
  }));
  sources.sort((a, b) => b.share - a.share);
  return { sources, relativeStd: Math.sqrt(total) };
}
