import { describe, expect, it } from 'vitest';
import {
  chargeBetween,
  effectiveCapacitanceF,
  FLAT_SHAPE,
  integrateAdaptive,
  JohnsonShape,
  NonlinearCharge,
  PointsShape,
  type BiasShape,
} from '../../../src/core/parts/capacitor/index.ts';
import { odexTimeTo, odexVoltageAt, type ChargeOde } from './capacitor-odex-reference.ts';

/**
 * Non-linear charging (t = ∫C(v)/i(v) dv by adaptive Gauss–Kronrod, inverse by a
 * Newton solve on that integral) against odex integrating the same ODE in time.
 * Issue target: ≤ 1e-6 relative.
 */
const REL = 1e-6;

const strongX7R = JohnsonShape.throughRetention(6.3, 0.35); // small-case low-voltage class II, class-typical
const measured = new PointsShape([
  { voltageV: 0, capacitanceF: 100e-9 },
  { voltageV: 1, capacitanceF: 96e-9 },
  { voltageV: 2.5, capacitanceF: 80e-9 },
  { voltageV: 4, capacitanceF: 62e-9 },
  { voltageV: 6.3, capacitanceF: 45e-9 },
]);

interface Case {
  name: string;
  shape: BiasShape;
  cF: number;
  i0A: number;
  gS: number;
  v0: number;
  v1: number;
}

// Pieces as they occur in a 5 V clock: charging toward ~5 V through 10 kΩ from 1/3 to 2/3 of the supply,
// discharging toward 0, a split-supply swing through 0 V (C(v) even), a near-asymptote end, a constant current.
const cases: Case[] = [
  { name: 'class II charge 1.67→3.33 V toward 5 V', shape: strongX7R, cF: 100e-9, i0A: 5 / 10e3, gS: 1 / 10e3, v0: 5 / 3, v1: 10 / 3 },
  { name: 'class II discharge 3.33→1.67 V toward 0 V', shape: strongX7R, cF: 100e-9, i0A: 0, gS: 1 / 10e3, v0: 10 / 3, v1: 5 / 3 },
  { name: 'class II through 0 V, −2→+2 V toward +5 V', shape: strongX7R, cF: 10e-9, i0A: 5 / 47e3, gS: 1 / 47e3, v0: -2, v1: 2 },
  { name: 'class II close to the asymptote, 0→4.999 V toward 5 V', shape: strongX7R, cF: 10e-9, i0A: 5 / 4.7e3, gS: 1 / 4.7e3, v0: 0, v1: 4.999 },
  { name: 'measured points 0.5→4.5 V toward 5 V (kinks)', shape: measured, cF: 100e-9, i0A: 5 / 10e3, gS: 1 / 10e3, v0: 0.5, v1: 4.5 },
  { name: 'measured points, −3→3 V at a constant 1 mA', shape: measured, cF: 100e-9, i0A: 1e-3, gS: 0, v0: -3, v1: 3 },
];

describe('NonlinearCharge against odex (same C(v) ODE integrated in time)', () => {
  for (const c of cases) {
    it(`${c.name}: crossing time within 1e-6`, () => {
      const ch = new NonlinearCharge().setPiece(c.shape, c.cF, c.i0A, c.gS);
      const t = ch.timeBetween(c.v0, c.v1);
      const ode: ChargeOde = { shape: c.shape, capacitanceF: c.cF, i0A: c.i0A, conductanceS: c.gS };
      const ref = odexTimeTo(ode, c.v0, c.v1, 3 * t);
      expect(Number.isFinite(ref)).toBe(true);
      expect(Math.abs(t - ref) / ref).toBeLessThanOrEqual(REL);
    });
    it(`${c.name}: voltage after a time (inverse) within 1e-6`, () => {
      const ch = new NonlinearCharge().setPiece(c.shape, c.cF, c.i0A, c.gS);
      const t = 0.6 * ch.timeBetween(c.v0, c.v1);
      const v = ch.voltageAfter(c.v0, t);
      const ref = odexVoltageAt({ shape: c.shape, capacitanceF: c.cF, i0A: c.i0A, conductanceS: c.gS }, c.v0, t);
      // As a relative time error: Δt = Δv / (dv/dt).
      const slope = (c.i0A - c.gS * ref) / (c.cF * c.shape.ratio(ref));
      expect(Math.abs(v - ref) / Math.abs(slope) / t).toBeLessThanOrEqual(REL);
      // And the round trip through the integral is exact to the quadrature tolerance.
      expect(Math.abs(ch.timeBetween(c.v0, v) - t) / t).toBeLessThan(1e-9);
    });
  }

  it('pieces met again (the kept quadratures) give their own times: same voltages, other asymptote, curve or current', () => {
    // One 1→2 V motion per (curve, v∞, g): a kept integral handed to the wrong piece is off by far more than 1e-6.
    const mildX7R = JohnsonShape.throughRetention(16, 0.6);
    const pieces = [strongX7R, mildX7R].flatMap((shape) =>
      [5, 3].flatMap((vInfV) => [1e-4, 2e-4].map((gS) => ({ shape, cF: 10e-9, i0A: gS * vInfV, gS }))),
    );
    const first = pieces.map((p) => new NonlinearCharge().setPiece(p.shape, p.cF, p.i0A, p.gS).timeBetween(1, 2));
    const again = [...pieces].reverse().map((p) => new NonlinearCharge().setPiece(p.shape, p.cF, p.i0A, p.gS).timeBetween(1, 2)).reverse();
    pieces.forEach((p, k) => {
      const ref = odexTimeTo({ shape: p.shape, capacitanceF: p.cF, i0A: p.i0A, conductanceS: p.gS }, 1, 2, 3 * first[k]);
      expect(Math.abs(first[k] - ref) / ref).toBeLessThanOrEqual(REL);
      expect(again[k]).toBe(first[k]);
    });
  });

  it('refuses to reach the asymptote or move against the current', () => {
    const ch = new NonlinearCharge().setPiece(strongX7R, 10e-9, 5e-4, 1e-4);
    expect(ch.timeBetween(1, 5)).toBe(Infinity);
    expect(ch.timeBetween(1, 6)).toBe(Infinity);
    expect(ch.timeBetween(3, 2)).toBe(Infinity);
  });
});

describe('flat capacitor: the textbook RC results exactly', () => {
  it('RC pull-up rise 10–90 % = RC·ln 9 (first-order step response, any circuits textbook)', () => {
    const R = 4.7e3;
    const C = 22e-12;
    const vdd = 5;
    const ch = new NonlinearCharge().setPiece(FLAT_SHAPE, C, vdd / R, 1 / R);
    const rise = ch.timeBetween(0.1 * vdd, 0.9 * vdd);
    expect(rise).toBeCloseTo(R * C * Math.log(9), 18);
    // v(t) = V(1 − e^(−t/RC)) at t = RC: 63.2 %.
    expect(ch.voltageAfter(0, R * C)).toBeCloseTo(vdd * (1 - Math.exp(-1)), 12);
  });

  it('constant current: t = C·ΔV / I (definition of capacitance)', () => {
    const ch = new NonlinearCharge().setPiece(FLAT_SHAPE, 1e-6, 1e-3, 0);
    expect(ch.timeBetween(0, 2)).toBeCloseTo(2e-3, 15);
  });
});

describe('adaptive Gauss–Kronrod quadrature', () => {
  it('is exact for polynomials (K15 integrates degree ≤ 22 exactly; Piessens et al., QUADPACK)', () => {
    expect(integrateAdaptive((x) => x ** 10, 0, 1, 1e-15)).toBeCloseTo(1 / 11, 15);
    expect(integrateAdaptive((x) => 3 * x * x, -1, 2, 1e-15)).toBeCloseTo(9, 14);
  });
  it('∫0^π sin = 2 and ∫0^1 1/(1+x²) = π/4 (calculus)', () => {
    expect(integrateAdaptive(Math.sin, 0, Math.PI, 1e-13)).toBeCloseTo(2, 12);
    expect(integrateAdaptive((x) => 1 / (1 + x * x), 0, 1, 1e-13)).toBeCloseTo(Math.PI / 4, 12);
  });
});

describe('charge and effective capacitance over a swing', () => {
  it('Johnson law: ∫C dv against a composite trapezoid sum (error ~ h², independent of the Kronrod rule)', () => {
    // r(v) = (1 + (v/a)²)^(−1/3) has no elementary antiderivative: compare with 2e5 trapezoids.
    const n = 200000;
    let s = 0;
    for (let k = 0; k <= n; k++) {
      const v = (5 * k) / n;
      s += (k === 0 || k === n ? 0.5 : 1) * strongX7R.ratio(v);
    }
    const trap = (s * 5) / n;
    expect(chargeBetween(strongX7R, 1, 0, 5)).toBeCloseTo(trap, 8);
    // And it is well below the flat 5 C: the curve loses capacitance with bias.
    expect(chargeBetween(strongX7R, 1, 0, 5)).toBeLessThan(0.8 * 5);
  });
  it('two curves asked in turn at the same voltages (the kept charges) each give their own ∫C dv (composite trapezoids)', () => {
    const mildX7R = JohnsonShape.throughRetention(16, 0.6);
    const trapezoids = (shape: BiasShape, v1: number) => {
      const n = 20000;
      let s = 0;
      for (let k = 0; k <= n; k++) s += (k === 0 || k === n ? 0.5 : 1) * shape.ratio((v1 * k) / n);
      return (s * v1) / n;
    };
    for (let pass = 0; pass < 2; pass++) {
      for (const shape of [strongX7R, mildX7R, measured]) {
        for (const v1 of [2, 4]) expect(chargeBetween(shape, 1, 0, v1)).toBeCloseTo(trapezoids(shape, v1), 6);
      }
    }
  });
  it('flat: Ceff = C; points: Ceff lies between the curve ends', () => {
    expect(effectiveCapacitanceF(FLAT_SHAPE, 10e-9, 1, 3)).toBe(10e-9);
    const ceff = effectiveCapacitanceF(measured, 100e-9, 1, 4);
    expect(ceff).toBeLessThan(96e-9);
    expect(ceff).toBeGreaterThan(62e-9);
    // Piecewise-linear: exact trapezoids between the knots (1→2.5, 2.5→4).
    const exact = ((96 + 80) / 2) * 1.5 + ((80 + 62) / 2) * 1.5;
    expect(ceff).toBeCloseTo((exact / 3) * 1e-9, 18);
  });
});
