/**
 * The timing capacitor's insulation resistance (parts/capacitor/insulation.ts: the class's guaranteed minimum,
 * class-typical figures from memory) is checked, not applied: check capacitor-leakage-significant reports the
 * frequency the circuit would run at with that leakage across the capacitor. The figure is checked against
 * the hand derivation for a leaky split-supply astable (Thevenin's theorem and the RC charging law, as in
 * Sedra & Smith's op-amp astable): T = 2·R_th·C·ln((V_th + βV)/(V_th − βV)), V_th = V·R_L/(R + R_L), R_th = R‖R_L.
 */
import { describe, expect, it } from 'vitest';
import { analyzeCircuit, findBuiltInAmplifier, type Circuit } from '../../../src/core/index.ts';
import { INSULATION_SHIFT_WARNING } from '../../../src/core/circuit/strays.ts';
import { resolveCapacitor } from '../../../src/core/parts/capacitor/index.ts';
import { leakyAstablePeriodS } from '../../helpers/leaky-astable.ts';

const ideal = findBuiltInAmplifier('ideal')!;
const V = 10;
const BETA = 1 / 3; // rGround 10 kΩ, rFeedback 20 kΩ

function astable(rTimingOhm: number, capacitor: { value: string; dielectric: string }): Circuit {
  const part = resolveCapacitor(capacitor);
  return {
    topology: 'two-resistor-feedback',
    supply: { positiveV: V, negativeV: -V },
    amplifier: ideal,
    parts: { rTiming: rTimingOhm, cTiming: part.capacitanceF, rGround: 10e3, rFeedback: 20e3 },
    capacitorInsulationOhm: part.insulationResistanceOhm,
  };
}

function leakyPeriodS(rOhm: number, cF: number, leakOhm: number): number {
  return leakyAstablePeriodS({ supplyV: V, beta: BETA, rOhm, cF, leakOhm });
}

describe('check capacitor-leakage-significant', () => {
  it('an aluminium electrolytic of 10 µF behind 470 kΩ: its 10 MΩ class minimum (100 s / C) moves the clock as the leaky-astable law says', () => {
    const circuit = astable(470e3, { value: '10u', dielectric: 'electrolytic' });
    expect(circuit.capacitorInsulationOhm).toBeCloseTo(10e6, 0);
    const r = analyzeCircuit(circuit);
    // The answer itself is the part without leakage (checked, not applied): the plain astable law.
    expect(Math.abs(r.periodS / (2 * 470e3 * 10e-6 * Math.log((1 + BETA) / (1 - BETA))) - 1)).toBeLessThan(1e-12);
    const check = r.checks.find((c) => c.code === 'capacitor-leakage-significant');
    expect(check).toMatchObject({ severity: 'warning', insulationResistanceOhm: circuit.capacitorInsulationOhm });
    const expectedHz = 1 / leakyPeriodS(470e3, 10e-6, circuit.capacitorInsulationOhm!);
    expect(Math.abs((check!.frequencyWithLeakageHz as number) / expectedHz - 1)).toBeLessThan(1e-12);
    expect(Math.abs(check!.frequencyShift as number)).toBeGreaterThan(INSULATION_SHIFT_WARNING);
    expect(check!.message).toMatch(/minimum insulation resistance \(10 MΩ, 25 °C\)/);
  });

  it('leakage that leaves the capacitor short of a threshold is reported as stopping the clock', () => {
    // R = R_L = 10 MΩ: the capacitor heads for V_th = V/2, short of the threshold βV = 2V/3 (rGround 10 kΩ, rFeedback 5 kΩ).
    const circuit = { ...astable(10e6, { value: '10u', dielectric: 'electrolytic' }), parts: { rTiming: 10e6, cTiming: 10e-6, rGround: 10e3, rFeedback: 5e3 } };
    const check = analyzeCircuit(circuit).checks.find((c) => c.code === 'capacitor-leakage-significant');
    expect(check).toMatchObject({ severity: 'warning', frequencyWithLeakageHz: null });
    expect(check!.message).toMatch(/would stop the oscillation/);
  });

  it('a C0G part behind kilohms is screened out (its 10 GΩ is a millionth of the timing conductance): no check', () => {
    const circuit = astable(10e3, { value: '10n', dielectric: 'C0G' });
    expect(circuit.capacitorInsulationOhm).toBe(10e9);
    expect(analyzeCircuit(circuit).checks.some((c) => c.code === 'capacitor-leakage-significant')).toBe(false);
  });

  it('a small shift stays silent: an X7R of 100 nF (5 GΩ) behind 1 MΩ moves the clock by less than the 0.1 % margin', () => {
    const circuit = astable(1e6, { value: '100n', dielectric: 'X7R' });
    const shift = 1 / leakyPeriodS(1e6, circuit.parts.cTiming, circuit.capacitorInsulationOhm!) / analyzeCircuit(circuit).frequencyHz - 1;
    expect(Math.abs(shift)).toBeLessThan(INSULATION_SHIFT_WARNING);
    expect(analyzeCircuit(circuit).checks.some((c) => c.code === 'capacitor-leakage-significant')).toBe(false);
  });
});
