import { describe, it, expect } from 'vitest';
import { stateLevels, referenceLevelV } from '../../../src/core/fit/capture/levels.ts';
import { analyzeEdges, findReferenceCrossings, findTransitions } from '../../../src/core/fit/capture/crossings.ts';
import { uniformClock } from '../../../src/core/fit/capture/sample-clock.ts';
import { addNoise, quantise, trapezoid } from './capture-synth.ts';
import type { PulseTrain } from './capture-synth.ts';

/*
 * Checks against the definitions of IEEE Std 181-2011 (transitions, pulses and
 * related waveforms), applied to textbook pulses built here:
 *  - state levels: histogram of the record split at the midpoint of its range,
 *    mode of each half (the standard's histogram method);
 *  - reference levels as % of the amplitude above the low state; the 50 %
 *    reference-level instant marks a transition;
 *  - transition duration: time between the 10 % and 90 % reference-level
 *    instants. For a linear ramp running 0 % -> 100 % in D, the 10 % and 90 %
 *    instants are 0.1 D and 0.9 D into it, so the duration is 0.8 D.
 * Period = spacing of like-direction 50 % instants; duty cycle = time above
 * the 50 % level over the period (pulse duration / period in 181 terms).
 * (Clause numbers of the standard are not quoted: from memory only.)
 */

const dtS = 1e-6;
const pulse: PulseTrain = { lowV: 0.2, highV: 4.6, periodS: 1e-3, dutyCycle: 0.3, rampS: 20e-6, firstEdgeS: 137.5e-6 };
const count = 40_000; // 40 periods
const clock = uniformClock(dtS, count);

describe('ideal trapezoidal pulse train (no noise)', () => {
  const v = trapezoid(pulse, dtS, count);

  it('state levels are the two plateaus', () => {
    const lv = stateLevels(v);
    // (9 digits: the level is a mean of ~1e4 equal samples, summation rounding ~1e-12)
    expect(lv.lowV).toBeCloseTo(pulse.lowV, 9);
    expect(lv.highV).toBeCloseTo(pulse.highV, 9);
    expect(lv.amplitudeV).toBeCloseTo(pulse.highV - pulse.lowV, 9);
  });

  it('period, duty and 10-90 % durations follow the definitions exactly', () => {
    const e = analyzeEdges(v, clock);
    expect(e.period.meanS).toBeCloseTo(pulse.periodS, 12);
    expect(e.period.stdS).toBeLessThan(1e-12);
    expect(e.frequencyHz).toBeCloseTo(1 / pulse.periodS, 6);
    expect(e.dutyCycle).toBeCloseTo(pulse.dutyCycle, 9);
    // IEEE 181: linear ramp 0-100 % in D -> 10-90 % duration 0.8 D.
    expect(e.riseTimeS!).toBeCloseTo(0.8 * pulse.rampS, 12);
    expect(e.fallTimeS!).toBeCloseTo(0.8 * pulse.rampS, 12);
    expect(e.riseCount).toBe(40);
  });

  it('the 50 % instant is mid-ramp and other reference levels sit proportionally along it', () => {
    const lv = stateLevels(v);
    const at50 = findTransitions(v, clock, lv);
    expect(at50[0].direction).toBe('rising');
    // ramp starts at firstEdgeS: p % of the way is p/100 * D later.
    expect(at50[0].timeS).toBeCloseTo(pulse.firstEdgeS + 0.5 * pulse.rampS, 12);
    const at25 = findReferenceCrossings(v, clock, lv, { referencePercent: 25 });
    expect(at25[0].timeS).toBeCloseTo(pulse.firstEdgeS + 0.25 * pulse.rampS, 12);
    // falling ramp: 25 % is reached 0.75 D after the ramp starts.
    const fallStartS = pulse.firstEdgeS + pulse.dutyCycle * pulse.periodS;
    expect(at25[1].direction).toBe('falling');
    expect(at25[1].timeS).toBeCloseTo(fallStartS + 0.75 * pulse.rampS, 12);
    // a 20-80 % band: duration 0.6 D for the same ramp.
    const band = findTransitions(v, clock, lv, { lowerPercent: 20, upperPercent: 80 });
    expect(band[0].durationS).toBeCloseTo(0.6 * pulse.rampS, 11);
    expect(referenceLevelV(lv, 50)).toBeCloseTo((pulse.lowV + pulse.highV) / 2, 9);
  });
});

describe('noisy, 8-bit quantised pulse train', () => {
  // Gaussian noise sigma = 1 % of the amplitude, 8-bit ADC over -0.5..5.5 V (LSB 23.5 mV).
  const amplitudeV = pulse.highV - pulse.lowV;
  const sigmaV = 0.01 * amplitudeV;
  const lsbV = 6 / 255;
  const v = quantise(addNoise(trapezoid(pulse, dtS, count), sigmaV, 20240611), 8, -0.5, 5.5);

  it('state levels within one LSB of the plateaus', () => {
    const lv = stateLevels(v);
    expect(Math.abs(lv.lowV - pulse.lowV)).toBeLessThan(lsbV);
    expect(Math.abs(lv.highV - pulse.highV)).toBeLessThan(lsbV);
  });

  it('period within 0.05 %, duty within 0.002, 10-90 % duration within 3 % of 0.8 D', () => {
    const e = analyzeEdges(v, clock);
    expect(e.period.count).toBe(39 + 39);
    expect(Math.abs(e.period.meanS / pulse.periodS - 1)).toBeLessThan(5e-4);
    // jitter: edge-time noise ~ sigma / slope; slope = amplitude / D.
    const edgeNoiseS = sigmaV / (amplitudeV / pulse.rampS);
    expect(e.period.stdS).toBeLessThan(5 * edgeNoiseS);
    expect(e.period.stdS).toBeGreaterThan(0);
    expect(Math.abs(e.dutyCycle - pulse.dutyCycle)).toBeLessThan(0.002);
    expect(Math.abs(e.riseTimeS! / (0.8 * pulse.rampS) - 1)).toBeLessThan(0.03);
    expect(Math.abs(e.fallTimeS! / (0.8 * pulse.rampS) - 1)).toBeLessThan(0.03);
  });

  it('hysteresis: noise far larger than one LSB around the 50 % level makes no extra edges', () => {
    // A slow ramp (D = 200 us) with 3 % noise crosses 50 % many times per edge.
    const slow: PulseTrain = { ...pulse, rampS: 200e-6 };
    const w = addNoise(trapezoid(slow, dtS, count), 0.03 * amplitudeV, 7);
    const e = analyzeEdges(w, clock);
    expect(e.riseCount).toBe(40);
    expect(e.fallCount).toBe(40);
    expect(Math.abs(e.period.meanS / pulse.periodS - 1)).toBeLessThan(1e-3);
  });
});
