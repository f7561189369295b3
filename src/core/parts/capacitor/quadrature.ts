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

const XGK = [
  0.991455371120812639206854697526329, 0.949107912342758524526189684047851, 0.864864423359769072789712788640926,
  0.741531185599394439863864773280788, 0.586087235467691130294144845693013, 0.405845151377397166906606412076961,
  0.207784955007898467600689403773245, 0.0,
] as const;
const WGK = [
  0.02293532201052922496373200805897, 0.063092092629978553290700663189204, 0.104790010322250183839876322541518,
  0.140653259715525918745189590510238, 0.16900472663926790282658342659855, 0.190350578064785409913256402421014,
  0.204432940075298892414161999234649, 0.209482141084727828012999174891714,
] as const;
/** Gauss 7-point weights for the Kronrod nodes XGK[1], XGK[3], XGK[5], XGK[7]. */
const WG = [
  0.129484966168869693270611432679082, 0.27970539148927666790146777142378, 0.381830050505118944950369775488975,
  0.417959183673469387755102040816327,
] as const;

/** Deepest interval halving: 2^-40 of the span is far below any useful voltage resolution. */
const MAX_DEPTH = 40;
/** Intervals evaluated before giving up refining (the estimate so far is returned). */
const MAX_INTERVALS = 400;

const stackA = new Float64Array(MAX_DEPTH + 2);
const stackB = new Float64Array(MAX_DEPTH + 2);
const stackD = new Int32Array(MAX_DEPTH + 2);

/** One K15 panel: writes the Kronrod value and |K15 − G7| into out[0], out[1]. */
function panel(f: (x: number) => number, a: number, b: number, out: Float64Array): void {
  const c = 0.5 * (a + b);
  const h = 0.5 * (b - a);
  const fc = f(c);
  let k = fc * WGK[7];
  let g = fc * WG[3];
  for (let j = 0; j < 7; j++) {
    const dx = h * XGK[j];
    const s = f(c - dx) + f(c + dx);
    k += WGK[j] * s;
    if (j & 1) g += WG[j >> 1] * s;
  }
  out[0] = k * h;
  out[1] = Math.abs((k - g) * h);
}

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
