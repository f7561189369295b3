/**
 * Comparator propagation delay versus overdrive.
 *
 * Why this law: the input stage turns the overdrive Vod into a current gm·Vod
 * that must move a fixed charge Q through the internal high-impedance node
 * before the output stage starts to switch; the rest of the delay (output
 * stage, level shifts) does not depend on the input. For a step of overdrive
 *
 *     t(Vod) = t∞ + k / Vod,        k = Q/gm  (V·s)
 *
 * so the two class-typical (or caller) points {overdriveV, delayS} fix t∞ and k
 * exactly. In an oscillator the input does not step: it crosses the threshold
 * at a slope S (V/s), the overdrive grows as S·t, and the same charge is moved
 * when ∫gm·S·t dt = Q, i.e.
 *
 *     t(S) = t∞ + √(2k / S).
 *
 * Both follow from the one charge model; a slow ramp gives a long delay, as
 * comparators show on the bench.
 */
import { CoreError } from '../errors.ts';

export interface DelayPoint {
  overdriveV: number;
  delayS: number;
}

export interface DelayLaw {
  /** Delay at infinite overdrive, s. */
  floorS: number;
  /** Charge-to-transconductance ratio, V·s. */
  chargeVS: number;
}

/**
 * t = t∞ + k/Vod through two points. When the points fall off faster than 1/Vod
 * (t∞ would come out negative) t∞ is held at 0 and k passes through the
 * small-overdrive point, the one that matters for slow oscillator ramps.
 */
export function delayLawFromPoints(a: DelayPoint, b: DelayPoint, pointer?: string): DelayLaw {
  for (const p of [a, b]) {
    if (!(Number.isFinite(p.overdriveV) && p.overdriveV > 0 && Number.isFinite(p.delayS) && p.delayS >= 0)) {
      throw new CoreError('invalid-value', 'a delay point needs overdriveV > 0 and delayS ≥ 0', pointer);
    }
  }
  if (a.overdriveV === b.overdriveV) throw new CoreError('invalid-value', 'the two delay points need different overdrives', pointer);
  const [small, large] = a.overdriveV < b.overdriveV ? [a, b] : [b, a];
  if (small.delayS < large.delayS) {
    throw new CoreError('invalid-value', 'delay must not grow with overdrive (less overdrive is slower)', pointer);
  }
  const k = (small.delayS - large.delayS) / (1 / small.overdriveV - 1 / large.overdriveV);
  const floor = large.delayS - k / large.overdriveV;
  if (floor < 0) return { floorS: 0, chargeVS: small.delayS * small.overdriveV };
  return { floorS: floor, chargeVS: k };
}

/** Delay after a step of overdriveV, s. */
export function delayForStepS(law: DelayLaw, overdriveV: number): number {
  return law.floorS + law.chargeVS / overdriveV;
}

/** Delay when the input crosses the threshold at slopeVPerS (|dv/dt|), s. */
export function delayForRampS(law: DelayLaw, slopeVPerS: number): number {
  if (law.chargeVS === 0) return law.floorS;
  return law.floorS + Math.sqrt((2 * law.chargeVS) / Math.abs(slopeVPerS));
}
