/**
 * The timing capacitor as a part: `{value, tolerance?, dielectric?, ratedVoltageV?,
 * caseSize?, ageHours?, biasCurve?}` (API names) resolved into what the model
 * needs — the capacitance at 0 V, its C(V) shape, its ageing rate and its
 * insulation resistance — with every default stated:
 * - no dielectric: an ideal capacitor (flat, no ageing, no leakage), as a bare value always was;
 * - class II/III without a rated voltage: DEFAULT_RATED_VOLTAGE_V; without a case: DEFAULT_CASE_SIZE;
 * - no ageHours: the part is at its reference age (the marked value applies);
 * - biasCurve: the caller's points replace the class-typical curve; they are
 *   absolute (the part's own capacitance at each bias), so their 0 V value is
 *   the capacitance at 0 V and `value` stays the marked value.
 */
import { CoreError } from '../../errors.ts';
import { parseDielectric, type Dielectric } from '../dielectric.ts';
import { parseComponentValue, parseToleranceLetter } from '../value-parse.ts';
import { ageingFactor, ageingRatePerDecade, AGEING_REFERENCE_HOURS } from './ageing.ts';
import {
  DEFAULT_CASE_SIZE,
  DEFAULT_RATED_VOLTAGE_V,
  FLAT_SHAPE,
  isBiasDependent,
  parseCaseSize,
  PointsShape,
  typicalBiasShape,
  type BiasShape,
  type CapacitancePoint,
  type CaseSize,
} from './dc-bias.ts';
import { insulationResistanceOhm } from './insulation.ts';
import { REFERENCE_TEMPERATURE_C, typicalTemperatureChange } from './temperature.ts';

/** What a caller sends (HTTP body shape after JSON parsing). */
export interface CapacitorSpec {
  value: string | number;
  /** Fraction (0.1), percent text ("10%") or an IEC 60062 letter ("K"). */
  tolerance?: string | number;
  dielectric?: string;
  ratedVoltageV?: number;
  caseSize?: string;
  /** Hours since the last de-ageing (soldering reflow de-ages a class II part). */
  ageHours?: number;
  /** Measured or published C(V) points of the actual part; replace the class-typical curve. */
  biasCurve?: readonly CapacitancePoint[];
}

export interface CapacitorModel {
  /** Marked value, F. */
  nominalF: number;
  /** Tolerance band as fractions (absent: exact). */
  tolerancePlusFraction?: number;
  toleranceMinusFraction?: number;
  dielectric?: Dielectric;
  ratedVoltageV?: number;
  caseSize?: CaseSize;
  ageHours: number;
  /** Where the C(V) shape comes from. */
  shape: BiasShape;
  ageingRatePerDecade: number;
  /** Capacitance at 0 V, 25 °C and ageHours, F (the marked value aged, or the caller curve's 0 V value). */
  capacitanceF: number;
  /** Leakage across the capacitor at 25 °C, ohm (Infinity: none). */
  insulationResistanceOhm: number;
}

function invalid(message: string, pointer?: string): never {
  throw new CoreError('invalid-value', message, pointer);
}

function at(pointer: string | undefined, field: string): string | undefined {
  return pointer === undefined ? undefined : `${pointer}/${field}`;
}

export function parseTolerance(t: string | number, pointer?: string): { plus: number; minus: number } {
  if (typeof t === 'number') {
    if (!Number.isFinite(t) || t < 0 || t >= 1) invalid('tolerance must be a fraction in [0, 1)', pointer);
    return { plus: t, minus: t };
  }
  const s = typeof t === 'string' ? t.trim() : '';
  const pct = /^±?\s*(\d+(?:\.\d+)?)\s*%$/.exec(s);
  if (pct) {
    const f = Number(pct[1]) / 100;
    if (f >= 1) invalid('tolerance must be below 100 %', pointer);
    return { plus: f, minus: f };
  }
  const band = parseToleranceLetter(s, pointer);
  return { plus: band.plusFraction, minus: band.minusFraction };
}

/** A bare value or the capacitor object -> the resolved part. */
export function resolveCapacitor(spec: CapacitorSpec | string | number, pointer?: string): CapacitorModel {
  if (typeof spec === 'string' || typeof spec === 'number') spec = { value: spec };
  if (spec === null || typeof spec !== 'object') invalid('a capacitor is a value or an object with a value', pointer);
  const nominalF = parseComponentValue(spec.value, 'capacitor', at(pointer, 'value'));
  const tol = spec.tolerance === undefined ? undefined : parseTolerance(spec.tolerance, at(pointer, 'tolerance'));
  const dielectric = spec.dielectric === undefined ? undefined : parseDielectric(spec.dielectric, at(pointer, 'dielectric'));
  if (spec.ratedVoltageV !== undefined && !(Number.isFinite(spec.ratedVoltageV) && spec.ratedVoltageV > 0)) {
    invalid('ratedVoltageV must be a positive number of volts', at(pointer, 'ratedVoltageV'));
  }
  const caseSize = spec.caseSize === undefined ? undefined : parseCaseSize(spec.caseSize, at(pointer, 'caseSize'));
  if (spec.ageHours !== undefined && !(Number.isFinite(spec.ageHours) && spec.ageHours >= 0)) {
    invalid('ageHours must be a number of hours ≥ 0', at(pointer, 'ageHours'));
  }
  const ageHours = spec.ageHours ?? AGEING_REFERENCE_HOURS;
  const rate = ageingRatePerDecade(dielectric);
  let shape: BiasShape;
  let capacitanceF: number;
  if (spec.biasCurve !== undefined) {
    const points = new PointsShape(spec.biasCurve, at(pointer, 'biasCurve'));
    shape = points;
    capacitanceF = points.zeroBiasF;
  } else {
    shape = isBiasDependent(dielectric)
      ? typicalBiasShape(dielectric, spec.ratedVoltageV ?? DEFAULT_RATED_VOLTAGE_V, caseSize ?? DEFAULT_CASE_SIZE)
      : FLAT_SHAPE;
    capacitanceF = nominalF * ageingFactor(rate, ageHours);
  }
  return {
    nominalF,
    ...(tol ? { tolerancePlusFraction: tol.plus, toleranceMinusFraction: tol.minus } : {}),
    ...(dielectric ? { dielectric } : {}),
    ...(spec.ratedVoltageV !== undefined ? { ratedVoltageV: spec.ratedVoltageV } : {}),
    ...(caseSize ? { caseSize } : {}),
    ageHours,
    shape,
    ageingRatePerDecade: rate,
    capacitanceF,
    insulationResistanceOhm: insulationResistanceOhm(dielectric, capacitanceF),
  };
}

export interface CapacitorConditions {
  temperatureC?: number;
  /** Hours since de-ageing at which to evaluate (default: the part's own ageHours). */
  ageHours?: number;
}

/**
 * Capacitance at 0 V under the given conditions (typical temperature curve,
 * log-decade ageing from the part's age), F. The C(V) shape multiplies it.
 */
export function capacitanceUnder(model: CapacitorModel, conditions: CapacitorConditions = {}): number {
  const t = conditions.temperatureC ?? REFERENCE_TEMPERATURE_C;
  const temp = model.dielectric ? 1 + typicalTemperatureChange(model.dielectric, t) : 1;
  const age =
    conditions.ageHours === undefined
      ? 1
      : ageingFactor(model.ageingRatePerDecade, conditions.ageHours) / ageingFactor(model.ageingRatePerDecade, model.ageHours);
  return model.capacitanceF * temp * age;
}

/** The C(V) curve the model uses over vMin…vMax as points (API names), for reports. */
export function curvePoints(shape: BiasShape, capacitanceF: number, vMinV: number, vMaxV: number, count = 9): CapacitancePoint[] {
  const n = Math.max(2, Math.floor(count));
  const out: CapacitancePoint[] = [];
  for (let k = 0; k < n; k++) {
    const v = vMinV + ((vMaxV - vMinV) * k) / (n - 1);
    out.push({ voltageV: v, capacitanceF: capacitanceF * shape.ratio(v) });
  }
  return out;
}
