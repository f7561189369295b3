/**
 * Exact charging of a capacitor whose capacitance depends on its voltage, C(v),
 * within one piece of the event-driven walk (docs/model.md, "non-linear
 * capacitor"). Inside a piece the rest of the circuit is a linear network, so
 * the capacitor current is affine in v:
 *
 *     i(v) = i0 − g·v          (g ≥ 0; g > 0: an exponential piece heading for v∞ = i0/g;
 *                               g = 0: a constant current, e.g. a current-limited output)
 *
 * and C(v)·dv/dt = i(v) separates: the time to go from v0 to v1 is
 *
 *     t = ∫ C(v) / i(v) dv.
 *
 * With g > 0 the logarithmic singularity at v∞ is taken out in closed form,
 *
 *     t = (C/g)·[ r(v∞)·ln((v∞−v0)/(v∞−v1)) + ∫ (r(v) − r(v∞)) / (v∞ − v) dv ],
 *
 * (r = C(v)/C), leaving a bounded, smooth remainder for adaptive Gauss–Kronrod
 * quadrature (split at the knees of a point-wise curve). With a flat curve the
 * remainder is zero and the result is the textbook τ·ln(...) exactly. The
 * inverse — the voltage reached after a given time, for pieces ended by a time
 * event and for waveform samples — is a Newton solve on that integral in the
 * log-distance coordinate u = ln((v∞−v0)/(v∞−v)), where dt/du = C·r(v)/g is
 * bounded and positive, so the iteration is monotone and quadratic.
 *
 * Charge integrals (a constant-current piece's time, ∫ v dt, ΔQ/ΔV) need no
 * quadrature: the curve's antiderivative is tabulated once per curve
 * (shape.charge, charge-table.ts).
 *
 * No time stepping anywhere: every answer is a quadrature, a table value or a root of one.
 */
import type { BiasShape } from './dc-bias.ts';
import { integrateAdaptive } from './quadrature.ts';

/** Relative accuracy of the time integrals (well inside the 1e-6 the reference tests ask for). */
export const CHARGE_RELATIVE_TOLERANCE = 1e-11;
const MAX_NEWTON = 60;

/**
 * Quadratures of source-at-rest pieces kept, one pool per thread for every integrator (as the
 * slew pieces are kept, engine/capacitor-kinematics.ts): a settled walk meets the same two
 * edges in every analysis of a circuit, and corners or draws that change only the time
 * constant meet them again. Keyed by the curve's curveId (a mutable shape takes a new one when its curve changes) and the three voltages, compared exactly.
 */
const REST_MEMORY = 8;
const restCurve = new Float64Array(REST_MEMORY).fill(-1);
const restV0 = new Float64Array(REST_MEMORY).fill(Number.NaN);
const restV1 = new Float64Array(REST_MEMORY).fill(Number.NaN);
const restVInf = new Float64Array(REST_MEMORY).fill(Number.NaN);
const restValue = new Float64Array(REST_MEMORY);
let restNext = 0;

/**
 * The curve's charge Q(v) at the last voltages asked, one pool per thread: the pieces of a walk
 * start and end at the same few voltages (the thresholds, power-up's 0 V), each asked for again by
 * every piece that meets it, in this analysis and the next; a table value (charge-table.ts) costs a
 * bisection and a degree-21 Chebyshev sum. Keyed by the curve's curveId and the voltage, compared exactly.
 */
const CHARGE_MEMORY = 8;
const chargeCurve = new Float64Array(CHARGE_MEMORY).fill(-1);
const chargeV = new Float64Array(CHARGE_MEMORY).fill(Number.NaN);
const chargeQ = new Float64Array(CHARGE_MEMORY);
let chargeNext = 0;

/** shape.charge(v), from the pool when it keeps it. */
function chargeAt(shape: BiasShape, v: number): number {
  for (let i = 0; i < CHARGE_MEMORY; i++) if (chargeCurve[i] === shape.curveId && chargeV[i] === v) return chargeQ[i];
  const q = shape.charge(v);
  chargeCurve[chargeNext] = shape.curveId;
  chargeV[chargeNext] = v;
  chargeQ[chargeNext] = q;
  chargeNext = (chargeNext + 1) % CHARGE_MEMORY;
  return q;
}

/**
 * A reusable integrator (no allocation per call): set the piece with setPiece,
 * then ask for times or voltages. Not re-entrant across pieces.
 */
export class NonlinearCharge {
  private shape!: BiasShape;
  private capacitanceF = 0;
  private g = 0;
  private i0 = 0;
  private vInf = 0;
  private rInf = 1;
  private readonly remainder = (v: number): number => {
    const d = this.vInf - v;
    return (this.shape.ratio(v) - this.rInf) / d;
  };
  private readonly ratioTimesV = (v: number): number => v * this.shape.ratio(v);

  /** Curve shape and capacitance at 0 V (F); capacitor current i(v) = i0A − conductanceS·v. */
  setPiece(shape: BiasShape, capacitanceF: number, i0A: number, conductanceS: number): this {
    this.shape = shape;
    this.capacitanceF = capacitanceF;
    this.g = conductanceS;
    this.i0 = i0A;
    if (conductanceS > 0) {
      this.vInf = i0A / conductanceS;
      this.rInf = shape.ratio(this.vInf);
    }
    return this;
  }

  /** Asymptote v∞ of an exponential piece (NaN for a constant-current piece). */
  get asymptoteV(): number {
    return this.g > 0 ? this.vInf : Number.NaN;
  }

  /**
   * Time to move from v0 to v1, s. Infinity when v1 is not reachable (at or beyond
   * the asymptote, or against the current).
   */
  timeBetween(v0: number, v1: number): number {
    if (v0 === v1) return 0;
    if (this.g > 0) {
      const d0 = this.vInf - v0;
      const d1 = this.vInf - v1;
      // Reachable only moving toward v∞ and stopping short of it.
      if (d0 === 0 || d1 / d0 <= 0 || Math.abs(d1) >= Math.abs(d0)) return Infinity;
      const logPart = this.rInf * Math.log(d0 / d1);
      if (this.shape.kind === 'flat') return (this.capacitanceF / this.g) * logPart;
      return (this.capacitanceF / this.g) * (logPart + this.remainderBetween(v0, v1, logPart));
    }
    if (this.i0 === 0 || (v1 - v0) * this.i0 < 0) return Infinity;
    if (this.shape.kind === 'flat') return (this.capacitanceF * (v1 - v0)) / this.i0;
    // A constant current: the time is the charge over the current, C·(Q(v1) − Q(v0))/i.
    return (this.capacitanceF * (chargeAt(this.shape, v1) - chargeAt(this.shape, v0))) / this.i0;
  }

  /**
   * ∫ v dt over the motion from v0 to v1 (= ∫ v·C(v)/i(v) dv), V·s — what the
   * walk logs with each piece for averages. Same reachability rules as timeBetween.
   * With g > 0, v = v∞ − i/g and ∫ i dt is the charge moved, so
   * ∫ v dt = v∞·t − C·(Q(v1) − Q(v0))/g with Q the curve's antiderivative
   * (shape.charge: a table, no quadrature); its error is the time's, scaled by v∞,
   * as the direct quadrature's was.
   */
  voltageTimeBetween(v0: number, v1: number): number {
    if (v0 === v1) return 0;
    if (this.g > 0) {
      const t = this.timeBetween(v0, v1);
      if (!Number.isFinite(t)) return t;
      return this.vInf * t - (this.capacitanceF * (chargeAt(this.shape, v1) - chargeAt(this.shape, v0))) / this.g;
    }
    if (this.i0 === 0 || (v1 - v0) * this.i0 < 0) return Infinity;
    const scale = Math.abs(v1 - v0) * (Math.abs(v0) + Math.abs(v1)) + 1e-300;
    return (this.capacitanceF * this.split(this.ratioTimesV, v0, v1, CHARGE_RELATIVE_TOLERANCE * scale)) / this.i0;
  }

  /**
   * ∫ v dt over a motion from v0 to v1 already known to take tS (the piece's own
   * duration): for g > 0 the charge identity alone, no integral at all.
   */
  voltageTimeOver(v0: number, v1: number, tS: number): number {
    if (this.g > 0 && Number.isFinite(tS)) {
      return this.vInf * tS - (this.capacitanceF * (chargeAt(this.shape, v1) - chargeAt(this.shape, v0))) / this.g;
    }
    return this.voltageTimeBetween(v0, v1);
  }

  /** Voltage reached tS after starting at v0 (the inverse of timeBetween). */
  voltageAfter(v0: number, tS: number): number {
    if (tS <= 0) return v0;
    const C = this.capacitanceF;
    if (this.g > 0) {
      const d0 = this.vInf - v0;
      if (d0 === 0) return v0;
      // Flat: the exponential itself. Otherwise Newton in u starting from the flat answer at r(v0).
      if (this.shape.kind === 'flat') return this.vInf - d0 * Math.exp((-tS * this.g) / C);
      let u = (tS * this.g) / (C * this.shape.ratio(v0));
      let v = this.vInf - d0 * Math.exp(-u);
      let tAt = this.timeBetween(v0, v);
      for (let k = 0; k < MAX_NEWTON; k++) {
        const err = tAt - tS;
        if (Math.abs(err) <= CHARGE_RELATIVE_TOLERANCE * 10 * tS) break;
        const du = (-err * this.g) / (C * this.shape.ratio(v));
        const uNext = Math.max(0.5 * u, u + du);
        const vNext = this.vInf - d0 * Math.exp(-uNext);
        // Integrate only the step (incremental), from the current point.
        const step = this.timeBetweenSigned(v, vNext);
        if (!Number.isFinite(step)) break;
        tAt += step;
        u = uNext;
        v = vNext;
      }
      return v;
    }
    if (this.i0 === 0) return v0;
    if (this.shape.kind === 'flat') return v0 + (this.i0 * tS) / C;
    let v = v0 + (this.i0 * tS) / (C * this.shape.ratio(v0));
    let tAt = this.timeBetween(v0, v);
    for (let k = 0; k < MAX_NEWTON; k++) {
      const err = tAt - tS;
      if (Math.abs(err) <= CHARGE_RELATIVE_TOLERANCE * 10 * tS) break;
      const vNext = v - (err * this.i0) / (C * this.shape.ratio(v));
      tAt += this.timeBetweenSigned(v, vNext);
      v = vNext;
    }
    return v;
  }

  /**
   * ∫ (r(v) − r(v∞))/(v∞ − v) dv from v0 to v1: the quadrature of timeBetween, or the pool's
   * value when it keeps this (curve, v0, v1, v∞). The integral and its tolerance depend on
   * those four alone (logPart = r(v∞)·ln((v∞−v0)/(v∞−v1)) is theirs too), not on the
   * current's scale g nor on C0, so a piece met again, in this walk or a later one, is the
   * same number: circuits that differ only in the timing resistor or capacitor (corners,
   * draws) have the same pieces in units of their time constant.
   */
  private remainderBetween(v0: number, v1: number, logPart: number): number {
    const shape = this.shape;
    const vInf = this.vInf;
    for (let i = 0; i < REST_MEMORY; i++) {
      if (restCurve[i] === shape.curveId && restV0[i] === v0 && restV1[i] === v1 && restVInf[i] === vInf) return restValue[i];
    }
    const scale = Math.abs(logPart) + Math.abs(this.remainder(0.5 * (v0 + v1)) * (v1 - v0)) + 1e-300;
    const rest = this.split(this.remainder, v0, v1, CHARGE_RELATIVE_TOLERANCE * scale);
    restCurve[restNext] = shape.curveId;
    restV0[restNext] = v0;
    restV1[restNext] = v1;
    restVInf[restNext] = vInf;
    restValue[restNext] = rest;
    restNext = (restNext + 1) % REST_MEMORY;
    return rest;
  }

  /** Time from a to b allowing b to lie behind a (negative time), for Newton steps. */
  private timeBetweenSigned(a: number, b: number): number {
    const forward = this.g > 0 ? Math.abs(this.vInf - b) < Math.abs(this.vInf - a) : (b - a) * this.i0 > 0;
    return forward ? this.timeBetween(a, b) : -this.timeBetween(b, a);
  }

  /** ∫_a^b f, split at the knees of the curve (±knee) that lie strictly inside. */
  private split(f: (v: number) => number, a: number, b: number, absTol: number): number {
    const knees = this.shape.kneesV;
    if (knees.length === 0) return integrateAdaptive(f, a, b, absTol);
    const lo = Math.min(a, b);
    const hi = Math.max(a, b);
    const sign = b >= a ? 1 : -1;
    let total = 0;
    let from = lo;
    const span = hi - lo;
    // Knees at −k … +k in ascending order: negatives of the (ascending) knees reversed, then the knees.
    for (let pass = 0; pass < 2; pass++) {
      for (let j = 0; j < knees.length; j++) {
        const x = pass === 0 ? -knees[knees.length - 1 - j] : knees[j];
        if (x <= from || x >= hi) continue;
        total += integrateAdaptive(f, from, x, (absTol * (x - from)) / span);
        from = x;
      }
    }
    total += integrateAdaptive(f, from, hi, (absTol * (hi - from)) / span);
    return sign * total;
  }
}

/** Charge moved between v0 and v1 on a capacitor of capacitanceF (at 0 V) with this shape: ∫C(v)dv, coulomb. */
export function chargeBetween(shape: BiasShape, capacitanceF: number, v0: number, v1: number): number {
  if (shape.kind === 'flat') return capacitanceF * (v1 - v0);
  return capacitanceF * (chargeAt(shape, v1) - chargeAt(shape, v0));
}

/** The capacitance that moves the same charge over the swing v0…v1 as the curve: ΔQ/ΔV, farad. */
export function effectiveCapacitanceF(shape: BiasShape, capacitanceF: number, v0: number, v1: number): number {
  if (v0 === v1) return capacitanceF * shape.ratio(v0);
  return chargeBetween(shape, capacitanceF, v0, v1) / (v1 - v0);
}
