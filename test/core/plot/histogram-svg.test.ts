import { describe, it, expect } from 'vitest';
import { CoreError } from '../../../src/core/errors.ts';
import { binValues, renderHistogramSvg } from '../../../src/core/plot/histogram-svg.ts';
import type { HistogramPlotInput } from '../../../src/core/plot/histogram-svg.ts';
import { readAxis } from './axis-readout.ts';
import { demoFrequencies } from './demo-signals.ts';
import { allTexts, byClass, parseXml, textOf } from './svg-tree.ts';

// Invented Monte Carlo result: 4000 runs around 12.3 kHz.
const samples = demoFrequencies(4000, 12_300, 90);
const bins = binValues(samples, 30);
const baseInput: HistogramPlotInput = {
  bins,
  unit: 'Hz',
  title: 'Frequency spread, 4000 runs',
  subtitle: 'demo tolerances',
  specLimits: { low: 12_000, high: 12_600 },
  markers: [
    { label: 'p1', value: 12_090 },
    { label: 'p50', value: 12_300 },
    { label: 'p99', value: 12_510 },
  ],
};

/** Bar tops from the step outline "M x,y V y H x V y H x ... V y Z": [left x, top y, right x] per bin. */
function barTops(d: string): { leftPx: number; topPx: number; rightPx: number }[] {
  const start = /^M(-?[\d.]+),(-?[\d.]+)/.exec(d)!;
  let x = Number(start[1]);
  const out: { leftPx: number; topPx: number; rightPx: number }[] = [];
  for (const m of d.matchAll(/V(-?[\d.]+)H(-?[\d.]+)/g)) {
    out.push({ leftPx: x, topPx: Number(m[1]), rightPx: Number(m[2]) });
    x = Number(m[2]);
  }
  return out;
}

describe('renderHistogramSvg', () => {
  const svg = renderHistogramSvg(baseInput);
  const root = parseXml(svg); // throws on malformed XML (XML 1.0 well-formedness)

  it('is a standalone SVG document with a white background', () => {
    expect(root.attrs.xmlns).toBe('http://www.w3.org/2000/svg');
    expect(root.attrs.viewBox).toBe(`0 0 ${root.attrs.width} ${root.attrs.height}`);
    expect(root.attrs['font-family']).toBe('sans-serif');
    expect(byClass(root, 'background')[0].attrs.fill).toBe('#ffffff');
  });

  it('shows the title and a legend for bars, limits and markers', () => {
    expect(byClass(root, 'plot-title').map(textOf)).toEqual([baseInput.title]);
    const legend = byClass(root, 'legend-item').flatMap(allTexts);
    expect(legend).toEqual(['samples per bin (total 4000)', 'spec limit', 'marker']);
  });

  it('labels the frequency axis in kHz and counts in whole numbers, ticks where the labels say', () => {
    const x = readAxis(root, 'axis-x', 'Hz');
    expect(x.labels.every((l) => l.endsWith(' kHz'))).toBe(true);
    expect(x.worstTickMisfitPx).toBeLessThan(0.15);
    const y = readAxis(root, 'axis-left', '');
    expect(y.values.every((v) => Number.isInteger(v))).toBe(true);
    expect(y.worstTickMisfitPx).toBeLessThan(0.15);
    expect(allTexts(root)).toEqual(expect.arrayContaining(['frequency (kHz)', 'count']));
  });

  it('draws every bar from its edges up to its count', () => {
    const x = readAxis(root, 'axis-x', 'Hz');
    const y = readAxis(root, 'axis-left', '');
    const tops = barTops(byClass(root, 'bars')[0].attrs.d);
    expect(tops).toHaveLength(bins.counts.length);
    tops.forEach((bar, i) => {
      expect(Math.abs(bar.leftPx - x.toPx(bins.edges[i]))).toBeLessThan(0.15);
      expect(Math.abs(bar.rightPx - x.toPx(bins.edges[i + 1]))).toBeLessThan(0.15);
      expect(Math.abs(bar.topPx - y.toPx(bins.counts[i]))).toBeLessThan(0.15);
    });
  });

  it('draws spec limits as solid red vertical lines and markers as dashed ones, each labelled', () => {
    const x = readAxis(root, 'axis-x', 'Hz');
    const limits = byClass(root, 'spec-limit');
    expect(limits.map((l) => Number(l.attrs.x1))).toHaveLength(2);
    limits.forEach((l, i) => {
      const value = i === 0 ? 12_000 : 12_600;
      expect(l.attrs.x1).toBe(l.attrs.x2);
      expect(Math.abs(Number(l.attrs.x1) - x.toPx(value))).toBeLessThan(0.15);
      expect(l.attrs['stroke-dasharray']).toBeUndefined();
    });
    expect(byClass(root, 'spec-limit-label').map(textOf)).toEqual(['low limit 12.00 kHz', 'high limit 12.60 kHz']);
    const markers = byClass(root, 'marker');
    expect(markers).toHaveLength(3);
    markers.forEach((m, i) => {
      expect(m.attrs['stroke-dasharray']).toBeDefined();
      expect(Math.abs(Number(m.attrs.x1) - x.toPx(baseInput.markers![i].value))).toBeLessThan(0.15);
    });
    expect(byClass(root, 'marker-label').map(textOf)).toEqual(['p1 12.09 kHz', 'p50 12.30 kHz', 'p99 12.51 kHz']);
    expect(new Set([...limits, ...markers].map((l) => l.attrs.stroke)).size).toBe(2);
  });

  it('widens the axis to show a limit that lies outside the bins', () => {
    const out = parseXml(renderHistogramSvg({ ...baseInput, specLimits: { high: 14_000 } }));
    const x = readAxis(out, 'axis-x', 'Hz');
    expect(Math.max(...x.values)).toBeGreaterThanOrEqual(14_000);
  });

  it('escapes markup in labels', () => {
    const out = renderHistogramSvg({ ...baseInput, title: 'x<y & z', markers: [{ label: '<p50>', value: 12_300 }] });
    expect(out).toContain('x&lt;y &amp; z');
    expect(byClass(parseXml(out), 'marker-label').map(textOf)).toEqual(['<p50> 12.30 kHz']);
  });

  it('stays small with many bins', () => {
    const many = binValues(demoFrequencies(50_000, 12_300, 90, 7), 20_000);
    expect(renderHistogramSvg({ ...baseInput, bins: many }).length).toBeLessThan(500_000);
  });

  it('is deterministic', () => {
    expect(renderHistogramSvg(baseInput)).toBe(svg);
  });

  it('refuses bins it cannot draw', () => {
    const bad: HistogramPlotInput['bins'][] = [
      { edges: [0, 1], counts: [1, 2] },
      { edges: [0, 1, 1], counts: [1, 2] },
      { edges: [0, 1], counts: [-1] },
      { edges: [0, Number.NaN], counts: [1] },
    ];
    for (const b of bad) {
      expect(() => renderHistogramSvg({ ...baseInput, bins: b })).toThrow(CoreError);
    }
    expect(() => renderHistogramSvg({ ...baseInput, markers: [{ label: 'x', value: Number.NaN }] })).toThrow(CoreError);
  });
});
