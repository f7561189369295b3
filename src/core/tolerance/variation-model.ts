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
 *   timing capacitor ageing (y years in service): C = C0·A(t0 + y·8766 h)/A(t0),
 *                                               A the log-decade law (parts/capacitor/ageing.ts)
 * The factors multiply, so a part with a tolerance and a tempco gets both.
 * Class II/III codes give one change bound over the whole rated range, so the
 * band applies at every temperature in the range (the code says nothing finer).
 *
 * With a temperature range, the active parts drift with the same board
 * temperature T (ΔT = T − 25 °C), after the spreads above:
 *   input offset:        Vos += w·drift·ΔT, w uniform in [−1, 1] (the sign is unknown: corners take both)
 *   input bias current:  Ib ×= 2^(ΔT/doublingK)            (JFET/CMOS gate leakage)
 *   output headrooms:    h = max(0, h + drift·ΔT)
 *   recovery delay:      t ×= max(0, 1 + drift·ΔT)
 *   diode forward drop:  Vf = max(0, Vf − 2 mV/K·ΔT)        (common practice, parts/diode-drift.ts)
 * with the amplifier's drift figures from its table entries
 * (amplifiers/temperature-drift.ts, the same laws figuresAtTemperature uses).
 */
import type { ParameterInfo } from '../circuit/engine/compiled-network.ts';
import type { ModelName } from '../circuit/result.ts';
import { CoreError } from '../errors.ts';
import { toleranceSpec } from '../amplifiers/figures-table.ts';
import { capacitanceChangeAt, parseDielectric } from '../parts/dielectric.ts';
import { biasCurrentFactorAt, delayFactorAt, driftOf, headroomAtV } from '../amplifiers/temperature-drift.ts';
import type { AmplifierModel } from '../amplifiers/model.ts';
import { DIODE_FORWARD_DROP_TEMPCO_V_PER_K, forwardDropAtV } from '../parts/diode-drift.ts';
import { ageingFactor, ageingRatePerDecade, AGEING_REFERENCE_HOURS, HOURS_PER_YEAR } from '../parts/capacitor/ageing.ts';
import { REFERENCE_TEMPERATURE_C } from '../parts/capacitor/temperature.ts';
import {
  AMPLIFIER_SPREAD_FIELDS,
  SERVICE_LIFE_LIMIT_YEARS,
  type AgeingSummary,
  type TemperatureDriftSummary,
  type TemperatureModelSummary,
  type ToleranceNote,
  type ToleranceRequest,
  type VariationKind,
} from './types.ts';

/** Reference temperature of tempcos and EIA-198 change figures, °C: the capacitor model's, one constant. */
export { REFERENCE_TEMPERATURE_C };
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
  temperatureDrifts: TemperatureDriftSummary[];
  ageing: AgeingSummary | null;
  notes: ToleranceNote[];
}

interface LinearTempTerm {
  param: number;
  tempcoPpmPerK: number;
  spreadPpmPerK: number;
  spreadDim: number;
}

/** How an active part's parameter follows the board temperature (module comment). */
export const DRIFT_LAW = { offset: 0, headroom: 1, diodeDrop: 2, biasDoubling: 3, delay: 4 } as const;
type DriftLaw = (typeof DRIFT_LAW)[keyof typeof DRIFT_LAW];

interface DriftTerm {
  param: number;
  law: DriftLaw;
  /** V/K (offset, headroom, diode drop), K per doubling (bias), 1/K (delay). */
  figure: number;
  /** Dimension of the drift's unknown sign (offset), −1 for none. */
  signDim: number;
}

interface AgeingTerm {
  param: number;
  ratePerDecade: number;
  ageHours: number;
  yearsDim: number;
}

/** A drift law applied to x at dT kelvin from 25 °C; w scales a drift of unknown sign. */
function driftedValue(law: DriftLaw, figure: number, x: number, dT: number, w: number): number {
  switch (law) {
    case DRIFT_LAW.offset: return x + w * figure * dT;
    case DRIFT_LAW.headroom: return headroomAtV(x, figure, dT);
    case DRIFT_LAW.diodeDrop: return forwardDropAtV(x, REFERENCE_TEMPERATURE_C + dT, figure);
    case DRIFT_LAW.biasDoubling: return x * biasCurrentFactorAt(figure, dT);
    case DRIFT_LAW.delay: return x * delayFactorAt(figure, dT);
  }
}

/** Capacitance factor after `years` in service from ageHours, by the log-decade law. */
function ageingRatio(ratePerDecade: number, ageHours: number, years: number): number {
  return ageingFactor(ratePerDecade, ageHours + years * HOURS_PER_YEAR) / ageingFactor(ratePerDecade, ageHours);
}

/** A linear tempco's relative change at board temperature T, with its spread taken at w. */
function linearChange(tempcoPpmPerK: number, spreadPpmPerK: number, w: number, temperatureC: number): number {
  return (tempcoPpmPerK + spreadPpmPerK * w) * 1e-6 * (temperatureC - REFERENCE_TEMPERATURE_C);
}

/**
 * Slot of each parameter by name, one map per parameter list: every model of a shape is built on the
 * layout's own list, so a batch of assemblies builds the map once per shape rather than per assembly.
 */
const parameterIndexes = new WeakMap<readonly ParameterInfo[], ReadonlyMap<string, number>>();

function parameterIndex(parameters: readonly ParameterInfo[]): ReadonlyMap<string, number> {
  let index = parameterIndexes.get(parameters);
  if (index === undefined) {
    index = new Map(parameters.map((p, i) => [p.name, i]));
    parameterIndexes.set(parameters, index);
  }
  return index;
}

function invalid(message: string, pointer: string): never {
  throw new CoreError('invalid-value', message, pointer);
}

function checkFraction(value: number, pointer: string): void {
  if (!Number.isFinite(value) || value < 0 || value >= 1) invalid('a tolerance is a fraction from 0 up to (not including) 1', pointer);
}

/** Slot of a role that is a part (resistor or capacitor) of this circuit. */
function partIndexOf(index: ReadonlyMap<string, number>, parameters: readonly ParameterInfo[], role: string, pointer: string): number {
  const i = index.get(role);
  const kind = i === undefined ? undefined : parameters[i].kind;
  if (i === undefined || (kind !== 'resistor' && kind !== 'capacitor')) {
    const roles = parameters.filter((p) => p.kind === 'resistor' || p.kind === 'capacitor').map((p) => p.name);
    invalid(`'${role}' is not a part of this circuit; its parts are ${roles.join(', ')}`, pointer);
  }
  return i;
}

/**
 * What a model build collects as it goes. The steps below are module functions over it rather than
 * closures of buildVariationModel: a model is built per tolerance run (once per BOM assembly), and a
 * runner that keeps function names (tsx) pays for every closure each build creates.
 */
interface ModelBuild {
  index: ReadonlyMap<string, number>;
  nominal: Float64Array;
  dims: Dimension[];
  lists: TermLists;
  /** Index of the temperature dimension, −1 when there is none. */
  temperatureDimension: number;
  temperatureModels: TemperatureModelSummary[];
  temperatureDrifts: TemperatureDriftSummary[];
}

function spreadDim(build: ModelBuild, name: string, kind: VariationKind, targets: number[]): number {
  build.dims.push({ name, kind, sampling: 'spread', low: -1, high: 1, reference: 0, center: 0, targets });
  return build.dims.length - 1;
}

function multiply(build: ModelBuild, param: number, dim: number, scale: number): void {
  build.lists.multParam.push(param);
  build.lists.multDim.push(dim);
  build.lists.multScale.push(scale);
}

function addLinear(build: ModelBuild, role: string, p: number, tempcoPpmPerK: number, spreadPpmPerK: number, dielectric: string | null, within: boolean): void {
  const dims = build.dims;
  let spread = -1;
  if (spreadPpmPerK > 0) {
    dims.push({ name: `${role} tempco`, kind: 'tempco-spread', sampling: 'uniform', low: -1, high: 1, reference: 0, center: 0, targets: [p] });
    spread = dims.length - 1;
  }
  dims[build.temperatureDimension].targets.push(p);
  build.lists.linear.push({ param: p, tempcoPpmPerK, spreadPpmPerK, spreadDim: spread });
  const t = dims[build.temperatureDimension];
  // The change at both ends of the range with both ends of the tempco spread, (low, −1), (low, +1), (high, −1), (high, +1).
  const c0 = linearChange(tempcoPpmPerK, spreadPpmPerK, -1, t.low);
  const c1 = linearChange(tempcoPpmPerK, spreadPpmPerK, 1, t.low);
  const c2 = linearChange(tempcoPpmPerK, spreadPpmPerK, -1, t.high);
  const c3 = linearChange(tempcoPpmPerK, spreadPpmPerK, 1, t.high);
  build.temperatureModels.push({
    role,
    model: dielectric ? 'dielectric' : 'tempco',
    dielectric,
    changeMinFraction: Math.min(c0, c1, c2, c3) + 0,
    changeMaxFraction: Math.max(c0, c1, c2, c3) + 0,
    withinRatedRange: within,
  });
}

/** One active-part parameter drifting with the board temperature (absent from this shape: nothing). */
function addDrift(build: ModelBuild, name: string, law: DriftLaw, figure: number, source: TemperatureDriftSummary['source'], words: string, signDim = -1): void {
  const p = build.index.get(name);
  if (p === undefined) return;
  const dims = build.dims;
  const t = dims[build.temperatureDimension];
  const x0 = build.nominal[p];
  build.lists.drifts.push({ param: p, law, figure, signDim });
  t.targets.push(p);
  if (signDim >= 0) dims[signDim].targets.push(p);
  // The value at both ends of the range with both signs, (low, −1), (low, +1), (high, −1), (high, +1).
  const e0 = driftedValue(law, figure, x0, t.low - REFERENCE_TEMPERATURE_C, -1);
  const e1 = driftedValue(law, figure, x0, t.low - REFERENCE_TEMPERATURE_C, 1);
  const e2 = driftedValue(law, figure, x0, t.high - REFERENCE_TEMPERATURE_C, -1);
  const e3 = driftedValue(law, figure, x0, t.high - REFERENCE_TEMPERATURE_C, 1);
  build.temperatureDrifts.push({ parameter: name, source, law: words, valueAtReference: x0, valueMin: Math.min(e0, e1, e2, e3) + 0, valueMax: Math.max(e0, e1, e2, e3) + 0 });
}

function addActiveDrift(build: ModelBuild, amp: AmplifierModel, model: ModelName): void {
  const { dims, index, nominal } = build;
  const drift = driftOf(amp);
  const timeDomain = model === 'time-domain';
  if (drift.inputOffsetDriftVPerK > 0) {
    dims.push({ name: 'inputOffsetV drift sign', kind: 'tempco-spread', sampling: 'uniform', low: -1, high: 1, reference: 0, center: 0, targets: [] });
    addDrift(build, 'inputOffsetV', DRIFT_LAW.offset, drift.inputOffsetDriftVPerK, 'amplifier', `± ${micro(drift.inputOffsetDriftVPerK)} µV/K (sign unknown: both)`, dims.length - 1);
  }
  const biasIndex = index.get('inputBiasCurrentA');
  if (Number.isFinite(drift.inputBiasDoublingK) && biasIndex !== undefined && nominal[biasIndex] > 0) {
    addDrift(build, 'inputBiasCurrentA', DRIFT_LAW.biasDoubling, drift.inputBiasDoublingK, 'amplifier', `doubles every ${drift.inputBiasDoublingK} K`);
  }
  if (drift.outputHeadroomDriftVPerK !== 0) {
    const words = `${milli(drift.outputHeadroomDriftVPerK)} mV/K (not below 0)`;
    addDrift(build, 'outputHeadroomHighV', DRIFT_LAW.headroom, drift.outputHeadroomDriftVPerK, 'amplifier', words);
    addDrift(build, 'outputHeadroomLowV', DRIFT_LAW.headroom, drift.outputHeadroomDriftVPerK, 'amplifier', words);
  }
  const delayIndex = index.get('recoveryDelayS');
  if (timeDomain && drift.delayDriftPerK !== 0 && delayIndex !== undefined && nominal[delayIndex] > 0) {
    addDrift(build, 'recoveryDelayS', DRIFT_LAW.delay, drift.delayDriftPerK, 'amplifier', `${Number((drift.delayDriftPerK * 100).toPrecision(3))} %/K`);
  }
  if (index.has('diodeForwardDropV')) {
    addDrift(build, 'diodeForwardDropV', DRIFT_LAW.diodeDrop, DIODE_FORWARD_DROP_TEMPCO_V_PER_K, 'steering-diodes', `${milli(DIODE_FORWARD_DROP_TEMPCO_V_PER_K)} mV/K (silicon junction, common practice; not below 0)`);
  }
}

export function buildVariationModel(
  request: ToleranceRequest,
  parameters: readonly ParameterInfo[],
  nominal: Float64Array,
  model: ModelName,
): VariationModel {
  request = withPartDefaults(request, parameters);
  const index = parameterIndex(parameters);
  const build: ModelBuild = {
    index,
    nominal,
    dims: [],
    lists: { multParam: [], multDim: [], multScale: [], linear: [], bandParam: [], bandDim: [], addParam: [], addDim: [], addScale: [], drifts: [], ageing: [] },
    temperatureDimension: -1,
    temperatureModels: [],
    temperatureDrifts: [],
  };
  const { dims, temperatureModels, temperatureDrifts } = build;
  const { addParam, addDim, addScale, bandParam, bandDim, drifts } = build.lists;
  const notes: ToleranceNote[] = [];

  // --- tracking groups first: their members take no independent tolerance dimension
  const tracked = new Map<string, number>();
  (request.tracking ?? []).forEach((group, g) => {
    const pointer = `/tracking/${g}`;
    if (group.roles.length < 2) invalid('a tracking group needs at least two parts', `${pointer}/roles`);
    const members = group.roles.map((role, k) => {
      if (tracked.has(role)) invalid(`'${role}' is already in tracking group ${tracked.get(role)}`, `${pointer}/roles/${k}`);
      tracked.set(role, g);
      return partIndexOf(index, parameters, role, `${pointer}/roles/${k}`);
    });
    const shared = group.tolerance ?? Math.max(0, ...group.roles.map((r) => request.tolerances[r] ?? 0));
    checkFraction(shared, `${pointer}/tolerance`);
    if (shared > 0) {
      const d = spreadDim(build, `tracking[${g}]`, 'tracking', members);
      for (const p of members) multiply(build, p, d, shared);
    }
    const residual = group.residualTolerance ?? 0;
    checkFraction(residual, `${pointer}/residualTolerance`);
    if (residual > 0) {
      group.roles.forEach((role, k) => {
        const d = spreadDim(build, `${role} residual`, 'tracking-residual', [members[k]]);
        multiply(build, members[k], d, residual);
      });
    }
  });

  // --- independent part tolerances
  for (const [role, tolerance] of Object.entries(request.tolerances)) {
    const pointer = `/tolerances/${role}`;
    const p = partIndexOf(index, parameters, role, pointer);
    checkFraction(tolerance, pointer);
    if (tracked.has(role) || tolerance === 0) continue;
    multiply(build, p, spreadDim(build, role, 'part-tolerance', [p]), tolerance);
  }

  // --- temperature
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
    build.temperatureDimension = dims.length - 1;
  }
  const temperatureDimension = build.temperatureDimension;
  const coefficients = Object.entries(request.temperatureCoefficients ?? {});
  if (coefficients.length > 0 && !range) {
    notes.push({ code: 'no-temperature-range', message: 'temperatureCoefficients are given but no temperature range: the parts are taken at 25 °C' });
  }
  for (const [role, coefficient] of range ? coefficients : []) {
    const pointer = `/temperatureCoefficients/${role}`;
    const p = partIndexOf(index, parameters, role, pointer);
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
        addLinear(build, role, p, dielectric.tempcoPpmPerK, dielectric.tempcoTolerancePpmPerK ?? 0, dielectric.code, within);
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
      addLinear(build, role, p, tempcoPpmPerK, tempcoTolerancePpmPerK, null, true);
    }
  }

  // --- drift of the active parts with the board temperature
  if (range) addActiveDrift(build, request.circuit.amplifier, model);
  if (range && coefficients.length === 0 && drifts.length === 0) {
    notes.push({
      code: 'temperature-without-coefficients',
      message: 'A temperature range is given but nothing in this circuit drifts with it (no part temperature coefficient, no amplifier drift figure, no steering diodes): temperature has no effect',
    });
  }

  // --- ageing of the timing capacitor over the service life
  const ageingTerms = build.lists.ageing;
  let ageing: AgeingSummary | null = null;
  const serviceLifeYears = request.serviceLifeYears ?? 0;
  if (!Number.isFinite(serviceLifeYears) || serviceLifeYears < 0 || serviceLifeYears > SERVICE_LIFE_LIMIT_YEARS) {
    invalid(`serviceLifeYears must be from 0 to ${SERVICE_LIFE_LIMIT_YEARS} years`, '/serviceLifeYears');
  }
  const capacitorIndex = parameters.findIndex((p) => p.kind === 'capacitor');
  if (capacitorIndex >= 0) {
    const role = parameters[capacitorIndex].name;
    const law = timingCapacitorAgeing(request, role);
    if (law && law.ageingRatePerDecade > 0) {
      if (serviceLifeYears > 0) {
        dims.push({ name: `${role} ageing`, kind: 'ageing', sampling: 'uniform', low: 0, high: serviceLifeYears, reference: 0, center: serviceLifeYears / 2, targets: [capacitorIndex] });
        ageingTerms.push({ param: capacitorIndex, ratePerDecade: law.ageingRatePerDecade, ageHours: law.ageHours, yearsDim: dims.length - 1 });
        ageing = {
          role,
          ratePerDecade: law.ageingRatePerDecade,
          ageStartHours: law.ageHours,
          ageEndHours: law.ageHours + serviceLifeYears * HOURS_PER_YEAR,
          serviceLifeYears,
          changeFraction: ageingRatio(law.ageingRatePerDecade, law.ageHours, serviceLifeYears) - 1,
        };
      } else {
        notes.push({
          code: 'ageing-not-included',
          message: `${role} ages about ${Number((law.ageingRatePerDecade * 100).toPrecision(3))} % per decade of hours (class II/III ceramic); give serviceLifeYears to include its loss over the board's life`,
        });
      }
    }
  } else if (serviceLifeYears > 0) {
    notes.push({ code: 'ageing-not-included', message: 'serviceLifeYears is given but the circuit has no timing capacitor' });
  }

  // --- supply
  const supplyTolerance = request.supplyTolerance ?? 0;
  checkFraction(supplyTolerance, '/supplyTolerance');
  if (supplyTolerance > 0) {
    const rails = ['supplyPositiveV', 'supplyNegativeV'].map((n) => index.get(n)!).filter((i) => nominal[i] !== 0);
    if (request.supplyRailsIndependent) {
      for (const r of rails) multiply(build, r, spreadDim(build, parameters[r].name, 'supply', [r]), supplyTolerance);
    } else {
      const d = spreadDim(build, 'supply', 'supply', rails);
      for (const r of rails) multiply(build, r, d, supplyTolerance);
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
    multiply(build, p, spreadDim(build, field, 'amplifier', [p]), fraction);
  }
  const offsetRangeV = spreads.inputOffsetRangeV ?? 0;
  if (!Number.isFinite(offsetRangeV) || offsetRangeV < 0 || offsetRangeV > 1) invalid('inputOffsetRangeV must be from 0 to 1 V', '/amplifierSpreads/inputOffsetRangeV');
  if (offsetRangeV > 0) {
    const p = index.get('inputOffsetV')!;
    const d = spreadDim(build, 'inputOffsetRange', 'amplifier', [p]);
    addParam.push(p);
    addDim.push(d);
    addScale.push(offsetRangeV);
  }

  const terms = new VariationTerms(nominal, build.lists, temperatureDimension);

  const reference = column(Float64Array, dims, (d) => d.reference);
  const center = column(Float64Array, dims, (d) => d.center);
  const varied = new Set<number>();
  for (const d of dims) for (const t of d.targets) varied.add(t);
  return {
    parameters,
    nominal,
    dimensions: dims,
    temperatureDimension,
    variedParameters: [...varied].sort((a, b) => a - b),
    // Methods, not arrow properties: nothing per build but the object (keepNames runners name every arrow).
    apply(u: Float64Array, values: Float64Array) {
      terms.apply(u, values);
    },
    terms,
    referencePoint() {
      return reference.slice();
    },
    centerPoint() {
      return center.slice();
    },
    temperatureModels,
    temperatureDrifts,
    ageing,
    notes,
  };
}

/**
 * What the timing capacitor's part object states fills in for what the request leaves out: its
 * tolerance (unless tolerances or a tracking group names it) and its dielectric as its temperature
 * behaviour (unless temperatureCoefficients names it).
 */
function withPartDefaults(request: ToleranceRequest, parameters: readonly ParameterInfo[]): ToleranceRequest {
  const part = request.timingCapacitor;
  const role = parameters.find((p) => p.kind === 'capacitor')?.name;
  if (!part || role === undefined) return request;
  const tracked = (request.tracking ?? []).some((g) => g.roles.includes(role));
  const out = { ...request };
  if (part.toleranceFraction !== undefined && part.toleranceFraction > 0 && request.tolerances[role] === undefined && !tracked) {
    out.tolerances = { ...request.tolerances, [role]: part.toleranceFraction };
  }
  if (part.dielectric !== undefined && request.temperature && request.temperatureCoefficients?.[role] === undefined) {
    out.temperatureCoefficients = { ...request.temperatureCoefficients, [role]: { dielectric: part.dielectric } };
  }
  return out;
}

/**
 * The timing capacitor's ageing law: from its part object when the request has one, else from a
 * dielectric named for it in temperatureCoefficients (at the reference age, where the marked value applies).
 */
function timingCapacitorAgeing(request: ToleranceRequest, role: string): { ageingRatePerDecade: number; ageHours: number } | undefined {
  if (request.timingCapacitor) return request.timingCapacitor;
  const coefficient = request.temperatureCoefficients?.[role];
  if (!coefficient || !('dielectric' in coefficient)) return undefined;
  try {
    return { ageingRatePerDecade: ageingRatePerDecade(parseDielectric(coefficient.dielectric)), ageHours: AGEING_REFERENCE_HOURS };
  } catch {
    return undefined; // an unknown code is reported where the temperature coefficients are read
  }
}

const micro = (x: number) => Number((x * 1e6).toPrecision(3));
const milli = (x: number) => Number((x * 1e3).toPrecision(3));

interface TermLists {
  multParam: number[];
  multDim: number[];
  multScale: number[];
  linear: LinearTempTerm[];
  bandParam: number[];
  bandDim: number[];
  addParam: number[];
  addDim: number[];
  addScale: number[];
  drifts: DriftTerm[];
  ageing: AgeingTerm[];
}

/**
 * One field of each entry as a typed array: a plain loop (TypedArray.from with a map function goes through
 * the iterator protocol, and a model is built per tolerance run: once per BOM assembly).
 */
function column<T, A extends Float64Array | Int32Array | Uint8Array>(Type: new (length: number) => A, list: readonly T[], field: (entry: T) => number): A {
  const out = new Type(list.length);
  for (let i = 0; i < list.length; i++) out[i] = field(list[i]);
  return out;
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

  private readonly dP: Int32Array;
  private readonly dLaw: Uint8Array;
  private readonly dFigure: Float64Array;
  private readonly dSign: Int32Array;
  private readonly gP: Int32Array;
  private readonly gRate: Float64Array;
  private readonly gHours: Float64Array;
  private readonly gD: Int32Array;
  /**
   * The temperature-only factors of the bias-doubling and delay laws (a power and a product), kept for
   * the last two board temperatures: a search or a sample run meets a handful of temperatures over and
   * over, a corner search mostly the two ends of the range in turn. NaN: none computed yet. The product
   * x·factor is the one driftedValue forms.
   */
  private factorDT = Number.NaN;
  private dFactor: Float64Array;
  private otherFactorDT = Number.NaN;
  private otherFactor: Float64Array;

  constructor(
    private readonly nominal: Float64Array,
    lists: TermLists,
    private readonly tDim: number,
  ) {
    this.mP = Int32Array.from(lists.multParam);
    this.mD = Int32Array.from(lists.multDim);
    this.mS = Float64Array.from(lists.multScale);
    this.lP = column(Int32Array, lists.linear, (l) => l.param);
    this.lA = column(Float64Array, lists.linear, (l) => l.tempcoPpmPerK * 1e-6);
    this.lS = column(Float64Array, lists.linear, (l) => l.spreadPpmPerK * 1e-6);
    this.lD = column(Int32Array, lists.linear, (l) => l.spreadDim);
    this.bP = Int32Array.from(lists.bandParam);
    this.bD = Int32Array.from(lists.bandDim);
    this.aP = Int32Array.from(lists.addParam);
    this.aD = Int32Array.from(lists.addDim);
    this.aS = Float64Array.from(lists.addScale);
    this.dP = column(Int32Array, lists.drifts, (d) => d.param);
    this.dLaw = column(Uint8Array, lists.drifts, (d) => d.law);
    this.dFigure = column(Float64Array, lists.drifts, (d) => d.figure);
    this.dSign = column(Int32Array, lists.drifts, (d) => d.signDim);
    this.gP = column(Int32Array, lists.ageing, (g) => g.param);
    this.gRate = column(Float64Array, lists.ageing, (g) => g.ratePerDecade);
    this.gHours = column(Float64Array, lists.ageing, (g) => g.ageHours);
    this.gD = column(Int32Array, lists.ageing, (g) => g.yearsDim);
    this.dFactor = new Float64Array(lists.drifts.length);
    this.otherFactor = new Float64Array(lists.drifts.length);
  }

  /** The factors for board temperature dT kelvin from 25 °C (computed only for a temperature not among the last two). */
  private driftFactorsAt(dT: number): Float64Array {
    if (dT === this.factorDT) return this.dFactor;
    // Swap in the other slot: it holds the factors of dT already, or is the older one and is overwritten.
    const otherDT = this.otherFactorDT;
    const other = this.otherFactor;
    this.otherFactorDT = this.factorDT;
    this.otherFactor = this.dFactor;
    this.factorDT = dT;
    this.dFactor = other;
    if (dT !== otherDT) {
      const { dLaw, dFigure } = this;
      for (let i = 0; i < dLaw.length; i++) {
        if (dLaw[i] === DRIFT_LAW.biasDoubling) other[i] = biasCurrentFactorAt(dFigure[i], dT);
        else if (dLaw[i] === DRIFT_LAW.delay) other[i] = delayFactorAt(dFigure[i], dT);
      }
    }
    return other;
  }

  apply(u: Float64Array, values: Float64Array): void {
    // A loop, not values.set(): the vector has a couple of dozen entries and the builtin call costs more.
    const nominal = this.nominal;
    for (let i = 0; i < nominal.length; i++) values[i] = nominal[i];
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
    const { gP, gRate, gHours, gD } = this;
    for (let i = 0; i < gP.length; i++) values[gP[i]] *= ageingRatio(gRate[i], gHours[i], u[gD[i]]);
    if (this.tDim >= 0) {
      // Active parts drift last: their laws act on the spread value (e.g. a headroom's floor at 0).
      const dT = u[this.tDim] - REFERENCE_TEMPERATURE_C;
      const { dP, dLaw, dFigure, dSign } = this;
      const factor = this.driftFactorsAt(dT);
      for (let i = 0; i < dP.length; i++) {
        const law = dLaw[i] as DriftLaw;
        if (law === DRIFT_LAW.biasDoubling || law === DRIFT_LAW.delay) {
          values[dP[i]] *= factor[i];
          continue;
        }
        const w = dSign[i] >= 0 ? u[dSign[i]] : 1;
        values[dP[i]] = driftedValue(law, dFigure[i], values[dP[i]], dT, w);
      }
    }
  }
}
