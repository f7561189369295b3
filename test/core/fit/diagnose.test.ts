import { describe, expect, it } from 'vitest';
import { chiSquareQuantile95 } from '../../../src/core/fit/diagnose/chi-square.ts';
import { describeShift, signedPercent } from '../../../src/core/fit/diagnose/wording.ts';
import { fitCircuit, type FitReport } from '../../../src/core/fit/index.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import { addNoise, quantise } from './capture-synth.ts';
import { synthesizeCapture } from './estimate-capture-synth.ts';
import { bridgeClock, bridgeClockTolerances, withAmplifier, withParts } from './estimate-scenario.ts';

/** Synthetic record: noise, 8-bit quantisation, channel offsets, a trigger point mid-cycle. */
function record(truth: Circuit, seed: number) {
  const dt = 50e-9;
  const n = 40_000;
  const cap = synthesizeCapture(truth, { sampleIntervalS: dt, sampleCount: n, phaseS: 53e-6 });
  addNoise(cap.output, 0.02, seed);
  addNoise(cap.capacitor, 0.005, seed + 1);
  for (let i = 0; i < n; i++) {
    cap.output[i] -= 0.02;
    cap.capacitor[i] += 0.008;
  }
  quantise(cap.output, 8, -3, 3);
  quantise(cap.capacitor, 8, -1.5, 1.5);
  return { sampleIntervalS: dt, output: cap.output, capacitor: cap.capacitor };
}

const diagnoseCapture = (truth: Circuit, seed: number): FitReport =>
  fitCircuit({ circuit: bridgeClock, tolerances: bridgeClockTolerances, capture: record(truth, seed) });

const firstCauses = (r: FitReport) => r.diagnosis.explanations[0].causes.map((c) => c.parameter).sort();

describe('ranked explanations from synthetic captures with one known cause', () => {
  it('a capacitor 7.5 % high: cTiming alone ranks first, inside its tolerance', () => {
    const r = diagnoseCapture(withParts(bridgeClock, { cTiming: 4.7e-9 * 1.075 }), 101);
    // +7.5 % on a 10 % capacitor is inside its tolerance: the board is in order, and the best explanation still names it.
    expect(r.diagnosis.verdict.agreesWithNominal).toBe(true);
    const best = r.diagnosis.explanations[0];
    expect(firstCauses(r)).toEqual(['cTiming']);
    expect(best.causes[0].relativeShift!).toBeGreaterThan(0.06);
    expect(best.causes[0].relativeShift!).toBeLessThan(0.09);
    expect(best.causes[0].withinTolerance).toBe(true);
    expect(best.causes[0].text).toMatch(/^cTiming \+7\.\d %.*inside its 10 % tolerance$/);
    expect(best.accountsForMeasurements).toBe(true);
    expect(r.diagnosis.verdict.statement).toMatch(/^The measurements agree with the nominal circuit within its tolerances/);
    // Scores are posterior probabilities over the nominal circuit and the explanations listed: ranked, summing to one.
    const scores = r.diagnosis.explanations.map((e) => e.score);
    expect([...scores].sort((a, b) => b - a)).toEqual(scores);
    expect(scores.reduce((a, b) => a + b, 0) + r.diagnosis.verdict.nominalScore).toBeCloseTo(1, 9);
  });

  it('an output that stops 0.35 V short of the positive rail: outputHighV ranks first', () => {
    const r = diagnoseCapture(withAmplifier(bridgeClock, { outputHeadroomHighV: 0.35 }), 111);
    expect(firstCauses(r)).toEqual(['outputHighV']);
    const shift = r.diagnosis.explanations[0].causes[0].shift;
    expect(shift).toBeGreaterThan(-0.45);
    expect(shift).toBeLessThan(-0.25);
  });

  it('a slew rate of 2 V/µs instead of 8: slewRateVPerS ranks first', () => {
    const r = diagnoseCapture(withAmplifier(bridgeClock, { slewRateVPerS: 2e6 }), 121);
    expect(firstCauses(r)).toEqual(['slewRateVPerS']);
    const e = r.diagnosis.explanations[0].causes[0];
    expect(Math.abs(e.estimate! / 2e6 - 1)).toBeLessThan(0.1);
  });

  it('two causes at once (capacitor +25 %, beyond its 10 % tolerance, and output high short by 0.3 V): the pair ranks first', () => {
    const truth = withAmplifier(withParts(bridgeClock, { cTiming: 4.7e-9 * 1.25 }), { outputHeadroomHighV: 0.32 });
    const r = diagnoseCapture(truth, 131);
    expect(firstCauses(r)).toEqual(['cTiming', 'outputHighV']);
    expect(r.diagnosis.explanations[0].accountsForMeasurements).toBe(true);
  });

  it('the nominal circuit itself: a plain statement that the measurements agree', () => {
    const r = diagnoseCapture(bridgeClock, 141);
    expect(r.diagnosis.verdict.agreesWithNominal).toBe(true);
    expect(r.diagnosis.verdict.statement).toMatch(/^The measurements agree with the nominal circuit within its tolerances/);
    expect(r.diagnosis.verdict.nominalChiSquare).toBeLessThanOrEqual(r.diagnosis.verdict.chiSquareBound95);
  });
});

describe('ranked explanations from scalar figures', () => {
  it('9.3 kHz instead of 10.09 kHz from the frequency alone: the 10 % capacitor is a likelier cause than a 1 % resistor', () => {
    const r = fitCircuit({ circuit: bridgeClock, tolerances: bridgeClockTolerances, measurements: { frequencyHz: { value: 9300, uncertainty: 5 } } });
    const rank = (p: string) => r.diagnosis.explanations.findIndex((e) => e.causes.length === 1 && e.causes[0].parameter === p);
    expect(rank('cTiming')).toBeGreaterThanOrEqual(0);
    const rTiming = rank('rTiming');
    if (rTiming >= 0) expect(rank('cTiming')).toBeLessThan(rTiming);
    const c = r.diagnosis.explanations[rank('cTiming')].causes[0];
    // f ∝ 1/C: the shift that explains 9300 Hz is 10090/9300 − 1 to first order.
    expect(c.relativeShift!).toBeCloseTo(r.nominal.frequencyHz / 9300 - 1, 2);
  });

  it('figures that match the nominal prediction give the agreement statement', () => {
    const nominalHz = fitCircuit({ circuit: bridgeClock, measurements: { frequencyHz: 1000 } }).nominal.frequencyHz;
    const r = fitCircuit({ circuit: bridgeClock, measurements: { frequencyHz: nominalHz * 1.0005, dutyCycle: 0.501 } });
    expect(r.diagnosis.verdict.agreesWithNominal).toBe(true);
  });
});

describe('χ² bound and wording', () => {
  it('Wilson–Hilferty matches the tabulated 95 % χ² quantiles to within 3 % (NIST/SEMATECH e-Handbook, upper critical values of the chi-square distribution)', () => {
    const table: [number, number][] = [
      [1, 3.841],
      [2, 5.991],
      [5, 11.07],
      [10, 18.307],
      [20, 31.41],
    ];
    for (const [k, q] of table) expect(Math.abs(chiSquareQuantile95(k) / q - 1)).toBeLessThan(0.03);
  });

  it('says a shift inside or beyond the tolerance in plain words', () => {
    const base = { kind: 'part' as const, unit: 'F' as const, nominal: 10e-9, standardDeviation: 1e-10, priorStandardDeviation: 3.3e-10, tolerance: 0.1, posteriorToPriorSd: 0.2 };
    expect(describeShift({ ...base, parameter: 'cTiming', estimate: 10.89e-9, shift: 0.89e-9, relativeShift: 0.089, shiftInTolerances: 0.89 }, 'cTiming')).toBe(
      'cTiming +8.9 % (10 nF -> 10.9 nF), inside its 10 % tolerance',
    );
    expect(describeShift({ ...base, parameter: 'cTiming', estimate: 12.3e-9, shift: 2.3e-9, relativeShift: 0.23, shiftInTolerances: 2.3 }, 'cTiming')).toBe(
      'cTiming +23 % (10 nF -> 12.3 nF), 2.3× its 10 % tolerance',
    );
    expect(signedPercent(-0.0123)).toBe('-1.2 %');
  });
});
