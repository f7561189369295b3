/**
 * The tabulated antiderivative of the C(V) curves (shape.charge, the charge per
 * unit C(0)) against independent implementations written here:
 * - the field law (1 + (v/V_a)²)^(−1/3): for |x| < 1 its antiderivative is
 *   x·₂F₁(1/3, 1/2; 3/2; −x²) (DLMF 15.2.1, the hypergeometric series, summed
 *   here term by term); beyond, composite Simpson on a fine grid (Abramowitz &
 *   Stegun 25.4.5) from the series value at x = 0.5;
 * - point curves: the trapezoids of the straight segments, summed by hand.
 */
import { describe, expect, it } from 'vitest';
import { JohnsonShape, PointsShape } from '../../../src/core/parts/capacitor/index.ts';

/** x·₂F₁(1/3, 1/2; 3/2; −x²) by its series (|x| < 1). */
function seriesCharge(x: number): number {
  let term = 1;
  let sum = 1;
  for (let n = 0; n < 400; n++) {
    term *= (((1 / 3 + n) * (1 / 2 + n)) / ((3 / 2 + n) * (n + 1))) * -x * x;
    sum += term;
    if (Math.abs(term) < 1e-18) break;
  }
  return x * sum;
}

function simpson(f: (x: number) => number, a: number, b: number, n: number): number {
  const h = (b - a) / n;
  let s = f(a) + f(b);
  for (let i = 1; i < n; i++) s += (i & 1 ? 4 : 2) * f(a + i * h);
  return (s * h) / 3;
}

describe('charge of the field-law curve', () => {
  const scaleV = 1.7;
  const shape = new JohnsonShape(scaleV);
  const r = (x: number) => 1 / Math.cbrt(1 + x * x);

  it('matches the hypergeometric series below the scale voltage (1e-13)', () => {
    for (const x of [0, 1e-6, 0.1, 0.37, 0.5, 0.8]) {
      expect(Math.abs(shape.charge(x * scaleV) - scaleV * seriesCharge(x))).toBeLessThan(1e-13 * scaleV);
    }
  });

  it('matches composite Simpson far up the curve and is odd in v (1e-11 relative)', () => {
    for (const x of [1.5, 3, 12, 90, 2500]) {
      const reference = scaleV * (seriesCharge(0.5) + simpson(r, 0.5, x, 200_000));
      expect(Math.abs(shape.charge(x * scaleV) / reference - 1)).toBeLessThan(1e-11);
      expect(shape.charge(-x * scaleV)).toBe(-shape.charge(x * scaleV));
    }
  });
});

describe('charge of a point curve', () => {
  // Absolute farads; normalised by the 0 V value (10 nF).
  const shape = new PointsShape([
    { voltageV: 0, capacitanceF: 10e-9 },
    { voltageV: 2, capacitanceF: 8e-9 },
    { voltageV: 5, capacitanceF: 4e-9 },
  ]);

  it('is the sum of the trapezoids, flat beyond the last point', () => {
    expect(shape.charge(1)).toBeCloseTo(0.5 * (1 + 0.9) * 1, 14);
    expect(shape.charge(2)).toBeCloseTo(0.5 * (1 + 0.8) * 2, 14);
    expect(shape.charge(3.5)).toBeCloseTo(1.8 + 0.5 * (0.8 + 0.6) * 1.5, 14);
    expect(shape.charge(7)).toBeCloseTo(1.8 + 0.5 * (0.8 + 0.4) * 3 + 0.4 * 2, 14);
    expect(shape.charge(-3.5)).toBe(-shape.charge(3.5));
  });
});
