/**
 * Reference for the non-linear charging primitive: the capacitor ODE
 * C(v)·dv/dt = i0 − g·v integrated in TIME by odex (Hairer & Wanner's ODEX,
 * Gragg–Bulirsch–Stoer extrapolation, npm registry) — a general-purpose stepping
 * integrator that shares nothing with the quadrature it checks but the C(v) shape.
 */
import { createRequire } from 'node:module';
import type { BiasShape } from '../../../src/core/parts/capacitor/index.ts';

interface OdexSolver {
  denseOutput: boolean;
  relativeTolerance: number | number[];
  absoluteTolerance: number | number[];
  maxSteps: number;
  solve(
    f: (x: number, y: number[]) => number[],
    x0: number,
    y0: number[],
    xEnd: number,
    solOut?: (n: number, xOld: number, x: number, y: number[], dense?: (c: number, x: number) => number) => boolean | void,
  ): { y: number[] };
}
const odex = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver };

export interface ChargeOde {
  shape: BiasShape;
  capacitanceF: number;
  i0A: number;
  conductanceS: number;
}

function solver(dimension = 1): OdexSolver {
  const s = new odex.Solver(dimension);
  s.relativeTolerance = 1e-12;
  s.absoluteTolerance = 1e-13;
  s.maxSteps = 1e6;
  return s;
}

function rhs(p: ChargeOde): (x: number, y: number[]) => number[] {
  return (_x, y) => [(p.i0A - p.conductanceS * y[0]) / (p.capacitanceF * p.shape.ratio(y[0]))];
}

/** v(tS) from v0 by odex. */
export function odexVoltageAt(p: ChargeOde, v0: number, tS: number): number {
  return solver().solve(rhs(p), 0, [v0], tS).y[0];
}

/** Time at which v first reaches v1 from v0, by odex's dense output and bisection inside the crossing step. */
export function odexTimeTo(p: ChargeOde, v0: number, v1: number, horizonS: number): number {
  const s = solver();
  s.denseOutput = true;
  const dir = Math.sign(v1 - v0);
  let found = Number.NaN;
  let prevY = v0;
  s.solve(rhs(p), 0, [v0], horizonS, (_n, xOld, x, y, dense) => {
    if (!Number.isNaN(found) || !dense) return;
    if ((y[0] - v1) * dir >= 0 && (prevY - v1) * dir < 0) {
      let lo = xOld;
      let hi = x;
      for (let k = 0; k < 200 && hi - lo > 1e-16 * Math.abs(hi); k++) {
        const mid = 0.5 * (lo + hi);
        if ((dense(0, mid) - v1) * dir >= 0) hi = mid;
        else lo = mid;
      }
      found = 0.5 * (lo + hi);
      return false;
    }
    prevY = y[0];
  });
  return found;
}

/** v(tS) of r(v)·v' = k0 + k1·t − a·v (a moving source: the slew piece) by odex. */
export function odexRampVoltageAt(shape: BiasShape, a: number, k0: number, k1: number, v0: number, tS: number): number {
  return solver().solve((x, y) => [(k0 + k1 * x - a * y[0]) / shape.ratio(y[0])], 0, [v0], tS).y[0];
}

/** ∫₀ᵀ v dt of the same ODE by odex (the integral carried as a second state). */
export function odexRampIntegral(shape: BiasShape, a: number, k0: number, k1: number, v0: number, tS: number): number {
  return solver(2).solve((x, y) => [(k0 + k1 * x - a * y[0]) / shape.ratio(y[0]), y[0]], 0, [v0, 0], tS).y[1];
}
