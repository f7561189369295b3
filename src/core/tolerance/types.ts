/**
 * Tolerance analysis input and output, in core terms (SI units, fractions 0..1).
 * JSON pointers in errors refer to the request body of POST /v1/tolerance.
 */
import type { ModelChoice } from '../circuit/analyze.ts';
import type { ModelEffect, ModelName } from '../circuit/result.ts';
import type { Circuit } from '../circuit/types.ts';
import { TOLERANCE_FIGURES, type ToleranceFigureName } from '../amplifiers/figures-table.ts';

export type ToleranceDistribution = 'uniform' | 'normal';

/** A part's temperature behaviour: a linear coefficient (with an optional ± spread), or a capacitor dielectric code. */
export type TemperatureCoefficient =
  | { tempcoPpmPerK: number; tempcoTolerancePpmPerK?: number }
  | { dielectric: string };

/** Amplifier figures that may spread, as fractions of their nominal value: the figure table's tolerance entries. */
export const AMPLIFIER_SPREAD_FIELDS = TOLERANCE_FIGURES;
export type AmplifierSpreadField = ToleranceFigureName;

export type AmplifierSpreads = Partial<Record<AmplifierSpreadField, number>> & {
  /** Input offset may lie anywhere within nominal ± this, V (offsets centre on 0, so a fraction of nominal rarely fits). */
  inputOffsetRangeV?: number;
};

export interface TrackingGroup {
  /** Parts that move together (e.g. one resistor network). */
  roles: string[];
  /** Spread of the shared draw, fraction (default: the largest tolerance given for the members). */
  tolerance?: number;
  /** Independent spread of each member on top of the shared draw, fraction (default 0). */
  residualTolerance?: number;
}

export interface MonteCarloOptions {
  samples: number;
  /** Any integer; the same seed gives the same result. */
  seed?: number;
  distribution?: ToleranceDistribution;
  /** Normal distribution only: σ as a fraction of the tolerance (default 1/3, i.e. tolerance = 3σ, common practice). */
  sigmaPerTolerance?: number;
}

export interface FrequencySpec {
  frequencyHz: number;
  /** Allowed relative deviation from frequencyHz, fraction. */
  frequencyTolerance: number;
  dutyMin?: number;
  dutyMax?: number;
}

/** What the timing capacitor's part object states (parts/capacitor/model.ts), when the circuit gives one. */
export interface TimingCapacitorPart {
  /** Fractional loss per decade of hours (log-decade law, parts/capacitor/ageing.ts). */
  ageingRatePerDecade: number;
  /** Hours since the last de-ageing at the start of service. */
  ageHours: number;
  /** Its dielectric code: its temperature behaviour when temperatureCoefficients does not name the capacitor. */
  dielectric?: string;
  /** Its tolerance (the larger side), fraction: used when tolerances does not name the capacitor. */
  toleranceFraction?: number;
}

/** Longest service life a request may state, years (beyond it the log-decade law is extrapolated past any data). */
export const SERVICE_LIFE_LIMIT_YEARS = 100;

export interface ToleranceRequest {
  circuit: Circuit;
  model?: ModelChoice;
  /** Per-part tolerance by role, fraction (0.01 = 1 %). */
  tolerances: Readonly<Record<string, number>>;
  temperatureCoefficients?: Readonly<Record<string, TemperatureCoefficient>>;
  temperature?: { minC: number; maxC: number };
  /**
   * Years in service: class II/III timing capacitors lose capacitance by the log-decade law over
   * them (corners take the start and the end, Monte Carlo a uniform age). Default 0: no ageing.
   */
  serviceLifeYears?: number;
  /**
   * The timing capacitor's part object: its ageing law and age, and its dielectric and tolerance where
   * temperatureCoefficients and tolerances do not name it. Without it, ageing follows a dielectric
   * named for the capacitor in temperatureCoefficients.
   */
  timingCapacitor?: TimingCapacitorPart;
  /** Both rails scale by one shared draw within ± this fraction (or each on its own: supplyRailsIndependent). */
  supplyTolerance?: number;
  supplyRailsIndependent?: boolean;
  amplifierSpreads?: AmplifierSpreads;
  tracking?: readonly TrackingGroup[];
  monteCarlo?: MonteCarloOptions;
  spec?: FrequencySpec;
  /** When set, the result carries a frequency histogram with this many bins. */
  histogramBins?: number;
}

export interface DistributionSummary {
  p0_1: number;
  p1: number;
  p5: number;
  p50: number;
  p95: number;
  p99: number;
  p99_9: number;
  mean: number;
  std: number;
  min: number;
  max: number;
}

export interface Corner {
  frequencyHz: number;
  dutyCycle: number;
  /** Board temperature at the corner, °C (null when no temperature range was given). */
  temperatureC: number | null;
  /** Every varied parameter's value at the corner (SI units). */
  values: Record<string, number>;
  /** Relative change of each varied parameter against nominal (omitted for parameters whose nominal is 0). */
  deviations: Record<string, number>;
}

export interface WorstCase {
  frequencyMinHz: number;
  frequencyMaxHz: number;
  dutyMin: number;
  dutyMax: number;
  method: 'all-corners' | 'sensitivity-guided';
  cornersEvaluated: number;
  /** Corners at which the circuit does not oscillate (excluded from the extremes); sensitivity-guided: those the search met. */
  latchedCorners: number;
  corners: { frequencyMin: Corner; frequencyMax: Corner; dutyMin: Corner; dutyMax: Corner };
  /** Whether every corner meets the spec (null without a spec). */
  withinSpec: boolean | null;
}

export interface YieldDetail {
  passing: number;
  failing: number;
  standardError: number;
  /** Wilson score interval at 95 % confidence. */
  interval95: { low: number; high: number };
  frequencyPassFraction: number;
  dutyPassFraction: number;
}

export interface MonteCarloResult {
  samples: number;
  seed: number;
  distribution: ToleranceDistribution;
  sigmaPerTolerance: number | null;
  oscillating: number;
  latched: number;
  frequencyHz: DistributionSummary | null;
  dutyCycle: DistributionSummary | null;
  /** Fraction of samples inside the spec (latched samples fail); null without a spec. */
  yield: number | null;
  yieldDetail: YieldDetail | null;
  elapsedS: number;
  samplesPerSecond: number;
}

export interface PartSensitivity {
  /** Part role, or the circuit-level parameter name for supply and amplifier figures. */
  role: string;
  kind: 'resistor' | 'capacitor' | 'supply' | 'amplifier' | 'load' | 'diode' | 'stray';
  /** d ln f / d ln x at nominal. */
  sensitivity: number;
  /** d(duty cycle) / d ln x at nominal. */
  dutySensitivity: number;
  /** Share of the first-order variance of ln f from this part's own variations (its tolerance, tempco or dielectric spread). */
  varianceShare: number;
}

export interface VarianceSource {
  source: string;
  kind: VariationKind;
  /** First-order share of the variance of ln f, 0..1. */
  share: number;
  /** First-order contribution to the relative standard deviation of f, fraction. */
  relativeStd: number;
}

export type VariationKind =
  | 'part-tolerance'
  | 'tracking'
  | 'tracking-residual'
  | 'temperature'
  | 'tempco-spread'
  | 'dielectric-band'
  | 'supply'
  | 'amplifier'
  | 'ageing';

export interface TemperatureModelSummary {
  role: string;
  model: 'tempco' | 'dielectric';
  dielectric: string | null;
  /** Range of the relative value change over the temperature range (and its spread), fraction. */
  changeMinFraction: number;
  changeMaxFraction: number;
  /** False when the temperature range leaves the dielectric's rated range. */
  withinRatedRange: boolean;
}

/**
 * How one parameter of an active part follows the board temperature (amplifier drift figures from
 * the amplifier table, the steering diodes' forward drop): applied at every corner and Monte Carlo
 * sample with the sample's temperature.
 */
export interface TemperatureDriftSummary {
  /** The parameter that drifts; its values below are in the unit its name states. */
  parameter: string;
  source: 'amplifier' | 'steering-diodes';
  /** The law with its figure, in words. */
  law: string;
  /** Value at 25 °C. */
  valueAtReference: number;
  /** Smallest and largest value over the temperature range (and the drift's sign, where it is unknown). */
  valueMin: number;
  valueMax: number;
}

/** The timing capacitor's ageing over the service life (log-decade law). */
export interface AgeingSummary {
  role: string;
  ratePerDecade: number;
  /** Hours since de-ageing at the start and at the end of service. */
  ageStartHours: number;
  ageEndHours: number;
  serviceLifeYears: number;
  /** Capacitance change from the start to the end of service, fraction (negative: loss). */
  changeFraction: number;
}

export interface ToleranceNote {
  code: string;
  message: string;
}

export interface ToleranceResult {
  model: ModelName;
  /** The amplifier effects every evaluation included (empty: the closed-form special case). */
  modelEffects: ModelEffect[];
  nominal: { frequencyHz: number; dutyCycle: number };
  worstCase: WorstCase;
  monteCarlo: MonteCarloResult;
  sensitivities: PartSensitivity[];
  varianceSources: VarianceSource[];
  /** First-order estimate of the relative standard deviation of f (root sum of squares of the sources). */
  linearEstimate: { frequencyRelativeStd: number };
  temperatureModels: TemperatureModelSummary[];
  temperatureDrifts: TemperatureDriftSummary[];
  /** Null when nothing ages (no service life, or a capacitor that does not age). */
  ageing: AgeingSummary | null;
  notes: ToleranceNote[];
  histogram?: { edges: number[]; counts: number[] };
}
