/**
 * The φ-functions of exponential integrators, evaluated without cancellation:
 *
 *   φ1(x) = (1 − e^−x)/x,   φ2(x) = (x − 1 + e^−x)/x²,   φ3(x) = (x²/2 − x + 1 − e^−x)/x³
 *
 * (φ_{k+1}(x) = (1/k! − φ_k(x))/x, φ_k(0) = 1/k!). With them the solution of a
 * first-order linear piece driven by a ramp is one formula for every time
 * constant, including the no-resistive-path limit x → 0, and it stays accurate
 * when the piece is short against τ (the usual case for a slew ramp), where the
 * textbook "particular + homogeneous" form cancels badly.
 */

/**
 * Below this x the recurrence loses digits (relative error ~ 2ε/x for φ2 and
 * ~ 6ε/x² for φ3): use the Taylor series there, whose truncation after TERMS
 * terms is below x^TERMS/(TERMS+k)! < 1e-16 relative.
 */
export const SERIES_LIMIT = 0.1;
/** Series terms (series1..series3 below are this loop unrolled: change them together). */
const TERMS = 10;
/** 1/n! for n = 0..TERMS+3. */
const INV_FACT = (() => {
  const out = new Float64Array(TERMS + 4);
  out[0] = 1;
  for (let n = 1; n < out.length; n++) out[n] = out[n - 1] / n;
  return out;
})();

/** Series Σ (−x)^n / (n+k)! (Horner), the Taylor expansion of φ_k. */
export function series(x: number, k: number): number {
  let acc = INV_FACT[TERMS + k];
  for (let n = TERMS - 1; n >= 0; n--) acc = INV_FACT[n + k] - x * acc;
  return acc;
}

// The coefficients once more as plain constants, for the unrolled forms below
// (they are the very table entries, so the results are the loop's, bit for bit).
const F1 = INV_FACT[1];
const F2 = INV_FACT[2];
const F3 = INV_FACT[3];
const F4 = INV_FACT[4];
const F5 = INV_FACT[5];
const F6 = INV_FACT[6];
const F7 = INV_FACT[7];
const F8 = INV_FACT[8];
const F9 = INV_FACT[9];
const F10 = INV_FACT[10];
const F11 = INV_FACT[11];
const F12 = INV_FACT[12];
const F13 = INV_FACT[13];

/**
 * series(x, 1), series(x, 2) and series(x, 3), unrolled: the same Horner steps in
 * the same order (TERMS = 10), without the loop and table reads. These sit in
 * the innermost call of every root solve, where the loop form showed in profiles.
 */
export function series1(x: number): number {
  return F1 - x * (F2 - x * (F3 - x * (F4 - x * (F5 - x * (F6 - x * (F7 - x * (F8 - x * (F9 - x * (F10 - x * F11)))))))));
}
export function series2(x: number): number {
  return F2 - x * (F3 - x * (F4 - x * (F5 - x * (F6 - x * (F7 - x * (F8 - x * (F9 - x * (F10 - x * (F11 - x * F12)))))))));
}
export function series3(x: number): number {
  return F3 - x * (F4 - x * (F5 - x * (F6 - x * (F7 - x * (F8 - x * (F9 - x * (F10 - x * (F11 - x * (F12 - x * F13)))))))));
}

/** Fills out[0..2] with e^−x, φ1, φ2 for x >= 0 (what v(t) needs). */
export function phi2(x: number, out: Float64Array): void {
  if (x < SERIES_LIMIT) {
    out[0] = Math.exp(-x);
    out[1] = series1(x);
    out[2] = series2(x);
  } else {
    const m = Math.expm1(-x);
    const p1 = -m / x;
    out[0] = 1 + m;
    out[1] = p1;
    out[2] = (1 - p1) / x;
  }
}

/** Fills out[0..3] with e^−x, φ1, φ2, φ3 for x >= 0 (integrals need φ3 too). */
export function phiAll(x: number, out: Float64Array): void {
  phi2(x, out);
  out[3] = x < SERIES_LIMIT ? series3(x) : (0.5 - out[2]) / x;
}
