/**
 * Binds a nominal circuit, its fit parameters and the measurements into one
 * residual function, and fits any subset of the parameters (the others held
 * at nominal) — the full estimate and every candidate explanation use it.
 */
import type { Circuit } from '../../circuit/types.ts';
import { CoreError } from '../../errors.ts';
import { predictFigures, type PredictedFigures } from './forward.ts';
import { solveMap, type MapSolution } from './map-lm.ts';
import type { Measurement } from './measurements.ts';
import { buildParameters, circuitAt, nominalVector, type FitParameter } from './parameters.ts';

export interface FitSetup {
  circuit: Circuit;
  parameters: FitParameter[];
  measurements: Measurement[];
  nominalX: Float64Array;
  nominalFigures: PredictedFigures;
  figuresAt(x: ArrayLike<number>): PredictedFigures;
  residualsAt(x: ArrayLike<number>): Float64Array;
}

export function createFitSetup(circuit: Circuit, measurements: Measurement[], tolerances: Readonly<Record<string, number>> = {}): FitSetup {
  const nominalFigures = predictFigures(circuit);
  const parameters = buildParameters(circuit, nominalFigures.periodS, Math.abs(nominalFigures.outputHighV - nominalFigures.outputLowV), tolerances);
  const nominalX = nominalVector(parameters);
  const figuresAt = (x: ArrayLike<number>) => predictFigures(circuitAt(circuit, parameters, x));
  const residualsAt = (x: ArrayLike<number>) => {
    const fig = figuresAt(x);
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
  /** Covariance of the active parameters, in the fitted space. */
  solution: MapSolution;
}

export function fitSubset(setup: FitSetup, active: readonly number[], start?: ArrayLike<number>): SubsetFit {
  const params = active.map((j) => setup.parameters[j]);
  const embed = (xs: Float64Array): Float64Array => {
    const full = Float64Array.from(setup.nominalX);
    for (let k = 0; k < active.length; k++) full[active[k]] = xs[k];
    return full;
  };
  const solution = solveMap({
    size: active.length,
    priorMean: params.map((p) => p.priorMean),
    priorSd: params.map((p) => p.priorSd),
    lower: params.map((p) => p.lower ?? -Infinity),
    upper: params.map(() => Infinity),
    residuals: (xs) => setup.residualsAt(embed(xs)),
    ...(start ? { start: active.map((j) => start[j]) } : {}),
  });
  return { active: [...active], x: embed(solution.x), solution };
}

/** χ² of the nominal circuit against the measurements. */
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
