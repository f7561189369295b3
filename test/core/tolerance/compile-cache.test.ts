/**
 * ClosedFormCompileCache must hand out, for every circuit, the evaluator compileClosedForm would:
 * the same value layout, the same figures bit for bit, the same errors. The reference is
 * compileClosedForm itself (and through it closedFormFigures, which fast-evaluator.test.ts checks
 * against the textbook). Random values come from fast-check (property-based testing library).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import { ClosedFormCompileCache, compileClosedForm, EVALUATION_STATUS, OUTPUT_LENGTH, type ClosedFormEvaluator } from '../../../src/core/circuit/fast-evaluator.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';

const ideal = findBuiltInAmplifier('ideal')!;
const logUniform = (lo: number, hi: number) => fc.double({ min: Math.log(lo), max: Math.log(hi), noNaN: true }).map(Math.exp);

/** Figures of an evaluator at its nominal and at values scaled by `factors` (one per parameter, cycled). */
function figures(evaluator: ClosedFormEvaluator, factors: readonly number[]): number[] {
  const out = new Float64Array(OUTPUT_LENGTH);
  const seen: number[] = [];
  seen.push(evaluator.evaluate(evaluator.nominal, out), ...out);
  const values = Float64Array.from(evaluator.nominal, (v, i) => v * factors[i % factors.length]);
  seen.push(evaluator.evaluate(values, out), ...out);
  return seen;
}

/** What compileClosedForm (or the cache) throws for a circuit, as code + pointer + message; undefined when it compiles. */
function refusal(compile: () => unknown): { code: string; pointer?: string; message: string } | undefined {
  try {
    compile();
    return undefined;
  } catch (err) {
    const e = err as { code: string; pointer?: string; message: string };
    return { code: e.code, pointer: e.pointer, message: e.message };
  }
}

const dividerArb = fc.record({
  rTiming: logUniform(1e3, 1e6),
  cTiming: logUniform(1e-10, 1e-6),
  rTop: logUniform(1e3, 1e6),
  rBottom: logUniform(1e3, 1e6),
  rFeedback: logUniform(1e3, 1e6),
});
const factorsArb = fc.array(fc.double({ min: 0.8, max: 1.2, noNaN: true }), { minLength: 12, maxLength: 12 });

describe('ClosedFormCompileCache', () => {
  it('gives the same figures as compileClosedForm, bit for bit, on circuits of one shape with random values', () => {
    const cache = new ClosedFormCompileCache();
    let compared = 0;
    fc.assert(
      fc.property(dividerArb, fc.double({ min: 3, max: 15, noNaN: true }), factorsArb, (parts, vPos, factors) => {
        const circuit: Circuit = { topology: 'three-resistor-divider', supply: { positiveV: vPos, negativeV: 0 }, amplifier: ideal, parts };
        const fresh = refusal(() => compileClosedForm(circuit));
        const cached = refusal(() => cache.compile(circuit));
        expect(cached).toEqual(fresh);
        if (fresh) return;
        const a = compileClosedForm(circuit);
        const b = cache.compile(circuit);
        expect(b.parameters).toEqual(a.parameters);
        expect(Array.from(b.nominal)).toEqual(Array.from(a.nominal));
        // toEqual compares numbers with Object.is: identical bits (NaN = NaN for non-oscillating sets).
        expect(figures(b, factors)).toEqual(figures(a, factors));
        expect(b.circuitAt(b.nominal)).toEqual(a.circuitAt(a.nominal));
        compared++;
      }),
      { numRuns: 300, seed: 20251202 },
    );
    expect(compared).toBeGreaterThan(100);
    expect(cache.reused).toBeGreaterThan(compared); // every circuit after the first came from the cached shape
  });

  it('rebinds a diode-steered shape to a new diode resistance exactly, and recompiles for a new forward drop', () => {
    const cache = new ClosedFormCompileCache();
    // Invented values (demo only): split-rail diode-steered clock, two diodes.
    const base: Circuit = {
      topology: 'diode-steered',
      supply: { positiveV: 5, negativeV: -5 },
      amplifier: ideal,
      parts: { rCharge: 10e3, rDischarge: 47e3, cTiming: 10e-9, rFeedback: 20e3, rGround: 10e3 },
      diode: { forwardDropV: 0.3, resistanceOhm: 2 },
    };
    cache.compile(base);
    const factors = [1.1, 0.9, 1.05, 0.97, 1.02];
    const otherResistance: Circuit = { ...base, parts: { ...base.parts, rCharge: 12e3 }, diode: { forwardDropV: 0.3, resistanceOhm: 7.5 } };
    expect(figures(cache.compile(otherResistance), factors)).toEqual(figures(compileClosedForm(otherResistance), factors));
    expect(cache.reused).toBe(1);
    const otherDrop: Circuit = { ...base, diode: { forwardDropV: 0.65, resistanceOhm: 2 } };
    expect(figures(cache.compile(otherDrop), factors)).toEqual(figures(compileClosedForm(otherDrop), factors));
    expect(cache.reused).toBe(1); // the drop is part of the stamping program: compiled afresh
  });

  it('keeps shapes apart: output resistance, load and present roles each change the structure', () => {
    const cache = new ClosedFormCompileCache();
    const split: Circuit = {
      topology: 'two-resistor-feedback',
      supply: { positiveV: 12, negativeV: -12 },
      amplifier: ideal,
      parts: { rTiming: 10e3, cTiming: 10e-9, rFeedback: 20e3, rGround: 10e3 },
    };
    const variants: Circuit[] = [
      split,
      { ...split, amplifier: { ...ideal, outputResistanceOhm: 75 } },
      { ...split, load: { resistanceOhm: 4.7e3, returnV: 0 } },
      { ...split, topology: 'diode-steered', parts: { rCharge: 10e3, rDischarge: 22e3, cTiming: 10e-9, rFeedback: 20e3, rGround: 10e3 } },
      {
        ...split,
        topology: 'diode-steered',
        supply: { positiveV: 5, negativeV: 0 },
        parts: { rCharge: 10e3, rDischarge: 22e3, cTiming: 10e-9, rFeedback: 20e3, rTop: 33e3, rBottom: 33e3 },
      },
    ];
    const factors = [1.03, 0.98, 1.01];
    for (const circuit of variants) {
      const cached = cache.compile(circuit);
      const fresh = compileClosedForm(circuit);
      expect(cached.parameters).toEqual(fresh.parameters);
      expect(figures(cached, factors)).toEqual(figures(fresh, factors));
    }
    expect(cache.reused).toBe(0);
    // The same shapes again, other values: all reused, still identical.
    for (const circuit of variants) {
      const moved: Circuit = { ...circuit, parts: Object.fromEntries(Object.entries(circuit.parts).map(([k, v]) => [k, v * 1.1])) };
      expect(figures(cache.compile(moved), factors)).toEqual(figures(compileClosedForm(moved), factors));
    }
    expect(cache.reused).toBe(variants.length);
  });

  it('refuses a bad circuit of a cached shape exactly as compileClosedForm does', () => {
    const cache = new ClosedFormCompileCache();
    const good: Circuit = {
      topology: 'two-resistor-feedback',
      supply: { positiveV: 5, negativeV: -5 },
      amplifier: ideal,
      parts: { rTiming: 10e3, cTiming: 1e-9, rFeedback: 10e3, rGround: 10e3 },
    };
    cache.compile(good);
    const bad: Circuit[] = [
      { ...good, parts: { ...good.parts, rTiming: -5 } }, // validation: out of range, with a pointer
      { ...good, supply: { positiveV: -1, negativeV: -5 } }, // validation: ground outside the rails
    ];
    for (const circuit of bad) {
      const fresh = refusal(() => compileClosedForm(circuit));
      expect(fresh).toBeDefined();
      expect(refusal(() => cache.compile(circuit))).toEqual(fresh);
    }
    // An offset beyond the thresholds: it compiles (the reference solve needs no hysteresis) and latches at nominal.
    const latching: Circuit = { ...good, amplifier: { ...ideal, inputOffsetV: 4 } };
    const fresh = compileClosedForm(latching);
    const cached = cache.compile(latching);
    expect(cache.reused).toBe(1);
    const out = new Float64Array(OUTPUT_LENGTH);
    expect(fresh.evaluate(fresh.nominal, out)).toBe(EVALUATION_STATUS.latched);
    expect(cached.evaluate(cached.nominal, out)).toBe(EVALUATION_STATUS.latched);
  });
});
