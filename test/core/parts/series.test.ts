import { describe, it, expect } from 'vitest';
import {
  SERIES_NAMES,
  isInSeries,
  nearestInSeries,
  seriesMantissas,
  seriesTolerance,
  seriesValues,
  type SeriesName,
} from '../../../src/core/parts/index.ts';
import { CoreError } from '../../../src/core/errors.ts';

// Tables of IEC 60063:2015 typed out literally (values of one decade).
const IEC_E3 = [1.0, 2.2, 4.7];
const IEC_E6 = [1.0, 1.5, 2.2, 3.3, 4.7, 6.8];
const IEC_E12 = [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2];
const IEC_E24 = [
  1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1,
];
const IEC_E48 = [
  1.0, 1.05, 1.1, 1.15, 1.21, 1.27, 1.33, 1.4, 1.47, 1.54, 1.62, 1.69, 1.78, 1.87, 1.96, 2.05, 2.15, 2.26, 2.37, 2.49,
  2.61, 2.74, 2.87, 3.01, 3.16, 3.32, 3.48, 3.65, 3.83, 4.02, 4.22, 4.42, 4.64, 4.87, 5.11, 5.36, 5.62, 5.9, 6.19, 6.49,
  6.81, 7.15, 7.5, 7.87, 8.25, 8.66, 9.09, 9.53,
];
const IEC_E96 = [
  1.0, 1.02, 1.05, 1.07, 1.1, 1.13, 1.15, 1.18, 1.21, 1.24, 1.27, 1.3, 1.33, 1.37, 1.4, 1.43, 1.47, 1.5, 1.54, 1.58,
  1.62, 1.65, 1.69, 1.74, 1.78, 1.82, 1.87, 1.91, 1.96, 2.0, 2.05, 2.1, 2.15, 2.21, 2.26, 2.32, 2.37, 2.43, 2.49, 2.55,
  2.61, 2.67, 2.74, 2.8, 2.87, 2.94, 3.01, 3.09, 3.16, 3.24, 3.32, 3.4, 3.48, 3.57, 3.65, 3.74, 3.83, 3.92, 4.02, 4.12,
  4.22, 4.32, 4.42, 4.53, 4.64, 4.75, 4.87, 4.99, 5.11, 5.23, 5.36, 5.49, 5.62, 5.76, 5.9, 6.04, 6.19, 6.34, 6.49, 6.65,
  6.81, 6.98, 7.15, 7.32, 7.5, 7.68, 7.87, 8.06, 8.25, 8.45, 8.66, 8.87, 9.09, 9.31, 9.53, 9.76,
];
const IEC_E192 = [
  1.0, 1.01, 1.02, 1.04, 1.05, 1.06, 1.07, 1.09, 1.1, 1.11, 1.13, 1.14, 1.15, 1.17, 1.18, 1.2, 1.21, 1.23, 1.24, 1.26,
  1.27, 1.29, 1.3, 1.32, 1.33, 1.35, 1.37, 1.38, 1.4, 1.42, 1.43, 1.45, 1.47, 1.49, 1.5, 1.52, 1.54, 1.56, 1.58, 1.6,
  1.62, 1.64, 1.65, 1.67, 1.69, 1.72, 1.74, 1.76, 1.78, 1.8, 1.82, 1.84, 1.87, 1.89, 1.91, 1.93, 1.96, 1.98, 2.0, 2.03,
  2.05, 2.08, 2.1, 2.13, 2.15, 2.18, 2.21, 2.23, 2.26, 2.29, 2.32, 2.34, 2.37, 2.4, 2.43, 2.46, 2.49, 2.52, 2.55, 2.58,
  2.61, 2.64, 2.67, 2.71, 2.74, 2.77, 2.8, 2.84, 2.87, 2.91, 2.94, 2.98, 3.01, 3.05, 3.09, 3.12, 3.16, 3.2, 3.24, 3.28,
  3.32, 3.36, 3.4, 3.44, 3.48, 3.52, 3.57, 3.61, 3.65, 3.7, 3.74, 3.79, 3.83, 3.88, 3.92, 3.97, 4.02, 4.07, 4.12, 4.17,
  4.22, 4.27, 4.32, 4.37, 4.42, 4.48, 4.53, 4.59, 4.64, 4.7, 4.75, 4.81, 4.87, 4.93, 4.99, 5.05, 5.11, 5.17, 5.23, 5.3,
  5.36, 5.42, 5.49, 5.56, 5.62, 5.69, 5.76, 5.83, 5.9, 5.97, 6.04, 6.12, 6.19, 6.26, 6.34, 6.42, 6.49, 6.57, 6.65, 6.73,
  6.81, 6.9, 6.98, 7.06, 7.15, 7.23, 7.32, 7.41, 7.5, 7.59, 7.68, 7.77, 7.87, 7.96, 8.06, 8.16, 8.25, 8.35, 8.45, 8.56,
  8.66, 8.76, 8.87, 8.98, 9.09, 9.2, 9.31, 9.42, 9.53, 9.65, 9.76, 9.88,
];

const IEC_TABLES: Record<SeriesName, number[]> = {
  E3: IEC_E3, E6: IEC_E6, E12: IEC_E12, E24: IEC_E24, E48: IEC_E48, E96: IEC_E96, E192: IEC_E192,
};

function everySecond(xs: readonly number[]): number[] {
  return xs.filter((_, i) => i % 2 === 0);
}

describe('IEC 60063:2015 series tables', () => {
  for (const name of SERIES_NAMES) {
    it(`${name} equals the published table value by value`, () => {
      const expected = IEC_TABLES[name];
      expect(expected.length).toBe(Number(name.slice(1)));
      expect([...seriesMantissas(name)]).toEqual(expected);
    });
  }

  it('E192 keeps the published exception 9.20 (the formula would give 9.19)', () => {
    // IEC 60063:2015, E192 table; 10^(185/192) = 9.1948
    expect(seriesMantissas('E192')[185]).toBe(9.2);
    expect(seriesMantissas('E192')).not.toContain(9.19);
  });

  it('E96 is every second E192 value and E48 every second E96 value (IEC 60063:2015 construction)', () => {
    expect([...seriesMantissas('E96')]).toEqual(everySecond(IEC_E192));
    expect([...seriesMantissas('E48')]).toEqual(everySecond(IEC_E96));
  });

  it('E24 contains E12 contains E6 contains E3 (IEC 60063:2015 tables above)', () => {
    const chain: SeriesName[] = ['E3', 'E6', 'E12', 'E24'];
    for (let i = 0; i + 1 < chain.length; i++) {
      const coarse = seriesMantissas(chain[i]);
      const fine = seriesMantissas(chain[i + 1]);
      for (const v of coarse) expect(fine).toContain(v);
    }
    expect([...seriesMantissas('E12')]).toEqual(everySecond(IEC_E24));
  });
});

describe('seriesValues', () => {
  it('lists decade multiples exactly, without float noise (IEC 60063:2015 E12)', () => {
    const values = seriesValues('E12', 1000, 10000);
    const expected = [...IEC_E12.map((m) => Math.round(m * 10) * 100), 10000];
    expect(values).toEqual(expected);
    expect(values).toContain(4700);
    expect(values).toContain(3300);
  });

  it('lists small values as the nearest doubles of their decimals (IEC 60063:2015 E24)', () => {
    const values = seriesValues('E24', 1e-9, 9.99e-9);
    expect(values.map((v) => Number((v * 1e9).toPrecision(3)))).toEqual(IEC_E24);
    expect(values).toContain(4.7e-9);
    expect(values).toContain(3.3e-9);
  });

  it('is inclusive at both ends and ascending', () => {
    const values = seriesValues('E6', 2.2, 47);
    expect(values[0]).toBe(2.2);
    expect(values[values.length - 1]).toBe(47);
    for (let i = 1; i < values.length; i++) expect(values[i]).toBeGreaterThan(values[i - 1]);
  });

  it('rejects bad ranges', () => {
    expect(() => seriesValues('E12', 0, 10)).toThrow(CoreError);
    expect(() => seriesValues('E12', 100, 10)).toThrow(CoreError);
    expect(() => seriesValues('E99' as SeriesName, 1, 10)).toThrow(CoreError);
  });
});

describe('nearestInSeries', () => {
  it('brackets a value between E12 neighbours (IEC 60063:2015 E12: 3.9, 4.7)', () => {
    const r = nearestInSeries('E12', 4200);
    expect(r.lower).toBe(3900);
    expect(r.higher).toBe(4700);
    expect(r.nearest).toBe(3900);
    expect(r.errorLower).toBeCloseTo((3900 - 4200) / 4200, 12);
    expect(r.errorHigher).toBeCloseTo((4700 - 4200) / 4200, 12);
    expect(r.errorNearest).toBe(r.errorLower);
  });

  it('crosses decade boundaries (IEC 60063:2015 E24: 9.1 then 10)', () => {
    const r = nearestInSeries('E24', 9.6e3);
    expect(r.lower).toBe(9100);
    expect(r.higher).toBe(10000);
    expect(r.nearest).toBe(10000);
  });

  it('returns the value itself when it is in the series, also after float noise', () => {
    const r = nearestInSeries('E24', 4.7e3);
    expect([r.lower, r.nearest, r.higher]).toEqual([4700, 4700, 4700]);
    expect(r.errorNearest).toBe(0);
    expect(nearestInSeries('E12', 0.1 * 3 * 11000).nearest).toBe(3300);
  });

  it('isInSeries uses the E192 exception (IEC 60063:2015)', () => {
    expect(isInSeries('E192', 920)).toBe(true);
    expect(isInSeries('E192', 919)).toBe(false);
    expect(isInSeries('E24', 2.7e-6)).toBe(true);
    expect(isInSeries('E24', 2.8e-6)).toBe(false);
    expect(isInSeries('E96', 1.74e4)).toBe(true);
  });
});

describe('seriesTolerance (common practice)', () => {
  it('gives the tolerance usually sold with each series', () => {
    // common practice: E6 20 %, E12 10 %, E24 5 %, E48 2 %, E96 1 %, E192 0.5 %
    const expected: Record<SeriesName, number> = { E3: 0.2, E6: 0.2, E12: 0.1, E24: 0.05, E48: 0.02, E96: 0.01, E192: 0.005 };
    for (const name of SERIES_NAMES) expect(seriesTolerance(name)).toBe(expected[name]);
  });
});
