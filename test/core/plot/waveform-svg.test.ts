import { describe, it, expect } from 'vitest';
import { CoreError } from '../../../src/core/errors.ts';
import { renderWaveformSvg } from '../../../src/core/plot/waveform-svg.ts';
import type { WaveformPlotInput } from '../../../src/core/plot/waveform-svg.ts';
import { readAxis } from './axis-readout.ts';
import { demoOscillator } from './demo-signals.ts';
import { allTexts, byClass, findAll, parseXml, textOf } from './svg-tree.ts';

const demo = demoOscillator(2001, 50e-6);
const baseInput: WaveformPlotInput = {
  timeS: demo.timeS,
  traces: [
    { name: 'capacitor', unit: 'V', values: demo.capacitorV },
    { name: 'output', unit: 'V', values: demo.outputV },
    { name: 'decision node', unit: 'V', values: demo.decisionV },
  ],
  thresholds: { upperV: demo.upperV, lowerV: demo.lowerV },
  title: 'f = 31.2 kHz, duty 50.0 %',
  subtitle: 'demo circuit, 5 V supply',
};

/** Points of a d3 line path ("M x,y L x,y ..."). */
function pathPoints(d: string): [number, number][] {
  return [...d.matchAll(/[ML](-?[\d.]+),(-?[\d.]+)/g)].map((m) => [Number(m[1]), Number(m[2])]);
}

describe('renderWaveformSvg', () => {
  const svg = renderWaveformSvg(baseInput);
  const root = parseXml(svg); // throws on malformed XML (XML 1.0 well-formedness)

  it('is a standalone SVG document with a white background', () => {
    expect(root.name).toBe('svg');
    expect(root.attrs.xmlns).toBe('http://www.w3.org/2000/svg');
    expect(root.attrs.viewBox).toBe('0 0 800 420');
    expect(root.attrs.width).toBe('800');
    expect(root.attrs.height).toBe('420');
    expect(root.attrs['font-family']).toBe('sans-serif');
    const [background] = byClass(root, 'background');
    expect(background.attrs).toMatchObject({ x: '0', y: '0', width: '800', height: '420', fill: '#ffffff' });
  });

  it('shows the title, the subtitle and one legend entry per trace plus the thresholds', () => {
    expect(byClass(root, 'plot-title').map(textOf)).toEqual([baseInput.title]);
    const legendTexts = byClass(root, 'legend-item').flatMap(allTexts);
    expect(legendTexts).toEqual(['capacitor', 'output', 'decision node', 'thresholds']);
    expect(allTexts(root)).toContain('demo circuit, 5 V supply');
  });

  it('labels a 0..50 µs time axis in µs and a 0..5 V axis in V, each tick where its label says', () => {
    const x = readAxis(root, 'axis-x', 's');
    expect(x.labels.every((l) => l.endsWith(' µs'))).toBe(true);
    expect(x.labels).toContain('50 µs');
    expect(x.worstTickMisfitPx).toBeLessThan(0.15);
    const y = readAxis(root, 'axis-left', 'V');
    expect(y.labels.every((l) => / V$/.test(l))).toBe(true);
    expect(y.worstTickMisfitPx).toBeLessThan(0.15);
    expect(allTexts(root)).toEqual(expect.arrayContaining(['time (µs)', 'voltage (V)']));
  });

  it('draws each threshold as a dashed horizontal line at its value, with a label', () => {
    const y = readAxis(root, 'axis-left', 'V');
    for (const [name, value] of [
      ['upper', demo.upperV],
      ['lower', demo.lowerV],
    ] as const) {
      const [lineEl] = byClass(root, `threshold-${name}`);
      expect(lineEl.attrs['stroke-dasharray']).toBeDefined();
      expect(lineEl.attrs.y1).toBe(lineEl.attrs.y2);
      expect(Math.abs(Number(lineEl.attrs.y1) - y.toPx(value))).toBeLessThan(0.15);
      expect(allTexts(byClass(root, `threshold-label-${name}`)[0]).join('')).toBe(
        `${name} threshold ${value.toFixed(2)} V`,
      );
    }
  });

  it('draws every trace in its own colour, starting at its first sample', () => {
    const paths = byClass(root, 'trace');
    expect(paths).toHaveLength(3);
    expect(new Set(paths.map((p) => p.attrs.stroke)).size).toBe(3);
    const x = readAxis(root, 'axis-x', 's');
    const y = readAxis(root, 'axis-left', 'V');
    baseInput.traces.forEach((trace, i) => {
      const [first] = pathPoints(paths[i].attrs.d);
      expect(Math.abs(first[0] - x.toPx(demo.timeS[0]))).toBeLessThan(0.15);
      expect(Math.abs(first[1] - y.toPx(trace.values[0]))).toBeLessThan(0.15);
    });
  });

  it('escapes markup in every piece of text', () => {
    const nasty = `a < b & "c" 'd' > </svg><script>`;
    const out = renderWaveformSvg({
      ...baseInput,
      title: nasty,
      subtitle: nasty,
      traces: [{ name: nasty, unit: 'V', values: demo.capacitorV }],
    });
    expect(out).not.toContain('<script>');
    expect(out).toContain('a &lt; b &amp; &quot;c&quot; &apos;d&apos; &gt;');
    const parsed = parseXml(out);
    expect(allTexts(parsed).filter((t) => t === nasty).length).toBeGreaterThanOrEqual(3);
  });

  it('decimates 200 000 samples per trace to a small document', () => {
    const long = demoOscillator(200_000, 400e-6);
    const out = renderWaveformSvg({
      ...baseInput,
      timeS: long.timeS,
      traces: [
        { name: 'capacitor', unit: 'V', values: long.capacitorV },
        { name: 'output', unit: 'V', values: long.outputV },
        { name: 'decision node', unit: 'V', values: long.decisionV },
      ],
    });
    expect(out.length).toBeLessThan(500_000);
    const parsed = parseXml(out);
    const [frame] = byClass(parsed, 'plot-frame');
    const widthPx = Number(frame.attrs.width);
    for (const path of byClass(parsed, 'trace')) {
      expect(pathPoints(path.attrs.d).length).toBeLessThanOrEqual(4 * Math.ceil(widthPx));
    }
    // The peaks survive decimation: the capacitor trace still reaches the upper threshold's line.
    const y = readAxis(parsed, 'axis-left', 'V');
    const capY = pathPoints(byClass(parsed, 'trace')[0].attrs.d).map((p) => p[1]);
    expect(Math.abs(Math.min(...capY) - y.toPx(long.upperV))).toBeLessThan(1);
  });

  it('keeps threshold labels inside the plot area when a threshold sits at its edge', () => {
    // Capacitor alone on its axis: its peaks are the thresholds, so the upper line is near the top.
    const out = parseXml(renderWaveformSvg({ ...baseInput, traces: [baseInput.traces[0]] }));
    const [frame] = byClass(out, 'plot-frame');
    const top = Number(frame.attrs.y);
    const bottom = top + Number(frame.attrs.height);
    for (const label of byClass(out, 'threshold-label')) {
      const baseline = Number(label.attrs.y);
      expect(baseline - 11).toBeGreaterThanOrEqual(top); // 11 px font above the baseline
      expect(baseline).toBeLessThanOrEqual(bottom);
    }
  });

  it('is deterministic', () => {
    expect(renderWaveformSvg(baseInput)).toBe(svg);
  });

  it('puts a second unit on a right-hand axis', () => {
    const current = Float64Array.from(demo.outputV, (v) => v * 1e-3);
    const out = parseXml(
      renderWaveformSvg({
        ...baseInput,
        traces: [
          { name: 'capacitor', unit: 'V', values: demo.capacitorV },
          { name: 'supply current', unit: 'A', values: current },
        ],
      }),
    );
    const right = readAxis(out, 'axis-right', 'A');
    expect(right.labels.every((l) => l.endsWith(' mA'))).toBe(true);
    expect(right.worstTickMisfitPx).toBeLessThan(0.15);
    expect(byClass(out, 'legend-item').flatMap(allTexts)).toContain('supply current (right axis)');
  });

  it('refuses inputs it cannot draw', () => {
    const bad: Partial<WaveformPlotInput>[] = [
      { timeS: [0] , traces: [{ name: 'a', unit: 'V', values: [1] }] },
      { timeS: [0, 2, 1], traces: [{ name: 'a', unit: 'V', values: [1, 2, 3] }] },
      { timeS: [0, 1], traces: [{ name: 'a', unit: 'V', values: [1] }] },
      { timeS: [0, 1], traces: [{ name: 'a', unit: 'V', values: [1, Number.NaN] }] },
      { timeS: [0, 1], traces: [] },
      { timeS: [0, 1], traces: ['V', 'A', 's'].map((unit) => ({ name: unit, unit, values: [0, 1] })) },
      { widthPx: 10 },
    ];
    for (const patch of bad) {
      let caught: unknown;
      try {
        renderWaveformSvg({ ...baseInput, ...patch });
      } catch (error) {
        caught = error;
      }
      expect(caught).toBeInstanceOf(CoreError);
      expect((caught as CoreError).code).toBe('invalid-value');
    }
  });

  it('only writes elements an SVG renderer knows', () => {
    const known = new Set(['svg', 'title', 'rect', 'g', 'line', 'text', 'path']);
    expect(findAll(root, (el) => !known.has(el.name))).toEqual([]);
  });
});
