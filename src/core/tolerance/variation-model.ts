/**
 * Turns a tolerance request into independent variation dimensions and a map
 * from a point in that space to the evaluator's value vector.
 *
 * Each dimension is either a "spread" u in [-1, 1] (part tolerances, tracking
 * draws, supply, amplifier spreads: drawn by the requested distribution) or a
 * "uniform" range in its own units (temperature in °C, a tempco's ± spread, a
 * dielectric's change band: drawn uniformly, because those figures are bounds,
 * not statistics — our choice, documented in the API).
 *
 * How values move (x0 = nominal):
 *   tolerance / tracking / supply / amplifier:  x = x0·(1 + t·u)
 *   linear tempco (resistor, class I, film):    x = x0·(1 + (α + Δα·w)·1e-6·(T − 25 °C))
 *   class II/III band (EIA-198 X7R, Y5V...):    x = x0·(1 + c),  c uniform in the code's band
 *   input offset range:                         Vos = Vos0 + range·u
 * The factors multiply, so a part with a tolerance and a tempco gets both.
 * Class II/III codes give one change bound over the whole rated range, so the
 * band applies at every temperature in the range (the code says nothing finer).
 */
import type { ParameterInfo } from '../circuit/engine/compiled-network.ts';
import type { ModelName } from '../circuit/result.ts';
import { CoreError } from '../errors.ts';
import { toleranceSpec } from '../amplifiers/figures-table.ts';
import { capacitanceChangeAt, parseDielectric } from '../parts/dielectric.ts';
import {
  AMPLIFIER_SPREAD_FIELDS,
  type TemperatureModelSummary,
  type ToleranceNote,
  type ToleranceRequest,
  type VariationKind,
} from './types.ts';

/** Reference temperature of tempcos and EIA-198 change figures, °C. */
export const REFERENCE_TEMPERATURE_C = 25;
/** Plausible board temperatures, °C (outside: a typo, not a design). */
export const TEMPERATURE_LIMITS_C = { min: -273.15, max: 500 } as const;
/** A tempco beyond this is a units mistake (ppm/K vs %/K), ppm/K. */
export const TEMPCO_LIMIT_PPM_PER_K = 1e5;

export interface Dimension {
  name: string;
  kind: VariationKind;
  sampling: 'spread' | 'uniform';
  low: number;
  high: number;
  /** Position giving the nominal circuit. */
  reference: number;
  /** Mean of the dimension's distribution (where variance shares are linearised). */
  center: number;
  /** Parameter indices this dimension moves. */
  targets: number[];
}

export interface VariationModel {
  parameters: readonly ParameterInfo[];
  nominal: Float64Array;
  dimensions: Dimension[];
  /** Index of the temperature dimension, −1 when there is none. */
  temperatureDimension: number;
  /** Parameter indices moved by at least one dimension. */
  variedParameters: number[];
  /** Writes the value vector for point u (one entry per dimension). */
  apply(u: Float64Array, values: Float64Array): void;
  /** The same map as a class instance (monomorphic in hot loops). */
  terms: VariationTerms;
  referencePoint(): Float64Array;
  centerPoint(): Float64Array;
  temperatureModels: TemperatureModelSummary[];
  notes: ToleranceNote[];
}

interface LinearTempTerm {
  param: number;
  tempcoPpmPerK: number;
  spreadPpmPerK: number;
  spreadDim: number;
}

function invalid(message: string, pointer: string): never {
  throw new CoreError('invalid-value', message, pointer);
}

function checkFraction(value: number, pointer: string): void {
  if (!Number.isFinite(value) || value < 0 || value >= 1) invalid('a tolerance is a fraction from 0 up to (not including) 1', pointer);
}

export function buildVariationModel(
  request: ToleranceRequest,
  parameters: readonly ParameterInfo[],
  nominal: Float64Array,
  model: ModelName,
): VariationModel {
  const index = new Map(parameters.map((p, i) => [p.name, i]));
  const partIndex = (role: string, pointer: string): number => {
    const i = index.get(role);
    const kind = i === undefined ? undefined : parameters[i].kind;
    if (i === undefined || (kind !== 'resistor' && kind !== 'capacitor')) {
      const roles = parameters.filter((p) => p.kind === 'resistor' || p.kind === 'capacitor').map((p) => p.name);
      invalid(`'${role}' is not a part of this circuit; its parts are ${roles.join(', ')}`, pointer);
    }
    return i;
  };
  const dims: Dimension[] = [];
  const notes: ToleranceNote[] = [];
  const multParam: number[] = [];
  const multDim: number[] = [];
  const multScale: number[] = [];
  const addParam: number[] = [];
  const addDim: number[] = [];
  const addScale: number[] = [];
  const bandParam: number[] = [];
  const bandDim: number[] = [];
  const linear: LinearTempTerm[] = [];
  const temperatureModels: TemperatureModelSummary[] = [];

  const spreadDim = (name: string, kind: VariationKind, targets: number[]): number => {
    dims.push({ name, kind, sampling: 'spread', low: -1, high: 1, reference: 0, center: 0, targets });
    return dims.length - 1;
  };
  const multiply = (param: number, dim: number, scale: number) => {
    multParam.push(param);
    multDim.push(dim);
    multScale.push(scale);
  };

  // --- tracking groups first: their members take no independent tolerance dimension
  const tracked = new Map<string, number>();
  (request.tracking ?? []).forEach((group, g) => {
    const pointer = `/tracking/${g}`;
    if (group.roles.length < 2) invalid('a tracking group needs at least two parts', `${pointer}/roles`);
    const members = group.roles.map((role, k) => {
      if (tracked.has(role)) invalid(`'${role}' is already in tracking group ${tracked.get(role)}`, `${pointer}/roles/${k}`);
      tracked.set(role, g);
      return partIndex(role, `${pointer}/roles/${k}`);
    });
    const shared = group.tolerance ?? Math.max(0, ...group.roles.map((r) => request.tolerances[r] ?? 0));
    checkFraction(shared, `${pointer}/tolerance`);
    if (shared > 0) {
      const d = spreadDim(`tracking[${g}]`, 'tracking', members);
      for (const p of members) multiply(p, d, shared);
    }
    const residual = group.residualTolerance ?? 0;
    checkFraction(residual, `${pointer}/residualTolerance`);
    if (residual > 0) {
      group.roles.forEach((role, k) => {
        const d = spreadDim(`${role} residual`, 'tracking-residual', [members[k]]);
        multiply(members[k], d, residual);
      });
    }
  });

  // --- independent part tolerances
  for (const [role, tolerance] of Object.entries(request.tolerances)) {
    const pointer = `/tolerances/${role}`;
    const p = partIndex(role, pointer);
    checkFraction(tolerance, pointer);
    if (tracked.has(role) || tolerance === 0) continue;
    multiply(p, spreadDim(role, 'part-tolerance', [p]), tolerance);
  }

  // --- temperature
  let temperatureDimension = -1;
  const range = request.temperature;
  if (range) {
    const { minC, maxC } = range;
    if (!Number.isFinite(minC) || minC < TEMPERATURE_LIMITS_C.min) invalid('temperature.minC must be a temperature above absolute zero', '/temperature/minC');
    if (!Number.isFinite(maxC) || maxC > TEMPERATURE_LIMITS_C.max) invalid(`temperature.maxC must be at most ${TEMPERATURE_LIMITS_C.max} °C`, '/temperature/maxC');
    if (!(maxC >= minC)) invalid('temperature.maxC must not be below minC', '/temperature/maxC');
    dims.push({
      name: 'temperature',
      kind: 'temperature',
      sampling: 'uniform',
      low: minC,
      high: maxC,
      reference: REFERENCE_TEMPERATURE_C,
      center: (minC + maxC) / 2,
      targets: [],
    });
    temperatureDimension = dims.length - 1;
  }
  const coefficients = Object.entries(request.temperatureCoefficients ?? {});
  if (coefficients.length > 0 && !range) {
    notes.push({ code: 'no-temperature-range', message: 'temperatureCoefficients are given but no temperature range: the parts are taken at 25 °C' });
  }
  if (range && coefficients.length === 0) {
    notes.push({ code: 'temperature-without-coefficients', message: 'A temperature range is given but no part has a temperature coefficient: temperature has no effect' });
  }
  for (const [role, coefficient] of range ? coefficients : []) {
    const pointer = `/temperatureCoefficients/${role}`;
    const p = partIndex(role, pointer);
    const tempDim = dims[temperatureDimension];
    if ('dielectric' in coefficient) {
      if (parameters[p].kind !== 'capacitor') invalid(`'${role}' is a resistor: give tempcoPpmPerK, not a dielectric`, `${pointer}/dielectric`);
      const dielectric = parseDielectric(coefficient.dielectric, `${pointer}/dielectric`);
      const within = capacitanceChangeAt(dielectric, tempDim.low).withinRatedRange && capacitanceChangeAt(dielectric, tempDim.high).withinRatedRange;
      if (!within) {
        notes.push({
          code: 'outside-rated-temperature',
          message: `${role}: ${dielectric.code} is rated for ${dielectric.tempMinC} to ${dielectric.tempMaxC} °C, narrower than the requested range; its figures are extrapolated`,
        });
      }
      if (dielectric.tempcoPpmPerK !== undefined) {
        addLinear(role, p, dielectric.tempcoPpmPerK, dielectric.tempcoTolerancePpmPerK ?? 0, dielectric.code, within);
      } else {
        // Class II/III (and electrolytic) figures are one band across the rated range.
        const band = capacitanceChangeAt(dielectric, tempDim.center);
        dims.push({
          name: `${role} dielectric`,
          kind: 'dielectric-band',
          sampling: 'uniform',
          low: band.minFraction,
          high: band.maxFraction,
          reference: Math.min(band.maxFraction, Math.max(band.minFraction, 0)),
          center: (band.minFraction + band.maxFraction) / 2,
          targets: [p],
        });
        bandParam.push(p);
        bandDim.push(dims.length - 1);
        temperatureModels.push({
          role,
          model: 'dielectric',
          dielectric: dielectric.code,
          changeMinFraction: band.minFraction,
          changeMaxFraction: band.maxFraction,
          withinRatedRange: within,
        });
      }
    } else {
      const { tempcoPpmPerK, tempcoTolerancePpmPerK = 0 } = coefficient;
      if (!Number.isFinite(tempcoPpmPerK) || Math.abs(tempcoPpmPerK) > TEMPCO_LIMIT_PPM_PER_K) {
        invalid(`tempcoPpmPerK must be within ±${TEMPCO_LIMIT_PPM_PER_K} ppm/K`, `${pointer}/tempcoPpmPerK`);
      }
      if (!Number.isFinite(tempcoTolerancePpmPerK) || tempcoTolerancePpmPerK < 0 || tempcoTolerancePpmPerK > TEMPCO_LIMIT_PPM_PER_K) {
        invalid('tempcoTolerancePpmPerK must be a non-negative ppm/K figure', `${pointer}/tempcoTolerancePpmPerK`);
      }
      addLinear(role, p, tempcoPpmPerK, tempcoTolerancePpmPerK, null, true);
    }
  }

  function addLinear(role: string, p: number, tempcoPpmPerK: number, spreadPpmPerK: number, dielectric: string | null, within: boolean) {
    let spread = -1;
    if (spreadPpmPerK > 0) {
      dims.push({ name: `${role} tempco`, kind: 'tempco-spread', sampling: 'uniform', low: -1, high: 1, reference: 0, center: 0, targets: [p] });
      spread = dims.length - 1;
    }
    dims[temperatureDimension].targets.push(p);
    linear.push({ param: p, tempcoPpmPerK, spreadPpmPerK, spreadDim: spread });
    const t = dims[temperatureDimension];
    const changes = [t.low, t.high].flatMap((T) => [-1, 1].map((w) => (tempcoPpmPerK + spreadPpmPerK * w) * 1e-6 * (T - REFERENCE_TEMPERATURE_C)));
    temperatureModels.push({
      role,
      model: dielectric ? 'dielectric' : 'tempco',
      dielectric,
      changeMinFraction: Math.min(...changes) + 0,
      changeMaxFraction: Math.max(...changes) + 0,
      withinRatedRange: within,
    });
  }

  // --- supply
  const supplyTolerance = request.supplyTolerance ?? 0;
  checkFraction(supplyTolerance, '/supplyTolerance');
  if (supplyTolerance > 0) {
    const rails = ['supplyPositiveV', 'supplyNegativeV'].map((n) => index.get(n)!).filter((i) => nominal[i] !== 0);
    if (request.supplyRailsIndependent) {
      for (const r of rails) multiply(r, spreadDim(parameters[r].name, 'supply', [r]), supplyTolerance);
    } else {
      const d = spreadDim('supply', 'supply', rails);
      for (const r of rails) multiply(r, d, supplyTolerance);
    }
  }

  // --- amplifier spreads
  const spreads = request.amplifierSpreads ?? {};
  for (const field of AMPLIFIER_SPREAD_FIELDS) {
    const fraction = spreads[field];
    if (fraction === undefined || fraction === 0) continue;
    const pointer = `/amplifierSpreads/${field}`;
    checkFraction(fraction, pointer);
    const p = index.get(field)!;
    const dynamic = toleranceSpec(field)?.timeDomainOnly === true;
    if (dynamic && model === 'closed-form') {
      notes.push({ code: 'spread-not-modelled', message: `${field} spreads have no effect: the closed form answers this circuit (instant edges, no delay)` });
      continue;
    }
    if (!Number.isFinite(nominal[p]) || nominal[p] === 0) {
      notes.push({ code: 'spread-without-effect', message: `${field} is ${nominal[p] === 0 ? '0' : 'unlimited'} for this amplifier, so a relative spread has no effect` });
      continue;
    }
    multiply(p, spreadDim(field, 'amplifier', [p]), fraction);
  }
  const offsetRangeV = spreads.inputOffsetRangeV ?? 0;
  if (!Number.isFinite(offsetRangeV) || offsetRangeV < 0 || offsetRangeV > 1) invalid('inputOffsetRangeV must be from 0 to 1 V', '/amplifierSpreads/inputOffsetRangeV');
  if (offsetRangeV > 0) {
    const p = index.get('inputOffsetV')!;
    const d = spreadDim('inputOffsetRange', 'amplifier', [p]);
    addParam.push(p);
    addDim.push(d);
    addScale.push(offsetRangeV);
  }

  const terms = new VariationTerms(nominal, multParam, multDim, multScale, linear, bandParam, bandDim, addParam, addDim, addScale, temperatureDimension);
  const apply = (u: Float64Array, values: Float64Array) => terms.apply(u, values);

  const varied = new Set<number>();
  for (const d of dims) for (const t of d.targets) varied.add(t);
  return {
    parameters,
    nominal,
    dimensions: dims,
    temperatureDimension,
    variedParameters: [...varied].sort((a, b) => a - b),
    apply,
    terms,
    referencePoint: () => Float64Array.from(dims, (d) => d.reference),
    centerPoint: () => Float64Array.from(dims, (d) => d.center),
    temperatureModels,
    notes,
  };
}

/** The hot-loop form of the map from a point to the value vector (see the module comment for the formulas). */
export class VariationTerms {
  private readonly mP: Int32Array;
  private readonly mD: Int32Array;
  private readonly mS: Float64Array;
  private readonly lP: Int32Array;
  private readonly lA: Float64Array;
  private readonly lS: Float64Array;
  private readonly lD: Int32Array;
  private readonly bP: Int32Array;
  private readonly bD: Int32Array;
  private readonly aP: Int32Array;
  private readonly aD: Int32Array;
  private readonly aS: Float64Array;

  constructor(
    private readonly nominal: Float64Array,
    multParam: number[],
    multDim: number[],
    multScale: number[],
    linear: LinearTempTerm[],
    bandParam: number[],
    bandDim: number[],
    addParam: number[],
    addDim: number[],
    addScale: number[],
    private readonly tDim: number,
  ) {
    this.mP = Int32Array.from(multParam);
    this.mD = Int32Array.from(multDim);
    this.mS = Float64Array.from(multScale);
    this.lP = Int32Array.from(linear, (l) => l.param);
    this.lA = Float64Array.from(linear, (l) => l.tempcoPpmPerK * 1e-6);
    this.lS = Float64Array.from(linear, (l) => l.spreadPpmPerK * 1e-6);
    this.lD = Int32Array.from(linear, (l) => l.spreadDim);
    this.bP = Int32Array.from(bandParam);
    this.bD = Int32Array.from(bandDim);
    this.aP = Int32Array.from(addParam);
    this.aD = Int32Array.from(addDim);
    this.aS = Float64Array.from(addScale);
  }

  apply(u: Float64Array, values: Float64Array): void {
    values.set(this.nominal);
    const { mP, mD, mS } = this;
    for (let i = 0; i < mP.length; i++) values[mP[i]] *= 1 + mS[i] * u[mD[i]];
    if (this.tDim >= 0) {
      const dT = u[this.tDim] - REFERENCE_TEMPERATURE_C;
      const { lP, lA, lS, lD } = this;
      for (let i = 0; i < lP.length; i++) {
        const alpha = lD[i] >= 0 ? lA[i] + lS[i] * u[lD[i]] : lA[i];
        values[lP[i]] *= 1 + alpha * dT;
      }
    }
    const { bP, bD, aP, aD, aS } = this;
    for (let i = 0; i < bP.length; i++) values[bP[i]] *= 1 + u[bD[i]];
    for (let i = 0; i < aP.length; i++) values[aP[i]] += aS[i] * u[aD[i]];
  }
}
