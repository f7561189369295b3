/**
 * The compiled evaluator must give the same numbers as the reference path
 * (closedFormFigures: solveNetwork + solveState + closedFormOscillation) on any
 * circuit, because Monte Carlo, corners and sensitivities all run through it.
 * Random circuits come from fast-check (property-based testing library).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import { closedFormFigures } from '../../../src/core/circuit/analyze.ts';
import { compileClosedForm, EVALUATION_STATUS, OUTPUT_LENGTH, OUTPUT_SLOT } from '../../../src/core/circuit/fast-evaluator.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import { CoreError } from '../../../src/core/errors.ts';

const ideal = findBuiltInAmplifier('ideal')!;
const logUniform = (lo: number, hi: number) => fc.double({ min: Math.log(lo), max: Math.log(hi), noNaN: true }).map(Math.exp);

const amplifierArb = fc.record({
  outputHeadroomHighV: fc.double({ min: 0, max: 1.5, noNaN: true }),
  outputHeadroomLowV: fc.double({ min: 0, max: 1.5, noNaN: true }),
  outputResistanceOhm: fc.oneof(fc.constant(0), logUniform(1, 500)),
  inputOffsetV: fc.double({ min: -0.01, max: 0.01, noNaN: true }),
  inputBiasCurrentA: fc.double({ min: -1e-7, max: 1e-7, noNaN: true }),
});

const circuitArb: fc.Arbitrary<Circuit> = fc
  .record({
    split: fc.boolean(),
    amp: amplifierArb,
    vPos: fc.double({ min: 3, max: 30, noNaN: true }),
    vNeg: fc.double({ min: 3, max: 30, noNaN: true }),
    r: fc.array(logUniform(1e3, 1e6), { minLength: 4, maxLength: 4 }),
    c: logUniform(1e-10, 1e-5),
    load: fc.option(fc.record({ resistanceOhm: logUniform(1e3, 1e5), returnV: fc.double({ min: 0, max: 2, noNaN: true }) }), { nil: undefined }),
  })
  .map(({ split, amp, vPos, vNeg, r, c, load }) => {
    const circuit: Circuit = split
      ? {
          topology: 'two-resistor-feedback',
          supply: { positiveV: vPos, negativeV: -vNeg },
          amplifier: { ...ideal, ...amp },
          parts: { rTiming: r[0], cTiming: c, rFeedback: r[1], rGround: r[2] },
        }
      : {
          topology: 'three-resistor-divider',
          supply: { positiveV: vPos, negativeV: 0 },
          amplifier: { ...ideal, ...amp },
          parts: { rTiming: r[0], cTiming: c, rTop: r[1], rBottom: r[2], rFeedback: r[3] },
        };
    if (load) circuit.load = load;
    return circuit;
  });

function reference(circuit: Circuit) {
  try {
    return closedFormFigures(circuit);
  } catch (err) {
    if (err instanceof CoreError) return undefined;
    throw err;
  }
}

function relErr(a: number, b: number) {
  return Math.abs(a - b) / Math.abs(b);
}

describe('compileClosedForm', () => {
  it('agrees with closedFormFigures to 1e-12 on random circuits and random value sets', () => {
    let compared = 0;
    fc.assert(
      fc.property(circuitArb, fc.array(fc.double({ min: -0.3, max: 0.3, noNaN: true }), { minLength: 16, maxLength: 16 }), (circuit, jitter) => {
        const ref = reference(circuit);
        if (!ref) return; // the nominal circuit latches: compileClosedForm must refuse it as the reference does
        const evaluator = compileClosedForm(circuit);
        expect(evaluator.compiled).toBe(true);
        const out = new Float64Array(OUTPUT_LENGTH);
        expect(evaluator.evaluate(evaluator.nominal, out)).toBe(EVALUATION_STATUS.ok);
        expect(relErr(out[OUTPUT_SLOT.periodS], ref.periodS)).toBeLessThan(1e-12);
        expect(relErr(out[OUTPUT_SLOT.dutyCycle], ref.dutyCycle)).toBeLessThan(1e-12);
        // A perturbed value set (parts, rails, amplifier figures) against the reference on the rebuilt circuit.
        const values = Float64Array.from(evaluator.nominal, (v, i) => (evaluator.parameters[i].name === 'outputResistanceOhm' && v === 0 ? 0 : v * (1 + jitter[i % 16])));
        const status = evaluator.evaluate(values, out);
        const ref2 = reference(evaluator.circuitAt(values));
        if (!ref2) {
          expect(status).not.toBe(EVALUATION_STATUS.ok);
          expect(Number.isNaN(out[0])).toBe(true);
        } else {
          expect(status).toBe(EVALUATION_STATUS.ok);
          expect(relErr(out[OUTPUT_SLOT.periodS], ref2.periodS)).toBeLessThan(1e-12);
          expect(relErr(out[OUTPUT_SLOT.dutyCycle], ref2.dutyCycle)).toBeLessThan(1e-12);
          expect(relErr(out[OUTPUT_SLOT.timeHighS], ref2.timeHighS)).toBeLessThan(1e-12);
          expect(relErr(out[OUTPUT_SLOT.timeLowS], ref2.timeLowS)).toBeLessThan(1e-12);
        }
        compared++;
      }),
      { numRuns: 400, seed: 20240611 },
    );
    expect(compared).toBeGreaterThan(100);
  });

  it('reproduces the textbook split-supply period T = 2RC·ln((1+β)/(1−β))', () => {
    // Sedra & Smith, Microelectronic Circuits, op-amp astable multivibrator: β = R1/(R1+R2).
    const parts = { rTiming: 10e3, cTiming: 10e-9, rFeedback: 20e3, rGround: 10e3 };
    const evaluator = compileClosedForm({ topology: 'two-resistor-feedback', supply: { positiveV: 12, negativeV: -12 }, amplifier: ideal, parts });
    const out = new Float64Array(OUTPUT_LENGTH);
    evaluator.evaluate(evaluator.nominal, out);
    const beta = parts.rGround / (parts.rGround + parts.rFeedback);
    expect(relErr(out[OUTPUT_SLOT.periodS], 2 * parts.rTiming * parts.cTiming * Math.log((1 + beta) / (1 - beta)))).toBeLessThan(1e-12);
    expect(out[OUTPUT_SLOT.dutyCycle]).toBeCloseTo(0.5, 12);
  });

  it('reports non-physical values and latching instead of throwing', () => {
    const evaluator = compileClosedForm({
      topology: 'two-resistor-feedback',
      supply: { positiveV: 5, negativeV: -5 },
      amplifier: ideal,
      parts: { rTiming: 10e3, cTiming: 1e-9, rFeedback: 10e3, rGround: 10e3 },
    });
    const out = new Float64Array(OUTPUT_LENGTH);
    const v = Float64Array.from(evaluator.nominal);
    v[evaluator.indexOf('rTiming')] = -1;
    expect(evaluator.evaluate(v, out)).toBe(EVALUATION_STATUS.invalidValue);
    v[evaluator.indexOf('rTiming')] = 10e3;
    v[evaluator.indexOf('inputOffsetV')] = 10; // offset beyond the thresholds: no hysteresis left
    expect(evaluator.evaluate(v, out)).toBe(EVALUATION_STATUS.latched);
    expect(Number.isNaN(out[OUTPUT_SLOT.periodS])).toBe(true);
  });

  it('validates the circuit once, at compile time, with a pointer', () => {
    expect(() =>
      compileClosedForm({ topology: 'two-resistor-feedback', supply: { positiveV: 5, negativeV: -5 }, amplifier: ideal, parts: { rTiming: 1e3, cTiming: 1e-9, rFeedback: 1e3 } }),
    ).toThrow(expect.objectContaining({ code: 'missing-part', pointer: '/parts/rGround' }));
  });
});

describe('compileClosedForm on a diode-steered circuit with its own diode', () => {
  // Our own scenario: a ±5 V clock whose charge and discharge paths each run through a Schottky-like
  // steering diode, 0.3 V and 2 Ω (invented figures, demo only). The reference is closedFormFigures,
  // the path the compiled evaluator must reproduce (solveNetwork + solveState + closedFormOscillation).
  const circuit: Circuit = {
    topology: 'diode-steered',
    supply: { positiveV: 5, negativeV: -5 },
    amplifier: ideal,
    parts: { rCharge: 10e3, rDischarge: 47e3, cTiming: 10e-9, rFeedback: 20e3, rGround: 10e3 },
    diode: { forwardDropV: 0.3, resistanceOhm: 2 },
  };

  it('uses the circuit’s diode, not the default one, and agrees with closedFormFigures to 1e-12', () => {
    const ref = closedFormFigures(circuit);
    const withDefaultDiode = closedFormFigures({ ...circuit, diode: undefined });
    // The two diodes give clearly different periods, so an evaluator that ignored the diode would fail below.
    expect(relErr(ref.periodS, withDefaultDiode.periodS)).toBeGreaterThan(1e-3);
    const evaluator = compileClosedForm(circuit);
    expect(evaluator.compiled).toBe(true);
    const out = new Float64Array(OUTPUT_LENGTH);
    expect(evaluator.evaluate(evaluator.nominal, out)).toBe(EVALUATION_STATUS.ok);
    expect(relErr(out[OUTPUT_SLOT.periodS], ref.periodS)).toBeLessThan(1e-12);
    expect(relErr(out[OUTPUT_SLOT.dutyCycle], ref.dutyCycle)).toBeLessThan(1e-12);
    expect(relErr(out[OUTPUT_SLOT.timeHighS], ref.timeHighS)).toBeLessThan(1e-12);
    expect(relErr(out[OUTPUT_SLOT.timeLowS], ref.timeLowS)).toBeLessThan(1e-12);
  });

  it('keeps the custom diode when values move (charge resistor +20 %)', () => {
    const evaluator = compileClosedForm(circuit);
    const values = Float64Array.from(evaluator.nominal);
    values[evaluator.indexOf('rCharge')] *= 1.2;
    const out = new Float64Array(OUTPUT_LENGTH);
    expect(evaluator.evaluate(values, out)).toBe(EVALUATION_STATUS.ok);
    const ref = closedFormFigures(evaluator.circuitAt(values));
    expect(evaluator.circuitAt(values).diode).toEqual(circuit.diode);
    expect(relErr(out[OUTPUT_SLOT.periodS], ref.periodS)).toBeLessThan(1e-12);
    expect(relErr(out[OUTPUT_SLOT.dutyCycle], ref.dutyCycle)).toBeLessThan(1e-12);
  });
});
