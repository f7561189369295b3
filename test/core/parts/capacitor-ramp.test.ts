import { describe, expect, it } from 'vitest';
import { ChebyshevPiece, FLAT_SHAPE, JohnsonShape } from '../../../src/core/parts/capacitor/index.ts';
import { odexRampIntegral, odexRampVoltageAt } from './capacitor-odex-reference.ts';
import { CapacitorKinematics } from '../../../src/core/circuit/engine/capacitor-kinematics.ts';

/**
 * Slew pieces with C(v): r(v)·v' = k0 + k1·t − a·v solved by Picard–Chebyshev
 * collocation, against odex integrating the same ODE (issue target ≤ 1e-6 relative).
 */
const shape = JohnsonShape.throughRetention(6.3, 0.35);
// 10 kΩ, 100 nF: a = 1/τ = 1000 /s; the source ramps 0 → 5 V at 0.5 V/µs (10 µs), then beyond the piece.
const tau = 10e3 * 100e-9;
const a = 1 / tau;

describe('ChebyshevPiece against odex', () => {
  const cases = [
    { name: 'short slew (10 µs ≪ τ = 1 ms) from 1.67 V', k0: 0, k1: 0.5e6 * a, v0: 5 / 3, T: 10e-6 },
    { name: 'slew as long as τ (slew-limited clock) from 3.3 V', k0: -5 * a, k1: 10 / tau * a, v0: 10 / 3, T: tau },
    { name: 'ramp through 0 V (split supply) over 3τ', k0: -2 * a, k1: (4 / (3 * tau)) * a, v0: -1, T: 3 * tau },
  ];
  for (const c of cases) {
    it(`${c.name}: v(t) and ∫v dt within 1e-6`, () => {
      const p = new ChebyshevPiece().set(shape, a, c.k0, c.k1, c.v0, 5);
      for (const frac of [0.25, 0.5, 1]) {
        const t = c.T * frac;
        const v = p.v(t);
        const ref = odexRampVoltageAt(shape, a, c.k0, c.k1, c.v0, t);
        // As a fraction of the 5 V span (the slope passes through zero in some pieces, so no time-relative form).
        expect(Math.abs(v - ref) / 5).toBeLessThan(1e-9);
      }
      const integral = p.integralV(c.T);
      const refI = odexRampIntegral(shape, a, c.k0, c.k1, c.v0, c.T);
      expect(Math.abs(integral - refI)).toBeLessThan(1e-9 * 5 * c.T);
    });
  }

  it('flat capacitor: the exact exponential-plus-ramp response (first-order linear ODE, textbook)', () => {
    const k1 = 1e3 * a;
    const p = new ChebyshevPiece().set(FLAT_SHAPE, a, 0, k1, 0, 5);
    const t = 2 * tau;
    // v' = k1·t − a·v, v(0) = 0:  v = (k1/a)·(t − (1 − e^(−a t))/a).
    const exact = (k1 / a) * (t - (1 - Math.exp(-a * t)) / a);
    expect(p.v(t)).toBeCloseTo(exact, 12);
  });
});

describe('solved slew pieces shared between kinematics', () => {
  // The walk's and the evaluator's kinematics share one pool of solved slew pieces: a kinematics whose
  // piece another one took over must still answer for its own inputs (against odex, as above).
  it('a piece evicted by a dozen other slews still answers for its own inputs', () => {
    const mine = new CapacitorKinematics();
    const other = new CapacitorKinematics();
    mine.setShape(shape, 5);
    other.setShape(shape, 5);
    const k1 = (10 / tau) * a;
    mine.set(a, -5 * a, k1, 10 / 3, 0, 10 / tau);
    const t = 0.5 * tau;
    for (let i = 0; i < 12; i++) {
      other.set(a, -5 * a, k1, 1 + 0.1 * i, 0, 10 / tau);
      other.v(t);
    }
    expect(Math.abs(mine.v(t) - odexRampVoltageAt(shape, a, -5 * a, k1, 10 / 3, t)) / 5).toBeLessThan(1e-9);
  });
});

