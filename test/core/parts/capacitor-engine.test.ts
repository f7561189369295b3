/**
 * The engine with a class II timing capacitor (C(v) non-linear pieces) against
 * odex integrating the same circuit ODE with C(v) (test/core/circuit/
 * engine-odex-reference.ts: its own nodal solve and amplifier behaviour; only
 * the C(v) curve is shared). Issue target: ≤ 1e-6 relative.
 */
import { describe, expect, it } from 'vitest';
import { analyzeCircuit, findBuiltInAmplifier, type Circuit } from '../../../src/core/index.ts';
import { resolveCapacitor } from '../../../src/core/parts/capacitor/index.ts';
import { referenceOscillation } from '../circuit/engine-odex-reference.ts';

const smallX7R = resolveCapacitor({ value: '10n', dielectric: 'X7R', ratedVoltageV: 6.3, caseSize: '0402' });

function circuit(amplifierId: string, supplyV: number, topology = 'three-resistor-divider'): Circuit {
  const amp = findBuiltInAmplifier(amplifierId)!;
  return {
    topology,
    supply: { positiveV: supplyV, negativeV: 0 },
    amplifier: amp,
    parts: { rTiming: 22e3, cTiming: smallX7R.capacitanceF, rTop: 68e3, rBottom: 68e3, rFeedback: 68e3 },
    capacitorShape: smallX7R.shape,
  };
}

describe('engine with a C(v) timing capacitor against odex', () => {
  const cases: [string, string, number][] = [
    ['ideal amplifier (one non-linear piece per state)', 'ideal', 5],
    ['slewing, delayed CMOS op-amp (ramp pieces with C(v))', 'cmos-rro-micropower', 5],
    ['bipolar single-supply op-amp with headroom', 'bipolar-single-supply-general', 5],
  ];
  for (const [name, amp, v] of cases) {
    it(`${name}: period and duty within 1e-6`, () => {
      const c = circuit(amp, v);
      const got = analyzeCircuit(c);
      const ref = referenceOscillation(c, { tolerance: 1e-11 });
      expect(Math.abs(got.periodS / ref.periodS - 1)).toBeLessThan(1e-6);
      expect(Math.abs(got.dutyCycle - ref.dutyCycle)).toBeLessThan(1e-6);
    });
  }

  // The capacitor's extremes lie inside a slew piece here (the output slews for a third of the cycle): an
  // extremum search on the C(v) polynomial, against the largest and smallest of odex's samples on a fine grid.
  for (const rTiming of [4.7e3, 100e3]) {
    it(`slewing CMOS op-amp, rTiming ${rTiming} Ω: capacitor max and min within 1e-6 of odex's sampled waveform`, () => {
      const c = { ...circuit('cmos-rro-micropower', 5), parts: { ...circuit('cmos-rro-micropower', 5).parts, rTiming } };
      const got = analyzeCircuit(c);
      const ref = referenceOscillation(c, { tolerance: 1e-11, sample: { perPeriod: 20000, periods: 1 } });
      const samples = ref.samples!.capacitorV;
      let maxV = -Infinity;
      let minV = Infinity;
      for (const v of samples) {
        maxV = Math.max(maxV, v);
        minV = Math.min(minV, v);
      }
      expect(Math.abs(got.capacitor.maxV / maxV - 1)).toBeLessThan(1e-6);
      expect(Math.abs(got.capacitor.minV / minV - 1)).toBeLessThan(1e-6);
    });
  }

  it('the curve slows nothing and speeds the clock: shorter period than the same value as a linear capacitor', () => {
    const c = circuit('ideal', 5);
    const linear = analyzeCircuit({ ...c, capacitorShape: undefined });
    const nonlinear = analyzeCircuit(c);
    expect(nonlinear.periodS).toBeLessThan(linear.periodS * 0.9);
  });
});
