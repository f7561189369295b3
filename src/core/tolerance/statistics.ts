/** Summary statistics for Monte Carlo samples, and the few distribution facts the analysis needs. */
import type { DistributionSummary } from './types.ts';

/**
 * Error function, Abramowitz & Stegun, Handbook of Mathematical Functions,
 * formula 7.1.26 (|error| < 1.5e-7): enough for variance weights and intervals.
 */
export function erf(x: number): number {
  const sign = x < 0 ? -1 : 1;
  const ax = Math.abs(x);
  const t = 1 / (1 + 0.3275911 * ax);
  const poly = t * (0.254829592 + t * (-0.284496736 + t * (1.421413741 + t * (-1.453152027 + t * 1.061405429))));
  return sign * (1 - poly * Math.exp(-ax * ax));
}

export function normalCdf(z: number): number {
  return 0.5 * (1 + erf(z / Math.SQRT2));
}

/**
 * Variance of a standard normal truncated to [−a, a]:
 * 1 − 2a·φ(a) / (2Φ(a) − 1) (Johnson, Kotz & Balakrishnan, Continuous Univariate
 * Distributions, vol. 1, truncated normal moments).
 */
export function truncatedNormalVariance(a: number): number {
  if (!Number.isFinite(a)) return 1;
  const phi = Math.exp((-a * a) / 2) / Math.sqrt(2 * Math.PI);
  return 1 - (2 * a * phi) / (2 * normalCdf(a) - 1);
}

/**
 * Percentile of ascending-sorted data by linear interpolation between order
 * statistics: Hyndman & Fan (1996) definition 7, the default of R's quantile()
 * and of numpy.percentile. q in 0..1.
 */
export function percentileSorted(sorted: ArrayLike<number>, q: number): number {
  const n = sorted.length;
  if (n === 0) return Number.NaN;
  const h = (n - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

export const REPORTED_PERCENTILES = [
  ['p0_1', 0.001],
  ['p1', 0.01],
  ['p5', 0.05],
  ['p50', 0.5],
  ['p95', 0.95],
  ['p99', 0.99],
  ['p99_9', 0.999],
] as const;

/** Mean, sample standard deviation (n − 1), extremes and the reported percentiles of the finite values. */
export function summarize(values: Float64Array): DistributionSummary | null {
  const finite = new Float64Array(values.length);
  let n = 0;
  let sum = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!Number.isFinite(v)) continue;
    finite[n++] = v;
    sum += v;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (n === 0) return null;
  const data = finite.subarray(0, n);
  const mean = sum / n;
  // Two-pass variance (sum of squared deviations from the mean) stays accurate when the spread is tiny against the mean.
  let m2 = 0;
  let drift = 0;
  for (let i = 0; i < n; i++) {
    const d = data[i] - mean;
    m2 += d * d;
    drift += d;
  }
  m2 -= (drift * drift) / n; // the corrected two-pass algorithm (Chan, Golub & LeVeque 1983)
  const summary = { mean, std: n > 1 ? Math.sqrt(Math.max(0, m2) / (n - 1)) : 0, min, max } as DistributionSummary;
  // Type-7 percentiles need the order statistics at floor(h) and floor(h) + 1: select just those.
  const ranks = new Set<number>();
  for (const [, q] of REPORTED_PERCENTILES) {
    const h = (n - 1) * q;
    ranks.add(Math.floor(h));
    ranks.add(Math.min(n - 1, Math.floor(h) + 1));
  }
  selectRanks(data, [...ranks].sort((a, b) => a - b));
  for (const [key, q] of REPORTED_PERCENTILES) {
    const h = (n - 1) * q;
    const lo = Math.floor(h);
    const hi = Math.min(n - 1, lo + 1);
    summary[key] = data[lo] + (h - lo) * (data[hi] - data[lo]);
  }
  return summary;
}

/**
 * Rearranges a (no NaN) so that a[r] is the r-th smallest value for every r in
 * the ascending list `ranks`: Hoare's FIND (quickselect, CACM 1961) run on the
 * ranks together, median-of-three pivots, insertion sort for short runs. O(n·log k)
 * instead of a full sort's O(n·log n).
 */
export function selectRanks(a: Float64Array, ranks: readonly number[]): void {
  const go = (lo: number, hi: number, rlo: number, rhi: number): void => {
    while (rlo <= rhi) {
      if (hi - lo < 24) {
        insertionSort(a, lo, hi);
        return;
      }
      const mid = (lo + hi) >>> 1;
      const x = a[lo];
      const y = a[mid];
      const z = a[hi];
      const pivot = x < y ? (y < z ? y : x < z ? z : x) : x < z ? x : y < z ? z : y;
      let i = lo - 1;
      let j = hi + 1;
      for (;;) {
        do i++;
        while (a[i] < pivot);
        do j--;
        while (a[j] > pivot);
        if (i >= j) break;
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
      }
      if (j >= hi) {
        insertionSort(a, lo, hi); // no progress (cannot happen with a median pivot; kept as a guard)
        return;
      }
      let split = rlo;
      while (split <= rhi && ranks[split] <= j) split++;
      go(lo, j, rlo, split - 1);
      lo = j + 1;
      rlo = split;
    }
  };
  go(0, a.length - 1, 0, ranks.length - 1);
}

function insertionSort(a: Float64Array, lo: number, hi: number): void {
  for (let i = lo + 1; i <= hi; i++) {
    const v = a[i];
    let j = i - 1;
    while (j >= lo && a[j] > v) {
      a[j + 1] = a[j];
      j--;
    }
    a[j + 1] = v;
  }
}

/** Wilson score interval for a binomial proportion (Wilson, JASA 1927), z = 1.96 for 95 %. */
export function wilsonInterval(passing: number, n: number, z = 1.959963984540054): { low: number; high: number } {
  if (n === 0) return { low: 0, high: 1 };
  const p = passing / n;
  const z2 = z * z;
  const denom = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denom;
  const half = (z * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n))) / denom;
  return { low: Math.max(0, centre - half), high: Math.min(1, centre + half) };
}
