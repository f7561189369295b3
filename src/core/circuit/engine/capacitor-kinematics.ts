/**
 * The motion inside one piece when the timing capacitor's capacitance depends
 * on its voltage (a class II/III ceramic: docs/model.md, "non-linear
 * capacitor"). The network reduction is the same as for a linear capacitor,
 * made with the capacitance at 0 V, C0; the capacitor then obeys
 *
 *     r(v)·dv/dt = k0 + k1·t − a·v,        r(v) = C(v)/C0,
 *
 * the linear piece's equation with its left side weighted by the curve. Two
 * piece kinds, both event-driven and exact to the quadrature tolerance:
 * - source at rest (k1 = 0): separable — time = ∫ r(v)/(k0 − a·v) dv by
 *   adaptive quadrature, an event at a known voltage is a quadrature, a time
 *   event an inverse (NonlinearCharge, parts/capacitor/charging.ts);
 * - source slewing (k1 ≠ 0): Picard–Chebyshev collocation over the piece, a
 *   dense polynomial answer (ChebyshevPiece, parts/capacitor/chebyshev-piece.ts).
 * With a flat curve every method defers to the linear Kinematics unchanged, so
 * linear capacitors keep their closed forms bit for bit.
 */
import { ChebyshevPiece, FLAT_SHAPE, NonlinearCharge, type BiasShape } from '../../parts/capacitor/index.ts';
import { Kinematics } from './kinematics.ts';

/** Event functions a piece can watch (threshold + diodes + clamp + limit). */
const EXIT_MEMORY = 10;
/**
 * Slew pieces kept solved, one pool for every kinematics of the thread: a walk meets the
 * same few pieces again and again (the rising and falling edge of every settled cycle,
 * and the re-tries of a piece shortened by an event), and the figures then re-read the
 * walk's logged pieces through the evaluator's own kinematics (piece-evaluator.ts) with
 * the same inputs: each is the same polynomial every time, solved once. A kinematics
 * whose piece was taken over by another (its generation moved on) sets it again.
 */
const SLEW_MEMORY = 8;
const SLEWS = Array.from({ length: SLEW_MEMORY }, () => new ChebyshevPiece());
let slewNext = 0;

export class CapacitorKinematics extends Kinematics {
  shape: BiasShape = FLAT_SHAPE;
  private autonomous = true;
  private scaleV = 1;
  private readonly charge = new NonlinearCharge();
  private cheb = SLEWS[0];
  /** The generation of cheb when this kinematics set or found it (another taking it over moves it on). */
  private chebGeneration = -1;
  /** Events of this piece located at known voltages: their times and voltages (save the inverse at the piece end). */
  private readonly exitT = new Float64Array(EXIT_MEMORY);
  private readonly exitV = new Float64Array(EXIT_MEMORY);
  private exits = 0;

  /** The curve of the circuit's timing capacitor; scaleV (the supply span) sets tolerances. */
  setShape(shape: BiasShape, scaleV: number): void {
    this.shape = shape;
    this.nonlinear = shape.kind !== 'flat';
    this.scaleV = scaleV;
  }

  protected override setNonlinearPiece(): void {
    const { a, k0, k1 } = this;
    this.autonomous = k1 === 0;
    this.exits = 0;
    // Per unit C0: the "capacitance" is 1 and the current k0 − a·v.
    if (this.autonomous) this.charge.setPiece(this.shape, 1, k0, a);
    else this.takeSlewPiece();
  }

  /** The solved slew piece for this piece's inputs if the pool keeps one, else the oldest slot set to them. */
  private takeSlewPiece(): ChebyshevPiece {
    const { a, k0, k1, v0 } = this;
    let piece: ChebyshevPiece | undefined;
    for (let i = 0; i < SLEW_MEMORY && !piece; i++) if (SLEWS[i].holds(this.shape, a, k0, k1, v0, this.scaleV)) piece = SLEWS[i];
    if (!piece) {
      piece = SLEWS[slewNext].set(this.shape, a, k0, k1, v0, this.scaleV);
      slewNext = (slewNext + 1) % SLEW_MEMORY;
    }
    this.cheb = piece;
    this.chebGeneration = piece.generation;
    return piece;
  }

  /** This piece's slew solution (set again if another kinematics took its slot over since). */
  private slew(): ChebyshevPiece {
    return this.cheb.generation === this.chebGeneration ? this.cheb : this.takeSlewPiece();
  }

  override v(t: number): number {
    if (!this.nonlinear) return super.v(t);
    if (t === 0) return this.v0;
    if (!this.autonomous) return this.slew().v(t);
    for (let k = 0; k < this.exits; k++) if (this.exitT[k] === t) return this.exitV[k];
    return this.charge.voltageAfter(this.v0, t);
  }

  override dv(t: number, vAtT: number): number {
    if (!this.nonlinear) return super.dv(t, vAtT);
    return this.curvedDv(t, vAtT);
  }

  /** dv for a C(v) capacitor, out of dv so that a linear capacitor's dv stays as small as before (it is inlined into the root solves). */
  private curvedDv(t: number, vAtT: number): number {
    const r = this.shape.ratio(vAtT);
    this.dvAtV = vAtT;
    this.dvRatio = r;
    return (-this.a * vAtT + this.k0 + this.k1 * t) / r;
  }

  /** v and r(v) of the last dv call: d2v, which the probe calls right after it, needs them. */
  private dvAtV = 0;
  private dvRatio = 1;

  /**
   * v'' from v' for the Newton steps of the bracketed solvers. With C(v), d(r·v')/dt = k1 − a·v' gives
   * v'' = (k1 − a·v' − r'(v)·v'²)/r(v) at the v of the preceding dv call. The curve's terms matter: a
   * slope without them (off by the factor r and the r'·v'² term) made the Newton steps of an
   * extremum search converge only linearly, ~30 evaluations each on a slewing edge.
   */
  override d2v(dvAtT: number): number {
    if (!this.nonlinear) return -this.a * dvAtT + this.k1;
    return this.curvedD2v(dvAtT);
  }

  private curvedD2v(dvAtT: number): number {
    return (this.k1 - this.a * dvAtT - this.shape.slope(this.dvAtV) * dvAtT * dvAtT) / this.dvRatio;
  }

  override integralV(durationS: number): number {
    if (!this.nonlinear) return super.integralV(durationS);
    if (!this.autonomous) return this.slew().integralV(durationS);
    return this.charge.voltageTimeOver(this.v0, this.v(durationS), durationS);
  }

  override endAndIntegral(durationS: number, out: Float64Array): void {
    if (!this.nonlinear) {
      super.endAndIntegral(durationS, out);
      return;
    }
    if (!this.autonomous) {
      const piece = this.slew();
      out[0] = piece.v(durationS);
      out[1] = piece.integralV(durationS);
      return;
    }
    const vEnd = this.v(durationS);
    out[0] = vEnd;
    out[1] = this.charge.voltageTimeOver(this.v0, vEnd, durationS);
  }

  /**
   * First time in (0, T] at which g = constPart + cv·v leaves g ≥ 0 in a piece
   * whose source is at rest (the non-linear counterpart of the closed-form
   * exponential exit): v moves monotonically, so g crosses zero at most once,
   * at the known voltage v* = −constPart/cv, reached after a quadrature.
   */
  voltageExit(g0: number, constPart: number, cv: number, T: number): number {
    if (cv === 0) return Infinity;
    const a = this.a;
    const vInf = a > 0 ? this.k0 / a : Number.NaN;
    const dir = a > 0 ? Math.sign(vInf - this.v0) : Math.sign(this.k0);
    if (dir === 0 || cv * dir >= 0) return Infinity; // g constant or rising along the motion
    if (g0 < 0) return 0;
    const vStar = -constPart / cv;
    if ((vStar - this.v0) * dir < 0) return 0;
    if (a > 0 && !((vInf - vStar) * dir > 0)) return Infinity; // settles before reaching it
    const t = this.charge.timeBetween(this.v0, vStar);
    if (!(t > 0)) return 0;
    if (this.exits < EXIT_MEMORY) {
      this.exitT[this.exits] = t;
      this.exitV[this.exits++] = vStar;
    }
    return t <= T ? t : Infinity;
  }
}
