import { describe, it, expect } from 'vitest';
import { parseBomValueText, type ComponentKind } from '../../../src/core/parts/index.ts';

interface Case {
  text: string;
  kind?: ComponentKind;
  expected: {
    kind?: ComponentKind;
    value?: number;
    tolerance?: number;
    ratedVoltageV?: number;
    dielectric?: string;
    tempcoPpmPerK?: number;
    packageCode?: string;
    unparsed?: string[];
  };
}

// Values by IEC 60062:2016 (RKM letters, numeric code, tolerance letters), SI prefixes,
// EIA-198 dielectric codes; package codes are the imperial chip sizes (common practice).
const cases: Case[] = [
  { text: '3K3 1% 0603', kind: 'resistor', expected: { value: 3.3e3, tolerance: 0.01, packageCode: '0603', unparsed: [] } },
  {
    text: '10nF 50V C0G 5%',
    kind: 'capacitor',
    expected: { value: 1e-8, ratedVoltageV: 50, dielectric: 'C0G', tolerance: 0.05, unparsed: [] },
  },
  { text: '4u7/16V X5R', kind: 'capacitor', expected: { value: 4.7e-6, ratedVoltageV: 16, dielectric: 'X5R', unparsed: [] } },
  { text: '103 K', kind: 'capacitor', expected: { value: 10e-9, tolerance: 0.1, unparsed: [] } },
  { text: '103 K', kind: 'resistor', expected: { value: 10e3, tolerance: 0.1, unparsed: [] } },
  { text: '10k 0.1% 25ppm', kind: 'resistor', expected: { value: 10e3, tolerance: 0.001, tempcoPpmPerK: 25, unparsed: [] } },
  {
    text: '22uF 25V electrolytic',
    kind: 'capacitor',
    expected: { value: 22e-6, ratedVoltageV: 25, dielectric: 'ELECTROLYTIC', unparsed: [] },
  },
  {
    text: '100n X7R 0402 10%',
    kind: 'capacitor',
    expected: { value: 100e-9, dielectric: 'X7R', packageCode: '0402', tolerance: 0.1, unparsed: [] },
  },
  { text: '104M', kind: 'capacitor', expected: { value: 100e-9, tolerance: 0.2, unparsed: [] } },
  { text: '4.7 kΩ ±1 %', kind: 'resistor', expected: { value: 4.7e3, tolerance: 0.01, unparsed: [] } },
  { text: '10 nF +/-5% 100 V', kind: 'capacitor', expected: { value: 1e-8, tolerance: 0.05, ratedVoltageV: 100, unparsed: [] } },
  { text: '100nF +80/-20% Y5V', kind: 'capacitor', expected: { value: 1e-7, tolerance: 0.8, dielectric: 'Y5V', unparsed: [] } },
  { text: '47R 5% 1206', kind: 'resistor', expected: { value: 47, tolerance: 0.05, packageCode: '1206', unparsed: [] } },
  { text: '4702 0.1% 25 ppm/K', kind: 'resistor', expected: { value: 47e3, tolerance: 0.001, tempcoPpmPerK: 25, unparsed: [] } },
  { text: '1n0 6V3 NP0', kind: 'capacitor', expected: { value: 1e-9, ratedVoltageV: 6.3, dielectric: 'C0G', unparsed: [] } },
  { text: '220p N750', kind: 'capacitor', expected: { value: 220e-12, tempcoPpmPerK: -750, unparsed: [] } },
  {
    text: '1uF 63V aluminium electrolytic radial',
    kind: 'capacitor',
    expected: { value: 1e-6, ratedVoltageV: 63, dielectric: 'ELECTROLYTIC', packageCode: 'RADIAL', unparsed: [] },
  },
  { text: '4k7 1% thick film', kind: 'resistor', expected: { value: 4.7e3, tolerance: 0.01, unparsed: ['thick', 'film'] } },
  { text: '4700', kind: 'resistor', expected: { value: undefined, unparsed: ['4700'] } },
  { text: '47', kind: 'capacitor', expected: { value: undefined, unparsed: ['47'] } },
  { text: '10nF 5% 10%', kind: 'capacitor', expected: { value: 1e-8, tolerance: 0.05, unparsed: ['10%'] } },
  // no kind given: settled by the units
  { text: '10nF 50V', expected: { kind: 'capacitor', value: 1e-8, ratedVoltageV: 50, unparsed: [] } },
  { text: '2k2 1%', expected: { kind: 'resistor', value: 2.2e3, tolerance: 0.01, unparsed: [] } },
  { text: '103', expected: { kind: undefined, value: undefined, unparsed: ['103'] } },
];

describe('parseBomValueText', () => {
  for (const c of cases) {
    it(`${JSON.stringify(c.text)} (${c.kind ?? 'kind not given'})`, () => {
      const r = parseBomValueText(c.text, c.kind);
      const e = c.expected;
      if ('kind' in e || c.kind) expect(r.kind).toBe('kind' in e ? e.kind : c.kind);
      // Values are built by decimal conversion, so they equal the literal exactly.
      expect(r.value).toBe(e.value);
      expect(r.tolerance).toBe(e.tolerance);
      expect(r.ratedVoltageV).toBe(e.ratedVoltageV);
      expect(r.dielectric?.code).toBe(e.dielectric);
      expect(r.tempcoPpmPerK).toBe(e.tempcoPpmPerK);
      expect(r.packageCode).toBe(e.packageCode);
      if (e.unparsed) expect(r.unparsed).toEqual(e.unparsed);
    });
  }

  it('describes what it recognised in words', () => {
    const r = parseBomValueText('3K3 1% 0603', 'resistor');
    expect(r.understood).toHaveLength(3);
    expect(r.understood.join(' | ')).toMatch(/3\.3 kΩ/);
    expect(r.resistanceOhm).toBe(3300);
    expect(r.capacitanceF).toBeUndefined();
  });

  it('keeps the asymmetric band of +80/-20 %', () => {
    const r = parseBomValueText('100nF +80/-20% Y5V', 'capacitor');
    expect(r.toleranceBand).toEqual({ plusFraction: 0.8, minusFraction: 0.2, asymmetric: true });
  });

  it('explains an ambiguous 4-digit resistor number', () => {
    const r = parseBomValueText('4700', 'resistor');
    expect(r.notes.join(' ')).toMatch(/ambiguous/);
  });

  it('does not take a dielectric for a resistor', () => {
    const r = parseBomValueText('10k X7R', 'resistor');
    expect(r.dielectric).toBeUndefined();
    expect(r.unparsed).toEqual(['X7R']);
  });

  it('returns empty results for empty text', () => {
    const r = parseBomValueText('', 'resistor');
    expect(r.value).toBeUndefined();
    expect(r.unparsed).toEqual([]);
  });
});

describe('parseBomValueText: dielectric words read the same every time', () => {
  // Dielectric codes by EIA-198 (C0G, X7R); "aluminium electrolytic" is a BOM word mapped by
  // parts/dielectric.ts. The dielectric lookup remembers tokens it has seen: a second reading must
  // give the same answer, and each reading its own object.
  const texts: [string, ComponentKind | undefined, string | undefined][] = [
    ['10nF 50V C0G 5%', 'capacitor', 'C0G'],
    ['100n X7R 0402 10%', 'capacitor', 'X7R'],
    ['47uF 25V aluminium electrolytic', 'capacitor', 'ELECTROLYTIC'],
    ['4n7 X7R', undefined, 'X7R'], // kind inferred: the dielectric word says capacitor
    ['10nF 50V 5%', 'capacitor', undefined],
  ];
  it('gives equal readings on repeat, and a fresh dielectric object per reading', () => {
    for (const [text, kind, code] of texts) {
      const first = parseBomValueText(text, kind);
      const second = parseBomValueText(text, kind);
      expect(second).toEqual(first);
      expect(first.dielectric?.code).toBe(code);
      if (code === undefined) continue;
      expect(first.kind).toBe('capacitor');
      expect(second.dielectric).not.toBe(first.dielectric);
      first.dielectric!.code = 'changed by a caller';
      expect(parseBomValueText(text, kind).dielectric?.code).toBe(code);
    }
  });
});
