/**
 * Adaptive Gauss–Kronrod quadrature (7-point Gauss embedded in the 15-point
 * Kronrod rule; nodes and weights of the classic QUADPACK QK15 rule, Piessens
 * et al., "QUADPACK", Springer 1983). The difference between the two rules is
 * the error estimate; an interval whose estimate exceeds its share of the
 * tolerance is halved. Allocation-free: a fixed stack of intervals.
 *
 * Used by the non-linear charging primitive (charging.ts), whose integrands are
 * smooth on each interval it is handed (kinks of a point-wise capacitance curve
 * are split off by the caller), so the K15 estimate converges in very few levels.
 */

// Rounded to the nearest double (17 significant digits); the 33-digit table values round to these.
const XGK = [
  0.9914553711208126, 0.9491079123427585, 0.8648644233597691, 0.7415311855993945, 0.5860872354676911,
  0.4058451513773972, 0.20778495500789848, 0.0,
] as const;
const WGK = [
  0.022935322010529224, 0.06309209262997856, 0.10479001032225019, 0.14065325971552592, 0.1690047266392679,
  0.19035057806478542, 0.20443294007529889, 0.20948214108472782,
] as const;
/** Gauss 7-point weights for the Kronrod nodes XGK[1], XGK[3], XGK[5], XGK[7]. */
const WG = [0.1294849661688697, 0.27970539148927664, 0.3818300505051189, 0.4179591836734694] as const;

/** Deepest interval halving: 2^-40 of the span is far below any useful voltage resolution. */
const MAX_DEPTH = 40;
/** Intervals evaluated before giving up refining (the estimate so far is returned). */
const MAX_INTERVALS = 400;

const stackA = new Float64Array(MAX_DEPTH + 2);
const stackB = new Float64Array(MAX_DEPTH + 2);
const stackD = new Int32Array(MAX_DEPTH + 2);

/**
 * One K15 panel: writes the Kronrod value and its error estimate into out[0], out[1].
 * The estimate is QUADPACK's (QK15): |K15 − G7| scaled by min(1, (200·|K15 − G7|/I_asc)^1.5),
 * I_asc ≈ ∫|f − mean f| — the difference of the two rules overstates the error of the
 * Kronrod value by orders of magnitude once the panel resolves f, and this scaling
 * (Piessens et al. 1983, §2.2.2) says so.
 */
function panel(f: (x: number) => number, a: number, b: number, out: Float64Array): void {
  const c = 0.5 * (a + b);
  const h = 0.5 * (b - a);
  const fc = f(c);
  let k = fc * WGK[7];
  let g = fc * WG[3];
  for (let j = 0; j < 7; j++) {
    const dx = h * XGK[j];
    const f1 = f(c - dx);
    const f2 = f(c + dx);
    fv1[j] = f1;
    fv2[j] = f2;
    const s = f1 + f2;
    k += WGK[j] * s;
    if (j & 1) g += WG[j >> 1] * s;
  }
  const mean = 0.5 * k;
  let asc = WGK[7] * Math.abs(fc - mean);
  for (let j = 0; j < 7; j++) asc += WGK[j] * (Math.abs(fv1[j] - mean) + Math.abs(fv2[j] - mean));
  asc *= Math.abs(h);
  let err = Math.abs((k - g) * h);
  if (asc !== 0 && err !== 0) {
    // q^1.5 as q·√q: a general power (x ** 1.5) cost as much as a third of the panel's 15 curve evaluations.
    const q = (200 * err) / asc;
    err = q >= 1 ? asc : asc * (q * Math.sqrt(q));
  }
  out[0] = k * h;
  out[1] = err;
}

const fv1 = new Float64Array(7);
const fv2 = new Float64Array(7);
const scratch = new Float64Array(2);

/**
 * ∫_a^b f(x) dx to an absolute tolerance absTol (the interval estimates are
 * summed; each interval must meet its length share of the tolerance).
 * Returns the integral; lastQuadratureError() gives the summed estimate of its error.
 */
export function integrateAdaptive(f: (x: number) => number, a: number, b: number, absTol: number): number {
  if (a === b) {
    lastErr = 0;
    return 0;
  }
  const span = Math.abs(b - a);
  let top = 0;
  stackA[0] = a;
  stackB[0] = b;
  stackD[0] = 0;
  let total = 0;
  let err = 0;
  let intervals = 0;
  while (top >= 0) {
    const lo = stackA[top];
    const hi = stackB[top];
    const depth = stackD[top];
    top--;
    panel(f, lo, hi, scratch);
    intervals++;
    const share = (absTol * Math.abs(hi - lo)) / span;
    if (scratch[1] <= share || depth >= MAX_DEPTH || intervals + top >= MAX_INTERVALS) {
      total += scratch[0];
      err += scratch[1];
      continue;
    }
    const mid = 0.5 * (lo + hi);
    // Right half first on the stack so the left half is integrated first (order does not matter for the sum).
    top++;
    stackA[top] = mid;
    stackB[top] = hi;
    stackD[top] = depth + 1;
    top++;
    stackA[top] = lo;
    stackB[top] = mid;
    stackD[top] = depth + 1;
  }
  lastErr = err;
  return total;
}

let lastErr = 0;
/** Summed error estimate of the last integrateAdaptive call. */
export function lastQuadratureError(): number {
  return lastErr;
}
