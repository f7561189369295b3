/**
 * Capacitance versus DC bias, C(V), of a timing capacitor.
 *
 * Class II/III ceramics are ferroelectric: the permittivity falls as the field
 * in each layer rises. The shape used here is the field dependence of a
 * ferroelectric in its paraelectric/diffuse regime from the Landau–Devonshire
 * expansion (K. M. Johnson, "Variation of dielectric constant with voltage in
 * ferroelectrics", J. Appl. Phys. 33, 2826 (1962)):
 *
 *     C(V) = C(0) · (1 + (V / V_a)²)^(−1/3)
 *
 * flat at low bias, falling as V^(−2/3) at high bias, even in V. V_a is set so
 * that the curve passes through a class-typical retention at the rated voltage,
 * from the dielectric, the rated voltage and the case size (thinner layers in
 * small cases and low-voltage ratings mean a higher field at a given voltage).
 * Those retention figures are TYPICAL OF THE CLASS, written from memory of the
 * trade — not a datasheet; a caller who has the curve of the actual part passes
 * it as points [{voltageV, capacitanceF}] and that curve is used instead.
 *
 * Class I ceramics, film, mica (and, here, electrolytics) are flat.
 */
import { CoreError } from '../../errors.ts';
import type { Dielectric } from '../dielectric.ts';
import { ChargeTable } from './charge-table.ts';

/** One measured or published point of a C(V) curve. Binding API names. */
export interface CapacitancePoint {
  voltageV: number;
  capacitanceF: number;
}

/**
 * C(V) normalised to the value at 0 V: ratio(v) = C(v)/C(0). The engine multiplies
 * by the part's capacitance (nominal × tolerance × temperature × age), so one
 * shape serves every corner and Monte Carlo draw.
 */
export interface BiasShape {
  readonly kind: 'flat' | 'class-typical' | 'points';
  /** Identity of the curve (compiled circuit shapes are keyed by it). */
  readonly key: string;
  /**
   * Identity of the values the curve gives now: two reads with the same curveId give the same ratio,
   * charge and slope everywhere. A shape whose curve can change (a stray's share that follows the
   * parameter vector, a fit's adjustable law) takes a new one whenever it does. The per-thread pools of
   * solved pieces key on it, never on the object (newCurveId).
   */
  readonly curveId: number;
  /** C(v)/C(0), even in v. */
  ratio(voltageV: number): number;
  /** ∫₀ᵛ ratio(u) du, V: the charge at v per unit C(0) (odd in v). Exact to rounding, no quadrature. */
  charge(voltageV: number): number;
  /** d ratio/dv, 1/V (odd in v; a point-wise curve's segment slope, either one at a knee): Newton slopes of the root solves. */
  slope(voltageV: number): number;
  /** |v| where the shape has a kink (point-wise curves); quadrature splits there. Empty when smooth. */
  readonly kneesV: readonly number[];
}

let lastCurveId = 0;
/** A curveId no curve of this thread has had yet (0 is the flat curve's). */
export function newCurveId(): number {
  return ++lastCurveId;
}

export const FLAT_SHAPE: BiasShape = Object.freeze({
  kind: 'flat' as const,
  key: 'flat',
  curveId: 0,
  ratio: () => 1,
  charge: (voltageV: number) => voltageV,
  slope: () => 0,
  kneesV: Object.freeze([]) as readonly number[],
});

/** Johnson-law shape with its scale voltage V_a. */
export class JohnsonShape implements BiasShape {
  readonly kind = 'class-typical' as const;
  readonly kneesV: readonly number[] = [];
  private readonly invScaleSq: number;
  readonly key: string;
  readonly curveId = newCurveId();
  constructor(readonly scaleV: number) {
    this.invScaleSq = 1 / (scaleV * scaleV);
    this.key = `johnson:${scaleV}`;
  }
  ratio(voltageV: number): number {
    return 1 / Math.cbrt(1 + voltageV * voltageV * this.invScaleSq);
  }
  /** r' = −(2/3)·(v/V_a²)·r/(1 + (v/V_a)²). */
  slope(voltageV: number): number {
    const y = 1 + voltageV * voltageV * this.invScaleSq;
    return ((-2 / 3) * voltageV * this.invScaleSq) / (y * Math.cbrt(y));
  }
  /** In units of V_a the law is (1 + x²)^(−1/3) whatever the part: one table serves every scale. */
  charge(voltageV: number): number {
    const x = voltageV / this.scaleV;
    return Math.sign(x) * this.scaleV * JOHNSON_CHARGE.value(Math.abs(x));
  }
  /** V_a for which ratio(ratedV) = retention (Johnson law solved for the scale). */
  static throughRetention(ratedV: number, retention: number): JohnsonShape {
    return new JohnsonShape(ratedV / Math.sqrt(retention ** -3 - 1));
  }
}

/** ∫₀ˣ (1 + u²)^(−1/3) du, the field law in units of its scale voltage. */
const JOHNSON_CHARGE = new ChargeTable((x) => 1 / Math.cbrt(1 + x * x));

/**
 * Piecewise-linear in |v| through caller points (absolute farads, normalised by
 * the curve's value at 0 V — the first point's value when it starts above 0 V);
 * held flat beyond the last point.
 */
export class PointsShape implements BiasShape {
  readonly kind = 'points' as const;
  readonly kneesV: readonly number[];
  private readonly vs: Float64Array;
  private readonly rs: Float64Array;
  /** Capacitance at 0 V of the caller's curve, F. */
  readonly zeroBiasF: number;
  readonly curveId = newCurveId();
  constructor(points: readonly CapacitancePoint[], pointer?: string) {
    const list: readonly CapacitancePoint[] = points;
    if (!Array.isArray(list as unknown) || list.length === 0) invalid('a C(V) curve needs at least one point', pointer);
    const sorted = list
      .map((p, i) => {
        if (!Number.isFinite(p.voltageV) || p.voltageV < 0) invalid('voltageV must be finite and ≥ 0', `${pointer ?? ''}/${i}/voltageV`);
        if (!Number.isFinite(p.capacitanceF) || p.capacitanceF <= 0) invalid('capacitanceF must be finite and > 0', `${pointer ?? ''}/${i}/capacitanceF`);
        return { v: p.voltageV, c: p.capacitanceF };
      })
      .sort((a, b) => a.v - b.v);
    for (let i = 1; i < sorted.length; i++) {
      if (sorted[i].v === sorted[i - 1].v) invalid(`two C(V) points at ${sorted[i].v} V`, pointer);
    }
    this.zeroBiasF = sorted[0].c;
    this.vs = Float64Array.from(sorted, (p) => p.v);
    this.rs = Float64Array.from(sorted, (p) => p.c / sorted[0].c);
    this.kneesV = sorted.map((p) => p.v).filter((v) => v > 0);
    this.key = `points:${sorted.map((p) => `${p.v}/${p.c}`).join(',')}`;
  }
  readonly key: string;
  ratio(voltageV: number): number {
    const x = Math.abs(voltageV);
    const vs = this.vs;
    const n = vs.length;
    if (x <= vs[0]) return this.rs[0];
    if (x >= vs[n - 1]) return this.rs[n - 1];
    const lo = this.segmentOf(x);
    const hi = lo + 1;
    const w = (x - vs[lo]) / (vs[hi] - vs[lo]);
    return this.rs[lo] + w * (this.rs[hi] - this.rs[lo]);
  }
  /** The slope of the segment |v| lies in (held flat outside the points), signed like v. */
  slope(voltageV: number): number {
    const x = Math.abs(voltageV);
    const vs = this.vs;
    const n = vs.length;
    if (x < vs[0] || x >= vs[n - 1]) return 0;
    const lo = this.segmentOf(x);
    const hi = lo + 1;
    return (Math.sign(voltageV) * (this.rs[hi] - this.rs[lo])) / (vs[hi] - vs[lo]);
  }
  /** The first point of the segment holding x (vs[0] ≤ x < vs[n − 1]), by bisection. */
  private segmentOf(x: number): number {
    const vs = this.vs;
    let lo = 0;
    let hi = vs.length - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (vs[mid] <= x) lo = mid;
      else hi = mid;
    }
    return lo;
  }
  /** Piecewise quadratic: the trapezoids of the linear pieces below |v|, plus the part of the one |v| is in. */
  charge(voltageV: number): number {
    const x = Math.abs(voltageV);
    const { vs, rs } = this;
    const n = vs.length;
    let q = Math.min(x, vs[0]) * rs[0];
    for (let i = 1; i < n && vs[i - 1] < x; i++) {
      const end = Math.min(x, vs[i]);
      const rEnd = rs[i - 1] + ((end - vs[i - 1]) / (vs[i] - vs[i - 1])) * (rs[i] - rs[i - 1]);
      q += 0.5 * (rs[i - 1] + rEnd) * (end - vs[i - 1]);
    }
    if (x > vs[n - 1]) q += (x - vs[n - 1]) * rs[n - 1];
    return Math.sign(voltageV) * q;
  }
}

/** EIA inch case codes the class-typical table knows, smallest first. */
export const CASE_SIZES = ['01005', '0201', '0402', '0603', '0805', '1206', '1210', '1812', '2220'] as const;
export type CaseSize = (typeof CASE_SIZES)[number];

/**
 * Fraction of C(0) LOST at the rated voltage for an X7R-like class II body of a
 * low-voltage rating (≤ 16 V), by case size. Typical of the class, from memory.
 */
const LOSS_AT_RATED_BY_CASE: Readonly<Record<CaseSize, number>> = {
  '01005': 0.8,
  '0201': 0.75,
  '0402': 0.65,
  '0603': 0.55,
  '0805': 0.45,
  '1206': 0.38,
  '1210': 0.32,
  '1812': 0.26,
  '2220': 0.22,
};
/** Case assumed when none is given: a mid-size part (stated default). */
export const DEFAULT_CASE_SIZE: CaseSize = '0805';

/**
 * Higher ratings are built with thicker layers than their rating strictly needs,
 * so the loss at the rated voltage is smaller (typical of the class, from memory).
 */
function ratingFactor(ratedVoltageV: number): number {
  if (ratedVoltageV <= 16) return 1;
  if (ratedVoltageV <= 25) return 0.9;
  if (ratedVoltageV <= 50) return 0.75;
  if (ratedVoltageV <= 100) return 0.6;
  return 0.5;
}

/**
 * Dielectric factor on the loss: narrow-band class II codes (change letter up
 * to F) have lower permittivity and lose about half as much; the 85 °C bodies
 * (X5R) and the wider S/T bands are higher-k and lose more; class III (Y5V,
 * Z5U) loses the most. Typical of the class, from memory.
 */
function dielectricFactor(d: Dielectric): number {
  if (d.family === 'ceramic-class-3') return 1.5;
  const change = d.code[2];
  if ('ABCDEF'.includes(change)) return 0.5;
  if (change === 'S' || change === 'T') return 1.15;
  if (d.code[1] === '5') return 1.1;
  return 1;
}

/** Retention ratio C(V_rated)/C(0) of the class-typical curve. */
export function typicalRetentionAtRated(d: Dielectric, ratedVoltageV: number, caseSize: CaseSize): number {
  const loss = LOSS_AT_RATED_BY_CASE[caseSize] * ratingFactor(ratedVoltageV) * dielectricFactor(d);
  const floor = d.family === 'ceramic-class-3' ? 0.7 : 0;
  return 1 - Math.min(0.9, Math.max(floor, loss));
}

/** True for the ferroelectric bodies whose capacitance depends on bias (class II and III ceramics). */
export function isBiasDependent(d: Dielectric | undefined): boolean {
  return d !== undefined && (d.family === 'ceramic-class-2' || d.family === 'ceramic-class-3');
}

export function parseCaseSize(text: string, pointer?: string): CaseSize {
  const t = typeof text === 'string' ? text.trim() : '';
  if ((CASE_SIZES as readonly string[]).includes(t)) return t as CaseSize;
  return invalid(`"${text}" is not a known EIA inch case code (${CASE_SIZES.join(', ')})`, pointer);
}

/**
 * Rated voltage assumed when a class II/III part comes without one (stated
 * default): the lowest common rating, so that an unknown part is not assumed
 * better than it may be.
 */
export const DEFAULT_RATED_VOLTAGE_V = 16;

/** The class-typical shape for a dielectric, rated voltage and case size; flat for non-ferroelectric bodies. */
export function typicalBiasShape(d: Dielectric | undefined, ratedVoltageV: number, caseSize: CaseSize): BiasShape {
  if (!isBiasDependent(d)) return FLAT_SHAPE;
  return JohnsonShape.throughRetention(ratedVoltageV, typicalRetentionAtRated(d!, ratedVoltageV, caseSize));
}

function invalid(message: string, pointer?: string): never {
  throw new CoreError('invalid-value', message, pointer);
}

/**
 * A shape that crossed a thread boundary (structured clone keeps the data, not
 * the class) made whole again; a live shape is returned as is.
 */
export function reviveBiasShape(shape: BiasShape | undefined): BiasShape | undefined {
  if (!shape || typeof shape.ratio === 'function') return shape;
  const data = shape as unknown as { kind: string; scaleV?: number; vs?: Float64Array; rs?: Float64Array; zeroBiasF?: number };
  if (data.kind === 'class-typical' && data.scaleV !== undefined) return new JohnsonShape(data.scaleV);
  if (data.kind === 'points' && data.vs && data.rs && data.zeroBiasF !== undefined) {
    const z = data.zeroBiasF;
    return new PointsShape(Array.from(data.vs, (v, i) => ({ voltageV: v, capacitanceF: data.rs![i] * z })));
  }
  return FLAT_SHAPE;
}
