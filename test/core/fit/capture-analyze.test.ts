import { describe, it, expect } from 'vitest';
import { analyzeCapture } from '../../../src/core/fit/capture/analyze-capture.ts';
import { parseCaptureCsv } from '../../../src/core/fit/capture/csv.ts';
import { mapChannels } from '../../../src/core/fit/capture/channel-map.ts';
import { addNoise, astable, quantise } from './capture-synth.ts';

/*
 * Whole-capture analysis of an ideal split-supply astable built here.
 * Reference: Sedra & Smith, Microelectronic Circuits, op-amp astable
 * multivibrator: output at +-L, capacitor switching at +-beta*L,
 * T = 2 tau ln((1 + beta) / (1 - beta)), duty 50 %.
 */
const L = 10;
const beta = 0.4;
const tauS = 220e-6;
const periodS = 2 * tauS * Math.log((1 + beta) / (1 - beta));
const dt = 0.5e-6;
const count = 40_000; // 20 ms, about 27 periods

function build(seed: number) {
  const a = astable({ outputHighV: L, outputLowV: -L, upperSwitchV: beta * L, lowerSwitchV: -beta * L, tauS }, dt, count);
  addNoise(a.output, 0.03, seed);
  addNoise(a.capacitor, 0.01, seed + 1);
  return { output: quantise(a.output, 8, -12, 12), capacitor: quantise(a.capacitor, 10, -12, 12) };
}

describe('analyzeCapture on a split-supply astable', () => {
  it('two channels: period, duty, levels, tau, switching levels', () => {
    const { output, capacitor } = build(1);
    const f = analyzeCapture({ sampleIntervalS: dt, output, capacitor });
    expect(f.timingSource).toBe('output');
    expect(Math.abs(f.periodS / periodS - 1)).toBeLessThan(1e-3);
    expect(f.frequencyHz * f.periodS).toBeCloseTo(1, 12);
    expect(Math.abs(f.dutyCycle! - 0.5)).toBeLessThan(2e-3);
    expect(Math.abs(f.outputHighV! - L)).toBeLessThan(0.1); // 8-bit LSB over 24 V is 94 mV
    expect(Math.abs(f.outputLowV! + L)).toBeLessThan(0.1);
    expect(Math.abs(f.risingTauS! / tauS - 1)).toBeLessThan(5e-3);
    expect(Math.abs(f.fallingTauS! / tauS - 1)).toBeLessThan(5e-3);
    expect(Math.abs(f.capacitorMaxV! - beta * L)).toBeLessThan(0.03);
    expect(Math.abs(f.capacitorMinV! + beta * L)).toBeLessThan(0.03);
    expect(f.capacitorMaxV!).toBeGreaterThan(beta * L - 0.1);
    expect(f.capacitorMinV!).toBeLessThan(-beta * L + 0.1);
    expect(f.sampleCount).toBe(count);
    expect(f.durationS).toBeCloseTo((count - 1) * dt, 12);
    // instantaneous edges in the synthetic output: the 10-90 % duration is under one sample
    expect(f.riseTimeS!).toBeLessThan(dt);
  });

  it('capacitor only: timing from its turning points', () => {
    const { capacitor } = build(2);
    const f = analyzeCapture({ sampleIntervalS: dt, capacitor });
    expect(f.timingSource).toBe('capacitor');
    expect(Math.abs(f.periodS / periodS - 1)).toBeLessThan(2e-3);
    expect(f.dutyCycle).toBeUndefined();
    // symmetric astable: the capacitor spends half the period above its mid level
    expect(Math.abs(f.capacitorAboveMidShare! - 0.5)).toBeLessThan(5e-3);
    expect(f.outputHighV).toBeUndefined();
    expect(Math.abs(f.risingTauS! / tauS - 1)).toBeLessThan(1e-2);
    expect(f.warnings.some((w) => w.includes('turning points'))).toBe(true);
  });

  it('explicit time column gives the same answer as the sample interval', () => {
    const { output, capacitor } = build(3);
    const timeS = Float64Array.from({ length: count }, (_, i) => 0.25 + i * dt);
    const a = analyzeCapture({ sampleIntervalS: dt, output, capacitor });
    const b = analyzeCapture({ timeS, output, capacitor });
    expect(b.periodS).toBeCloseTo(a.periodS, 12);
    expect(b.risingTauS!).toBeCloseTo(a.risingTauS!, 9);
    expect(b.warnings.length).toBe(a.warnings.length);
  });

  it('from a CSV export through mapChannels', () => {
    const { output, capacitor } = build(4);
    const rows = ['Time (ms),Output (V),Capacitor (V)'];
    for (let i = 0; i < count; i += 2) rows.push(`${(i * dt * 1e3).toExponential(6)},${output[i].toFixed(4)},${capacitor[i].toFixed(4)}`);
    const parsed = parseCaptureCsv(rows.join('\r\n') + '\r\n');
    const m = mapChannels(parsed.channels);
    const f = analyzeCapture({ timeS: parsed.timeS!, output: m.output!.values, capacitor: m.capacitor!.values });
    expect(Math.abs(f.periodS / periodS - 1)).toBeLessThan(2e-3);
    expect(Math.abs(f.risingTauS! / tauS - 1)).toBeLessThan(1e-2);
  });
});
