/**
 * One value reader: the EIA three-digit marking code read the same by the API's value reader
 * (parseComponentValue) and the BOM value-text reader. Table: IEC 60062 numeric code for resistors
 * (two significant digits, then the power of ten) and the EIA-198 three-digit capacitor marking on a
 * picofarad base, where the multiplier digits 8 and 9 mean ×0.01 and ×0.1 (rows marked "from memory"
 * are written from memory of those tables, not copied from them).
 */
import { describe, expect, it } from 'vitest';
import { parseBomValueText } from '../../../src/core/parts/bom-value-text.ts';
import { parseComponentValue, type ComponentKind } from '../../../src/core/parts/value-parse.ts';
import { CoreError } from '../../../src/core/errors.ts';

const TABLE: [string, ComponentKind, number, string][] = [
  ['103', 'resistor', 10e3, 'IEC 60062 numeric code'],
  ['100', 'resistor', 10, 'IEC 60062 numeric code'],
  ['221', 'resistor', 220, 'IEC 60062 numeric code'],
  ['474', 'resistor', 470e3, 'IEC 60062 numeric code'],
  ['105', 'resistor', 1e6, 'IEC 60062 numeric code'],
  ['103', 'capacitor', 10e-9, 'EIA-198 marking, pF base'],
  ['104', 'capacitor', 100e-9, 'EIA-198 marking, pF base'],
  ['100', 'capacitor', 10e-12, 'EIA-198 marking, pF base'],
  ['221', 'capacitor', 220e-12, 'EIA-198 marking, pF base'],
  ['475', 'capacitor', 4.7e-6, 'EIA-198 marking, pF base'],
  ['479', 'capacitor', 4.7e-12, 'EIA-198 multiplier 9 = ×0.1 (from memory)'],
  ['158', 'capacitor', 0.15e-12, 'EIA-198 multiplier 8 = ×0.01 (from memory)'],
];

describe('EIA three-digit codes, one reader for the API and the BOM', () => {
  for (const [code, kind, expected, source] of TABLE) {
    it(`${code} as a ${kind} is ${expected} (${source})`, () => {
      expect(parseComponentValue(code, kind) / expected).toBeCloseTo(1, 12);
      const bom = parseBomValueText(code, kind);
      expect(bom.value! / expected).toBeCloseTo(1, 12);
    });
  }

  it('refuses codes with no value or a multiplier resistors do not use, naming the field', () => {
    for (const [code, kind] of [['000', 'resistor'], ['108', 'resistor'], ['009', 'capacitor']] as const) {
      try {
        parseComponentValue(code, kind, '/parts/x');
        throw new Error(`accepted ${code}`);
      } catch (e) {
        expect(e).toBeInstanceOf(CoreError);
        expect((e as CoreError).pointer).toBe('/parts/x');
      }
    }
  });

  it('keeps four-digit strings and numbers in base units (no second meaning)', () => {
    expect(parseComponentValue('4700', 'resistor')).toBe(4700);
    expect(parseComponentValue(103, 'resistor')).toBe(103);
  });
});
