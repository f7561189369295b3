import { describe, it, expect } from 'vitest';
import { parseCaptureCsv } from '../../../src/core/fit/capture/csv.ts';
import { mapChannels } from '../../../src/core/fit/capture/channel-map.ts';
import { CoreError } from '../../../src/core/errors.ts';

/*
 * Each variant below is a small export written for this test in the common
 * shapes oscilloscope CSV files take (metadata lines, header rows, unit rows,
 * separators, decimal commas); values are our own. Expected numbers follow
 * from the literal text and the SI prefixes (BIPM SI brochure: m = 1e-3,
 * u/µ = 1e-6).
 */

function codeOf(fn: () => unknown): string | undefined {
  try {
    fn();
  } catch (e) {
    return e instanceof CoreError ? e.code : 'not-a-core-error';
  }
  return undefined;
}

describe('parseCaptureCsv variants', () => {
  it('plain header TIME,CH1,CH2 with scientific notation', () => {
    const csv = 'TIME,CH1,CH2\n-1.0E-06,0.02,1.5\n0.0E+00,4.98,1.52\n1.0E-06,5.01,1.55\n';
    const r = parseCaptureCsv(csv);
    expect(Array.from(r.timeS!)).toEqual([-1e-6, 0, 1e-6]);
    expect(r.channels.map((c) => c.name)).toEqual(['CH1', 'CH2']);
    expect(Array.from(r.channels[1].values)).toEqual([1.5, 1.52, 1.55]);
    expect(r.sampleIntervalS).toBeUndefined();
  });

  it('metadata key,value lines before a header, no time column', () => {
    const csv = 'Model,Bench scope\nSample Interval,2e-6\nRecord Length,4\n\nCH1,CH2\n0.1,2\n0.2,2.1\n4.9,2.2\n5.0,2.1\n';
    const r = parseCaptureCsv(csv);
    expect(r.sampleIntervalS).toBe(2e-6);
    expect(r.timeS).toBeUndefined();
    expect(r.channels.map((c) => c.name)).toEqual(['CH1', 'CH2']);
    expect(r.channels[0].values.length).toBe(4);
    expect(r.notes.some((n) => n.includes('Record Length = 4'))).toBe(true);
  });

  it('units in the header with SI prefixes, semicolons, decimal comma, CRLF', () => {
    const csv = 'Time (us);Output (V);Capacitor (mV)\r\n0,0;0,10;2500\r\n0,5;4,95;2510,5\r\n1,0;5,02;2521\r\n\r\n\r\n';
    const r = parseCaptureCsv(csv);
    expect(Array.from(r.timeS!)).toEqual([0, 0.5e-6, 1e-6]);
    expect(r.channels.map((c) => [c.name, c.unit])).toEqual([
      ['Output', 'V'],
      ['Capacitor', 'V'],
    ]);
    expect(r.channels[0].values[1]).toBeCloseTo(4.95, 12);
    expect(r.channels[1].values[1]).toBeCloseTo(2.5105, 12);
  });

  it('"x-axis,1,2" names followed by a units row, tab separated', () => {
    const csv = 'x-axis\t1\t2\nsecond\tVolt\tVolt\n-2.0e-04\t-0.04\t1.0\n-1.9e-04\t4.9\t1.1\n-1.8e-04\t5.0\t1.2\n';
    const r = parseCaptureCsv(csv);
    expect(r.timeS![0]).toBe(-2e-4);
    expect(r.channels.map((c) => [c.name, c.unit])).toEqual([
      ['1', 'V'],
      ['2', 'V'],
    ]);
    const m = mapChannels(r.channels);
    expect(m.output?.name).toBe('1');
    expect(m.capacitor?.name).toBe('2');
  });

  it('metadata carried in the leading columns of the data rows', () => {
    const csv =
      'Record Length,4,,-1.0e-05,0.1\n' + 'Sample Interval,5.0e-06,,-5.0e-06,0.2\n' + 'Trigger Point,2,,0.0e+00,4.8\n' + ',,,5.0e-06,4.9\n';
    const r = parseCaptureCsv(csv);
    expect(r.sampleIntervalS).toBe(5e-6);
    // no header: first numeric column increases evenly -> time
    expect(Array.from(r.timeS!)).toEqual([-1e-5, -5e-6, 0, 5e-6]);
    expect(r.channels.length).toBe(1);
    expect(Array.from(r.channels[0].values)).toEqual([0.1, 0.2, 4.8, 4.9]);
  });

  it('sample interval given in a unit, one data column', () => {
    const csv = 'Sample Interval (us),0.5\nCH1 [mV]\n100\n4900\n5000\n';
    const r = parseCaptureCsv(csv);
    expect(r.sampleIntervalS).toBeCloseTo(0.5e-6, 18);
    expect(r.channels[0].unit).toBe('V');
    expect(Array.from(r.channels[0].values)).toEqual([0.1, 4.9, 5]);
  });

  it('a footer after the data is dropped with a note', () => {
    const r = parseCaptureCsv('Time,Out\n0,0\n1e-6,5\n2e-6,0\nEnd of record\n');
    expect(r.channels[0].values.length).toBe(3);
    expect(r.notes.some((n) => n.includes('line 5'))).toBe(true);
  });

  it('a rare unreadable row inside a long record with a time column is dropped', () => {
    const rows = ['Time,Out'];
    for (let i = 0; i < 3000; i++) rows.push(i === 1500 ? '1.5e-3,###' : `${i * 1e-6},${i % 2}`);
    const r = parseCaptureCsv(rows.join('\n'));
    expect(r.channels[0].values.length).toBe(2999);
    expect(r.notes.some((n) => n.includes('line 1502'))).toBe(true);
  });
});

describe('parseCaptureCsv rejects unreadable files with the line and the reason', () => {
  it('a bad value inside a short record', () => {
    const csv = 'TIME,CH1\n0,1\n1e-6,abc\n2e-6,3\n3e-6,4\n';
    expect(codeOf(() => parseCaptureCsv(csv))).toBe('bad-capture');
    expect(() => parseCaptureCsv(csv)).toThrowError(/line 3: field 2 "abc" is not a number/);
  });

  it('a missing field', () => {
    const csv = 'TIME,CH1,CH2\n0,1,2\n1e-6,2\n2e-6,3,4\n3e-6,4,5\n';
    expect(() => parseCaptureCsv(csv)).toThrowError(/line 3: expected at least 3 fields, found 2/);
  });

  it('without a time column any dropped row would shift the timing', () => {
    const csv = 'Sample Interval,1e-6\nCH1\n1\n2\nx\n3\n4\n';
    expect(() => parseCaptureCsv(csv)).toThrowError(/line 5: .*no time column/);
  });

  it('no numbers at all, and an empty file', () => {
    expect(codeOf(() => parseCaptureCsv('hello,world\nfoo,bar\n'))).toBe('bad-capture');
    expect(codeOf(() => parseCaptureCsv('\n\n'))).toBe('bad-capture');
  });
});

describe('mapChannels', () => {
  const ch = (name: string) => ({ name, values: new Float64Array(2) });

  it('by name hints', () => {
    const m = mapChannels([ch('Capacitor'), ch('Output')]);
    expect(m.output?.name).toBe('Output');
    expect(m.capacitor?.name).toBe('Capacitor');
  });

  it('by scope channel number', () => {
    const m = mapChannels([ch('CH2'), ch('CH1'), ch('CH3')]);
    expect(m.output?.name).toBe('CH1');
    expect(m.capacitor?.name).toBe('CH2');
  });

  it('explicit names win, unknown names are reported', () => {
    const m = mapChannels([ch('CH1'), ch('CH2')], { output: 'ch2', capacitor: 'CH1' });
    expect(m.output?.name).toBe('CH2');
    expect(m.capacitor?.name).toBe('CH1');
    expect(codeOf(() => mapChannels([ch('CH1')], { output: 'Vout' }))).toBe('unknown-reference');
  });

  it('ambiguous channels need names', () => {
    expect(codeOf(() => mapChannels([ch('A'), ch('B'), ch('C')]))).toBe('bad-capture');
  });
});
