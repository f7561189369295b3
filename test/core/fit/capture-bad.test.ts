import { describe, it, expect } from 'vitest';
import { analyzeCapture } from '../../../src/core/fit/capture/analyze-capture.ts';
import { stateLevels } from '../../../src/core/fit/capture/levels.ts';
import { refusal } from '../../helpers/core-error.ts';
import { addNoise, astable, quantise, trapezoid } from './capture-synth.ts';

/*
 * Captures that cannot be analysed must fail with CoreError code
 * 'bad-capture', a machine-readable details.reason and a message saying why.
 * The signals are synthesised here; the expectations are what the analysis
 * promises, not measured values.
 */

const dt = 1e-6;
const pulse = { lowV: 0, highV: 5, periodS: 1e-3, dutyCycle: 0.5, rampS: 10e-6, firstEdgeS: 100e-6 };

describe('bad captures', () => {
  it('flat line: constant, and noise only', () => {
    const constant = refusal(() => analyzeCapture({ sampleIntervalS: dt, output: new Float64Array(5000).fill(3.3) }));
    expect(constant.code).toBe('bad-capture');
    expect(constant.details?.reason).toBe('flat-line');
    expect(constant.message).toMatch(/flat line/);
    const noise = refusal(() => analyzeCapture({ sampleIntervalS: dt, output: addNoise(new Float64Array(5000).fill(3.3), 0.05, 3) }));
    expect(noise.code).toBe('bad-capture');
    expect(noise.details?.reason).toBe('flat-line');
  });

  it('flat line with one glitch is one state, not two', () => {
    const v = addNoise(new Float64Array(5000).fill(1), 0.01, 4);
    v[2500] = 5;
    const e = refusal(() => stateLevels(v, { channelName: 'output' }));
    expect(e.details?.reason).toBe('flat-line');
    expect(e.message).toMatch(/one state only/);
  });

  it('one edge only', () => {
    const v = new Float64Array(4000);
    for (let i = 2000; i < v.length; i++) v[i] = 5;
    addNoise(v, 0.02, 5);
    const e = refusal(() => analyzeCapture({ sampleIntervalS: dt, output: v }));
    expect(e.code).toBe('bad-capture');
    expect(e.details?.reason).toBe('too-few-edges');
    expect(e.message).toMatch(/one edge only/);
  });

  it('one edge each way is not a period either', () => {
    const v = new Float64Array(6000);
    for (let i = 2000; i < 4000; i++) v[i] = 5;
    const e = refusal(() => analyzeCapture({ sampleIntervalS: dt, output: v }));
    expect(e.message).toMatch(/one edge in each direction/);
  });

  it('clipped output: the high state sits at the top ADC code', () => {
    // 8-bit ADC over -0.5..4.8 V: the 5 V state is cut off at 4.8 V, the low state keeps its noise.
    const v = quantise(addNoise(trapezoid(pulse, dt, 20_000), 0.05, 6), 8, -0.5, 4.8);
    const e = refusal(() => analyzeCapture({ sampleIntervalS: dt, output: v }));
    expect(e.code).toBe('bad-capture');
    expect(e.details?.reason).toBe('clipped');
    expect(e.message).toMatch(/clipped/);
    expect(e.pointer).toBe('/output');
    // the same signal with head-room passes
    const ok = quantise(addNoise(trapezoid(pulse, dt, 20_000), 0.05, 6), 8, -0.5, 5.5);
    expect(analyzeCapture({ sampleIntervalS: dt, output: ok }).periodS).toBeCloseTo(pulse.periodS, 6);
  });

  it('clipped capacitor: its peaks are cut flat', () => {
    const a = astable({ outputHighV: 5, outputLowV: -5, upperSwitchV: 2.5, lowerSwitchV: -2.5, tauS: 1e-4 }, dt, 10_000);
    const cap = a.capacitor.map((x) => Math.min(x, 2.0));
    const e = refusal(() => analyzeCapture({ sampleIntervalS: dt, output: a.output, capacitor: cap }));
    expect(e.details?.reason).toBe('clipped');
    expect(e.pointer).toBe('/capacitor');
  });

  it('mismatched channel lengths, and a time column of the wrong length', () => {
    const e = refusal(() => analyzeCapture({ sampleIntervalS: dt, output: new Float64Array(100), capacitor: new Float64Array(99) }));
    expect(e.code).toBe('bad-capture');
    expect(e.details?.reason).toBe('length-mismatch');
    expect(e.message).toMatch(/100 samples but capacitor has 99/);
    const t = refusal(() => analyzeCapture({ timeS: new Float64Array(99), output: new Float64Array(100) }));
    expect(t.details?.reason).toBe('length-mismatch');
  });

  it('NaN sample: the first one is named', () => {
    const v = trapezoid(pulse, dt, 5000);
    v[1234] = NaN;
    v[3000] = NaN;
    const e = refusal(() => analyzeCapture({ sampleIntervalS: dt, output: v }));
    expect(e.code).toBe('bad-capture');
    expect(e.message).toMatch(/sample 1234 is NaN/);
    expect(e.pointer).toBe('/output/1234');
    expect(e.details?.index).toBe(1234);
  });

  it('no channel, bad sample interval, no time base, non-monotonic time', () => {
    expect(refusal(() => analyzeCapture({ sampleIntervalS: dt })).details?.reason).toBe('no-channel');
    for (const bad of [0, -1e-6, Number.NaN]) {
      const e = refusal(() => analyzeCapture({ sampleIntervalS: bad, output: new Float64Array(10) }));
      expect(e.details?.reason).toBe('bad-sample-interval');
      expect(e.pointer).toBe('/sampleIntervalS');
    }
    expect(refusal(() => analyzeCapture({ output: new Float64Array(10) })).details?.reason).toBe('no-time-base');
    const t = Float64Array.from({ length: 10 }, (_, i) => i * dt);
    t[6] = t[5];
    const e = refusal(() => analyzeCapture({ timeS: t, output: new Float64Array(10) }));
    expect(e.details?.reason).toBe('non-monotonic-time');
    expect(e.message).toMatch(/sample 6/);
  });
});
