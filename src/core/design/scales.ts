/** Choosing resistance scales inside a bounds interval. */

/** Scale preferred when the bounds leave it open (common practice: 10 kΩ to 100 kΩ networks suit most op-amps). */
export const OPEN_SCALE_OHM = 22e3;
/** How far inside a one-sided bound the preferred scale sits (half a decade). */
const ONE_SIDED_FACTOR = Math.sqrt(10);

/** A scale inside [minOhm, maxOhm]: the geometric middle, or half a decade inside a one-sided bound. */
export function preferredScaleOhm(minOhm: number, maxOhm: number): number {
  const lo = minOhm > 0 ? minOhm : undefined;
  const hi = Number.isFinite(maxOhm) ? maxOhm : undefined;
  if (lo && hi) return Math.sqrt(lo * hi);
  if (lo) return Math.max(lo * ONE_SIDED_FACTOR, Math.min(OPEN_SCALE_OHM, lo * 1e3));
  if (hi) return Math.min(hi / ONE_SIDED_FACTOR, OPEN_SCALE_OHM);
  return OPEN_SCALE_OHM;
}

/** Up to `count` log-spaced scales across [min, max] around the preferred one, at most `perDecade` per decade. */
export function scalesWithin(minOhm: number, maxOhm: number, count: number, perDecade: number): number[] {
  const centre = preferredScaleOhm(minOhm, maxOhm);
  const out = [centre];
  const step = 10 ** (1 / perDecade);
  for (let k = 1; out.length < count; k++) {
    const down = centre / step ** k;
    const up = centre * step ** k;
    const downOk = down >= minOhm;
    const upOk = up <= maxOhm;
    if (!downOk && !upOk) break;
    if (upOk) out.push(up);
    if (downOk && out.length < count) out.push(down);
  }
  return out;
}
