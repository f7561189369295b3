import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { bestCombination, buildValueSet, combinedValue, snapValue } from '../../../src/core/design/index.ts';
import { nearestInSeries } from '../../../src/core/parts/series.ts';
import type { Catalogue } from '../../../src/core/parts/catalogue.ts';

const e24 = (min: number, max: number) => buildValueSet({ series: 'E24' }, 'resistor', { min, max });

describe('snapValue against IEC 60063', () => {
  it('finds the E24 neighbours of 4.6 kΩ: 4.3 kΩ below, 4.7 kΩ above and nearest', () => {
    // IEC 60063 E24 table: ... 3.9, 4.3, 4.7, 5.1 ...
    const s = snapValue(4600, e24(100, 1e6));
    expect(s.lower?.value).toBe(4300);
    expect(s.higher?.value).toBe(4700);
    expect(s.nearest.value).toBe(4700);
    expect(s.nearest.error).toBeCloseTo((4700 - 4600) / 4600, 15);
    expect(s.lower?.error).toBeCloseTo((4300 - 4600) / 4600, 15);
    expect(s.nearest.parts[0].series).toBe('E24');
    // Common practice: E24 parts are 5 % parts unless the caller says otherwise.
    expect(s.nearest.parts[0].tolerance).toBe(0.05);
  });

  it('returns a series value itself with zero error on both sides', () => {
    const s = snapValue(4700, e24(100, 1e6));
    expect([s.lower?.value, s.nearest.value, s.higher?.value]).toEqual([4700, 4700, 4700]);
    expect(s.nearest.error).toBe(0);
  });

  it('agrees with the series neighbour lookup for any value (cross-check of two implementations)', () => {
    const set = buildValueSet({ series: 'E96' }, 'resistor', { min: 1, max: 1e9 });
    fc.assert(
      fc.property(fc.double({ min: 20, max: 5e8, noNaN: true }), (ideal) => {
        const s = snapValue(ideal, set);
        const n = nearestInSeries('E96', ideal);
        expect(s.lower?.value).toBe(n.lower);
        expect(s.higher?.value).toBe(n.higher);
        expect(s.nearest.value).toBe(n.nearest);
      }),
      { numRuns: 300 },
    );
  });

  it('has no lower neighbour below the smallest catalogue value', () => {
    const cat: Catalogue = { id: 'tiny', parts: [{ kind: 'capacitor', value: 1e-9, tolerance: 0.05, partNumber: 'C1', status: 'active' }] };
    const set = buildValueSet({ catalogue: cat }, 'capacitor', { min: 1e-15, max: 1 });
    const s = snapValue(5e-10, set);
    expect(s.lower).toBeNull();
    expect(s.higher?.parts[0].partNumber).toBe('C1');
  });
});

describe('two-part combinations', () => {
  it('adds series resistors and parallel capacitors, and combines the others reciprocally (circuit theory)', () => {
    expect(combinedValue('resistor', 'series', 1000, 2200)).toBe(3200);
    expect(combinedValue('capacitor', 'parallel', 1e-9, 2.2e-9)).toBeCloseTo(3.2e-9, 24);
    expect(combinedValue('resistor', 'parallel', 1000, 1000)).toBe(500);
    expect(combinedValue('capacitor', 'series', 2e-9, 2e-9)).toBeCloseTo(1e-9, 24);
  });

  it('finds the same best pair as a brute force over every pair of a small catalogue', () => {
    // An invented catalogue of our own (values from the E12 table, two decades).
    const values = [1000, 1200, 1500, 1800, 2200, 2700, 3300, 3900, 4700, 5600, 6800, 8200, 10000, 12000, 15000, 18000, 22000];
    const cat: Catalogue = { id: 'mini', parts: values.map((v, i) => ({ kind: 'resistor', value: v, tolerance: 0.01, partNumber: `R${i}`, status: 'active' })) };
    const set = buildValueSet({ catalogue: cat }, 'resistor', { min: 1, max: 1e9 });
    fc.assert(
      fc.property(fc.double({ min: 1500, max: 30000, noNaN: true }), (ideal) => {
        let best = Infinity;
        for (const a of values) {
          for (const b of values) {
            for (const v of [a + b, (a * b) / (a + b)]) best = Math.min(best, Math.abs(v / ideal - 1));
          }
        }
        const combo = bestCombination(ideal, set);
        expect(combo).not.toBeNull();
        expect(Math.abs(combo!.error)).toBeCloseTo(best, 12);
        expect(combo!.parts).toHaveLength(2);
      }),
      { numRuns: 200 },
    );
  });

  it('reports a combination only when it beats the nearest single part', () => {
    const s = snapValue(4700, e24(100, 1e6), true);
    expect(s.combination).toBeNull();
    const t = snapValue(5000, e24(100, 1e6), true);
    expect(t.combination).not.toBeNull();
    expect(Math.abs(t.combination!.error)).toBeLessThan(Math.abs(t.nearest.error));
  });
});

describe('value sets', () => {
  it('keeps designable catalogue parts only, one per value, preferred status first', () => {
    const cat: Catalogue = {
      id: 'c',
      parts: [
        { kind: 'resistor', value: 1000, tolerance: 0.05, partNumber: 'A', status: 'active' },
        { kind: 'resistor', value: 1000, tolerance: 0.01, partNumber: 'B', status: 'preferred' },
        { kind: 'resistor', value: 2000, tolerance: 0.01, partNumber: 'C', status: 'not-for-new-designs' },
      ],
    };
    const set = buildValueSet({ catalogue: cat }, 'resistor', { min: 1, max: 1e6 });
    expect(set.options.map((o) => o.partNumber)).toEqual(['B']);
  });

  it('is infeasible when nothing is left', () => {
    const cat: Catalogue = { id: 'c', parts: [{ kind: 'resistor', value: 1000, tolerance: 0.05, partNumber: 'A', status: 'active' }] };
    expect(() => buildValueSet({ catalogue: cat }, 'capacitor', { min: 1e-12, max: 1 }, { pointer: '/values/capacitor' })).toThrow(
      expect.objectContaining({ code: 'infeasible', pointer: '/values/capacitor' }),
    );
  });
});
