/**
 * The fit against captures made by the exact time-domain engine (not by the
 * fit's own closed form, nor by estimate-capture-synth.ts's generator): each
 * record carries one known deviation, noise, 8-bit quantisation, channel
 * offsets and a mid-cycle trigger. Recovery is checked at 3σ of the stated
 * posterior uncertainty: for a correct Gaussian posterior a 1σ check fails
 * about a third of the time by chance and 2σ one time in twenty per parameter,
 * while a 3σ miss (0.3 % by chance) means the estimate or its uncertainty is
 * wrong; a few such checks per test stay reliable for fixed seeds and still
 * catch a biased model.
 */
import { describe, expect, it } from 'vitest';
import { fitCircuit } from '../../../src/core/fit/index.ts';
import { engineBenchRecord, engineCapture } from './estimate-engine-capture.ts';
import { bridgeClock, bridgeClockTolerances, withAmplifier, withParts } from './estimate-scenario.ts';
import { analyzeCircuit } from '../../../src/core/circuit/analyze.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';

function fitRecord(truth: Circuit, seed: number) {
  return fitCircuit({ circuit: bridgeClock, tolerances: bridgeClockTolerances, capture: engineBenchRecord(truth, seed) });
}

function estimateOf(report: ReturnType<typeof fitCircuit>, name: string) {
  const e = report.estimation.estimates.find((x) => x.parameter === name);
  if (!e) throw new Error(`no estimate for ${name}`);
  return e;
}

const firstCauses = (r: ReturnType<typeof fitCircuit>) => r.diagnosis.explanations[0].causes.map((c) => c.parameter).sort();

describe('engine-made captures: the sampler itself', () => {
  it('has the engine period and the requested trigger offset', () => {
    const truth = withAmplifier(bridgeClock, { recoveryDelayS: 3e-6 });
    const periodS = analyzeCircuit(truth, { model: 'time-domain' }).periodS;
    const dt = 50e-9;
    const at0 = engineCapture(truth, { sampleIntervalS: dt, sampleCount: 4000 });
    const shifted = engineCapture(truth, { sampleIntervalS: dt, sampleCount: 4000, phaseS: 10e-6 });
    // 10 µs = 200 samples: the shifted record is the first one moved along.
    expect(shifted.capacitor[0]).toBeCloseTo(at0.capacitor[200], 9);
    // One period later the waveform repeats (the period is not a whole number of samples: compare at the nearest sample).
    const k = Math.round(periodS / dt);
    const slopeVPerS = Math.abs(at0.capacitor[k + 1] - at0.capacitor[k]) / dt;
    expect(Math.abs(at0.capacitor[k] - at0.capacitor[0])).toBeLessThanOrEqual(slopeVPerS * dt);
  });
});

describe('fit of engine-made captures with known deviations', () => {
  it('capacitor +7.5 %: recovered within 3σ, and ranked first', () => {
    const trueC = 4.7e-9 * 1.075;
    const r = fitRecord(withParts(bridgeClock, { cTiming: trueC }), 211);
    const c = estimateOf(r, 'cTiming');
    expect(Math.abs(c.estimate - trueC)).toBeLessThan(3 * c.standardDeviation);
    expect(c.standardDeviation / trueC).toBeLessThan(0.01); // the data decided it, not the 10 % prior
    expect(r.estimation.converged).toBe(true);
    expect(firstCauses(r)).toEqual(['cTiming']);
    expect(r.diagnosis.explanations[0].accountsForMeasurements).toBe(true);
  });

  it('recovery delay ×3.5 (0.3 µs -> 1.05 µs, inside the class range): recovered within 3σ, and ranked first', () => {
    const r = fitRecord(withAmplifier(bridgeClock, { recoveryDelayS: 3.5 * bridgeClock.amplifier.recoveryDelayS }), 221);
    const d = estimateOf(r, 'recoveryDelayS');
    expect(Math.abs(d.estimate - 1.05e-6)).toBeLessThan(3 * d.standardDeviation);
    expect(d.standardDeviation).toBeLessThan(0.5e-6);
    const c = estimateOf(r, 'cTiming');
    expect(Math.abs(c.estimate - 4.7e-9)).toBeLessThan(3 * c.standardDeviation);
    expect(firstCauses(r)).toEqual(['recoveryDelayS']);
  });

  it('output high 0.35 V short of the rail: recovered within 3σ, and ranked first', () => {
    const r = fitRecord(withAmplifier(bridgeClock, { outputHeadroomHighV: 0.35 }), 231);
    const high = estimateOf(r, 'outputHighV');
    expect(Math.abs(high.estimate - 2.15)).toBeLessThan(3 * high.standardDeviation);
    expect(firstCauses(r)).toEqual(['outputHighV']);
  });

  it('slew rate 2 V/µs instead of 8 (ramp/τ = 0.033): recovered within 3σ, and ranked first', () => {
    const truth = withAmplifier(bridgeClock, { slewRateVPerS: 2e6 });
    const r = fitRecord(truth, 241);
    const slew = estimateOf(r, 'slewRateVPerS');
    expect(Math.abs(slew.estimate - 2e6)).toBeLessThan(3 * slew.standardDeviation);
    expect(slew.standardDeviation / 2e6).toBeLessThan(0.1);
    const c = estimateOf(r, 'cTiming');
    expect(Math.abs(c.estimate - 4.7e-9)).toBeLessThan(3 * c.standardDeviation);
    expect(firstCauses(r)).toEqual(['slewRateVPerS']);
  });

  it('the nominal circuit itself agrees with its engine-made capture', () => {
    const r = fitRecord(bridgeClock, 251);
    expect(r.diagnosis.verdict.agreesWithNominal).toBe(true);
  });
});
