/**
 * The amplifier figure table is the single description of the figures: the
 * ideal part, the built-in archetypes, the validation and the JSON Schema the
 * HTTP layer derives from it must agree with it. The schema side is checked with
 * an outside validator (ajv, JSON Schema 2020-12) against the core validation.
 */
import Ajv2020Module from 'ajv/dist/2020.js';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  AMPLIFIER_FIGURE_NAMES,
  AMPLIFIER_FIGURE_TABLE,
  BUILT_IN_AMPLIFIERS,
  AMPLIFIER_PARAMETERS,
  FITTED_FIGURES,
  fitWindow,
  hasDynamicLimits,
  IDEAL_FIGURES,
  NUMBER_FIGURE_NAMES,
  resolveAmplifier,
  TOLERANCE_FIGURES,
  UNLIMITED_FIGURES,
  validateFigures,
  WALK_FIGURES,
  type AmplifierFigures,
  type NumberFigure,
} from '../../../src/core/index.ts';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import { prepareModel } from '../../../src/core/circuit/analyze.ts';
import { buildParameters } from '../../../src/core/fit/estimate/parameters.ts';
import { figureValueInRange } from '../../../src/core/amplifiers/validate-figures.ts';
import { amplifierFigureSchema } from '../../../src/http/schemas/common.ts';
import { refusal } from '../../helpers/core-error.ts';

const Ajv2020 = (Ajv2020Module as unknown as { default: typeof Ajv2020Module.default }).default ?? Ajv2020Module;

describe('amplifier figure table', () => {
  it('gives the ideal part and every built-in archetype a valid figure set', () => {
    expect(() => validateFigures(IDEAL_FIGURES, '')).not.toThrow();
    for (const amp of BUILT_IN_AMPLIFIERS) expect(() => validateFigures(amp, `/${amp.id}`), amp.id).not.toThrow();
    // Every figure of the model is a table entry and nothing else (identity fields aside).
    const identity = ['id', 'name', 'technologyClass', 'description', 'figuresBasis'];
    for (const amp of BUILT_IN_AMPLIFIERS) expect(Object.keys(amp).filter((k) => !identity.includes(k)).sort()).toEqual([...AMPLIFIER_FIGURE_NAMES].sort());
  });

  it('ideal part: the textbook amplifier (rails reached, no limits, instant, no input errors)', () => {
    // Sedra & Smith's ideal op-amp used as a comparator: output at the rails, no slew limit, no delay.
    expect(IDEAL_FIGURES).toMatchObject({ outputHeadroomHighV: 0, outputHeadroomLowV: 0, outputResistanceOhm: 0, slewRateVPerS: Infinity, recoveryDelayS: 0 });
    expect(hasDynamicLimits(IDEAL_FIGURES)).toBe(false);
    expect(hasDynamicLimits({ ...IDEAL_FIGURES, slewRateVPerS: 1e6 })).toBe(true);
    expect(hasDynamicLimits({ ...IDEAL_FIGURES, recoveryDelayS: 1e-6 })).toBe(true);
    expect(hasDynamicLimits({ ...IDEAL_FIGURES, outputResistanceOhm: 10 })).toBe(false);
  });

  it('refuses the degenerate values of issue 10 by range, naming the figure', () => {
    for (const [name, value] of [
      ['slewRateVPerS', 1e-300],
      ['recoveryDelayS', 1e300],
      ['outputResistanceOhm', 5e-324],
      ['outputCurrentLimitA', 1e-300],
      ['differentialClampV', 5e-324],
      ['inputBiasCurrentA', 1e300],
      ['inputOffsetV', Number.NaN],
      ['recoveryDelayS', Infinity],
    ] as const) {
      const err = refusal(() => resolveAmplifier({ base: 'cmos-rrio-fast', [name]: value }, findBuiltInAmplifier, '/circuit/amplifier'));
      expect(err.code, name).toBe('invalid-value');
      expect(err.pointer).toBe(`/circuit/amplifier/${name}`);
    }
  });

  it('refuses in-range figures that together leave no output swing or no common-mode range', () => {
    const swing = refusal(() => validateFigures({ ...IDEAL_FIGURES, supplyMaxV: 5, outputHeadroomHighV: 3, outputHeadroomLowV: 2 }, ''));
    expect(swing.pointer).toBe('/outputHeadroomHighV');
    const cm = refusal(() => validateFigures({ ...IDEAL_FIGURES, supplyMaxV: 5, inputCommonModeLowMarginV: 3, inputCommonModeHighMarginV: 2 }, ''));
    expect(cm.pointer).toBe('/inputCommonModeHighMarginV');
    const order = refusal(() => validateFigures({ ...IDEAL_FIGURES, supplyMinV: 6, supplyMaxV: 5 }, ''));
    expect(order.pointer).toBe('/supplyMaxV');
    // An open-drain output's high level is the pull-up's: its high headroom does not count.
    expect(() => validateFigures({ ...IDEAL_FIGURES, outputStage: 'open-drain', supplyMaxV: 5, outputHeadroomHighV: 6, outputHeadroomLowV: 0.2 }, '')).not.toThrow();
  });

  it('the JSON Schema of each figure accepts exactly what the core accepts (ajv as the outside reference)', () => {
    const ajv = new Ajv2020({ strict: false });
    for (const name of NUMBER_FIGURE_NAMES) {
      const d = AMPLIFIER_FIGURE_TABLE[name] as NumberFigure;
      const validate = ajv.compile(amplifierFigureSchema(name) as object);
      const unlimited = d.unlimited?.value;
      const edges = [d.min, d.max, -d.min, -d.max, 0, 5e-324, -5e-324, d.min * (1 - 1e-12), d.max * (1 + 1e-12), d.min / 2, 1e308, -1e308];
      fc.assert(
        fc.property(fc.oneof(fc.constantFrom(...edges), fc.double({ noNaN: true, noDefaultInfinity: true })), (v) => {
          // The wire form: a finite number, or null for the unlimited value. The one documented
          // difference: "0 or min..max" figures admit (0, min) in the schema; the core refuses the gap.
          const inGap = d.zeroAllowed === true && v > 0 && v < d.min;
          expect(validate(v), `${name} ${v}`).toBe(figureValueInRange(d, v) || inGap);
        }),
        { seed: 11, numRuns: 300 },
      );
      expect(validate(null), `${name} null`).toBe(unlimited !== undefined);
    }
  });

  it('derives the wire null table, the tolerance list and the fit list from the entries', () => {
    expect(UNLIMITED_FIGURES.map((u) => u.name).sort()).toEqual(
      ['supplyMaxV', 'outputCurrentLimitA', 'slewRateVPerS', 'inputCommonModeLowMarginV', 'inputCommonModeHighMarginV', 'differentialClampV', 'inputBiasDoublingK'].sort(),
    );
    expect(UNLIMITED_FIGURES.find((u) => u.name === 'inputCommonModeLowMarginV')!.value).toBe(-Infinity);
    expect(TOLERANCE_FIGURES).toEqual(['outputHeadroomHighV', 'outputHeadroomLowV', 'outputResistanceOhm', 'slewRateVPerS', 'recoveryDelayS', 'inputBiasCurrentA', 'inputOffsetV']);
    // The fit's amplifier parameters, in the order its answers list them.
    expect(FITTED_FIGURES.map((f) => f.fit.parameter)).toEqual(['outputHighV', 'outputLowV', 'slewRateVPerS', 'recoveryDelayS', 'outputResistanceOhm', 'inputOffsetV', 'inputBiasCurrentA']);
    expect(FITTED_FIGURES.map((f) => f.fit.order)).toEqual(FITTED_FIGURES.map((_, i) => i));
  });

  it("the walk's parameter vector takes its amplifier figures from the table, in slot order", () => {
    const slots = NUMBER_FIGURE_NAMES.flatMap((n) => {
      const walk = (AMPLIFIER_FIGURE_TABLE[n] as NumberFigure).walk;
      return walk ? [{ n, slot: walk.slot }] : [];
    });
    // Slots are 0..n−1, each once; the vector lists the figures by slot.
    expect(slots.map((s) => s.slot).sort((a, b) => a - b)).toEqual(slots.map((_, i) => i));
    expect(AMPLIFIER_PARAMETERS).toEqual([...slots].sort((a, b) => a.slot - b.slot).map((s) => s.n));
    expect(WALK_FIGURES).toEqual(AMPLIFIER_PARAMETERS);
    // The order answers list sensitivities and corner values in (vector order) is the one before the list was derived.
    expect(AMPLIFIER_PARAMETERS).toEqual([
      'outputHeadroomHighV',
      'outputHeadroomLowV',
      'outputResistanceOhm',
      'inputOffsetV',
      'inputBiasCurrentA',
      'slewRateVPerS',
      'recoveryDelayS',
      'outputCurrentLimitA',
      'differentialClampV',
      'internalHysteresisV',
      'overdriveDelayChargeVS',
      'inputCapacitanceF',
    ]);
    // Every time-domain figure the walk needs is in the vector.
    for (const n of NUMBER_FIGURE_NAMES) if ((AMPLIFIER_FIGURE_TABLE[n] as NumberFigure).timeDomain) expect(AMPLIFIER_PARAMETERS, n).toContain(n);
    const prepared = prepareModel({
      topology: 'two-resistor-feedback',
      supply: { positiveV: 5, negativeV: -5 },
      amplifier: findBuiltInAmplifier('cmos-rrio-fast')!,
      parts: { rTiming: 10e3, cTiming: 10e-9, rFeedback: 20e3, rGround: 10e3 },
    });
    expect(prepared.parameters.filter((p) => p.kind === 'amplifier').map((p) => p.name)).toEqual(AMPLIFIER_PARAMETERS);
  });

  it("the fit's amplifier parameters and windows follow the table (windows checked against the fit's own rules written out)", () => {
    const supply = { positiveV: 12, negativeV: 0 };
    const amplifier = findBuiltInAmplifier('bipolar-single-supply-general')!;
    const fitted = buildParameters({ topology: 'two-resistor-feedback', supply, amplifier, parts: { rTiming: 10e3, cTiming: 10e-9, rFeedback: 100e3, rGround: 100e3 } }).filter(
      (p) => p.kind === 'amplifier',
    );
    expect(fitted.map((p) => p.name)).toEqual(FITTED_FIGURES.map((f) => f.fit.parameter));
    // The windows as the fit documents them (fit/estimate/parameters.ts): levels from the rail to 4 × headroom + 0.5 V
    // inside it, a factor of five either side, delay 0 to 5 × typical, offset ±(5|x| + 2 mV), bias ±(5|x| + 10 nA).
    const h = amplifier.outputHeadroomHighV;
    const l = amplifier.outputHeadroomLowV;
    const expected: Record<string, [number, number, number]> = {
      outputHighV: [12 - h, 12 - (4 * h + 0.5), 12],
      outputLowV: [l, 0, 4 * l + 0.5],
      slewRateVPerS: [amplifier.slewRateVPerS, amplifier.slewRateVPerS / 5, amplifier.slewRateVPerS * 5],
      recoveryDelayS: [amplifier.recoveryDelayS, 0, 5 * amplifier.recoveryDelayS],
      outputResistanceOhm: [amplifier.outputResistanceOhm, amplifier.outputResistanceOhm / 5, amplifier.outputResistanceOhm * 5],
      inputOffsetV: [amplifier.inputOffsetV, -(Math.abs(amplifier.inputOffsetV) * 5 + 2e-3), Math.abs(amplifier.inputOffsetV) * 5 + 2e-3],
      inputBiasCurrentA: [amplifier.inputBiasCurrentA, -(Math.abs(amplifier.inputBiasCurrentA) * 5 + 10e-9), Math.abs(amplifier.inputBiasCurrentA) * 5 + 10e-9],
    };
    for (const p of fitted) expect([p.nominal, p.lo, p.hi], p.name).toEqual(expected[p.name]);
    for (const f of FITTED_FIGURES) {
      const w = fitWindow(f.fit.window, amplifier[f.figure], supply);
      expect([w.nominal, w.lo, w.hi], f.figure).toEqual(expected[f.fit.parameter]);
    }
    // Open drain: the high level belongs to the pull-up, and the delay is a propagation delay.
    const comparator = findBuiltInAmplifier('comparator-open-drain-bipolar')!;
    const od = buildParameters({
      topology: 'open-drain-pullup',
      supply,
      amplifier: comparator,
      parts: { rTiming: 10e3, cTiming: 10e-9, rPullup: 4.7e3, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 },
    }).filter((p) => p.kind === 'amplifier');
    expect(od.map((p) => p.name)).not.toContain('outputHighV');
    expect(od.find((p) => p.name === 'recoveryDelayS')?.label).toBe('propagation delay');
  });

  it('an inline amplifier takes omitted figures from its base, others from the ideal part', () => {
    const base = findBuiltInAmplifier('bipolar-single-supply-general')!;
    const m = resolveAmplifier({ base: base.id, slewRateVPerS: 2e6 }, findBuiltInAmplifier);
    for (const name of AMPLIFIER_FIGURE_NAMES) expect(m[name], name).toBe(name === 'slewRateVPerS' ? 2e6 : base[name]);
    const bare = resolveAmplifier({ recoveryDelayS: 1e-6 } as Partial<AmplifierFigures>, findBuiltInAmplifier);
    for (const name of AMPLIFIER_FIGURE_NAMES) expect(bare[name], name).toBe(name === 'recoveryDelayS' ? 1e-6 : IDEAL_FIGURES[name]);
  });
});
