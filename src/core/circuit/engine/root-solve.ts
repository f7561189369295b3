/**
 * Root and extremum search for quantities affine in (v, s) inside one piece:
 * g(t) = c0 + cv·v(t) + cs·s(t). Because v' is monotone in a piece (see
 * kinematics.ts), g' is monotone too, so g has at most one extremum and at most
 * two roots: splitting at the extremum leaves monotone parts, each holding at
 * most one sign change, which a bracketed Newton iteration (bisection when a
 * Newton step leaves the bracket) pins down to a few ulps of the piece length.
 *
 * Plain exponential pieces (the source does not move) are solved in closed form,
 * the same logarithm the closed-form model uses, so both models agree to
 * rounding where both apply.
 */
import type { CapacitorKinematics } from './capacitor-kinematics.ts';
import type { Kinematics } from './kinematics.ts';

/** Iteration cap of every bracketed solve (each step at least halves the bracket or is a converging Newton step). */
const MAX_ITERATIONS = 100;
/** Relative bracket width at which a time is considered exact (a few ulps). */
const RELATIVE_TIME_TOLERANCE = 4e-16;

/** What the bracketed solver needs: a value and its slope at t. */
export interface BracketProbe {
  eval(t: number): void;
  value: number;
  slope: number;
}

/** Evaluates g (order 0) or g' (order 1) and its slope at t, for the bracketed solver. */
export class AffineProbe implements BracketProbe {
  c0 = 0;
  cv = 0;
  cs = 0;
  order = 0;
  /** Boundary tolerance of the function firstExit watches (a start this far outside still counts as on it). */
  tolerance = 0;
  value = 0;
  slope = 0;
  constructor(readonly kin: Kinematics) {}

  setAffine(c0: number, cv: number, cs: number): this {
    this.c0 = c0;
    this.cv = cv;
    this.cs = cs;
    return this;
  }

  eval(t: number): void {
    const k = this.kin;
    if (this.cv === 0 && this.order === 0) {
      // g follows the source alone (e.g. the pin of a stiff output): no capacitor voltage needed.
      this.value = this.c0 + this.cs * k.s(t);
      this.slope = this.cs * k.r;
      return;
    }
    const v = k.v(t);
    const dv = k.dv(t, v);
    if (this.order === 0) {
      this.value = this.c0 + this.cv * v + this.cs * k.s(t);
      this.slope = this.cv * dv + this.cs * k.r;
    } else {
      this.value = this.cv * dv + this.cs * k.r;
      this.slope = this.cv * k.d2v(dv);
    }
  }
}

/**
 * Sign change of the probe inside [lo, hi], where the probe is >= 0 at lo and
 * < 0 at hi (values fLo, fHi). Returns a time on the hi side of the change
 * (the probe is already negative there), within a few ulps of the crossing.
 */
export function solveBracket(probe: BracketProbe, lo: number, hi: number, fLo: number, fHi: number, relativeTolerance = RELATIVE_TIME_TOLERANCE): number {
  let a = lo;
  let b = hi;
  const tolT = Math.max(relativeTolerance * Math.abs(hi), 1e-300);
  // Regula-falsi start: good when the bracket is nearly linear.
  let x = fLo - fHi > 0 ? a + (fLo * (b - a)) / (fLo - fHi) : 0.5 * (a + b);
  if (!(x > a && x < b)) x = 0.5 * (a + b);
  for (let i = 0; i < MAX_ITERATIONS; i++) {
    probe.eval(x);
    const f = probe.value;
    if (f === 0) return x; // exactly on the boundary: not yet outside, and the root itself
    if (f > 0) a = x;
    else b = x;
    if (b - a <= tolT) break;
    let next = x - f / probe.slope;
    // Newton on a convex function closes in from one side only: once its step is
    // below the tolerance, probe just across the root to close the bracket.
    if (Math.abs(next - x) <= tolT) next = f > 0 ? x + tolT : x - tolT;
    if (!(next > a && next < b)) next = 0.5 * (a + b);
    x = next;
  }
  return b;
}

/** Values of v, v', s at both ends of a piece, computed once and shared by every function watched in it. */
export class PieceEnds {
  durationS = 0;
  v0 = 0;
  dv0 = 0;
  s0 = 0;
  vT = 0;
  dvT = 0;
  sT = 0;
  /** ∫₀ᵀ v dt when fill() computed the far end (NaN otherwise): the walk logs it with the piece. */
  integralV = Number.NaN;
  private readonly endScratch = new Float64Array(2);

  /** Fill with a known far-end voltage (computed by the caller together with something else). */
  fillWithEnd(kin: Kinematics, durationS: number, vT: number): void {
    this.durationS = durationS;
    this.v0 = kin.v0;
    this.dv0 = kin.dv(0, kin.v0);
    this.s0 = kin.s0;
    this.vT = vT;
    this.integralV = Number.NaN;
    this.dvT = kin.dv(durationS, vT);
    this.sT = kin.s(durationS);
  }

  /** `always`: also fill the far end of a plain exponential piece (the walk's closed-form path does not need it). */
  fill(kin: Kinematics, durationS: number, always = false): void {
    this.durationS = durationS;
    this.v0 = kin.v0;
    // Kinematics.dv at t = 0 written out for a linear capacitor (the C(v) override is a call the walk's
    // every piece paid for).
    this.dv0 = kin.nonlinear ? kin.dv(0, kin.v0) : -kin.a * kin.v0 + kin.k0 + kin.k1 * 0;
    this.s0 = kin.s0;
    if (Number.isFinite(durationS) && (always || kin.r !== 0)) {
      // The end voltage and the integral share one evaluation of the φ-functions.
      const out = this.endScratch;
      kin.endAndIntegral(durationS, out);
      this.vT = out[0];
      this.integralV = out[1];
      this.dvT = kin.nonlinear ? kin.dv(durationS, this.vT) : -kin.a * this.vT + kin.k0 + kin.k1 * durationS;
      this.sT = kin.s0 + kin.r * durationS;
    } else {
      this.vT = this.dvT = this.sT = this.integralV = Number.NaN;
    }
  }
}

/**
 * First time in [0, T] at which g = c0 + cv·v + cs·s leaves the region g >= 0
 * (Infinity when it does not). A start within `tolerance` below zero counts as
 * on the boundary: an exit only if g is moving outward there.
 */
export function firstExit(probe: AffineProbe, ends: PieceEnds, c0: number, cv: number, cs: number, tolerance: number): number {
  // Small enough to be inlined at the call site: the numbers land in the probe's fields instead of
  // being boxed for the call (the walk calls this for every watched function of every piece).
  probe.setAffine(c0, cv, cs);
  probe.tolerance = tolerance;
  return exitOfProbe(probe, ends);
}

/** firstExit for g = probe.c0 + probe.cv·v + probe.cs·s and the boundary tolerance probe.tolerance. */
function exitOfProbe(probe: AffineProbe, ends: PieceEnds): number {
  const c0 = probe.c0;
  const cv = probe.cv;
  const cs = probe.cs;
  const tolerance = probe.tolerance;
  const kin = probe.kin;
  const T = ends.durationS;
  const g0 = c0 + cv * ends.v0 + cs * ends.s0;
  if (g0 < -tolerance) return 0;
  if (kin.r === 0) {
    // Source at rest: an exponential (closed form), or with a C(v) capacitor the exit at a known voltage.
    if (kin.nonlinear) return (kin as CapacitorKinematics).voltageExit(g0, c0 + cs * ends.s0, cv, T);
    return exitAtRest(kin.a, kin.k0, kin.v0, g0, c0 + cv * ends.vT + cs * ends.sT, c0 + cs * ends.s0, cv, T);
  }

  const gd0 = cv * ends.dv0 + cs * kin.r;
  if (g0 < 0 && gd0 < 0) return 0;
  const gT = c0 + cv * ends.vT + cs * ends.sT;
  const gdT = cv * ends.dvT + cs * kin.r;
  if (gd0 >= 0 && gdT >= 0) return Infinity; // non-decreasing over the piece
  if (gd0 <= 0 && gdT <= 0) {
    // non-increasing: one sign change at most
    if (gT >= 0) return Infinity;
    if (g0 < 0) return 0;
    probe.order = 0;
    return solveBracket(probe, 0, T, g0, gT);
  }
  const tExt = extremumTime(probe, T, gd0, gdT);
  probe.order = 0;
  probe.eval(tExt);
  const gExt = probe.value;
  if (gd0 < 0) {
    // convex, interior minimum
    if (gExt >= 0) return Infinity;
    if (g0 < 0) return 0;
    return solveBracket(probe, 0, tExt, g0, gExt);
  }
  // concave, interior maximum: the exit, if any, is on the falling part
  if (gT >= 0) return Infinity;
  if (gExt < 0) return 0;
  return solveBracket(probe, tExt, T, gExt, gT);
}

/**
 * firstExit in a plain exponential piece (linear capacitor, source at rest) from g at both ends (gT NaN
 * when the far end is not known) and g0 not below the boundary tolerance. Numbers in, a number out: the
 * walk's probe and the prepared model's cycle replay (cycle-replay.ts) both decide through it.
 */
export function exitAtRest(a: number, k0: number, v0: number, g0: number, gT: number, constPart: number, cv: number, T: number): number {
  // g is monotone in a plain exponential piece: strictly inside at a far end already evaluated (a piece
  // that ends at a time event), it never left — no logarithm needed.
  if (gT > 0) return Infinity;
  return exponentialExit(a, k0, v0, g0, constPart, cv, T);
}

/**
 * Exit time of g = constPart + cv·v from g >= 0 in a plain exponential piece (dv/dt = k0 − a·v from v0;
 * g0 = g at the start, already known not to be below the boundary tolerance):
 * g(t) = α + β·e^(−a·t) (or linear when a = 0), closed form. Numbers in, a number out, so the
 * prepared model's two-piece program (prepared.ts) calls it without a probe.
 */
export function exponentialExit(a: number, k0: number, v0: number, g0: number, constPart: number, cv: number, T: number): number {
  let t: number;
  if (a > 0) {
    const vInf = k0 / a;
    const alpha = constPart + cv * vInf;
    const beta = cv * (v0 - vInf);
    if (!(beta > 0)) return Infinity; // rising or constant: never leaves
    if (g0 < 0) return 0;
    if (!(alpha < 0)) return Infinity; // settles inside the region
    t = Math.log(beta / -alpha) / a;
  } else {
    const slope = cv * k0;
    if (!(slope < 0)) return Infinity;
    if (g0 < 0) return 0;
    t = g0 / -slope;
  }
  if (!(t > 0)) return 0;
  return t <= T ? t : Infinity;
}

/**
 * Time in (0, T) where g' changes sign (g'(0) = gd0 and g'(T) = gdT have
 * opposite signs). g' = cv·v' + cs·r with v'(t) = k1/a + (v'(0) − k1/a)·e^(−at)
 * (v'(0) + k1·t when a = 0), so the extremum is a logarithm away; the bracketed
 * solve is only the fallback for a·T so small that the logarithm would cancel.
 */
export function extremumTime(probe: AffineProbe, T: number, gd0: number, gdT: number): number {
  const kin = probe.kin;
  const cv = probe.cv;
  const cs = probe.cs;
  // The logarithm holds for a linear capacitor only; with C(v) the bracketed solve below finds it.
  if (cv !== 0 && !kin.nonlinear) {
    const target = (-cs * kin.r) / cv; // the v' at which g' = 0
    const a = kin.a;
    const dv0 = kin.dv(0, kin.v0);
    let t = Number.NaN;
    if (a * T > 1e-3) {
      const settle = kin.k1 / a;
      const ratio = (target - settle) / (dv0 - settle);
      if (ratio > 0 && ratio < 1) t = -Math.log(ratio) / a;
    } else if (a === 0 && kin.k1 !== 0) {
      t = (target - dv0) / kin.k1;
    }
    if (t > 0 && t < T) return t;
  }
  const c0 = probe.c0;
  probe.order = 1;
  // Orient so the solver sees "non-negative at lo, negative at hi".
  if (gd0 >= 0) return solveBracket(probe, 0, T, gd0, gdT);
  probe.setAffine(-c0, -cv, -cs);
  const t = solveBracket(probe, 0, T, -gd0, -gdT);
  probe.setAffine(c0, cv, cs);
  return t;
}
