/**
 * Comparator internal hysteresis and overdrive-dependent delay in the engine,
 * against odex integrating the same circuit with the same decision rule
 * (test/core/circuit/engine-odex-reference.ts). Scenario of our own: a 3.3 V
 * beacon clock on a push-pull CMOS comparator with a few millivolts of internal
 * hysteresis and a delay that grows at small overdrive.
 */
import { describe, expect, it } from 'vitest';
import { analyzeCircuit, findBuiltInAmplifier, type Circuit } from '../../../src/core/index.ts';
import { delayLawFromPoints } from '../../../src/core/amplifiers/propagation-delay.ts';
import { referenceOscillation } from '../circuit/engine-odex-reference.ts';

const base = findBuiltInAmplifier('comparator-push-pull-cmos')!;
// Class-typical points (from memory): 5 mV overdrive 2 µs, 100 mV 0.25 µs.
const law = delayLawFromPoints({ overdriveV: 5e-3, delayS: 2e-6 }, { overdriveV: 0.1, delayS: 0.25e-6 });

function beacon(internalHysteresisV: number, overdriveDelayChargeVS: number, recoveryDelayS = base.recoveryDelayS): Circuit {
  return {
    topology: 'three-resistor-divider',
    supply: { positiveV: 3.3, negativeV: 0 },
    amplifier: { ...base, id: 'beacon-comparator', figuresBasis: 'caller-supplied', internalHysteresisV, overdriveDelayChargeVS, recoveryDelayS },
    parts: { rTiming: 100e3, cTiming: 1e-9, rTop: 100e3, rBottom: 100e3, rFeedback: 1e6 },
  };
}

describe('comparator specifics in the engine (odex reference)', () => {
  it('internal hysteresis widens the swing and lengthens the period; engine and odex agree within 1e-6', () => {
    const plain = analyzeCircuit(beacon(0, 0));
    const c = beacon(20e-3, 0);
    const got = analyzeCircuit(c);
    expect(got.periodS).toBeGreaterThan(plain.periodS);
    const ref = referenceOscillation(c, { tolerance: 1e-11 });
    expect(Math.abs(got.periodS / ref.periodS - 1)).toBeLessThan(1e-6);
    expect(Math.abs(got.dutyCycle - ref.dutyCycle)).toBeLessThan(1e-6);
  });

  it('delay that follows overdrive (t∞ + √(2k/S) at the crossing slope): engine and odex agree within 1e-6', () => {
    const c = beacon(0, law.chargeVS, law.floorS);
    const got = analyzeCircuit(c);
    const fixed = analyzeCircuit(beacon(0, 0, law.floorS));
    // A slow exponential crossing has little overdrive: the clock is slower than with the floor delay alone.
    expect(got.periodS).toBeGreaterThan(fixed.periodS);
    const ref = referenceOscillation(c, { tolerance: 1e-11 });
    expect(Math.abs(got.periodS / ref.periodS - 1)).toBeLessThan(1e-6);
  });
});
