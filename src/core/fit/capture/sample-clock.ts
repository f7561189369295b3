/**
 * Where each sample of a capture sits in time. A scope record is either evenly
 * sampled (start time + interval, the usual case and the cheapest to store) or
 * carries an explicit time column. Every capture routine works through this one
 * type so that it never has to care which kind it was given.
 */
export type SampleClock =
  | { readonly kind: 'uniform'; readonly startS: number; readonly intervalS: number; readonly length: number }
  | { readonly kind: 'explicit'; readonly timeS: Float64Array };

export function uniformClock(intervalS: number, length: number, startS = 0): SampleClock {
  return { kind: 'uniform', startS, intervalS, length };
}

export function explicitClock(timeS: Float64Array): SampleClock {
  return { kind: 'explicit', timeS };
}

export function clockLength(clock: SampleClock): number {
  return clock.kind === 'uniform' ? clock.length : clock.timeS.length;
}

export function timeAt(clock: SampleClock, index: number): number {
  return clock.kind === 'uniform' ? clock.startS + index * clock.intervalS : clock.timeS[index];
}

/** Time between the first and the last sample. */
export function clockSpanS(clock: SampleClock): number {
  const n = clockLength(clock);
  return n < 2 ? 0 : timeAt(clock, n - 1) - timeAt(clock, 0);
}

/**
 * Fractional sample index at time `tS` (linear between samples), clamped to the
 * record. O(1) for a uniform clock, O(log n) binary search for an explicit one.
 */
export function indexAtTime(clock: SampleClock, tS: number): number {
  const n = clockLength(clock);
  if (n === 0) return 0;
  if (clock.kind === 'uniform') {
    const idx = (tS - clock.startS) / clock.intervalS;
    return Math.min(n - 1, Math.max(0, idx));
  }
  const t = clock.timeS;
  if (tS <= t[0]) return 0;
  if (tS >= t[n - 1]) return n - 1;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >>> 1;
    if (t[mid] <= tS) lo = mid;
    else hi = mid;
  }
  return lo + (tS - t[lo]) / (t[hi] - t[lo]);
}
