/**
 * BOM checks with parts as they really behave, one verdict with /v1/tolerance:
 * - a class II timing capacitor: the assembly's analyses run its class-typical C(V)
 *   (the bias-derating rule's frequency is the engine's, the worst case includes
 *   the derating) and agree with runToleranceAnalysis on the same C(V) part;
 * - a diode-steered clock over a temperature range: the worst case covers the
 *   steering diodes' forward-drop drift (−2 mV/K, common practice), checked by
 *   the odex reference integrator at the corner drops.
 * Scenarios of our own (invented values): the soil-moisture probe clock of the
 * BOM fixtures on a later revision, and a 5 V diode-steered strobe clock.
 */
import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import { analyzeCircuit, evaluateAssembly, runToleranceAnalysis, type BomAssembly, type BomRuleResult, type Circuit } from '../../../src/core/index.ts';
import { resolveCapacitor } from '../../../src/core/parts/capacitor/index.ts';
import { referenceOscillation } from '../circuit/engine-odex-reference.ts';
import { baseAssembly, context, NOMINAL_FREQUENCY_HZ } from './fixtures.ts';

const find = (rules: BomRuleResult[], ...codes: string[]) => rules.find((r) => codes.includes(r.code));

describe('class II timing capacitor: BOM verdict = tolerance verdict', () => {
  for (const amplifierId of ['ideal', 'cmos-rrio-fast']) {
    it(`a 0402 6.3 V X7R at 5 V (${amplifierId}): derated value, worst case and verdict as /v1/tolerance gives them`, () => {
      const assembly: BomAssembly = baseAssembly({
        id: `probe-clock-rev-c-${amplifierId}`,
        amplifier: amplifierId,
        lines: [
          { refdes: 'R1', value: '22K 1% 0603' },
          { refdes: 'C1', value: '4n7 6.3V X7R 10% 0402' },
          { refdes: 'R2, R3, R4', value: '68K 1% 0603' },
        ],
      });
      const bom = evaluateAssembly(assembly, 0, context({ mode: 'worst-case' }));
      // The same part as /v1/tolerance takes it: the capacitor object, the same tolerances.
      const part = resolveCapacitor({ value: '4n7', dielectric: 'X7R', ratedVoltageV: 6.3, caseSize: '0402' });
      const circuit: Circuit = {
        topology: 'three-resistor-divider',
        supply: { positiveV: 5, negativeV: 0 },
        amplifier: findBuiltInAmplifier(amplifierId)!,
        parts: { rTiming: 22e3, cTiming: part.capacitanceF, rTop: 68e3, rBottom: 68e3, rFeedback: 68e3 },
        capacitorShape: part.shape,
      };
      const tol = runToleranceAnalysis(
        { circuit, tolerances: { rTiming: 0.01, cTiming: 0.1, rTop: 0.01, rBottom: 0.01, rFeedback: 0.01 }, spec: { frequencyHz: NOMINAL_FREQUENCY_HZ, frequencyTolerance: 0.1 } },
        { parts: { monteCarlo: false, sensitivities: false } },
      );
      const bias = find(bom.rules, 'bias-derating', 'bias-derating-leaves-spec')!;
      const freq = find(bom.rules, 'frequency-within-spec', 'frequency-outside-spec')!;
      // The derated frequency is the engine's analysis of the C(V) circuit, the tolerance run's nominal.
      expect(Number(bias.figures.deratedFrequencyHz) / tol.nominal.frequencyHz - 1).toBeCloseTo(0, 9);
      expect(Number(bias.figures.deratedFrequencyHz) / analyzeCircuit(circuit).frequencyHz - 1).toBeCloseTo(0, 9);
      // A small-case, low-voltage part at 5 V keeps well under 80 % of its value over the swing (typical of the class).
      expect(Number(bias.figures.effectiveFraction)).toBeLessThan(0.8);
      expect(Number(bias.figures.effectiveCapacitanceF)).toBeCloseTo(Number(bias.figures.effectiveFraction) * 4.7e-9, 20);
      expect(bias.code).toBe('bias-derating-leaves-spec');
      // The worst case includes the derating: the BOM's and the tolerance run's figures and verdict agree.
      expect(Number(freq.figures.worstCaseMinHz) / tol.worstCase.frequencyMinHz - 1).toBeCloseTo(0, 9);
      expect(Number(freq.figures.worstCaseMaxHz) / tol.worstCase.frequencyMaxHz - 1).toBeCloseTo(0, 9);
      expect(freq.code).toBe(tol.worstCase.withinSpec ? 'frequency-within-spec' : 'frequency-outside-spec');
      expect(freq.code).toBe('frequency-outside-spec');
      expect(bom.pass).toBe(false);
    });
  }
});

describe('diode-steered clock over −40…85 °C: the BOM worst case covers the diode drift', () => {
  const assembly: BomAssembly = {
    id: 'strobe-clock-rev-a',
    topology: 'diode-steered',
    amplifier: 'ideal',
    lines: [
      { refdes: 'R1', value: '4K7 1% 0603 25ppm' },
      { refdes: 'R2', value: '47K 1% 0603 25ppm' },
      { refdes: 'C1', value: '10nF 50V C0G 1%' },
      { refdes: 'R3, R4, R5', value: '100K 1% 0603 25ppm' },
    ],
    roles: { rCharge: 'R1', rDischarge: 'R2', cTiming: 'C1', rTop: 'R3', rBottom: 'R4', rFeedback: 'R5' },
    supply: { positiveV: 5, negativeV: 0, tolerance: 0 },
    temperature: { minC: -40, maxC: 85 },
    spec: { frequencyHz: 2055, frequencyTolerance: 0.05 },
  };
  const base: Circuit = {
    topology: 'diode-steered',
    supply: { positiveV: 5, negativeV: 0 },
    amplifier: findBuiltInAmplifier('ideal')!,
    parts: { rCharge: 4.7e3, rDischarge: 47e3, cTiming: 10e-9, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 },
  };
  const referenceHz = (forwardDropV: number) => 1 / referenceOscillation({ ...base, diode: { forwardDropV, resistanceOhm: 10 } }, { tolerance: 1e-11 }).periodS;

  it('fails a ±5 % spec that the parts alone would meet; its span covers odex at 0.73 V and 0.48 V', () => {
    const bom = evaluateAssembly(assembly, 0, context({ mode: 'worst-case' }));
    const freq = find(bom.rules, 'frequency-within-spec', 'frequency-outside-spec')!;
    expect(freq.code).toBe('frequency-outside-spec');
    // −2 mV/K from 0.6 V at 25 °C (common practice): 0.73 V at −40 °C, 0.48 V at 85 °C.
    expect(Number(freq.figures.worstCaseMinHz)).toBeLessThan(referenceHz(0.73));
    expect(Number(freq.figures.worstCaseMaxHz)).toBeGreaterThan(referenceHz(0.48));
    // Without the range, the parts' tolerances alone stay inside ±5 %.
    const still = evaluateAssembly({ ...assembly, temperature: undefined }, 0, context({ mode: 'worst-case' }));
    expect(find(still.rules, 'frequency-within-spec', 'frequency-outside-spec')!.code).toBe('frequency-within-spec');
  });
});

describe('service life: a class II timing capacitor ages in the BOM check as in /v1/tolerance', () => {
  // The probe clock of the fixtures with a 50 V X7R part (bias derating small), an ideal amplifier so the
  // period is exactly proportional to the capacitance and the ageing corner can be checked by hand.
  const assembly: BomAssembly = baseAssembly({
    id: 'probe-clock-rev-f',
    amplifier: 'ideal',
    lines: [
      { refdes: 'R1', value: '22K 1% 0603' },
      { refdes: 'C1', value: '4n7 50V X7R 10% 0805' },
      { refdes: 'R2, R3, R4', value: '68K 1% 0603' },
    ],
  });

  it('ten years move the worst-case maximum by the log-decade law: 1 / (1 − 0.02·log10((1000 + 87,660) h / 1000 h))', () => {
    const fresh = evaluateAssembly(assembly, 0, context({ mode: 'worst-case' }));
    const aged = evaluateAssembly({ ...assembly, serviceLifeYears: 10 }, 0, context({ mode: 'worst-case' }));
    const span = (r: typeof fresh) => find(r.rules, 'frequency-within-spec', 'frequency-outside-spec')!.figures;
    // Log-decade ageing law of class II ceramics, C(t) = C(t0)(1 − k·log10(t/t0)) (IEC 60384-9 describes
    // ageing this way); k = 2 %/decade for X7R is typical of the class (from memory), t0 = 1000 h, 8766 h a year.
    const expectedRatio = 1 / (1 - 0.02 * Math.log10((1000 + 10 * 8766) / 1000));
    expect(Number(span(aged).worstCaseMaxHz) / Number(span(fresh).worstCaseMaxHz)).toBeCloseTo(expectedRatio, 6);
    // Ageing only lowers the capacitance: the slow end stays where it was.
    expect(Number(span(aged).worstCaseMinHz) / Number(span(fresh).worstCaseMinHz)).toBeCloseTo(1, 9);
  });

  it('a C0G part does not age: the same figures with or without a service life', () => {
    const c0g: BomAssembly = { ...assembly, lines: [assembly.lines[0], { refdes: 'C1', value: '4n7 50V C0G 2%' }, assembly.lines[2]] };
    const fresh = evaluateAssembly(c0g, 0, context({ mode: 'worst-case' }));
    const aged = evaluateAssembly({ ...c0g, serviceLifeYears: 10 }, 0, context({ mode: 'worst-case' }));
    expect(find(aged.rules, 'frequency-within-spec', 'frequency-outside-spec')!.figures).toEqual(
      find(fresh.rules, 'frequency-within-spec', 'frequency-outside-spec')!.figures,
    );
  });
});
