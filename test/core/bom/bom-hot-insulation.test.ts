/**
 * A BOM check weighs the timing capacitor's insulation at the assembly's hottest temperature: catalogues state
 * the class minimum at 25 °C, and ceramics lose about a decade of it per 100 K of heating (class-typical, from
 * memory: parts/capacitor/insulation.ts). The frequency the check reports is checked against the hand
 * derivation for a leaky split-supply astable (test/helpers/leaky-astable.ts: Thevenin's theorem and the RC
 * charging law, as in Sedra & Smith's op-amp astable).
 * Scenario of our own (invented values): a 0.45 Hz heartbeat blinker in an under-bonnet module, −40 to 125 °C,
 * 10 MΩ and a 100 nF C0G part, hysteresis from two equal 100 kΩ resistors (β = 1/2).
 */
import { describe, expect, it } from 'vitest';
import { evaluateAssembly, type BomAssembly } from '../../../src/core/index.ts';
import { insulationResistanceOhm } from '../../../src/core/parts/capacitor/index.ts';
import { parseDielectric } from '../../../src/core/parts/index.ts';
import { leakyAstablePeriodS } from '../../helpers/leaky-astable.ts';
import { context } from './fixtures.ts';

const V = 5;
const BETA = 0.5;
const R_OHM = 10e6;
const C_F = 100e-9;
const LEAKAGE_CODE = 'capacitor-leakage-significant';

function leakyPeriodS(leakOhm: number): number {
  return leakyAstablePeriodS({ supplyV: V, beta: BETA, rOhm: R_OHM, cF: C_F, leakOhm });
}

/** The blinker without leakage: the plain astable law. */
const PLAIN_PERIOD_S = leakyPeriodS(Infinity);

function blinker(temperature: BomAssembly['temperature']): BomAssembly {
  return {
    id: 'bonnet-heartbeat',
    lines: [
      { refdes: 'R1', value: '10M 1% 0603' },
      { refdes: 'C1', value: '100n 50V C0G 2%' },
      { refdes: 'R2 R3', value: '100K 1% 0603' },
    ],
    roles: { rTiming: 'R1', cTiming: 'C1', rFeedback: 'R2', rGround: 'R3' },
    topology: 'two-resistor-feedback',
    amplifier: 'ideal',
    supply: { positiveV: V, negativeV: -V, tolerance: 0 },
    ...(temperature ? { temperature } : {}),
    spec: { frequencyHz: 1 / PLAIN_PERIOD_S, frequencyTolerance: 0.1 },
  };
}

describe('BOM checks: the timing capacitor insulation at the hottest end of the range', () => {
  it('at 25 °C the C0G class minimum (10 GΩ) moves the blinker by ~0.02 %: no warning', () => {
    const r = evaluateAssembly(blinker(undefined), 0, context());
    expect(r.rules.some((x) => x.code === LEAKAGE_CODE)).toBe(false);
    // The same silence the hand law gives: |shift| far below the 0.1 % margin.
    expect(Math.abs(leakyPeriodS(10e9) / PLAIN_PERIOD_S - 1)).toBeLessThan(0.0005);
  });

  it('at 125 °C (a decade less, 1 GΩ) it moves it by ~0.2 %: warned, with the leaky-astable frequency and the temperature', () => {
    const r = evaluateAssembly(blinker({ minC: -40, maxC: 125 }), 0, context());
    const rule = r.rules.find((x) => x.code === LEAKAGE_CODE);
    expect(rule, JSON.stringify(r.rules.map((x) => x.code))).toBeDefined();
    const insulationOhm = insulationResistanceOhm(parseDielectric('C0G'), C_F, 125);
    expect(insulationOhm).toBeCloseTo(1e9, -3);
    expect(rule!.figures.insulationResistanceOhm).toBe(insulationOhm);
    expect(rule!.figures.insulationTemperatureC).toBe(125);
    expect(Math.abs(Number(rule!.figures.frequencyWithLeakageHz) * leakyPeriodS(insulationOhm) - 1)).toBeLessThan(1e-9);
    expect(Math.abs(Number(rule!.figures.frequencyShift))).toBeGreaterThan(0.001);
    expect(rule!.message).toMatch(/\(1 GΩ, 125 °C\)/);
  });

  it('a range that stays cool keeps the 25 °C figure (the model never raises insulation above it)', () => {
    const r = evaluateAssembly(blinker({ minC: -40, maxC: 20 }), 0, context());
    expect(r.rules.some((x) => x.code === LEAKAGE_CODE)).toBe(false);
  });
});
