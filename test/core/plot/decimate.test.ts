import { describe, it, expect } from 'vitest';
import { decimateMinMax } from '../../../src/core/plot/decimate.ts';

/** Deterministic pseudo-random numbers (Park–Miller minimal standard generator, CACM 1988). */
function lcg(seed: number): () => number {
  let state = seed;
  return () => {
    state = (state * 16807) % 2147483647;
    return state / 2147483647;
  };
}

function column(t: number, t0: number, t1: number, columns: number): number {
  return Math.min(columns - 1, Math.floor(((t - t0) / (t1 - t0)) * columns));
}

describe('decimateMinMax', () => {
  const n = 200_000;
  const columns = 700;
  const random = lcg(12345);
  const timeS = Float64Array.from({ length: n }, (_, i) => i * 1e-9);
  const values = Float64Array.from({ length: n }, () => random() * 2 - 1);
  const reduced = decimateMinMax(timeS, values, columns);

  it('keeps at most four points per pixel column', () => {
    expect(reduced.timeS.length).toBeLessThanOrEqual(4 * columns);
    expect(reduced.timeS.length).toBe(reduced.values.length);
  });

  it('keeps every column envelope (its lowest and highest sample) and the ends', () => {
    const t0 = timeS[0];
    const t1 = timeS[n - 1];
    const lo = new Array<number>(columns).fill(Infinity);
    const hi = new Array<number>(columns).fill(-Infinity);
    for (let i = 0; i < n; i++) {
      const c = column(timeS[i], t0, t1, columns);
      lo[c] = Math.min(lo[c], values[i]);
      hi[c] = Math.max(hi[c], values[i]);
    }
    const keptLo = new Array<number>(columns).fill(Infinity);
    const keptHi = new Array<number>(columns).fill(-Infinity);
    for (let k = 0; k < reduced.timeS.length; k++) {
      const c = column(reduced.timeS[k], t0, t1, columns);
      keptLo[c] = Math.min(keptLo[c], reduced.values[k]);
      keptHi[c] = Math.max(keptHi[c], reduced.values[k]);
    }
    expect(keptLo).toEqual(lo);
    expect(keptHi).toEqual(hi);
    expect(reduced.timeS[0]).toBe(t0);
    expect(reduced.timeS[reduced.timeS.length - 1]).toBe(t1);
  });

  it('returns points in time order, taken from the input', () => {
    for (let k = 1; k < reduced.timeS.length; k++) expect(reduced.timeS[k]).toBeGreaterThan(reduced.timeS[k - 1]);
    const k = Math.floor(reduced.timeS.length / 2);
    const i = Math.round(reduced.timeS[k] / 1e-9);
    expect(reduced.values[k]).toBe(values[i]);
  });

  it('keeps both levels of a step inside one pixel column, so a square-wave edge stays vertical', () => {
    const t = Float64Array.from({ length: 10_000 }, (_, i) => i);
    const v = Float64Array.from(t, (x) => (x < 5003 ? 0 : 5));
    const r = decimateMinMax(t, v, 100);
    const edge = Array.from(r.values).findIndex((x) => x === 5);
    expect(r.values[edge - 1]).toBe(0);
    // The last low point and the first high point fall in the same column.
    expect(column(r.timeS[edge - 1], 0, 9999, 100)).toBe(column(r.timeS[edge], 0, 9999, 100));
  });

  it('passes short traces through unchanged', () => {
    const r = decimateMinMax([0, 1, 2], [3, 1, 2], 100);
    expect(Array.from(r.values)).toEqual([3, 1, 2]);
  });
});
