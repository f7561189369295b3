/**
 * Binds a nominal circuit, its fit parameters and the measurements into one
 * residual function, and fits any subset of the parameters (the others held
 * at nominal) — the full estimate and every hypothesis of the diagnosis use it.
 */
import type { Strays } from '../../circuit/strays.ts';
import type { Circuit } from '../../circuit/types.ts';
import { JohnsonShape, type BiasShape } from '../../parts/capacitor/dc-bias.ts';
import { CoreError } from '../../errors.ts';
import { ForwardModel, type PredictedFigures } from './forward.ts';
import { solveMap, type MapSolution } from './map-lm.ts';
import type { Measurement } from './measurements.ts';
import { buildParameters, circuitAt, nominalVector, type FitParameter } from './parameters.ts';

/**
 * What a hypothesis changes in the circuit besides the fitted parameters: parts
 * of other values (a wrong part), a timing capacitor of another C(V) (another
 * dielectric), strays the circuit does not declare (a stray hypothesis). Fitted
 * parameters of a replaced part scale its new value.
 */
export interface CircuitVariant {
  parts?: Readonly<Record<string, number>>;
  capacitorShape?: BiasShape;
  /**
   * The timing capacitor follows the class-typical law (JohnsonShape) with this scale voltage: a
   * hypothesis that fits the curve. Evaluated through one adjustable shape (FITTED_LAW), so the
   * engine compiles one circuit shape for every scale instead of one per trial value.
   */
  capacitorScaleV?: number;
  /** The whole strays record of the variant (what the circuit declares plus the hypothesis' own). */
  strays?: Strays;
}

/**
 * The class-typical law with an adjustable scale, for fits over the scale. Its
 * key is fixed, so every scale walks the same compiled shape (a compiled shape
 * holds its curve by reference and reads it per piece, never caching values of
 * it); the scale is set right before each evaluation, which the fit makes
 * synchronously one at a time. One instance per thread: a second instance
 * with the same key would share the first one's compiled shape.
 */
class AdjustableLaw implements BiasShape {
  readonly kind = 'class-typical' as const;
  readonly key = 'johnson:fit-adjustable';
  readonly kneesV: readonly number[] = [];
  private law = new JohnsonShape(1);
  set scaleV(v: number) {
    if (v !== this.law.scaleV) this.law = new JohnsonShape(v);
  }
  ratio(voltageV: number): number {
    return this.law.ratio(voltageV);
  }
  charge(voltageV: number): number {
    return this.law.charge(voltageV);
  }
  slope(voltageV: number): number {
    return this.law.slope(voltageV);
  }
  /** The law of the current scale's (a new law, so a new id, whenever the scale changes). */
  get curveId(): number {
    return this.law.curveId;
  }
}
const FITTED_LAW = new AdjustableLaw();

export interface FitSetup {
  circuit: Circuit;
  parameters: FitParameter[];
  measurements: Measurement[];
  nominalX: Float64Array;
  nominalFigures: PredictedFigures;
  figuresAt(x: ArrayLike<number>, variant?: CircuitVariant): PredictedFigures;
  residualsAt(x: ArrayLike<number>, variant?: CircuitVariant): Float64Array;
}

export function createFitSetup(circuit: Circuit, measurements: Measurement[], tolerances: Readonly<Record<string, number>> = {}): FitSetup {
  // The nominal first: its steady state is where every later walk of the fit starts.
  const forward = new ForwardModel();
  const nominalFigures = forward.figures(circuit);
  const parameters = buildParameters(circuit, tolerances);
  const nominalX = nominalVector(parameters);
  const figuresAt = (x: ArrayLike<number>, variant?: CircuitVariant) => {
    const at = circuitAt(circuit, parameters, x, variant?.parts);
    if (variant?.capacitorShape) at.capacitorShape = variant.capacitorShape;
    if (variant?.capacitorScaleV !== undefined) {
      FITTED_LAW.scaleV = variant.capacitorScaleV;
      at.capacitorShape = FITTED_LAW;
    }
    if (variant?.strays) at.strays = variant.strays;
    return forward.figures(at);
  };
  const residualsAt = (x: ArrayLike<number>, variant?: CircuitVariant) => {
    const fig = figuresAt(x, variant);
    const r = new Float64Array(measurements.length);
    for (let i = 0; i < measurements.length; i++) {
      const m = measurements[i];
      r[i] = (fig[m.name] - m.value) / m.uncertainty;
    }
    return r;
  };
  return { circuit, parameters, measurements, nominalX, nominalFigures, figuresAt, residualsAt };
}

export interface SubsetFit {
  /** Indices into setup.parameters that were free. */
  active: number[];
  /** Full parameter vector (inactive ones at nominal). */
  x: Float64Array;
  solution: MapSolution;
}

export interface SubsetOptions {
  /** Prior σ per active parameter (default: the nuisance priors). */
  priorSd?: readonly number[];
  /** Residual transform (e.g. whitening by the nuisance covariance). */
  transform?: (r: Float64Array) => Float64Array;
  start?: ArrayLike<number>;
  maxIterations?: number;
  /** The circuit variant the fit runs on (a hypothesis' other part or capacitor). */
  variant?: CircuitVariant;
}

/**
 * Levenberg–Marquardt settings of every fit against the forward model:
 * - difference steps of 1e-3 posterior widths: the walk's steady cycle is exact
 *   to about 1e-12 of the supply span, and a step of 1e-6 widths (the solver's
 *   default, made for smooth closed-form residuals) moves a precisely measured
 *   figure by little more than that, so the slopes came out noisy and the
 *   search crept along valleys for hundreds of iterations;
 * - two χ² gains in a row below 1e-4 end the search: the evidence then moves
 *   by a factor e^(−5e-5) and the estimates by about a hundredth of a posterior
 *   width (Δχ² ≈ |step|² in posterior widths near the optimum).
 */
export const FIT_SEARCH = { differenceStep: 1e-3, costTolerance: 1e-4 } as const;

export function fitSubset(setup: FitSetup, active: readonly number[], options: SubsetOptions = {}): SubsetFit {
  const params = active.map((j) => setup.parameters[j]);
  const embed = (xs: Float64Array): Float64Array => {
    const full = Float64Array.from(setup.nominalX);
    for (let k = 0; k < active.length; k++) full[active[k]] = xs[k];
    return full;
  };
  const transform = options.transform ?? ((r: Float64Array) => r);
  const solution = solveMap(
    {
      size: active.length,
      priorMean: params.map((p) => p.priorMean),
      priorSd: options.priorSd ?? params.map((p) => p.priorSd),
      residuals: (xs) => transform(setup.residualsAt(embed(xs), options.variant)),
      ...(options.start ? { start: active.map((j) => options.start![j]) } : {}),
    },
    options.maxIterations === undefined ? FIT_SEARCH : { ...FIT_SEARCH, maxIterations: options.maxIterations },
  );
  return { active: [...active], x: embed(solution.x), solution };
}

/** χ² of the nominal circuit against the measurements (no allowance for tolerances). */
export function nominalChiSquare(setup: FitSetup): number {
  const r = setup.residualsAt(setup.nominalX);
  let s = 0;
  for (const v of r) s += v * v;
  return s;
}

export function requireMeasurements(setup: FitSetup): void {
  if (setup.measurements.length === 0) {
    throw new CoreError('invalid-value', 'nothing to fit: give measurements, a capture, or both', '/measurements');
  }
}
