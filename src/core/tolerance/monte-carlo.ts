/**
 * Monte Carlo over the variation dimensions: one seeded stream, dimensions
 * drawn in a fixed order per sample, so a seed always gives the same samples.
 *
 * Spread dimensions (tolerances, supply, amplifier) are uniform on [−1, 1] or
 * normal with σ = sigmaPerTolerance (default 1/3: tolerance = 3σ, common
 * practice) truncated at ±1, i.e. at the tolerance: a part marked 1 % is taken
 * to be inside 1 % (our choice; it also keeps every sample inside the
 * worst-case box). Uniform dimensions (temperature, tempco spread, dielectric
 * bands) are always uniform over their range.
 */
import { CoreError } from '../errors.ts';
import { EVALUATION_STATUS, OUTPUT_LENGTH } from '../circuit/engine/prepared.ts';
import { Xoshiro128 } from './prng.ts';
import type { SampleEvaluator } from './sample-evaluator.ts';
import type { ToleranceDistribution } from './types.ts';
import type { VariationModel } from './variation-model.ts';

export const DEFAULT_SIGMA_PER_TOLERANCE = 1 / 3;

export interface SamplingOptions {
  samples: number;
  seed: number;
  distribution: ToleranceDistribution;
  sigmaPerTolerance: number;
}

/** Looks at the run every `every` samples until it answers true (time-budget.ts); throwing stops the run there. */
export interface SamplingPilot {
  every: number;
  /** Called with the samples drawn so far and their time, ms; true: done looking. */
  check(samplesDrawn: number, pilotMs: number): boolean;
}

export interface MonteCarloSamples {
  /** 1/period per sample, Hz (NaN where the sample does not oscillate). */
  frequencyHz: Float64Array;
  dutyCycle: Float64Array;
  latched: number;
  elapsedS: number;
}

/** σ per tolerance must lie in (0, 1]: the normal draw is truncated at the tolerance, i.e. at u = ±1. */
export function checkSigmaPerTolerance(sigmaPerTolerance: number): void {
  if (!(sigmaPerTolerance > 0 && sigmaPerTolerance <= 1)) {
    throw new CoreError('invalid-value', 'sigmaPerTolerance must be in (0, 1]', '/monteCarlo/sigmaPerTolerance');
  }
}

/**
 * `pilot`: looks at the time of the first samples, inside the one loop, so the stream of an admitted run
 * is the unchecked run's draw for draw. `clock`: monotonic ms (elapsedS and the pilot's time).
 */
export function drawSamples(
  model: VariationModel,
  evaluator: SampleEvaluator,
  options: SamplingOptions,
  pilot?: SamplingPilot,
  clock: () => number = () => performance.now(),
): MonteCarloSamples {
  const { samples, seed, distribution, sigmaPerTolerance } = options;
  checkSigmaPerTolerance(sigmaPerTolerance);
  const started = clock();
  let piloting = pilot !== undefined;
  const every = pilot?.every ?? 1;
  const rng = new Xoshiro128(seed);
  const dims = model.dimensions;
  const d = dims.length;
  const spread = Uint8Array.from(dims, (x) => (x.sampling === 'spread' ? 1 : 0));
  const low = Float64Array.from(dims, (x) => x.low);
  const width = Float64Array.from(dims, (x) => x.high - x.low);
  const normal = distribution === 'normal';
  const u = new Float64Array(d);
  const terms = model.terms;
  const values = new Float64Array(model.nominal.length);
  const out = new Float64Array(OUTPUT_LENGTH);
  const frequencyHz = new Float64Array(samples);
  const dutyCycle = new Float64Array(samples);
  let latched = 0;
  for (let i = 0; i < samples; i++) {
    if (piloting && i > 0 && i % every === 0) piloting = !pilot?.check(i, clock() - started);
    for (let k = 0; k < d; k++) {
      if (spread[k] === 1 && normal) {
        let z: number;
        do z = sigmaPerTolerance * rng.nextNormal();
        while (z > 1 || z < -1);
        u[k] = z;
      } else {
        u[k] = low[k] + width[k] * rng.nextFloat();
      }
    }
    terms.apply(u, values);
    if (evaluator.evaluate(values, out) === EVALUATION_STATUS.ok) {
      frequencyHz[i] = 1 / out[0];
      dutyCycle[i] = out[1];
    } else {
      frequencyHz[i] = Number.NaN;
      dutyCycle[i] = Number.NaN;
      latched++;
    }
  }
  return { frequencyHz, dutyCycle, latched, elapsedS: (clock() - started) / 1000 };
}
