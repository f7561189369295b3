/**
 * Upper quantiles of the χ² distribution by the Wilson–Hilferty cube-root
 * normal approximation (Wilson & Hilferty, 1931, "The distribution of
 * chi-square", PNAS 17): χ²_p(k) ≈ k·(1 − 2/(9k) + z_p·√(2/(9k)))³. Within a
 * few per cent of the exact quantile even at k = 1, which is ample for a
 * goodness-of-fit verdict.
 */

/** Standard normal quantiles (one-sided) at 0.95 and 0.999 (Abramowitz & Stegun, table 26.1). */
export const Z_95 = 1.6448536269514722;
export const Z_999 = 3.090232306167813;

export function chiSquareQuantile(degreesOfFreedom: number, z: number): number {
  const k = Math.max(1, degreesOfFreedom);
  const c = 2 / (9 * k);
  return k * Math.max(0, 1 - c + z * Math.sqrt(c)) ** 3;
}

export function chiSquareQuantile95(degreesOfFreedom: number): number {
  return chiSquareQuantile(degreesOfFreedom, Z_95);
}

/** The bound a hypothesis must stay under to pass the goodness-of-fit test at the 1e-3 level. */
export function chiSquareQuantile999(degreesOfFreedom: number): number {
  return chiSquareQuantile(degreesOfFreedom, Z_999);
}
