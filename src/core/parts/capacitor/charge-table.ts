/**
 * The antiderivative Q(x) = ∫₀ˣ r(u) du of a smooth, even capacitance ratio
 * r (the charge a C(v) capacitor holds per unit C(0), in the curve's own
 * voltage scale), tabulated once per curve so that every charge integral of
 * every piece is a table lookup instead of a quadrature.
 *
 * On each interval [b_k, b_k+1] r is interpolated at Chebyshev points and the
 * interpolant is integrated exactly (the Chebyshev antiderivative recurrence,
 * Mason & Handscomb, "Chebyshev Polynomials", §2.4.4); Q is the running sum.
 * Intervals are 1/2 wide up to x = 2, then grow by a quarter of their start,
 * so the ratio of an interval's half-width to its distance from r's nearest
 * complex singularity (±i for the field law of dc-bias.ts) stays small and
 * degree DEGREE resolves r to rounding. Intervals are built as values reach them.
 */

/** Polynomial degree per interval (coefficients of an analytic r fall below 1e-16 well before this). */
const DEGREE = 20;
const COUNT = DEGREE + 1;
/** Width of the first intervals, and the growth of later ones relative to their start. */
const FIRST_WIDTH = 0.5;
const GROWTH = 0.25;
/** Most intervals a table builds (x up to about 1e9 of the curve's scale). */
const MAX_INTERVALS = 120;

// Chebyshev points of the first kind, cos(π(j + ½)/COUNT), and the cosine table of the discrete transform.
const NODE = Float64Array.from({ length: COUNT }, (_, j) => Math.cos((Math.PI * (j + 0.5)) / COUNT));
const COS = new Float64Array(COUNT * COUNT);
for (let k = 0; k < COUNT; k++) for (let j = 0; j < COUNT; j++) COS[k * COUNT + j] = Math.cos((Math.PI * k * (j + 0.5)) / COUNT);

export class ChargeTable {
  /** Interval starts (bounds.length = intervals + 1). */
  private bounds: number[] = [0];
  /** Q at each interval start. */
  private startQ: number[] = [0];
  /** Antiderivative coefficients per interval (COUNT + 1 each), local coordinate s ∈ [−1, 1], zero at s = −1. */
  private coeffs = new Float64Array(0);
  private readonly f = new Float64Array(COUNT);
  private readonly c = new Float64Array(COUNT);

  constructor(private readonly r: (x: number) => number) {}

  /** Q(x) for x ≥ 0. */
  value(x: number): number {
    const k = this.intervalOf(x);
    const a = this.bounds[k];
    const h = this.bounds[k + 1] - a;
    const s = (2 * (x - a)) / h - 1;
    // Clenshaw on the antiderivative's series.
    const base = k * (COUNT + 1);
    const cf = this.coeffs;
    let b1 = 0;
    let b2 = 0;
    for (let n = COUNT; n >= 1; n--) {
      const t = 2 * s * b1 - b2 + cf[base + n];
      b2 = b1;
      b1 = t;
    }
    return this.startQ[k] + 0.5 * h * (s * b1 - b2 + cf[base]);
  }

  private intervalOf(x: number): number {
    const bounds = this.bounds;
    while (bounds[bounds.length - 1] <= x) {
      if (bounds.length > MAX_INTERVALS) throw new RangeError(`capacitance curve table: ${x} is beyond its range`);
      this.build();
    }
    let lo = 0;
    let hi = bounds.length - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (bounds[mid] <= x) lo = mid;
      else hi = mid;
    }
    return lo;
  }

  /** Adds the next interval: interpolate r, integrate the series, extend the running sum. */
  private build(): void {
    const k = this.bounds.length - 1;
    const a = this.bounds[k];
    const h = a < 2 ? FIRST_WIDTH : GROWTH * a;
    const { f, c } = this;
    for (let j = 0; j < COUNT; j++) f[j] = this.r(a + 0.5 * h * (NODE[j] + 1));
    for (let n = 0; n < COUNT; n++) {
      let sum = 0;
      for (let j = 0; j < COUNT; j++) sum += f[j] * COS[n * COUNT + j];
      c[n] = (2 / COUNT) * sum;
    }
    c[0] *= 0.5;
    // Antiderivative b of Σ c_n T_n: b_n = (c_{n−1} − c_{n+1})/(2n), b_1 = c_0 − c_2/2, b_0 making it vanish at s = −1.
    const grown = new Float64Array((k + 1) * (COUNT + 1));
    grown.set(this.coeffs);
    const base = k * (COUNT + 1);
    const at = (n: number) => (n < COUNT ? c[n] : 0);
    grown[base + 1] = c[0] - 0.5 * at(2);
    for (let n = 2; n <= COUNT; n++) grown[base + n] = (at(n - 1) - at(n + 1)) / (2 * n);
    let atMinusOne = 0;
    for (let n = 1; n <= COUNT; n++) atMinusOne += n & 1 ? -grown[base + n] : grown[base + n];
    grown[base] = -atMinusOne;
    this.coeffs = grown;
    // Q at the interval's end: the series at s = 1 is Σ b_n.
    let atOne = 0;
    for (let n = 0; n <= COUNT; n++) atOne += grown[base + n];
    this.startQ.push(this.startQ[k] + 0.5 * h * atOne);
    this.bounds.push(a + h);
  }
}
