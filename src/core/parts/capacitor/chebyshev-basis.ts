/**
 * The Chebyshev machinery of the Picard–Chebyshev pieces (docs/model.md, "non-linear
 * capacitor"): degree-N interpolation on Chebyshev–Lobatto nodes, Clenshaw–Curtis
 * integration as one matrix, the split step that carries a linear decay on the
 * implicit side, and Clenshaw evaluation. One copy, shared by the one-state slew
 * piece (chebyshev-piece.ts) and the multi-state C(v) piece (circuit/engine/modal-curved.ts).
 */

/** Polynomial degree per sub-interval. */
export const CHEBYSHEV_DEGREE = 12;
const N = CHEBYSHEV_DEGREE;

// cos(π·j·k/N) for k = 0..N+1 (row k), j = 0..N: Lobatto nodes x_j = cos(πj/N) run from +1 down to −1.
export const COS = new Float64Array((N + 2) * (N + 1));
for (let k = 0; k <= N + 1; k++) for (let j = 0; j <= N; j++) COS[k * (N + 1) + j] = Math.cos((Math.PI * j * k) / N);
export const NODE_X = Float64Array.from({ length: N + 1 }, (_, j) => Math.cos((Math.PI * j) / N));

/** Chebyshev coefficients (true coefficients: p = Σ c_k T_k) of the interpolant through node values f_j. */
export function coefficients(f: Float64Array, c: Float64Array): void {
  for (let k = 0; k <= N; k++) {
    let s = 0.5 * (f[0] * COS[k * (N + 1)] + f[N] * COS[k * (N + 1) + N]);
    for (let j = 1; j < N; j++) s += f[j] * COS[k * (N + 1) + j];
    c[k] = (2 / N) * s;
  }
  c[0] *= 0.5;
  c[N] *= 0.5;
}

/** Antiderivative coefficients b (degree N+1) of p = Σ c_k T_k with I(−1) = 0. */
export function antiderivative(c: Float64Array, b: Float64Array): void {
  // c_k beyond N is 0 (written out: a helper closure here would be built on every call).
  b[1] = c[0] - 0.5 * c[2];
  for (let k = 2; k < N; k++) b[k] = (c[k - 1] - c[k + 1]) / (2 * k);
  b[N] = c[N - 1] / (2 * N);
  b[N + 1] = c[N] / (2 * (N + 1));
  let s = 0;
  for (let k = 1; k <= N + 1; k++) s += k & 1 ? -b[k] : b[k];
  b[0] = -s;
}

/**
 * The Picard step's linear part as one matrix: node values of f → node values of
 * ∫_{−1}^{x_j} p_f (p_f the interpolant of f), i.e. coefficients, antiderivative
 * and evaluation at the nodes composed once (row j, column i).
 */
export const INTEGRATE = (() => {
  const m = new Float64Array((N + 1) * (N + 1));
  const e = new Float64Array(N + 1);
  const c = new Float64Array(N + 1);
  const b = new Float64Array(N + 2);
  for (let i = 0; i <= N; i++) {
    e.fill(0);
    e[i] = 1;
    coefficients(e, c);
    antiderivative(c, b);
    for (let j = 0; j <= N; j++) {
      let sum = 0;
      for (let k = 0; k <= N + 1; k++) sum += b[k] * COS[k * (N + 1) + j];
      m[j * (N + 1) + i] = sum;
    }
  }
  return m;
})();

/**
 * The split Picard step for the level κ = α·h (α the decay rate carried on the implicit side):
 * the collocation equations v = v_A + (h/2)·M·f with f = −α·v + g rearrange to
 * v = v_A·P·1 + (h/2)·P·M·g, P = (I + (κ/2)·M)⁻¹. P·M (row-major) into pm, P·1 into u;
 * aug is scratch of (N+1)·(2N+3) numbers (nothing allocated here).
 */
export function buildSplitStep(kappa: number, pm: Float64Array, u: Float64Array, aug: Float64Array): void {
  const n = N + 1;
  // Gauss–Jordan with partial pivoting on [I + (κ/2)·M | M | 1] gives P·M and P·1 together.
  const w = 2 * n + 1;
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      aug[j * w + i] = (i === j ? 1 : 0) + 0.5 * kappa * INTEGRATE[j * n + i];
      aug[j * w + n + i] = INTEGRATE[j * n + i];
    }
    aug[j * w + 2 * n] = 1;
  }
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(aug[r * w + col]) > Math.abs(aug[pivot * w + col])) pivot = r;
    if (pivot !== col) {
      for (let k = 0; k < w; k++) {
        const t = aug[col * w + k];
        aug[col * w + k] = aug[pivot * w + k];
        aug[pivot * w + k] = t;
      }
    }
    const inv = 1 / aug[col * w + col];
    for (let k = 0; k < w; k++) aug[col * w + k] *= inv;
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const factor = aug[r * w + col];
      if (factor === 0) continue;
      for (let k = 0; k < w; k++) aug[r * w + k] -= factor * aug[col * w + k];
    }
  }
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) pm[j * n + i] = aug[j * w + n + i];
    u[j] = aug[j * w + 2 * n];
  }
}

/** Σ_{k=0}^{n} c_k T_k(x) by Clenshaw's recurrence. */
export function clenshaw(c: Float64Array, n: number, x: number, offset = 0): number {
  let b1 = 0;
  let b2 = 0;
  for (let k = n; k >= 1; k--) {
    const t = 2 * x * b1 - b2 + c[offset + k];
    b2 = b1;
    b1 = t;
  }
  return x * b1 - b2 + c[offset];
}


/** Chebyshev coefficients of the derivative (w.r.t. the local variable) of a degree-N series (d must not be c). */
export function derivative(c: Float64Array, d: Float64Array): void {
  d[N] = 0;
  d[N - 1] = 2 * N * c[N];
  for (let k = N - 1; k >= 1; k--) d[k - 1] = d[k + 1] + 2 * k * c[k];
  d[0] *= 0.5;
}

/** κ from which buildExponentialStep is well conditioned (its series' terms fall: a = κ/2 ≥ N²). */
export const EXPONENTIAL_STEP_KAPPA = 2 * N * N;

/**
 * The exponential counterpart of buildSplitStep for a fast decay (κ = α·h ≥ EXPONENTIAL_STEP_KAPPA):
 * z' = −α·z + g with g the interpolant of its node values solved exactly, z = z_A·e + (h/2)·E·g at the
 * nodes, e_j = e^(−κ(x_j+1)/2). In the local variable dz/dx = −a·z + (h/2)·g (a = κ/2), whose
 * polynomial particular solution p = Σ_m (−D)^m·g/a^(m+1) is a finite sum (D nilpotent) with falling
 * terms for a ≥ N²; z = p − e^(−a(x+1))·p(−1) + e^(−a(x+1))·z_A. Unlike the collocation (whose
 * stability function tends to ±1 for κ → ∞), a transient of the fast mode decays exactly, so what the
 * previous sub-interval left of it does not persist. E row-major into em, e into ex; scratch of 3·(N+1).
 */
export function buildExponentialStep(kappa: number, em: Float64Array, ex: Float64Array, scratch: Float64Array): void {
  const n = N + 1;
  const a = kappa / 2;
  const f = scratch.subarray(0, n);
  const term = scratch.subarray(n, 2 * n);
  const next = scratch.subarray(2 * n, 3 * n);
  for (let j = 0; j <= N; j++) ex[j] = Math.exp(-a * (NODE_X[j] + 1));
  for (let l = 0; l <= N; l++) {
    f.fill(0);
    f[l] = 1;
    coefficients(f, term);
    // f now accumulates p's coefficients.
    for (let k = 0; k <= N; k++) {
      term[k] /= a;
      f[k] = term[k];
    }
    for (let m = 1; m <= N; m++) {
      derivative(term, next);
      for (let k = 0; k <= N; k++) {
        term[k] = -next[k] / a;
        f[k] += term[k];
      }
    }
    const pAtStart = clenshaw(f, N, -1);
    for (let j = 0; j <= N; j++) em[j * n + l] = clenshaw(f, N, NODE_X[j]) - ex[j] * pAtStart;
  }
}
