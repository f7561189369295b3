import { describe, it, expect } from 'vitest';
import { analyzeCapture } from '../../../src/core/fit/capture/analyze-capture.ts';
import { addNoise, astable } from './capture-synth.ts';

/*
 * A 1,000,000-sample two-channel record (no timing asserts: it must complete
 * and be right). Reference: Sedra & Smith, Microelectronic Circuits, op-amp
 * astable: T = 2 tau ln((1 + beta) / (1 - beta)) for output +-L and
 * switching levels +-beta L; here beta = 10k / (10k + 22k) = 0.3125.
 */
describe('analyzeCapture on a 1e6-sample capture', () => {
  it('completes with the textbook period, tau and switching levels', () => {
    const L = 11;
    const beta = 10 / 32;
    const tauS = 100e-6;
    const periodS = 2 * tauS * Math.log((1 + beta) / (1 - beta));
    const dt = 10e-9;
    const count = 1_000_000; // 10 ms, about 77 periods
    const a = astable({ outputHighV: L, outputLowV: -L, upperSwitchV: beta * L, lowerSwitchV: -beta * L, tauS }, dt, count);
    addNoise(a.output, 0.05, 21);
    addNoise(a.capacitor, 0.01, 22);
    const f = analyzeCapture({ sampleIntervalS: dt, output: a.output, capacitor: a.capacitor });
    expect(f.sampleCount).toBe(count);
    expect(Math.abs(f.periodS / periodS - 1)).toBeLessThan(1e-4);
    expect(f.periodCount).toBeGreaterThan(140);
    expect(Math.abs(f.dutyCycle! - 0.5)).toBeLessThan(1e-3);
    expect(Math.abs(f.risingTauS! / tauS - 1)).toBeLessThan(2e-3);
    expect(Math.abs(f.fallingTauS! / tauS - 1)).toBeLessThan(2e-3);
    expect(Math.abs(f.capacitorMaxV! - beta * L)).toBeLessThan(0.01);
    expect(Math.abs(f.capacitorMinV! + beta * L)).toBeLessThan(0.01);
    expect(f.turningPointCount).toBeGreaterThan(140);
    // state levels by the IEEE 181 histogram method: 50 mV noise averaged over ~5e5 samples per state
    expect(Math.abs(f.outputHighV! - L)).toBeLessThan(0.005);
    expect(Math.abs(f.outputLowV! + L)).toBeLessThan(0.005);
  });
});
