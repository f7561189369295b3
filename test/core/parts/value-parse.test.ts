import { describe, it, expect } from 'vitest';
import {
  formatValue,
  parseComponentValue,
  parseEia96Code,
  parseNumericCode,
  parseToleranceLetter,
  type ComponentKind,
} from '../../../src/core/parts/index.ts';
import { CoreError } from '../../../src/core/errors.ts';

function expectInvalid(fn: () => unknown, pointer?: string): void {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(CoreError);
    expect((e as CoreError).code).toBe('invalid-value');
    if (pointer !== undefined) expect((e as CoreError).pointer).toBe(pointer);
    return;
  }
  throw new Error('expected a CoreError');
}

describe('parseComponentValue: SI-prefix forms (SI Brochure prefixes)', () => {
  const cases: [string, ComponentKind, number][] = [
    ['4.7k', 'resistor', 4.7e3],
    ['4.7 k', 'resistor', 4.7e3],
    ['4.7K', 'resistor', 4.7e3],
    ['3.3 kΩ', 'resistor', 3.3e3],
    ['3.3 k\u2126', 'resistor', 3.3e3], // OHM SIGN code point
    ['2.2 Mohm', 'resistor', 2.2e6],
    ['100 ohm', 'resistor', 100],
    ['100 ohms', 'resistor', 100],
    ['1.5 mΩ', 'resistor', 1.5e-3],
    ['4700', 'resistor', 4700],
    ['1e3', 'resistor', 1000],
    ['10 nF', 'capacitor', 1e-8],
    ['10n', 'capacitor', 1e-8],
    ['0.01u', 'capacitor', 1e-8],
    ['0.01\u00B5F', 'capacitor', 1e-8], // MICRO SIGN
    ['0.01\u03BCF', 'capacitor', 1e-8], // GREEK SMALL LETTER MU
    ['47pF', 'capacitor', 4.7e-11],
    ['1e-9', 'capacitor', 1e-9],
    ['100NF', 'capacitor', 1e-7],
    ['.1uF', 'capacitor', 1e-7],
  ];
  for (const [text, kind, expected] of cases) {
    it(`${JSON.stringify(text)} as ${kind} = ${expected}`, () => {
      expect(parseComponentValue(text, kind)).toBe(expected);
    });
  }
});

describe('parseComponentValue: IEC 60062:2016 RKM code examples', () => {
  // IEC 60062:2016, letter-and-digit code: the letter is the decimal marker and multiplier.
  const cases: [string, ComponentKind, number][] = [
    ['4K7', 'resistor', 4.7e3],
    ['4k7', 'resistor', 4.7e3],
    ['R47', 'resistor', 0.47],
    ['1R0', 'resistor', 1],
    ['0R1', 'resistor', 0.1],
    ['47R', 'resistor', 47],
    ['2M2', 'resistor', 2.2e6],
    ['3k3Ω', 'resistor', 3.3e3],
    ['1G0', 'resistor', 1e9],
    ['4n7', 'capacitor', 4.7e-9],
    ['p68', 'capacitor', 0.68e-12],
    ['4u7', 'capacitor', 4.7e-6],
    ['4\u00B57', 'capacitor', 4.7e-6],
    ['2n2F', 'capacitor', 2.2e-9],
  ];
  for (const [text, kind, expected] of cases) {
    it(`${text} = ${expected}`, () => {
      expect(parseComponentValue(text, kind)).toBe(expected);
    });
  }
});

describe('parseComponentValue: numbers and rejections', () => {
  it('passes finite positive numbers through', () => {
    expect(parseComponentValue(1234.5, 'resistor')).toBe(1234.5);
    expect(parseComponentValue(1e-9, 'capacitor')).toBe(1e-9);
  });

  it('rejects non-positive or non-finite numbers with the pointer', () => {
    expectInvalid(() => parseComponentValue(0, 'resistor', '/parts/rTiming'), '/parts/rTiming');
    expectInvalid(() => parseComponentValue(-5, 'resistor'));
    expectInvalid(() => parseComponentValue(Number.NaN, 'capacitor'));
    expectInvalid(() => parseComponentValue(Number.POSITIVE_INFINITY, 'capacitor'));
  });

  const bad: [string, ComponentKind][] = [
    ['4k7k', 'resistor'],
    ['1.2.3', 'resistor'],
    ['', 'resistor'],
    ['   ', 'capacitor'],
    ['k', 'resistor'],
    ['10nF', 'resistor'], // unit mismatch
    ['10n', 'resistor'], // nano is no resistor multiplier
    ['4.7 kΩ', 'capacitor'], // unit mismatch
    ['4k7', 'capacitor'],
    ['1.5m', 'resistor'], // milli without a unit: ambiguous
    ['2M2', 'capacitor'], // mega/micro confusion refused
    ['0', 'resistor'],
    ['0R0', 'resistor'],
    ['-1k', 'resistor'],
    ['4.7 kΩΩ', 'resistor'],
    ['10 xF', 'capacitor'],
    ['R', 'resistor'],
  ];
  for (const [text, kind] of bad) {
    it(`rejects ${JSON.stringify(text)} as ${kind}`, () => {
      expectInvalid(() => parseComponentValue(text, kind, '/x'), '/x');
    });
  }

  it('explains a unit mismatch in the message', () => {
    expect(() => parseComponentValue('10nF', 'resistor')).toThrow(/capacitance/);
  });
});

describe('parseNumericCode: IEC 60062:2016 three/four-digit code', () => {
  // IEC 60062:2016 numeric code: significant figures then the power-of-ten digit;
  // capacitors on a picofarad base.
  const cases: [string, ComponentKind, number][] = [
    ['103', 'resistor', 10e3],
    ['100', 'resistor', 10],
    ['472', 'resistor', 4.7e3],
    ['4702', 'resistor', 47e3],
    ['1001', 'resistor', 1e3],
    ['4R7', 'resistor', 4.7],
    ['R10', 'resistor', 0.1],
    ['104', 'capacitor', 100e-9],
    ['102', 'capacitor', 1e-9],
    ['470', 'capacitor', 47e-12],
    ['1R5', 'capacitor', 1.5e-12],
    ['109', 'capacitor', 1e-12], // multiplier 9 = ×0.1 (common practice, from memory)
  ];
  for (const [text, kind, expected] of cases) {
    it(`${text} on a ${kind} = ${expected}`, () => {
      expect(parseNumericCode(text, kind)).toBe(expected);
    });
  }

  it('rejects malformed codes', () => {
    expectInvalid(() => parseNumericCode('10', 'resistor'));
    expectInvalid(() => parseNumericCode('10000', 'resistor'));
    expectInvalid(() => parseNumericCode('1002', 'capacitor'));
    expectInvalid(() => parseNumericCode('000', 'resistor'));
    expectInvalid(() => parseNumericCode('4k7', 'resistor'));
  });
});

describe('parseEia96Code: EIA-96 / IEC 60062 Annex table examples', () => {
  // EIA-96 marking: code 01..96 is the E96 value index (01 = 100, 24 = 174, 96 = 976),
  // the letter the multiplier.
  const cases: [string, number][] = [
    ['01A', 100],
    ['01C', 10e3],
    ['24C', 17.4e3],
    ['68X', 49.9],
    ['96D', 976e3],
    ['01Z', 0.1],
    ['01Y', 1],
    ['01R', 1],
    ['01S', 10],
    ['01B', 1e3],
    ['01H', 1e3],
    ['01E', 1e6],
    ['01F', 10e6],
    ['44B', 2.8e3],
  ];
  for (const [text, expected] of cases) {
    it(`${text} = ${expected} Ω`, () => {
      expect(parseEia96Code(text)).toBe(expected);
    });
  }

  it('rejects codes outside the table', () => {
    expectInvalid(() => parseEia96Code('00A'));
    expectInvalid(() => parseEia96Code('97A'));
    expectInvalid(() => parseEia96Code('01Q'));
    expectInvalid(() => parseEia96Code('1A'));
  });
});

describe('parseToleranceLetter: IEC 60062:2016 tolerance letters', () => {
  const symmetric: [string, number][] = [
    ['B', 0.001],
    ['C', 0.0025],
    ['D', 0.005],
    ['F', 0.01],
    ['G', 0.02],
    ['J', 0.05],
    ['K', 0.1],
    ['M', 0.2],
  ];
  for (const [letter, fraction] of symmetric) {
    it(`${letter} = ±${fraction * 100} %`, () => {
      const t = parseToleranceLetter(letter);
      expect(t.plusFraction).toBe(fraction);
      expect(t.minusFraction).toBe(fraction);
      expect(t.asymmetric).toBe(false);
    });
  }

  it('Z is +80/-20 % and flagged asymmetric', () => {
    expect(parseToleranceLetter('Z')).toEqual({ letter: 'Z', plusFraction: 0.8, minusFraction: 0.2, asymmetric: true });
  });

  it('rejects unknown letters', () => {
    expectInvalid(() => parseToleranceLetter('X'));
    expectInvalid(() => parseToleranceLetter('KK'));
    expectInvalid(() => parseToleranceLetter(''));
  });
});

describe('formatValue', () => {
  it('round-trips through parseComponentValue', () => {
    const values: [number, ComponentKind][] = [
      [4700, 'resistor'], [100, 'resistor'], [2.2e6, 'resistor'], [0.47, 'resistor'], [17.4e3, 'resistor'],
      [1e-8, 'capacitor'], [4.7e-6, 'capacitor'], [0.68e-12, 'capacitor'], [100e-9, 'capacitor'], [1e-3, 'capacitor'],
    ];
    for (const [v, kind] of values) expect(parseComponentValue(formatValue(v, kind), kind)).toBe(v);
  });

  it('uses SI prefixes with the unit symbol', () => {
    expect(formatValue(4700, 'resistor')).toBe('4.7 kΩ');
    expect(formatValue(1e-8, 'capacitor')).toBe('10 nF');
    expect(formatValue(999.96, 'resistor')).toBe('1 kΩ');
  });
});
