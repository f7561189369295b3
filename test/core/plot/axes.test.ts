import { describe, it, expect } from 'vitest';
import { scaleLinear } from 'd3-scale';
import { axisTitle, siTickFormatter } from '../../../src/core/plot/axes.ts';

// Prefix factors from the SI Brochure, 9th edition (BIPM 2019), table 7.
const MICRO = 1e-6;
const MILLI = 1e-3;
const KILO = 1e3;

describe('siTickFormatter', () => {
  it('labels a 0..50 µs axis in µs at the positions d3-scale chose', () => {
    const f = siTickFormatter([0, 50e-6], 's', 6);
    // Reference: d3-scale's own ticks for the same domain and count.
    const d3Ticks = scaleLinear().domain([0, 50e-6]).ticks(6);
    expect(f.ticks).toEqual(d3Ticks);
    expect(f.prefix).toBe('µ');
    expect(f.unitLabel).toBe('µs');
    for (const t of d3Ticks) {
      expect(f.format(t)).toBe(`${Math.round(t / MICRO)} µs`);
    }
    expect(axisTitle(f, 's')).toBe('time (µs)');
  });

  it('uses one prefix for the whole axis, chosen from its larger end', () => {
    // 0..1.2 ms: the 0.2 ms ticks stay in ms rather than switching to 200 µs.
    const f = siTickFormatter([0, 1.2e-3], 's', 6);
    expect(f.unitLabel).toBe('ms');
    const labels = f.ticks.map((t) => f.format(t));
    expect(labels.every((l) => l.endsWith(' ms'))).toBe(true);
    expect(labels).toContain('0.2 ms');
    expect(f.format(1e-3)).toBe(`${(1e-3 / MILLI).toFixed(1)} ms`);
  });

  it('picks mV for a sub-volt axis, V for a few volts and kHz for kilohertz', () => {
    expect(siTickFormatter([0, 0.3], 'V').unitLabel).toBe('mV');
    expect(siTickFormatter([-0.3, 5.3], 'V').unitLabel).toBe('V');
    const hz = siTickFormatter([11_900, 12_700], 'Hz', 8);
    expect(hz.unitLabel).toBe('kHz');
    // d3 gives 100 Hz steps here, so one decimal in kHz tells every tick apart.
    expect(hz.format(12_300)).toBe(`${(12_300 / KILO).toFixed(1)} kHz`);
  });

  it('keeps an exact power of a thousand in the larger prefix (1 ms, not 1000 µs)', () => {
    expect(siTickFormatter([0, 1e-3], 's').unitLabel).toBe('ms');
  });

  it('writes negatives with the minus sign and never shows "-0"', () => {
    const f = siTickFormatter([-2, 2], 'V', 4);
    expect(f.format(-1)).toBe('\u22121 V'); // U+2212 MINUS SIGN, common typographic practice
    expect(f.format(-1e-17)).toBe('0 V');
  });

  it('adds digits for value labels without changing the axis prefix', () => {
    const f = siTickFormatter([0, 5], 'V', 6);
    expect(f.formatPrecise(10 / 3, 3)).toBe('3.33 V');
    const k = siTickFormatter([11_900, 12_700], 'Hz', 8);
    expect(k.formatPrecise(12_345.6, 4)).toBe('12.35 kHz');
  });

  it('leaves dimensionless and percent axes unprefixed', () => {
    const f = siTickFormatter([0, 3000], '', 4);
    expect(f.prefix).toBe('');
    expect(f.format(2000)).toBe('2000');
    expect(siTickFormatter([0, 0.01], '%').prefix).toBe('');
  });
});
