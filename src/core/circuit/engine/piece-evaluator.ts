/**
 * Re-evaluates logged pieces after the walk: values, extremes, level crossings
 * and integrals of any quantity affine in (v, s), all exact per piece.
 */
import type { ConfigCache, ConfigModel } from './configs.ts';
import { CapacitorKinematics } from './capacitor-kinematics.ts';
import { Kinematics } from './kinematics.ts';
import { LOG, LOG_STRIDE, type PieceLog } from './piece-log.ts';
import { AffineProbe, extremumTime, PieceEnds, solveBracket } from './root-solve.ts';
import { MAX_STATES, ModalKinematics, R_C, R_S, R_X, SLOT } from './modal.ts';

export class PieceEvaluator {
  readonly kin = new CapacitorKinematics();
  private readonly probe = new AffineProbe(this.kin);
  /**
   * The loaded piece once more as a plain Kinematics (the same fields, so the same v(t) bit for bit) for the
   * crossing solves of a linear capacitor: the solver's probe then meets one kinematics class there, and
   * its v(t) is compiled into the solve instead of called through the C(v) override.
   */
  private readonly linearKin = new Kinematics();
  private readonly linearProbe = new AffineProbe(this.linearKin);
  readonly ends = new PieceEnds();
  startS = 0;
  durationS = 0;
  logic = 0;
  target = 0;
  key = 0;
  /** Minimum and maximum from the last range() call. */
  rangeMin = 0;
  rangeMax = 0;
  /**
   * A plain exponential piece whose v' keeps its sign: every g affine in (v, s)
   * is then monotone, so no extremum search is needed (extremum() would say -1).
   */
  private monotone = false;
  /** ∫ v dt and ∫ s dt over the whole loaded piece (computed once per load). */
  private fullIntegralV = 0;
  private fullIntegralS = 0;

  constructor(
    private readonly log: PieceLog,
    private readonly cache: ConfigCache,
  ) {}

  /** The configuration of the loaded piece (set by load: no cache lookup per use). */
  config!: ConfigModel;

  /** The multi-state motion of the loaded piece (set when its configuration is dynamic: modal.ts). */
  readonly modal = new ModalKinematics();
  /** The loaded piece is multi-state: read it with the row methods. */
  dynamic = false;
  private readonly x0 = new Float64Array(MAX_STATES);
  private readonly span = new Float64Array(2);

  /** What every logged piece records whatever its motion: its place in time, the output state, its configuration. */
  private takeLogged(d: Float64Array, base: number, cfg: ConfigModel): void {
    this.startS = d[base + LOG.startS];
    this.durationS = d[base + LOG.durationS];
    this.logic = d[base + LOG.logic];
    this.target = d[base + LOG.target];
    this.key = cfg.key;
    this.config = cfg;
  }

  load(index: number): void {
    // The record read in place (this runs for every piece of every figure pass).
    const d = this.log.data;
    const base = index * LOG_STRIDE;
    const cfg = this.cache.get(d[base + LOG.key]);
    if (cfg.dyn) {
      this.dynamic = true;
      this.x0[SLOT.N] = d[base + LOG.v0];
      this.x0[SLOT.P] = d[base + LOG.xP0];
      this.x0[SLOT.O] = d[base + LOG.xO0];
      this.modal.set(cfg.dyn, this.x0, d[base + LOG.s0], d[base + LOG.rate]);
      this.takeLogged(d, base, cfg);
      return;
    }
    this.dynamic = false;
    if (this.kin.shape !== this.cache.biasShape) this.kin.setShape(this.cache.biasShape, this.cache.spanV);
    const s0 = d[base + LOG.s0];
    const r = d[base + LOG.rate];
    this.kin.set(cfg.a, cfg.b0 + cfg.bS * s0, cfg.bS * r, d[base + LOG.v0], s0, r);
    this.takeLogged(d, base, cfg);
    // The walk logged the far end and ∫v with the piece: no φ-function evaluation here.
    this.ends.fillWithEnd(this.kin, this.durationS, d[base + LOG.vEnd]);
    this.fullIntegralV = d[base + LOG.integralV];
    this.fullIntegralS = this.kin.integralS(this.durationS);
    const e = this.ends;
    // With r = 0, g' = cv·v' has strictly opposite signs at the ends only if v' has.
    this.monotone = r === 0 && !(e.dv0 < 0 && e.dvT > 0) && !(e.dv0 > 0 && e.dvT < 0);
  }

  // Row forms (a multi-state piece): g = row·[1, s, x_N, x_P, x_O] (modal.ts ROW).

  /** A row at t into the loaded multi-state piece. */
  atRow(row: ArrayLike<number>, t: number): number {
    return this.modal.setRow(row).at(t);
  }

  /** Minimum and maximum of a row over the piece into rangeMin, rangeMax. */
  rangeRow(row: ArrayLike<number>): void {
    this.modal.setRow(row).range(this.durationS, this.span);
    this.rangeMin = this.span[0];
    this.rangeMax = this.span[1];
  }

  /** Crossings of a row (plus `offset`) through zero inside the piece: as crossings(). */
  crossingsRow(row: ArrayLike<number>, offset: number, out: Float64Array, dir: Int8Array): number {
    return this.modal.setRow(row, 1, offset).crossings(this.durationS, out, dir, out.length);
  }

  /** ∫ of a row over the whole piece. */
  integralRow(row: ArrayLike<number>): number {
    return this.modal.setRow(row).integral(this.durationS);
  }

  /** ∫ of a row over [t1, t2] inside the piece. */
  integralRowBetween(row: ArrayLike<number>, t1: number, t2: number): number {
    const mk = this.modal.setRow(row);
    return mk.integral(t2) - (t1 > 0 ? mk.integral(t1) : 0);
  }

  /** ∫ max(0, row) dt over the whole piece. */
  positiveIntegralRow(row: ArrayLike<number>, scratchT: Float64Array, scratchDir: Int8Array): number {
    const mk = this.modal.setRow(row);
    const T = this.durationS;
    const n = mk.crossings(T, scratchT, scratchDir, scratchT.length);
    let total = 0;
    let from = 0;
    let positive = n > 0 ? scratchDir[0] < 0 : Math.max(mk.at(0), mk.at(T)) > 0;
    for (let i = 0; i <= n; i++) {
      const to = i < n ? scratchT[i] : T;
      if (positive) total += mk.integral(to) - mk.integral(from);
      if (i < n) positive = scratchDir[i] > 0;
      from = to;
    }
    return total;
  }

  /** The one-capacitor triplet (c0, cv, cs) as a row (N is the capacitor). */
  static tripletRow(c0: number, cv: number, cs: number, out: Float64Array): Float64Array {
    out.fill(0);
    out[R_C] = c0;
    out[R_S] = cs;
    out[R_X + SLOT.N] = cv;
    return out;
  }

  /** ∫ g dt over the whole piece. */
  integralFull(c0: number, cv: number, cs: number): number {
    return c0 * this.durationS + cv * this.fullIntegralV + cs * this.fullIntegralS;
  }

  at(c0: number, cv: number, cs: number, t: number): number {
    return c0 + cv * this.kin.v(t) + cs * this.kin.s(t);
  }

  atStart(c0: number, cv: number, cs: number): number {
    return c0 + cv * this.ends.v0 + cs * this.ends.s0;
  }

  atEnd(c0: number, cv: number, cs: number): number {
    return c0 + cv * this.ends.vT + cs * this.ends.sT;
  }

  /** Minimum and maximum over the piece into out[0], out[1]. */
  extremes(c0: number, cv: number, cs: number, out: Float64Array): void {
    this.range(c0, cv, cs);
    out[0] = this.rangeMin;
    out[1] = this.rangeMax;
  }

  /** Minimum and maximum over the piece into rangeMin, rangeMax. */
  range(c0: number, cv: number, cs: number): void {
    const e = this.ends;
    const g0 = c0 + cv * e.v0 + cs * e.s0;
    const gT = c0 + cv * e.vT + cs * e.sT;
    let lo = Math.min(g0, gT);
    let hi = Math.max(g0, gT);
    if (!this.monotone) {
      const tExt = this.extremum(c0, cv, cs);
      if (tExt >= 0) {
        const g = this.at(c0, cv, cs, tExt);
        lo = Math.min(lo, g);
        hi = Math.max(hi, g);
      }
    }
    this.rangeMin = lo;
    this.rangeMax = hi;
  }

  /** Time of the interior extremum, or −1 when g is monotone over the piece. */
  private extremum(c0: number, cv: number, cs: number): number {
    if (this.monotone) return -1;
    const e = this.ends;
    const r = this.kin.r;
    const gd0 = cv * e.dv0 + cs * r;
    const gdT = cv * e.dvT + cs * r;
    if (!(gd0 < 0 && gdT > 0) && !(gd0 > 0 && gdT < 0)) return -1;
    this.probe.setAffine(c0, cv, cs);
    return extremumTime(this.probe, this.durationS, gd0, gdT);
  }

  /**
   * Crossings of g through zero inside the piece (at most two): times into
   * out[0..], directions (+1 rising, −1 falling) into dir[0..]; returns the count.
   */
  crossings(c0: number, cv: number, cs: number, out: Float64Array, dir: Int8Array, relativeTolerance?: number): number {
    const T = this.durationS;
    const g0 = this.atStart(c0, cv, cs);
    const gT = this.atEnd(c0, cv, cs);
    const tExt = this.extremum(c0, cv, cs);
    let n = 0;
    if (tExt < 0) {
      n = this.crossIn(c0, cv, cs, 0, T, g0, gT, out, dir, n, relativeTolerance);
    } else {
      const gE = this.at(c0, cv, cs, tExt);
      n = this.crossIn(c0, cv, cs, 0, tExt, g0, gE, out, dir, n, relativeTolerance);
      n = this.crossIn(c0, cv, cs, tExt, T, gE, gT, out, dir, n, relativeTolerance);
    }
    return n;
  }

  private crossIn(c0: number, cv: number, cs: number, a: number, b: number, ga: number, gb: number, out: Float64Array, dir: Int8Array, n: number, tol?: number): number {
    let probe = this.probe;
    const k = this.kin;
    if (!k.nonlinear) {
      probe = this.linearProbe;
      this.linearKin.set(k.a, k.k0, k.k1, k.v0, k.s0, k.r);
    }
    probe.order = 0;
    if (ga >= 0 && gb < 0) {
      probe.setAffine(c0, cv, cs);
      out[n] = solveBracket(probe, a, b, ga, gb, tol);
      dir[n] = -1;
      return n + 1;
    }
    if (ga < 0 && gb >= 0) {
      probe.setAffine(-c0, -cv, -cs);
      out[n] = solveBracket(probe, a, b, -ga, -gb, tol);
      dir[n] = 1;
      return n + 1;
    }
    return n;
  }

  /** ∫ g dt over [t1, t2] inside the piece. */
  integral(c0: number, cv: number, cs: number, t1: number, t2: number): number {
    const k = this.kin;
    const iv = k.integralV(t2) - (t1 > 0 ? k.integralV(t1) : 0);
    const is = k.integralS(t2) - k.integralS(t1);
    return c0 * (t2 - t1) + cv * iv + cs * is;
  }

  /** ∫ max(0, g) dt over the whole piece. */
  positiveIntegral(c0: number, cv: number, cs: number, scratchT: Float64Array, scratchDir: Int8Array): number {
    // The integrand is zero at a crossing, so a time error δ there costs only ~g'·δ²/2 of charge:
    // a loose crossing tolerance keeps the integral exact to rounding.
    const n = this.crossings(c0, cv, cs, scratchT, scratchDir, 1e-9);
    if (n === 0) {
      // One sign throughout (zero at an end at most).
      return Math.max(this.atStart(c0, cv, cs), this.atEnd(c0, cv, cs)) > 0 ? this.integralFull(c0, cv, cs) : 0;
    }
    const T = this.durationS;
    const k = this.kin;
    let total = 0;
    let from = 0;
    // ∫₀^from v dt, computed once per crossing.
    let ivFrom = 0;
    // The first segment has the sign opposite to the first crossing's direction.
    let positive = scratchDir[0] < 0;
    for (let i = 0; i < n; i++) {
      const t = scratchT[i];
      const ivT = k.integralV(t);
      if (positive) total += this.segment(c0, cv, cs, from, ivFrom, t, ivT);
      positive = scratchDir[i] > 0;
      from = t;
      ivFrom = ivT;
    }
    // The far end's integral is the one logged with the piece.
    if (positive) total += this.segment(c0, cv, cs, from, ivFrom, T, this.fullIntegralV);
    return total;
  }

  /**
   * integral(c0, cv, cs, t1, t2) with ∫₀^t v dt already known at both ends
   * (iv1 is ignored for t1 = 0): the same arithmetic, without re-evaluating φ.
   */
  private segment(c0: number, cv: number, cs: number, t1: number, iv1: number, t2: number, iv2: number): number {
    const k = this.kin;
    const iv = iv2 - (t1 > 0 ? iv1 : 0);
    const is = k.integralS(t2) - k.integralS(t1);
    return c0 * (t2 - t1) + cv * iv + cs * is;
  }
}
