/**
 * The value-text table through the whole BOM line path: each text sits on a
 * BOM line, the role map puts it in a role (which says resistor or capacitor),
 * and the assembly's value-read rule must report what the standards say.
 *
 * Sources:
 * - IEC 60062:2016 "Marking codes for resistors and capacitors": RKM codes
 *   (the multiplier letter stands for the decimal point: 4K7, R47, 2M2, 4n7),
 *   tolerance letters (F ±1 %, G ±2 %, J ±5 %, K ±10 %, M ±20 %), and the numeric
 *   code (significant digits then the power of ten; capacitors on a picofarad base).
 * - EIA-96 marking (EIA-96 code table for 1 % resistors): two digits index the
 *   IEC 60063 E96 series (01 = 100, 24 = 174), then a multiplier letter
 *   (A ×1, B ×10, C ×100).
 */
import { describe, expect, it } from 'vitest';
import { evaluateAssembly, type BomRuleResult } from '../../../src/core/index.ts';
import { context, withLine } from './fixtures.ts';

interface Row {
  text: string;
  role: 'rTiming' | 'cTiming';
  value: number;
  tolerance?: number;
  source: string;
}

const rows: Row[] = [
  // IEC 60062 RKM codes
  { text: '4K7', role: 'rTiming', value: 4700, source: 'IEC 60062 RKM' },
  { text: 'R47', role: 'rTiming', value: 0.47, source: 'IEC 60062 RKM' },
  { text: '2M2', role: 'rTiming', value: 2.2e6, source: 'IEC 60062 RKM' },
  { text: '4n7', role: 'cTiming', value: 4.7e-9, source: 'IEC 60062 RKM' },
  // IEC 60062 tolerance letters
  { text: '4K7 F', role: 'rTiming', value: 4700, tolerance: 0.01, source: 'IEC 60062 letter F = ±1 %' },
  { text: '4K7 G', role: 'rTiming', value: 4700, tolerance: 0.02, source: 'IEC 60062 letter G = ±2 %' },
  { text: '4K7 J', role: 'rTiming', value: 4700, tolerance: 0.05, source: 'IEC 60062 letter J = ±5 %' },
  { text: '103 K', role: 'cTiming', value: 10e-9, tolerance: 0.1, source: 'IEC 60062 letter K = ±10 %' },
  { text: '104 M', role: 'cTiming', value: 100e-9, tolerance: 0.2, source: 'IEC 60062 letter M = ±20 %' },
  // IEC 60062 numeric codes
  { text: '103', role: 'rTiming', value: 10e3, source: 'IEC 60062 3-digit code: 10 × 10^3 Ω' },
  { text: '4702', role: 'rTiming', value: 47e3, source: 'IEC 60062 4-digit code: 470 × 10^2 Ω' },
  { text: '104', role: 'cTiming', value: 100e-9, source: 'IEC 60062 3-digit code on a capacitor: 10 × 10^4 pF' },
  { text: '100', role: 'rTiming', value: 10, source: 'IEC 60062 3-digit code: 10 × 10^0 Ω' },
  // EIA-96 (1 % parts, so the code also implies ±1 %: common practice)
  { text: '01A', role: 'rTiming', value: 100, tolerance: 0.01, source: 'EIA-96: E96 index 01 = 100, A = ×1' },
  { text: '01C', role: 'rTiming', value: 10e3, tolerance: 0.01, source: 'EIA-96: E96 index 01 = 100, C = ×100' },
  { text: '24C', role: 'rTiming', value: 17.4e3, tolerance: 0.01, source: 'EIA-96: E96 index 24 = 174, C = ×100' },
  // The owner's examples of BOM text
  { text: '3K3 1% 0603', role: 'rTiming', value: 3.3e3, tolerance: 0.01, source: 'IEC 60062 RKM + percent tolerance' },
  { text: '10nF 50V C0G 5%', role: 'cTiming', value: 10e-9, tolerance: 0.05, source: 'SI prefix + EIA-198 class I code' },
  { text: '4u7/16V X5R', role: 'cTiming', value: 4.7e-6, source: 'IEC 60062 RKM with µ as u' },
];

function valueRead(rules: BomRuleResult[], refdes: string): BomRuleResult | undefined {
  return rules.find((r) => r.code === 'value-read' && r.refdes === refdes);
}

describe('BOM value text, line by line through an assembly', () => {
  for (const row of rows) {
    it(`${JSON.stringify(row.text)} as ${row.role} = ${row.value} (${row.source})`, () => {
      const refdes = row.role === 'rTiming' ? 'R1' : 'C1';
      const result = evaluateAssembly(withLine(refdes, { value: row.text }), 0, context());
      const read = valueRead(result.rules, refdes);
      expect(read, JSON.stringify(result.rules)).toBeDefined();
      // Values are built by decimal conversion: they equal the literal exactly.
      expect(read!.figures.value).toBe(row.value);
      expect(read!.figures.kind).toBe(row.role === 'rTiming' ? 'resistor' : 'capacitor');
      if (row.tolerance !== undefined) expect(read!.figures.tolerance).toBe(row.tolerance);
      expect(read!.understood!.length).toBeGreaterThan(0);
      expect(result.rules.some((r) => r.code === 'value-unreadable')).toBe(false);
    });
  }

  it('reports an unreadable value instead of guessing ("47" on a capacitor: pF or µF?)', () => {
    const result = evaluateAssembly(withLine('C1', { value: '47' }), 0, context());
    const rule = result.rules.find((r) => r.code === 'value-unreadable');
    expect(rule?.refdes).toBe('C1');
    expect(rule?.severity).toBe('error');
    expect(result.pass).toBe(false);
  });

  it('reads attributes the value column leaves out from the description, never the value', () => {
    const result = evaluateAssembly(withLine('C1', { value: '4n7', description: 'CAP CER 100nF-class 50V C0G 5% 0603' }), 0, context());
    const read = valueRead(result.rules, 'C1')!;
    expect(read.figures.value).toBe(4.7e-9);
    expect(read.figures.dielectric).toBe('C0G');
    expect(read.figures.ratedVoltageV).toBe(50);
    expect(read.figures.tolerance).toBe(0.05);
    expect(read.figures.toleranceSource).toBe('description');
  });
});
