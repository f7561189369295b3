/**
 * Checks that fire before the failure, each with its code, figures and a hint, against hand figures
 * (Ohm's law, ½CV²) and the textbook astable result T = 2·ln2·RC for three equal divider resistors
 * (DESIGN.md §5; Sedra & Smith, op-amp astable multivibrator).
 */
import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import type { AmplifierModel } from '../../../src/core/amplifiers/model.ts';
import { analyzeCircuit } from '../../../src/core/circuit/analyze.ts';
import { CHECK_CODES } from '../../../src/core/circuit/checks.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';

const ideal = findBuiltInAmplifier('ideal')!;
// Our own scenario: a 5 V tick for a keypad scanner, three equal 30 kΩ divider resistors.
function circuit(amplifier: AmplifierModel, parts: Partial<Record<string, number>> = {}, supply = { positiveV: 5, negativeV: 0 }): Circuit {
  return { topology: 'three-resistor-divider', supply, amplifier, parts: { rTiming: 10e3, cTiming: 47e-9, rTop: 30e3, rBottom: 30e3, rFeedback: 30e3, ...parts } as Record<string, number> };
}
const codeOf = (c: Circuit, code: string) => analyzeCircuit(c).checks.find((k) => k.code === code);

describe('early-warning checks', () => {
  it('warns above half the output current limit and not below it (hand: (V+ − V+/3)/R at the switching instant)', () => {
    // At the low-to-high switch the capacitor sits at V+/3: the timing branch draws (5 − 5/3)/10 kΩ = 0.333 mA,
    // the feedback resistor (5 − P)/30 kΩ with P at 2V+/3 after the switch: 0.0556 mA (hand calculation).
    const peakA = (5 - 5 / 3) / 10e3 + (5 - 10 / 3) / 30e3;
    const near = codeOf(circuit({ ...ideal, outputCurrentLimitA: peakA / 0.6 }), CHECK_CODES.outputCurrentHigh);
    expect(near?.severity).toBe('warning');
    expect(near?.fractionOfLimit as number).toBeCloseTo(0.6, 3);
    expect(typeof near?.hint).toBe('string');
    expect(codeOf(circuit({ ...ideal, outputCurrentLimitA: peakA / 0.4 }), CHECK_CODES.outputCurrentHigh)).toBeUndefined();
  });

  it('warns when the output resistance exceeds 1 % of the timing resistance', () => {
    const c = codeOf(circuit({ ...ideal, outputResistanceOhm: 250 }), CHECK_CODES.outputResistanceSetsTiming);
    expect(c?.severity).toBe('warning');
    // Thevenin resistance at N (hand): rTiming + r0 ∥ (rFeedback + rTop ∥ rBottom) = 10 kΩ + 250 ∥ 45 kΩ.
    const r0Parallel = (250 * 45e3) / (250 + 45e3);
    expect(c?.fractionOfTimingResistance as number).toBeCloseTo(250 / (10e3 + r0Parallel), 9);
    expect(codeOf(circuit({ ...ideal, outputResistanceOhm: 50 }), CHECK_CODES.outputResistanceSetsTiming)).toBeUndefined();
  });

  it('reports clamp conduction with the frequency shift against the same circuit without the clamp (textbook 2·ln2·RC)', () => {
    // Inputs differ by up to V+/3 = 1.67 V at each switch: a 0.7 V clamp conducts every cycle.
    const check = codeOf(circuit({ ...ideal, differentialClampV: 0.7 }), CHECK_CODES.clampConducts);
    expect(check).toBeDefined();
    const withoutHz = check!.frequencyWithoutClampHz as number;
    expect(withoutHz).toBeCloseTo(1 / (2 * Math.LN2 * 10e3 * 47e-9), 6);
    const withHz = analyzeCircuit(circuit({ ...ideal, differentialClampV: 0.7 })).frequencyHz;
    expect(check!.frequencyShift as number).toBeCloseTo(withHz / withoutHz - 1, 12);
    expect(Math.abs(check!.frequencyShift as number)).toBeGreaterThan(0.001);
    expect(check!.severity).toBe('warning');
  });

  it('sizes the stored-energy caution on the larger rail magnitude, not the span (½CV², ground-referenced capacitor)', () => {
    const c = codeOf(circuit(ideal, { cTiming: 2.2e-3, rTiming: 1e3 }, { positiveV: 40, negativeV: -40 }), CHECK_CODES.storedEnergy);
    expect(c?.severity).toBe('caution');
    expect(c?.energyJ as number).toBeCloseTo(0.5 * 2.2e-3 * 40 * 40, 9); // 1.76 J, not the 7.04 J of the 80 V span
    expect(c?.capacitorReachV).toBe(40);
  });

  it('gives an open-drain output no source current', () => {
    const od = { ...findBuiltInAmplifier('ideal')!, outputStage: 'open-drain' as const };
    const a = analyzeCircuit({ topology: 'open-drain-pullup', supply: { positiveV: 5, negativeV: 0 }, amplifier: od, parts: { rPullup: 2.2e3, rTiming: 47e3, cTiming: 10e-9, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 } });
    expect(a.currents.outputPeakSourceA).toBe(0);
    expect(a.currents.outputPeakSinkA).toBeGreaterThan(0);
  });
});
