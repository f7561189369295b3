/** The seeded generator and the summary statistics, against published definitions and a reference library. */
import referenceErf from '@stdlib/math-base-special-erf';
import { describe, expect, it } from 'vitest';
import { Xoshiro128 } from '../../../src/core/tolerance/prng.ts';
import { erf, percentileSorted, selectRanks, summarize, truncatedNormalVariance, wilsonInterval } from '../../../src/core/tolerance/statistics.ts';

describe('xoshiro128**', () => {
  it('matches the reference algorithm from the state (1, 2, 3, 4)', () => {
    // Blackman & Vigna, reference C code xoshiro128starstar.c. Outputs from memory; the first three were
    // re-derived by hand from the published update rule (rotl(s1·5, 7)·9; s2 ^= s0; s3 ^= s1; ...).
    const g = Xoshiro128.fromState([1, 2, 3, 4]);
    const first = Array.from({ length: 6 }, () => g.nextUint32());
    expect(first).toEqual([11520, 0, 5927040, 70819200, 2031721883, 1637235492]);
  });

  it('is reproducible per seed and differs between seeds', () => {
    const a = new Xoshiro128(42);
    const b = new Xoshiro128(42);
    const c = new Xoshiro128(43);
    const sa = Array.from({ length: 8 }, () => a.nextFloat());
    expect(Array.from({ length: 8 }, () => b.nextFloat())).toEqual(sa);
    expect(Array.from({ length: 8 }, () => c.nextFloat())).not.toEqual(sa);
  });

  it('gives uniform [0,1) and standard normal deviates with the right moments', () => {
    const g = new Xoshiro128(7);
    const n = 1_000_000;
    let su = 0;
    let su2 = 0;
    let sn = 0;
    let sn2 = 0;
    let within1 = 0;
    let within2 = 0;
    let beyond3 = 0;
    let outOfRange = 0;
    for (let i = 0; i < n; i++) {
      const u = g.nextFloat();
      if (!(u >= 0 && u < 1)) outOfRange++;
      su += u;
      su2 += u * u;
      const z = g.nextNormal();
      sn += z;
      sn2 += z * z;
      if (Math.abs(z) <= 1) within1++;
      if (Math.abs(z) <= 2) within2++;
      if (Math.abs(z) > 3) beyond3++;
    }
    expect(outOfRange).toBe(0);
    // Uniform(0,1): mean 1/2, variance 1/12. Standard normal: mean 0, variance 1, P(|Z| <= k) = erf(k/√2).
    // Tolerances are 5 standard errors of each estimate.
    expect(Math.abs(su / n - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(su2 / n - (su / n) ** 2 - 1 / 12)).toBeLessThan(5 * Math.sqrt(1 / 180 / n));
    expect(Math.abs(sn / n)).toBeLessThan(5 / Math.sqrt(n));
    expect(Math.abs(sn2 / n - 1)).toBeLessThan(5 * Math.sqrt(2 / n));
    // Central and tail probabilities, P(|Z| <= k) = erf(k/√2), checked where the ziggurat's strips and its tail differ.
    for (const [count, k] of [[within1, 1], [within2, 2], [n - beyond3, 3]] as const) {
      const p = referenceErf(k / Math.SQRT2);
      expect(Math.abs(count / n - p)).toBeLessThan(5 * Math.sqrt((p * (1 - p)) / n));
    }
  });
});

describe('statistics', () => {
  it('erf agrees with the @stdlib reference implementation to the 1.5e-7 bound of Abramowitz & Stegun 7.1.26', () => {
    for (let x = -4; x <= 4; x += 0.137) expect(Math.abs(erf(x) - referenceErf(x))).toBeLessThan(1.5e-7);
  });

  it('percentiles follow Hyndman & Fan definition 7', () => {
    // Definition 7: h = (n − 1)·q, linear between x[floor h] and x[floor h + 1]. For 1..10 and q = 0.1: h = 0.9 -> 1.9
    // (R: quantile(1:10, 0.1) = 1.9, from memory).
    const data = Float64Array.from({ length: 10 }, (_, i) => i + 1);
    expect(percentileSorted(data, 0.1)).toBeCloseTo(1.9, 12);
    expect(percentileSorted(data, 0.5)).toBeCloseTo(5.5, 12);
    expect(percentileSorted(data, 0.999)).toBeCloseTo(1 + 9 * 0.999, 12);
  });

  it('selecting ranks gives the same order statistics as a full sort', () => {
    const g = new Xoshiro128(3);
    for (const n of [1, 5, 30, 1000, 54321]) {
      const a = Float64Array.from({ length: n }, (_, i) => (i % 7 === 0 ? 0.25 : g.nextNormal()));
      const sorted = Float64Array.from(a).sort();
      const ranks = [...new Set([0, Math.floor(n / 3), n - 1, Math.floor(n * 0.999)])].sort((x, y) => x - y);
      selectRanks(a, ranks);
      for (const r of ranks) expect(a[r]).toBe(sorted[r]);
    }
  });

  it('summarize ignores NaN (latched samples) and reports mean, sample std and percentiles', () => {
    const values = Float64Array.from([4, Number.NaN, 1, 3, 2, 5]);
    const s = summarize(values)!;
    expect(s.mean).toBe(3);
    expect(s.std).toBeCloseTo(Math.sqrt(2.5), 12); // sample variance of 1..5 is 2.5
    expect(s.p50).toBe(3);
    expect(s.min).toBe(1);
    expect(s.max).toBe(5);
    expect(summarize(Float64Array.from([Number.NaN]))).toBeNull();
  });

  it('truncated normal variance matches numerical integration of the density', () => {
    // Var of N(0,1) truncated to ±a = ∫ z²φ / ∫ φ over [−a, a]; composite Simpson rule, independent of the closed form.
    for (const a of [1, 2, 3, 5]) {
      const steps = 20_000;
      const h = (2 * a) / steps;
      let num = 0;
      let den = 0;
      for (let k = 0; k <= steps; k++) {
        const z = -a + k * h;
        const w = k === 0 || k === steps ? 1 : k % 2 ? 4 : 2;
        const phi = Math.exp((-z * z) / 2);
        num += w * z * z * phi;
        den += w * phi;
      }
      expect(truncatedNormalVariance(a)).toBeCloseTo(num / den, 6);
    }
  });

  it('Wilson interval: with no passes out of n the upper end is z²/(n + z²)', () => {
    // Wilson (1927) score interval at p̂ = 0 reduces to [0, z²/(n + z²)].
    const z = 1.959963984540054;
    const w = wilsonInterval(0, 10);
    expect(w.low).toBe(0);
    expect(w.high).toBeCloseTo((z * z) / (10 + z * z), 12);
  });
});
