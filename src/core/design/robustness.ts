/**
 * How well a design holds its target once built: worst case over the tolerance
 * box and Monte Carlo yield against the requested frequency and duty tolerances,
 * over the parts' own tolerances, their temperature behaviour across the board's
 * range and the supply tolerance. Computed by the tolerance core (one physics:
 * the same model as every other answer), never by a design-side estimate.
 */
import type { Circuit } from '../circuit/types.ts';
import { CoreError } from '../errors.ts';
import { runToleranceAnalysis } from '../tolerance/analyze-tolerance.ts';
import type { TemperatureCoefficient } from '../tolerance/types.ts';
import type { RoleValue } from './snap-value.ts';

export interface RobustnessOptions {
  /** Board temperature range, °C (default 0 to 70, the commercial range). */
  temperature?: { minC: number; maxC: number };
  /** Both rails move together within ± this fraction (default 0.05). */
  supplyTolerance?: number;
  /** Tempco of resistors whose source gives none, ppm/K (default 100: metal film, common practice). */
  resistorTempcoPpmPerK?: number;
  /** Dielectric of series capacitors (catalogue parts carry their own), default C0G. */
  capacitorDielectric?: string;
  /** Monte Carlo samples per design (default 1000) and seed (default 1). */
  samples?: number;
  seed?: number;
  /** Designs whose yield is below this are not offered (fraction). */
  minYield?: number;
}

export const ROBUSTNESS_DEFAULTS = {
  temperature: { minC: 0, maxC: 70 },
  supplyTolerance: 0.05,
  resistorTempcoPpmPerK: 100,
  capacitorDielectric: 'C0G',
  samples: 1000,
  seed: 1,
} as const;
/** Sample counts a request may ask for: enough for a yield to ±3 % (1σ at 50 %), few enough to stay in seconds. */
export const ROBUSTNESS_SAMPLE_RANGE = { min: 100, max: 5000 } as const;

export interface DesignRobustness {
  /** Fraction of Monte Carlo samples inside both tolerances (latched samples fail). */
  yield: number;
  yieldStandardError: number;
  yieldInterval95: { low: number; high: number };
  samples: number;
  seed: number;
  /** Extremes over the tolerance box (corners, sensitivity-guided when there are many). */
  worstCase: { frequencyMinHz: number; frequencyMaxHz: number; dutyMin: number; dutyMax: number; withinSpec: boolean };
  /**
   * Share of the tolerance left at the worst corner: 1 − (worst deviation / tolerance), the smaller of the
   * frequency and duty figures. Negative when a corner leaves the spec.
   */
  marginFraction: number;
  /** The tolerance each role was given, fraction. */
  partTolerances: Record<string, number>;
  model: 'closed-form' | 'time-domain';
}

export interface RobustnessTarget {
  frequencyHz: number;
  frequencyTolerance: number;
  dutyCycle: number;
  dutyTolerance: number;
}

export function checkRobustnessOptions(o: RobustnessOptions): Required<Omit<RobustnessOptions, 'minYield'>> & { minYield?: number } {
  const temperature = o.temperature ?? ROBUSTNESS_DEFAULTS.temperature;
  if (!(temperature.minC >= -60 && temperature.maxC <= 200 && temperature.minC <= temperature.maxC)) {
    throw new CoreError('invalid-value', 'robustness.temperature must lie within -60 to 200 °C with minC <= maxC', '/robustness/temperature');
  }
  const supplyTolerance = o.supplyTolerance ?? ROBUSTNESS_DEFAULTS.supplyTolerance;
  if (!(supplyTolerance >= 0 && supplyTolerance <= 0.3)) throw new CoreError('invalid-value', 'robustness.supplyTolerance is a fraction 0..0.3', '/robustness/supplyTolerance');
  const samples = o.samples ?? ROBUSTNESS_DEFAULTS.samples;
  if (!(Number.isInteger(samples) && samples >= ROBUSTNESS_SAMPLE_RANGE.min && samples <= ROBUSTNESS_SAMPLE_RANGE.max)) {
    throw new CoreError('invalid-value', `robustness.samples must be an integer ${ROBUSTNESS_SAMPLE_RANGE.min}..${ROBUSTNESS_SAMPLE_RANGE.max}`, '/robustness/samples');
  }
  const seed = o.seed ?? ROBUSTNESS_DEFAULTS.seed;
  if (!Number.isSafeInteger(seed)) throw new CoreError('invalid-value', 'robustness.seed must be an integer', '/robustness/seed');
  const tempco = o.resistorTempcoPpmPerK ?? ROBUSTNESS_DEFAULTS.resistorTempcoPpmPerK;
  if (!(Math.abs(tempco) <= 5000)) throw new CoreError('invalid-value', 'robustness.resistorTempcoPpmPerK must lie within ±5000 ppm/K', '/robustness/resistorTempcoPpmPerK');
  if (o.minYield !== undefined && !(o.minYield >= 0 && o.minYield <= 1)) throw new CoreError('invalid-value', 'robustness.minYield is a fraction 0..1', '/robustness/minYield');
  return {
    temperature,
    supplyTolerance,
    resistorTempcoPpmPerK: tempco,
    capacitorDielectric: o.capacitorDielectric ?? ROBUSTNESS_DEFAULTS.capacitorDielectric,
    samples,
    seed,
    ...(o.minYield !== undefined ? { minYield: o.minYield } : {}),
  };
}

/** The tolerance and temperature behaviour of each role, from the parts chosen (their source's tolerance). */
export function partVariations(parts: Readonly<Record<string, RoleValue>>, kinds: Readonly<Record<string, 'resistor' | 'capacitor'>>, o: ReturnType<typeof checkRobustnessOptions>) {
  const tolerances: Record<string, number> = {};
  const temperatureCoefficients: Record<string, TemperatureCoefficient> = {};
  for (const [role, v] of Object.entries(parts)) {
    // A two-part combination is no looser than its loosest part.
    tolerances[role] = Math.max(...v.parts.map((p) => p.tolerance));
    const first = v.parts[0];
    if (kinds[role] === 'capacitor') temperatureCoefficients[role] = { dielectric: first.dielectric ?? o.capacitorDielectric };
    else temperatureCoefficients[role] = { tempcoPpmPerK: first.tempcoPpmPerK ?? o.resistorTempcoPpmPerK };
  }
  return { tolerances, temperatureCoefficients };
}

/** Worst case and yield of one design. */
export function designRobustness(
  circuit: Circuit,
  parts: Readonly<Record<string, RoleValue>>,
  kinds: Readonly<Record<string, 'resistor' | 'capacitor'>>,
  target: RobustnessTarget,
  options: ReturnType<typeof checkRobustnessOptions>,
): DesignRobustness {
  const { tolerances, temperatureCoefficients } = partVariations(parts, kinds, options);
  const spec = {
    frequencyHz: target.frequencyHz,
    frequencyTolerance: target.frequencyTolerance,
    dutyMin: Math.max(0, target.dutyCycle - target.dutyTolerance),
    dutyMax: Math.min(1, target.dutyCycle + target.dutyTolerance),
  };
  const run = runToleranceAnalysis(
    {
      circuit,
      tolerances,
      temperatureCoefficients,
      temperature: options.temperature,
      supplyTolerance: options.supplyTolerance,
      monteCarlo: { samples: options.samples, seed: options.seed, distribution: 'normal' },
      spec,
    },
    { parts: { monteCarlo: true, sensitivities: false } },
  );
  const mc = run.monteCarlo!;
  const wc = run.worstCase;
  const fDev = Math.max(Math.abs(wc.frequencyMinHz / target.frequencyHz - 1), Math.abs(wc.frequencyMaxHz / target.frequencyHz - 1));
  const dDev = Math.max(Math.abs(wc.dutyMin - target.dutyCycle), Math.abs(wc.dutyMax - target.dutyCycle));
  const marginFraction = Math.min(1 - fDev / target.frequencyTolerance, 1 - dDev / target.dutyTolerance);
  return {
    yield: mc.yield ?? 0,
    yieldStandardError: mc.yieldDetail?.standardError ?? 0,
    yieldInterval95: mc.yieldDetail?.interval95 ?? { low: 0, high: 1 },
    samples: mc.samples,
    seed: mc.seed,
    worstCase: { frequencyMinHz: wc.frequencyMinHz, frequencyMaxHz: wc.frequencyMaxHz, dutyMin: wc.dutyMin, dutyMax: wc.dutyMax, withinSpec: wc.withinSpec === true },
    marginFraction: Number.isFinite(marginFraction) ? marginFraction : -1,
    partTolerances: tolerances,
    model: run.model,
  };
}
