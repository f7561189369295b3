/**
 * Upper quantile of the χ² distribution by the Wilson–Hilferty cube-root
 * normal approximation (Wilson & Hilferty, 1931, "The distribution of
 * chi-square", PNAS 17): χ²_p(k) ≈ k·(1 − 2/(9k) + z_p·√(2/(9k)))³. Within a
 * few per cent of the exact quantile even at k = 1, which is ample for a
 * "does the nominal circuit agree" verdict.
 */

/** Standard normal quantile at 0.95 (one-sided). */
export const Z_95 = 1.6448536269514722;

export function chiSquareQuantile95(degreesOfFreedom: number): number {
  const k = Math.max(1, degreesOfFreedom);
  const c = 2 / (9 * k);
  return k * (1 - c + Z_95 * Math.sqrt(c)) ** 3;
}
