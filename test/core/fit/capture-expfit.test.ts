import { describe, it, expect } from 'vitest';
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { fitExponential, fitExponentialFull, exponentialValueAt } from '../../../src/core/fit/capture/exp-segments.ts';
import { analyzeCapacitorSegments } from '../../../src/core/fit/capture/exp-segments.ts';
import { uniformClock } from '../../../src/core/fit/capture/sample-clock.ts';
import { CoreError } from '../../../src/core/errors.ts';
import { addNoise, astable } from './capture-synth.ts';

/*
 * Reference: the general-purpose curve-fitting library ml-levenberg-marquardt
 * (npm, 5.1.0) fitting the same three-parameter model
 *     v(t) = vInf + (v0 - vInf) * exp(-t / tau)
 * to the same noisy points. Both minimise the same sum of squares, so the
 * answers must agree closely (1e-3 relative on tau and vInf, as required).
 * The library is given time in milliseconds so its finite steps and damping
 * act on parameters of order one; the result is converted back to seconds.
 */

interface Case {
  label: string;
  v0V: number;
  vInfV: number;
  tauS: number;
  durationS: number;
  points: number;
  sigmaV: number;
  seed: number;
}

const cases: Case[] = [
  { label: 'charging 1.2 V -> 9 V, tau 1 ms, 1.1 tau long', v0V: 1.2, vInfV: 9, tauS: 1e-3, durationS: 1.1e-3, points: 1500, sigmaV: 0.02, seed: 11 },
  { label: 'discharging 3.3 V -> -4 V, tau 47 us, 0.6 tau long', v0V: 3.3, vInfV: -4, tauS: 47e-6, durationS: 0.6 * 47e-6, points: 800, sigmaV: 0.01, seed: 12 },
  { label: 'charging 0 V -> 2.5 V, tau 10 ms, 2.5 tau long', v0V: 0, vInfV: 2.5, tauS: 10e-3, durationS: 25e-3, points: 2000, sigmaV: 0.005, seed: 13 },
];

function synth(c: Case): { t: Float64Array; v: Float64Array } {
  const t = new Float64Array(c.points);
  const v = new Float64Array(c.points);
  const t0 = 0.0123; // a segment somewhere inside a record: the fit must not assume t starts at 0
  for (let k = 0; k < c.points; k++) {
    t[k] = t0 + (k * c.durationS) / (c.points - 1);
    v[k] = c.vInfV + (c.v0V - c.vInfV) * Math.exp(-(t[k] - t0) / c.tauS);
  }
  addNoise(v, c.sigmaV, c.seed);
  return { t, v };
}

function libraryFit(t: Float64Array, v: Float64Array): { vInfV: number; v0V: number; tauS: number } {
  const t0 = t[0];
  const xMs = Array.from(t, (x) => (x - t0) * 1e3);
  const y = Array.from(v);
  const durationMs = xMs[xMs.length - 1];
  // crude, model-free start: asymptote a little past the last point, tau a third of the span
  const start = [y[y.length - 1] + (y[y.length - 1] - y[0]) * 0.5, y[0], durationMs / 3];
  const model = ([vInf, v0, tau]: number[]) => (x: number) => vInf + (v0 - vInf) * Math.exp(-x / tau);
  const jacobian = ([vInf, v0, tau]: number[]) => (x: number) => {
    const e = Math.exp(-x / tau);
    return [1 - e, e, ((v0 - vInf) * e * x) / (tau * tau)];
  };
  const res = levenbergMarquardt({ x: xMs, y }, model, {
    initialValues: start,
    jacobianFunction: jacobian,
    maxIterations: 2000,
    errorTolerance: 1e-14,
    damping: 1e-3,
    minValues: [-1e3, -1e3, durationMs * 1e-3],
    maxValues: [1e3, 1e3, durationMs * 1e3],
  });
  const [vInfV, v0V, tauMs] = res.parameterValues;
  return { vInfV, v0V, tauS: tauMs * 1e-3 };
}

describe('exponential segment fit against ml-levenberg-marquardt', () => {
  for (const c of cases) {
    it(c.label, () => {
      const { t, v } = synth(c);
      const lib = libraryFit(t, v);
      for (const ours of [fitExponentialFull(t, v), fitExponential(t, v)]) {
        expect(Math.abs(ours.tauS / lib.tauS - 1)).toBeLessThan(1e-3);
        expect(Math.abs(ours.asymptoteV - lib.vInfV)).toBeLessThan(1e-3 * Math.abs(lib.vInfV));
        expect(Math.abs(ours.initialV - lib.v0V)).toBeLessThan(1e-3 * Math.max(1, Math.abs(lib.v0V)));
        expect(ours.pointCount).toBe(c.points);
        expect(ours.tauAtSearchBound).toBe(false);
        // residual is the injected noise
        expect(ours.rmsResidualV / c.sigmaV).toBeGreaterThan(0.9);
        expect(ours.rmsResidualV / c.sigmaV).toBeLessThan(1.1);
      }
    });
  }

  it('decimated fit of a 200 000-point segment stays within the noise-limited spread of the full fit', () => {
    const c: Case = { label: 'long', v0V: -2, vInfV: 6, tauS: 2e-3, durationS: 2.2e-3, points: 200_000, sigmaV: 0.02, seed: 99 };
    const { t, v } = synth(c);
    const full = fitExponentialFull(t, v);
    const dec = fitExponential(t, v, { maxPoints: 2000 });
    expect(dec.pointCount).toBe(2000);
    expect(full.pointCount).toBe(200_000);
    expect(Math.abs(full.tauS / c.tauS - 1)).toBeLessThan(2e-3);
    expect(Math.abs(dec.tauS / c.tauS - 1)).toBeLessThan(2e-2);
    expect(exponentialValueAt(full, t[0])).toBeCloseTo(full.initialV, 12);
  });

  it('too few points is a bad capture', () => {
    const t = Float64Array.from([0, 1, 2]);
    expect(() => fitExponentialFull(t, Float64Array.from([0, 1, 1.5]))).toThrowError(CoreError);
  });
});

describe('capacitor segments', () => {
  // Split-supply astable, Sedra & Smith op-amp astable: switching at +-beta*L with beta = 0.5,
  // T = 2 tau ln((1 + beta) / (1 - beta)).
  const tauS = 1e-3;
  const dt = 2e-6;
  const count = 20_000; // 40 ms: about 18 periods of 2.197 ms
  const a = { outputHighV: 12, outputLowV: -12, upperSwitchV: 6, lowerSwitchV: -6, tauS };
  const sig = astable(a, dt, count);
  addNoise(sig.capacitor, 0.02, 5);

  it('cut at the known switching instants: tau and switching levels', () => {
    const res = analyzeCapacitorSegments(sig.capacitor, uniformClock(dt, count), { edgeTimesS: sig.edgesS.filter((e) => e < (count - 1) * dt) });
    expect(res.boundarySource).toBe('output-edges');
    expect(res.segments.length).toBeGreaterThan(30);
    expect(Math.abs(res.risingTauS! / tauS - 1)).toBeLessThan(3e-3);
    expect(Math.abs(res.fallingTauS! / tauS - 1)).toBeLessThan(3e-3);
    expect(Math.abs(res.upperSwitchV! - 6)).toBeLessThan(0.01);
    expect(Math.abs(res.lowerSwitchV! + 6)).toBeLessThan(0.01);
    for (const s of res.segments) expect(Math.abs(s.asymptoteV - (s.direction === 'rising' ? 12 : -12))).toBeLessThan(0.3);
  });

  it('cut at the capacitor turning points when no edges are given', () => {
    const res = analyzeCapacitorSegments(sig.capacitor, uniformClock(dt, count));
    expect(res.boundarySource).toBe('turning-points');
    const expectedT = 2 * tauS * Math.log(3);
    const maxima = res.turningPoints!.filter((p) => p.kind === 'max');
    expect(Math.abs((maxima[maxima.length - 1].timeS - maxima[0].timeS) / (maxima.length - 1) / expectedT - 1)).toBeLessThan(2e-3);
    expect(Math.abs(res.risingTauS! / tauS - 1)).toBeLessThan(5e-3);
    expect(Math.abs(res.upperSwitchV! - 6)).toBeLessThan(0.03);
    expect(Math.abs(res.lowerSwitchV! + 6)).toBeLessThan(0.03);
  });
});
