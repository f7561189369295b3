/**
 * Renders both plots in headless Chromium and checks the pixels: the page must
 * show something (a fair share of non-white pixels) and the trace, bar and limit
 * colours the SVG asks for must actually appear. Screenshots are kept under the
 * system temp directory so a person can look at them.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { existsSync } from 'node:fs';
import { mkdtemp, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import type { Browser, Page } from 'playwright-core';
import { renderWaveformSvg } from '../../../src/core/plot/waveform-svg.ts';
import { binValues, renderHistogramSvg } from '../../../src/core/plot/histogram-svg.ts';
import { demoFrequencies, demoOscillator } from './demo-signals.ts';
import { countColour, decodePng, nonWhiteFraction } from './png-decode.ts';
import type { RgbaImage } from './png-decode.ts';
import { byClass, parseXml } from './svg-tree.ts';

const CHROMIUM_PATH = '/usr/bin/chromium';
const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];
const haveChromium = existsSync(CHROMIUM_PATH);
const requireChromium = Boolean(process.env.CI);
if (!haveChromium && !requireChromium) {
  console.warn(`render-browser.test.ts skipped: ${CHROMIUM_PATH} is missing (apt-get install chromium); CI would fail here`);
}

/** The few browser globals the page scripts use (the project compiles without the DOM library). */
interface PageGlobals {
  document: {
    querySelectorAll(selector: string): ArrayLike<{
      textContent: string | null;
      getBoundingClientRect(): { left: number; top: number; right: number; bottom: number };
    }>;
  };
  DOMParser: new () => {
    parseFromString(text: string, type: string): { getElementsByTagName(name: string): { length: number } };
  };
}

/** Screen-space boxes of the elements matching `selector`, from the browser's own layout. */
async function boxes(page: Page, selector: string) {
  return page.evaluate((sel) => {
    const { document } = globalThis as unknown as PageGlobals;
    return Array.from(document.querySelectorAll(sel)).map((el) => {
      const r = el.getBoundingClientRect();
      return { text: el.textContent ?? '', left: r.left, top: r.top, right: r.right, bottom: r.bottom };
    });
  }, selector);
}

type Box = Awaited<ReturnType<typeof boxes>>[number];

/**
 * Lengths of the runs of dark neutral-grey pixels along one pixel row: a dashed
 * line gives many short runs of about its dash length, a solid line a few long ones.
 */
function greyRuns(image: RgbaImage, row: number, fromX: number, toX: number): number[] {
  const runs: number[] = [];
  let run = 0;
  for (let x = Math.ceil(fromX); x <= Math.floor(toX); x++) {
    const p = (row * image.width + x) * 4;
    const [r, g, b] = [image.data[p], image.data[p + 1], image.data[p + 2]];
    const grey = Math.max(r, g, b) < 170 && Math.max(r, g, b) - Math.min(r, g, b) < 24;
    if (grey) run++;
    else if (run > 0) {
      runs.push(run);
      run = 0;
    }
  }
  if (run > 0) runs.push(run);
  return runs;
}

function overlapping(list: Box[]): [string, string][] {
  const out: [string, string][] = [];
  for (let i = 0; i < list.length; i++) {
    for (let j = i + 1; j < list.length; j++) {
      const a = list[i];
      const b = list[j];
      if (a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom) out.push([a.text, b.text]);
    }
  }
  return out;
}

describe.skipIf(!haveChromium && !requireChromium)('plots drawn by Chromium', () => {
  let browser: Browser;
  let shotDir: string;

  beforeAll(async () => {
    if (!haveChromium) throw new Error(`CI is set but ${CHROMIUM_PATH} is missing: install the Debian package chromium`);
    // launch() gives every run a fresh temporary profile (user-data dir) of its own.
    browser = await chromium.launch({ executablePath: CHROMIUM_PATH, args: CHROMIUM_ARGS });
    shotDir = await mkdtemp(join(tmpdir(), 'tickwright-plot-'));
    console.info(`plot screenshots in ${shotDir}`);
  });

  afterAll(async () => {
    await browser?.close();
  });

  /** Load the SVG as the only thing on a page, check the browser parsed it, screenshot it. */
  async function draw(svg: string, name: string): Promise<{ image: RgbaImage; page: Page }> {
    const root = parseXml(svg);
    const width = Number(root.attrs.width);
    const height = Number(root.attrs.height);
    const page = await browser.newPage({ viewport: { width, height }, deviceScaleFactor: 1 });
    const parseErrors = await page.evaluate(
      (text) => {
        const { DOMParser } = globalThis as unknown as PageGlobals;
        return new DOMParser().parseFromString(text, 'image/svg+xml').getElementsByTagName('parsererror').length;
      },
      svg,
    );
    expect(parseErrors).toBe(0);
    await page.setContent(`<!doctype html><html><body style="margin:0;background:#fff">${svg}</body></html>`);
    const png = await page.locator('svg').screenshot({ type: 'png' });
    await writeFile(join(shotDir, `${name}.png`), png);
    const image = decodePng(png);
    expect([image.width, image.height]).toEqual([width, height]);
    return { image, page };
  }

  it('draws the waveform: traces in their colours, dashed thresholds, readable labels', async () => {
    const demo = demoOscillator(200_000, 80e-6);
    const svg = renderWaveformSvg({
      timeS: demo.timeS,
      traces: [
        { name: 'capacitor', unit: 'V', values: demo.capacitorV },
        { name: 'output', unit: 'V', values: demo.outputV },
        { name: 'decision node', unit: 'V', values: demo.decisionV },
      ],
      thresholds: { upperV: demo.upperV, lowerV: demo.lowerV },
      title: 'f = 36.1 kHz, duty 50.0 %',
      subtitle: 'demo circuit, 5 V supply, 200 000 samples',
    });
    const { image, page } = await draw(svg, 'waveform');
    const inked = nonWhiteFraction(image);
    expect(inked).toBeGreaterThan(0.03);
    expect(inked).toBeLessThan(0.6);
    const colours = byClass(parseXml(svg), 'trace').map((p) => p.attrs.stroke);
    for (const colour of colours) {
      // A 2 px stroke leaves many fully covered pixels in the exact colour; 24 levels allow for blending.
      expect(countColour(image, colour, 24), colour).toBeGreaterThan(150);
    }
    // Thresholds are dashed: along each one's pixel row, many grey runs about one dash (7 px) long.
    const parsed = parseXml(svg);
    const [frame] = byClass(parsed, 'plot-frame');
    const left = Number(frame.attrs.x);
    const right = left + Number(frame.attrs.width);
    for (const name of ['upper', 'lower']) {
      const y = Number(byClass(parsed, `threshold-${name}`)[0].attrs.y1);
      const dashCounts = [Math.floor(y) - 1, Math.floor(y), Math.floor(y) + 1].map(
        (row) => greyRuns(image, row, left + 2, right - 2).filter((n) => n >= 4 && n <= 10).length,
      );
      expect(Math.max(...dashCounts), `${name} threshold dashes`).toBeGreaterThan(15);
    }
    // In-plot labels must not collide with each other, and no text may fall off the picture.
    const labels = await boxes(page, '.threshold-label, .legend-item text, .plot-title, .plot-subtitle');
    expect(overlapping(labels)).toEqual([]);
    const texts = await boxes(page, 'text');
    expect(texts.filter((t) => t.left < 0 || t.top < 0 || t.right > image.width || t.bottom > image.height)).toEqual([]);
    await page.close();
  });

  it('draws the histogram: bars, red limits and labelled markers that do not collide', async () => {
    const bins = binValues(demoFrequencies(4000, 12_300, 90), 30);
    const svg = renderHistogramSvg({
      bins,
      unit: 'Hz',
      title: 'Frequency spread, 4000 runs',
      specLimits: { low: 12_000, high: 12_600 },
      markers: [
        { label: 'p1', value: 12_090 },
        { label: 'p50', value: 12_300 },
        { label: 'p99', value: 12_510 },
      ],
    });
    const { image, page } = await draw(svg, 'histogram');
    const root = parseXml(svg);
    const barColour = byClass(root, 'bars')[0].attrs.fill;
    const limitColour = byClass(root, 'spec-limit')[0].attrs.stroke;
    // Bars cover a large part of the plot area.
    expect(countColour(image, barColour, 16) / (image.width * image.height)).toBeGreaterThan(0.1);
    expect(countColour(image, limitColour, 24)).toBeGreaterThan(100);
    const labels = await boxes(page, '.spec-limit-label, .marker-label, .legend-item text, .plot-title');
    expect(overlapping(labels)).toEqual([]);
    const texts = await boxes(page, 'text');
    expect(texts.filter((t) => t.left < 0 || t.top < 0 || t.right > image.width || t.bottom > image.height)).toEqual([]);
    await page.close();
  });
});
