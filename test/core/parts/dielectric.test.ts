import { describe, it, expect } from 'vitest';
import { capacitanceChangeAt, parseDielectric } from '../../../src/core/parts/index.ts';
import { CoreError } from '../../../src/core/errors.ts';

describe('parseDielectric: EIA-198 class II/III codes', () => {
  // EIA-198: low-temperature letter, high-temperature digit, capacitance-change letter.
  const cases: [string, string, number, number, number, number][] = [
    ['X7R', 'ceramic-class-2', -55, 125, 0.15, -0.15],
    ['X5R', 'ceramic-class-2', -55, 85, 0.15, -0.15],
    ['Y5V', 'ceramic-class-3', -30, 85, 0.22, -0.82],
    ['Z5U', 'ceramic-class-3', 10, 85, 0.22, -0.56],
    ['X6S', 'ceramic-class-2', -55, 105, 0.22, -0.22],
    ['X8R', 'ceramic-class-2', -55, 150, 0.15, -0.15],
    ['X7T', 'ceramic-class-2', -55, 125, 0.22, -0.33],
    ['X9M', 'unknown', 0, 0, 0, 0], // M is no change letter
  ];
  for (const [code, family, tMin, tMax, max, min] of cases) {
    if (family === 'unknown') {
      it(`rejects ${code}`, () => expect(() => parseDielectric(code)).toThrow(CoreError));
      continue;
    }
    it(`${code}: ${tMin}..${tMax} °C, +${max * 100}/${min * 100} %`, () => {
      const d = parseDielectric(code);
      expect(d.family).toBe(family);
      expect(d.tempMinC).toBe(tMin);
      expect(d.tempMaxC).toBe(tMax);
      expect(d.changeMaxFraction).toBe(max);
      expect(d.changeMinFraction).toBe(min);
      expect(d.fitForTiming).toBe(false);
    });
  }

  it('is case-insensitive and trims', () => {
    expect(parseDielectric(' x7r ').code).toBe('X7R');
  });
});

describe('parseDielectric: EIA-198 class I codes', () => {
  // EIA-198 class I: significant figure letter, multiplier digit, tolerance letter (ppm/K).
  const cases: [string, string, number, number][] = [
    ['C0G', 'C0G', 0, 30],
    ['NP0', 'C0G', 0, 30],
    ['COG', 'C0G', 0, 30],
    ['U2J', 'U2J', -750, 120],
    ['P2H', 'P2H', -150, 60],
    ['S2H', 'S2H', -330, 60],
    ['R2H', 'R2H', -220, 60],
    ['M7G', 'M7G', 100, 30],
    ['C0H', 'C0H', 0, 60],
  ];
  for (const [input, code, tempco, tol] of cases) {
    it(`${input}: ${tempco} ±${tol} ppm/K`, () => {
      const d = parseDielectric(input);
      expect(d.code).toBe(code);
      expect(d.family).toBe('ceramic-class-1');
      expect(d.tempcoPpmPerK).toBe(tempco);
      expect(Object.is(d.tempcoPpmPerK, -0)).toBe(false);
      expect(d.tempcoTolerancePpmPerK).toBe(tol);
      expect(d.fitForTiming).toBe(true);
    });
  }
});

describe('parseDielectric: technology words (class-typical, from memory)', () => {
  const cases: [string, string, boolean][] = [
    ['PP', 'film', true],
    ['polypropylene', 'film', true],
    ['polyester', 'film', true],
    ['Mylar', 'film', true],
    ['PPS', 'film', true],
    ['PEN', 'film', true],
    ['mica', 'mica', true],
    ['tantalum', 'tantalum', false],
    ['electrolytic', 'electrolytic', false],
    ['aluminium  electrolytic', 'electrolytic', false],
  ];
  for (const [word, family, fit] of cases) {
    it(`${word} -> ${family}, fit for timing: ${fit}`, () => {
      const d = parseDielectric(word);
      expect(d.family).toBe(family);
      expect(d.fitForTiming).toBe(fit);
      expect(d.reason.length).toBeGreaterThan(0);
    });
  }

  it('rejects unknown codes with invalid-value and the pointer', () => {
    for (const bad of ['', 'X7', 'Q7R', 'paper', 'C0Q', 'X1R']) {
      try {
        parseDielectric(bad, '/parts/cTiming/dielectric');
        throw new Error(`accepted ${bad}`);
      } catch (e) {
        expect(e).toBeInstanceOf(CoreError);
        expect((e as CoreError).code).toBe('invalid-value');
        expect((e as CoreError).pointer).toBe('/parts/cTiming/dielectric');
      }
    }
  });
});

describe('capacitanceChangeAt', () => {
  it('class I: (tempco ± tolerance) × (T - 25 °C) (EIA-198 U2J: -750 ±120 ppm/K)', () => {
    const d = parseDielectric('U2J');
    const hot = capacitanceChangeAt(d, 125);
    expect(hot.minFraction).toBeCloseTo((-750 - 120) * 100 * 1e-6, 12);
    expect(hot.maxFraction).toBeCloseTo((-750 + 120) * 100 * 1e-6, 12);
    const cold = capacitanceChangeAt(d, -55);
    // Below 25 °C the sign of dT flips: a negative tempco increases capacitance.
    expect(cold.minFraction).toBeCloseTo((-750 + 120) * -80 * 1e-6, 12);
    expect(cold.maxFraction).toBeCloseTo((-750 - 120) * -80 * 1e-6, 12);
  });

  it('class I at the reference temperature is exactly zero (EIA-198 C0G)', () => {
    const r = capacitanceChangeAt(parseDielectric('C0G'), 25);
    expect(r.minFraction).toBe(0);
    expect(r.maxFraction).toBe(0);
    const hot = capacitanceChangeAt(parseDielectric('C0G'), 85);
    expect(hot.maxFraction).toBeCloseTo(30e-6 * 60, 12);
    expect(hot.minFraction).toBeCloseTo(-30e-6 * 60, 12);
  });

  it('class II: the code band as a bound inside the rated range (EIA-198 X7R ±15 %)', () => {
    const d = parseDielectric('X7R');
    expect(capacitanceChangeAt(d, 100)).toEqual({ minFraction: -0.15, maxFraction: 0.15, withinRatedRange: true });
    expect(capacitanceChangeAt(d, 150).withinRatedRange).toBe(false);
    expect(capacitanceChangeAt(parseDielectric('Y5V'), -40).withinRatedRange).toBe(false);
  });

  it('rejects a non-finite temperature', () => {
    expect(() => capacitanceChangeAt(parseDielectric('X7R'), Number.NaN)).toThrow(CoreError);
  });
});
