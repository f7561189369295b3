/**
 * The joint search against an exhaustive search written here: on small value
 * sets every (threshold network, R, C) tuple is analysed with the closed form
 * (the nodal solve, an independent path from the search's screening model) and
 * the smallest frequency error must equal the search's best.
 */
import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import { IDEAL_FIGURES, type AmplifierModel } from '../../../src/core/amplifiers/model.ts';
import { closedFormFigures } from '../../../src/core/circuit/analyze.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import {
  buildValueSet,
  combinedValue,
  hysteresisFromOptions,
  hysteresisNear,
  jointSearch,
  jointSnap,
  screeningContext,
} from '../../../src/core/design/index.ts';
import { seriesValues } from '../../../src/core/parts/series.ts';


const ideal = findBuiltInAmplifier('ideal')!;
/** Our own figures: output resistance, headroom, bias and offset, but no slew/delay (so the closed form is the answer). */
const realStatic: AmplifierModel = {
  ...IDEAL_FIGURES,
  id: 'test-static',
  name: 'static test amplifier',
  technologyClass: 'test',
  description: 'invented for the test',
  figuresBasis: 'caller-supplied',
  outputResistanceOhm: 150,
  outputHeadroomHighV: 0.4,
  outputHeadroomLowV: 0.1,
  inputBiasCurrentA: 30e-9,
  inputOffsetV: 2e-3,
};

function relError(circuit: Circuit, targetHz: number): { error: number; duty: number } | null {
  try {
    const f = closedFormFigures(circuit);
    return { error: Math.abs(f.frequencyHz / targetHz - 1), duty: f.dutyCycle };
  } catch {
    return null;
  }
}

describe('joint snap, split supply, free ratio', () => {
  const supply = { positiveV: 6, negativeV: -6 };
  const timingR = seriesValues('E12', 1e3, 99.9e3);
  const timingC = seriesValues('E6', 1e-9, 99e-9);
  const network = seriesValues('E6', 1e3, 99.9e3);
  const window = { min: 0.2, max: 0.8 };

  function exhaustive(amplifier: AmplifierModel, targetHz: number): number {
    let best = Infinity;
    for (const rFeedback of network) {
      for (const rGround of network) {
        const beta = rGround / (rGround + rFeedback);
        if (beta < window.min || beta > window.max) continue;
        for (const rTiming of timingR) {
          for (const cTiming of timingC) {
            const e = relError({ topology: 'two-resistor-feedback', supply, amplifier, parts: { rFeedback, rGround, rTiming, cTiming } }, targetHz);
            if (e && e.error < best) best = e.error;
          }
        }
      }
    }
    return best;
  }

  function search(amplifier: AmplifierModel, targetHz: number) {
    return jointSnap({
      topology: 'two-resistor-feedback',
      supply,
      amplifier,
      targetFrequencyHz: targetHz,
      values: { resistor: { series: 'E12' }, capacitor: { series: 'E6' }, roles: { rFeedback: { series: 'E6' }, rGround: { series: 'E6' } } },
      ranges: { resistor: { min: 1e3, max: 99.9e3 }, capacitor: { min: 1e-9, max: 99e-9 } },
      hysteresis: { feedbackFractionMin: window.min, feedbackFractionMax: window.max },
      count: 3,
    });
  }

  for (const [label, amplifier] of [['ideal amplifier', ideal], ['output resistance, headroom, bias and offset', realStatic]] as const) {
    for (const targetHz of [777, 3210, 12345]) {
      it(`finds the exhaustive optimum at ${targetHz} Hz (${label})`, () => {
        const best = exhaustive(amplifier, targetHz);
        const result = search(amplifier, targetHz);
        expect(result.candidates.length).toBeGreaterThan(0);
        const found = Math.abs(result.candidates[0].frequencyError);
        expect(Math.abs(found - best)).toBeLessThanOrEqual(1e-12 + 1e-9 * best);
        // Far fewer evaluations than the space holds.
        expect(result.stats.pairsExamined).toBeLessThan(result.stats.exhaustiveTuples);
        // Ranked best first, and every part from its series.
        const errors = result.candidates.map((c) => Math.abs(c.frequencyError));
        expect([...errors].sort((a, b) => a - b)).toEqual(errors);
        const c = result.candidates[0];
        expect(network).toContain(c.parts.rFeedback.value);
        expect(timingR).toContain(c.parts.rTiming.value);
        expect(timingC).toContain(c.parts.cTiming.value);
      });
    }
  }
});

describe('joint search, single-supply divider with a duty target', () => {
  const supply = { positiveV: 5, negativeV: 0 };
  const dividerValues = seriesValues('E3', 1e3, 99e3);
  const timingR = seriesValues('E12', 1e3, 99.9e3);
  const timingC = seriesValues('E6', 1e-9, 99e-9);

  it('finds the exhaustive optimum over every divider triple within the duty tolerance', () => {
    const targetHz = 1500;
    const duty = 0.5;
    const dutyTolerance = 0.05;
    let best = Infinity;
    for (const rTop of dividerValues)
      for (const rBottom of dividerValues)
        for (const rFeedback of dividerValues)
          for (const rTiming of timingR)
            for (const cTiming of timingC) {
              const e = relError({ topology: 'three-resistor-divider', supply, amplifier: ideal, parts: { rTop, rBottom, rFeedback, rTiming, cTiming } }, targetHz);
              if (e && Math.abs(e.duty - duty) <= dutyTolerance && e.error < best) best = e.error;
            }
    const ctx = screeningContext(supply, ideal);
    const set = buildValueSet({ series: 'E3' }, 'resistor', { min: 1e3, max: 99e3 });
    // Neighbours wide enough to take in every value: the search space is every triple, as in the exhaustive loop.
    const hysteresis = hysteresisNear({ topology: 'three-resistor-divider', ideal: { rTop: 10e3, rBottom: 10e3, rFeedback: 10e3 }, sets: { rTop: set, rBottom: set, rFeedback: set }, ctx, neighbours: 10 });
    expect(hysteresis.networksConsidered).toBe(dividerValues.length ** 3);
    const result = jointSearch({
      topology: 'three-resistor-divider',
      supply,
      amplifier: ideal,
      targetFrequencyHz: targetHz,
      targetDutyCycle: duty,
      dutyTolerance,
      hysteresis,
      timing: {
        resistor: buildValueSet({ series: 'E12' }, 'resistor', { min: 1e3, max: 99.9e3 }),
        capacitor: buildValueSet({ series: 'E6' }, 'capacitor', { min: 1e-9, max: 99e-9 }),
        seriesResistanceOhm: 0,
      },
      count: 3,
    });
    expect(Math.abs(Math.abs(result.candidates[0].frequencyError) - best)).toBeLessThanOrEqual(1e-12 + 1e-9 * best);
    for (const c of result.candidates) expect(Math.abs(c.analysis.dutyCycle - duty)).toBeLessThanOrEqual(dutyTolerance);
  });
});

describe('joint search with two-part timing resistors', () => {
  const supply = { positiveV: 6, negativeV: -6 };
  const rValues = seriesValues('E6', 1e3, 99.9e3);
  const cValues = seriesValues('E6', 1e-9, 99e-9);
  const parts = { rFeedback: 10e3, rGround: 10e3 };

  it('finds the exhaustive optimum over singles and every series/parallel pair', () => {
    const targetHz = 2345;
    const options: number[] = [...rValues];
    for (let i = 0; i < rValues.length; i++)
      for (let j = 0; j <= i; j++) options.push(combinedValue('resistor', 'series', rValues[i], rValues[j]), combinedValue('resistor', 'parallel', rValues[i], rValues[j]));
    let best = Infinity;
    for (const rTiming of options)
      for (const cTiming of cValues) {
        const e = relError({ topology: 'two-resistor-feedback', supply, amplifier: ideal, parts: { ...parts, rTiming, cTiming } }, targetHz);
        if (e && e.error < best) best = e.error;
      }
    const ctx = screeningContext(supply, ideal);
    const set = buildValueSet({ series: 'E6' }, 'resistor', { min: 1e3, max: 99.9e3 });
    const near = hysteresisNear({ topology: 'two-resistor-feedback', ideal: parts, sets: { rFeedback: set, rGround: set }, ctx, neighbours: 1 });
    const only = hysteresisFromOptions([near.table.option(0)].filter((o) => o.parts.rFeedback.value === 10e3 && o.parts.rGround.value === 10e3));
    expect(only.table.count).toBe(1);
    const result = jointSearch({
      topology: 'two-resistor-feedback',
      supply,
      amplifier: ideal,
      targetFrequencyHz: targetHz,
      hysteresis: only,
      timing: { resistor: set, capacitor: buildValueSet({ series: 'E6' }, 'capacitor', { min: 1e-9, max: 99e-9 }), combine: 'resistor', seriesResistanceOhm: 0 },
      count: 2,
    });
    const top = result.candidates[0];
    expect(Math.abs(Math.abs(top.frequencyError) - best)).toBeLessThanOrEqual(1e-12 + 1e-9 * best);
    if (top.parts.rTiming.arrangement !== 'single') {
      const [a, b] = top.parts.rTiming.parts.map((p) => p.value);
      expect(top.parts.rTiming.value).toBeCloseTo(combinedValue('resistor', top.parts.rTiming.arrangement, a, b), 9);
    }
  });
});
