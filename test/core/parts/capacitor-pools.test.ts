/**
 * The per-thread pools of solved C(v) pieces (at-rest quadratures, charge-table values) key on the
 * curve's curveId, not on the shape object: a shape whose curve changes in place (a stray's share that
 * follows the parameter vector, the fit's adjustable law) must not be answered with a piece solved for
 * its earlier curve. Reference: the same piece solved on a fresh shape object with the same curve
 * (nothing pooled for it); the quadrature itself is checked against odex in capacitor-engine.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { StrayLoadedShape } from '../../../src/core/circuit/strays.ts';
import { NonlinearCharge } from '../../../src/core/parts/capacitor/charging.ts';
import { resolveCapacitor } from '../../../src/core/parts/capacitor/index.ts';

// Our own part: a small-case 6.3 V X7R 10 nF (class-typical curve).
const x7r = resolveCapacitor({ value: '10n', dielectric: 'X7R', ratedVoltageV: 6.3, caseSize: '0402' });

describe('pools of solved C(v) pieces follow a curve changed in place', () => {
  it('an at-rest time and a constant-current time after the stray share changes equal a fresh shape\'s', () => {
    const reused = new StrayLoadedShape();
    const charge = new NonlinearCharge();
    // Exponential piece (v∞ = 5 V) and constant-current piece, first with a 9 % stray share...
    charge.setPiece(reused.set(x7r.shape, 0.09), 1, 5, 1);
    const before = charge.timeBetween(1, 3);
    charge.setPiece(reused, 1, 2e-3, 0);
    const beforeCurrent = charge.timeBetween(1, 3);
    // ...then the same object re-set to 30 %: the same voltages, a different curve.
    charge.setPiece(reused.set(x7r.shape, 0.3), 1, 5, 1);
    const after = charge.timeBetween(1, 3);
    charge.setPiece(reused, 1, 2e-3, 0);
    const afterCurrent = charge.timeBetween(1, 3);
    const fresh = new StrayLoadedShape().set(x7r.shape, 0.3);
    const freshTime = new NonlinearCharge().setPiece(fresh, 1, 5, 1).timeBetween(1, 3);
    const freshCurrent = new NonlinearCharge().setPiece(new StrayLoadedShape().set(x7r.shape, 0.3), 1, 2e-3, 0).timeBetween(1, 3);
    expect(after).toBe(freshTime);
    expect(afterCurrent).toBe(freshCurrent);
    // The share matters (otherwise the check above says nothing): a few per cent here.
    expect(Math.abs(after / before - 1)).toBeGreaterThan(0.01);
    expect(Math.abs(afterCurrent / beforeCurrent - 1)).toBeGreaterThan(0.01);
  });

  it('setting the same curve again keeps its identity (pieces stay shared)', () => {
    const s = new StrayLoadedShape();
    const id = s.set(x7r.shape, 0.2).curveId;
    expect(s.set(x7r.shape, 0.2).curveId).toBe(id);
    expect(s.set(x7r.shape, 0.25).curveId).not.toBe(id);
  });
});
