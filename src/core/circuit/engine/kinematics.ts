/**
 * The motion inside one linear piece, solved exactly.
 *
 * In a piece the capacitor obeys  dv/dt = −a·v + k0 + k1·t  (a = G/C >= 0; k0 and k1
 * come from the network's constant and source terms while the output-stage source
 * moves as s(t) = s0 + r·t). The solution, with x = a·t, is
 *
 *   v(t) = v0·e^−x + k0·t·φ1(x) + k1·t²·φ2(x)          (exponential + ramp response)
 *   v'(t) = −a·v(t) + k0 + k1·t
 *   ∫₀ᵀ v dt = v0·T·φ1(aT) + k0·T²·φ2(aT) + k1·T³·φ3(aT)
 *
 * and v'' = (k1 − a·v'(0))·e^−at never changes sign, so v' is monotone in a piece:
 * every quantity affine in (v, s) has at most one extremum per piece. Root
 * finding and extremum search rely on that.
 */
import * as phi from './phi.ts';

// The φ-functions read through module-local bindings: every root solve's innermost call must not pay a live
// import binding's accessor per read (some loaders compile one to a getter call).
const phi2 = phi.phi2;
const phiAll = phi.phiAll;
const series1 = phi.series1;
const series2 = phi.series2;
const SERIES_LIMIT = phi.SERIES_LIMIT;

export class Kinematics {
  a = 0;
  k0 = 0;
  k1 = 0;
  v0 = 0;
  s0 = 0;
  r = 0;
  /**
   * True for a C(v) capacitor's motion (CapacitorKinematics with a curve that is not flat): the
   * root solves then take its own exits. A field, not an instanceof test, on the solvers' hot path.
   */
  nonlinear = false;
  private readonly phi = new Float64Array(4);

  /**
   * One method for every kinematics (not overridden, and small): the walk calls it for every piece,
   * and a call the compiler inlines hands the six numbers over without boxing them.
   */
  set(a: number, k0: number, k1: number, v0: number, s0: number, r: number): void {
    this.a = a;
    this.k0 = k0;
    this.k1 = k1;
    this.v0 = v0;
    this.s0 = s0;
    this.r = r;
    if (this.nonlinear) this.setNonlinearPiece();
  }

  /** A C(v) capacitor's piece set-up from the fields above (CapacitorKinematics; never called for a linear capacitor). */
  protected setNonlinearPiece(): void {}

  /** Capacitor voltage at time t into the piece. */
  v(t: number): number {
    if (t === 0) return this.v0;
    // φ-functions inlined (this is the innermost call of every root solve).
    const x = this.a * t;
    let e: number;
    let p1: number;
    let p2: number;
    if (x < SERIES_LIMIT) {
      e = Math.exp(-x);
      p1 = series1(x);
      p2 = series2(x);
    } else {
      const m = Math.expm1(-x);
      e = 1 + m;
      p1 = -m / x;
      p2 = (1 - p1) / x;
    }
    return this.v0 * e + this.k0 * t * p1 + this.k1 * t * t * p2;
  }

  /**
   * v(T) from one evaluation of e^−x, φ1, φ2 into the reused buffer: endAndIntegral's first number without
   * ∫v dt (and v(T) itself, bit for bit), small enough to be inlined where a piece's far end is read.
   */
  vAtEnd(durationS: number): number {
    const phi = this.phi;
    const T = durationS;
    phi2(this.a * T, phi);
    return this.v0 * phi[0] + this.k0 * T * phi[1] + this.k1 * T * T * phi[2];
  }

  /** dv/dt given v(t) (the ODE itself). */
  dv(t: number, vAtT: number): number {
    return -this.a * vAtT + this.k0 + this.k1 * t;
  }

  /** d²v/dt² given v'(t). */
  d2v(dvAtT: number): number {
    return -this.a * dvAtT + this.k1;
  }

  s(t: number): number {
    return this.s0 + this.r * t;
  }

  /** ∫₀ᵀ v dt. */
  integralV(durationS: number): number {
    const phi = this.phi;
    phiAll(this.a * durationS, phi);
    const T = durationS;
    return this.v0 * T * phi[1] + this.k0 * T * T * phi[2] + this.k1 * T * T * T * phi[3];
  }

  /** v(T) into out[0] and ∫₀ᵀ v dt into out[1], from one evaluation of the φ-functions. */
  endAndIntegral(durationS: number, out: Float64Array): void {
    const phi = this.phi;
    const T = durationS;
    phiAll(this.a * T, phi);
    out[0] = this.v0 * phi[0] + this.k0 * T * phi[1] + this.k1 * T * T * phi[2];
    out[1] = this.v0 * T * phi[1] + this.k0 * T * T * phi[2] + this.k1 * T * T * T * phi[3];
  }

  /** ∫₀ᵀ s dt. */
  integralS(durationS: number): number {
    return this.s0 * durationS + 0.5 * this.r * durationS * durationS;
  }

  /** True when the source does not move (the piece is a plain exponential). */
  get isExponential(): boolean {
    return this.r === 0;
  }
}
