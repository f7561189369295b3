/**
 * The BOM check for a class II timing capacitor: its effective capacitance over
 * the swing it actually sees and the frequency it gives, against the spec.
 * Scenario of our own (the BOM fixtures' soil-moisture probe clock): revision C
 * swaps the 4.7 nF C0G for a small-case 6.3 V X7R part.
 */
import { describe, expect, it } from 'vitest';
import { evaluateAssembly, type BomRuleResult } from '../../../src/core/index.ts';
import { DEFAULT_CASE_SIZE, typicalBiasShape } from '../../../src/core/parts/capacitor/index.ts';
import { parseDielectric } from '../../../src/core/parts/index.ts';
import { context, NOMINAL_FREQUENCY_HZ, R_TIMING_OHM, C_TIMING_F, withLine } from '../bom/fixtures.ts';
import { odexTimeTo } from './capacitor-odex-reference.ts';

function rule(valueText: string, code: string): BomRuleResult | undefined {
  const result = evaluateAssembly(withLine('C1', { value: valueText }), 0, context());
  return result.rules.find((r) => r.code === code);
}

describe('bias-derating rules', () => {
  it('a 0402 6.3 V X7R at 5 V leaves a ±10 % spec; the derated frequency agrees with odex on the same C(V) circuit', () => {
    const r = rule('4n7 6.3V X7R 10% 0402', 'bias-derating-leaves-spec');
    expect(r).toBeDefined();
    const f = r!.figures;
    expect(f.caseSize).toBe('0402');
    // Thresholds of three equal resistors at 5 V: V+/3 and 2V+/3 (Sedra & Smith, single-supply astable).
    expect(f.swingLowV as number).toBeCloseTo(5 / 3, 9);
    expect(f.swingHighV as number).toBeCloseTo(10 / 3, 9);
    expect(f.effectiveFraction as number).toBeLessThan(0.8);
    expect(f.deratedFrequencyHz as number).toBeGreaterThan(1.1 * NOMINAL_FREQUENCY_HZ);
    // Reference: each state's RC charge with the same C(v), integrated in time by odex.
    // Thevenin resistance at N is R_timing (ideal output); the high state heads for 5 V, the low for 0 V.
    const shape = typicalBiasShape(parseDielectric('X7R'), 6.3, '0402');
    const tau = R_TIMING_OHM * C_TIMING_F;
    const high = odexTimeTo({ shape, capacitanceF: tau, i0A: 5, conductanceS: 1 }, 5 / 3, 10 / 3, 10 * tau);
    const low = odexTimeTo({ shape, capacitanceF: tau, i0A: 0, conductanceS: 1 }, 10 / 3, 5 / 3, 10 * tau);
    expect(Math.abs((f.deratedFrequencyHz as number) * (high + low) - 1)).toBeLessThan(1e-6);
  });

  it('a 1206 50 V X7R keeps most of its value: a warning with its figure, inside the spec', () => {
    const r = rule('4n7 50V X7R 10% 1206', 'bias-derating');
    expect(r?.severity).toBe('warning');
    expect(r!.figures.effectiveFraction as number).toBeGreaterThan(0.9);
    expect(r!.figures.deratedFrequencyHz as number).toBeLessThan(1.1 * NOMINAL_FREQUENCY_HZ);
  });

  it('states its assumptions when rating and case are missing', () => {
    const r = rule('4n7 X7R 10%', 'bias-derating') ?? rule('4n7 X7R 10%', 'bias-derating-leaves-spec');
    expect(r!.figures.caseSize).toBe(DEFAULT_CASE_SIZE);
    expect(r!.message).toContain('none stated');
  });

  it('class I and film carry no bias rule', () => {
    expect(rule('4n7 50V C0G 2%', 'bias-derating')).toBeUndefined();
    expect(rule('4n7 50V C0G 2%', 'bias-derating-leaves-spec')).toBeUndefined();
  });
});
