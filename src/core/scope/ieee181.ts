/**
 * How the output figures are read off a waveform, as a scope shows them
 * (IEEE Std 181-2011, "Transitions, Pulses, and Related Waveforms") — the ONE
 * definition behind /v1/analyze, /v1/waveform, tolerance, BOM checks and the
 * fit, applied to two representations of a waveform:
 * - the engine's exact steady cycle (src/core/circuit/engine/figures.ts), and
 * - a sampled scope record (src/core/fit/capture/), noisy and quantised.
 * A noiseless capture of a circuit therefore reads the figures the engine
 * predicts for it, however slow or tilted its edges and tops.
 *
 * - **State levels** (high, low): the histogram-mode state levels (§5.2.1):
 *   the amplitude histogram of the record is split at the middle of its range
 *   and the mode of each half is the state level. On the exact cycle that mode
 *   is where the output is flattest in each state: the pin at the instant the
 *   output stage starts to leave the state (an output approaching its level
 *   monotonically is flattest at the end; a waveform that never settles has its
 *   turning point there). On samples the histogram's modal bin, refined to
 *   the centroid of the bins around it (`histogramModeLevels`), finds the
 *   states and the transitions between them; the level is then read where the
 *   definition puts it, by a local fit over the end of each state evaluated
 *   where the samples show the output leaving it (src/core/fit/capture/
 *   scope-readings.ts, endOfStateLevels): on a tilted top the modal window
 *   leans into the tilt, on a flat one both agree. On a tilted top this is the
 *   histogram mode's limit for vanishing bins (docs/model.md §5, tilted tops).
 * - **Reference levels**: fractions of the amplitude above the low state
 *   (`REFERENCE_FRACTION`, §5.3.2); the 50 % reference-level instant is the
 *   transition's time.
 * - **Period and duty cycle**: from the output's 50 % reference-level instants
 *   (`dutyFromInstants`).
 * - **Transition durations**: from the 10 % to the 90 % reference-level
 *   instant of the same transition (`durationBetween`).
 * Averages over drive intervals are reported only under names that say so
 * (meanHighV/meanLowV).
 */

/** IEEE Std 181 reference levels used everywhere, fractions of the amplitude above the low state. */
export const REFERENCE_FRACTION = { lower: 0.1, mid: 0.5, upper: 0.9 } as const;

/** Voltage `fraction` of the way from the low to the high state level (IEEE 181 reference level). */
export function referenceLevelV(lowV: number, highV: number, fraction: number): number {
  return lowV + fraction * (highV - lowV);
}

/**
 * ((x % m) + m) % m, the phase of x in [0, m), without the floating-point
 * remainder where it is not needed: |x| < m leaves x % m = x exactly, and for
 * m <= y < 2m the remainder is y − m, which is exact (Sterbenz). Same bits as
 * the remainder form; the remainder is slow in V8.
 */
export function phaseIn(x: number, m: number): number {
  const r = x > -m && x < m ? x : x % m;
  const y = r + m;
  if (y < m) return y;
  return y < 2 * m ? y - m : y % m;
}

/**
 * Time from instant `fromS` to the next instant `toS` of a periodic waveform
 * (both may lie in different cycles): a transition duration (10 % → 90 %
 * instants) or a pulse duration (rising → falling 50 % instants).
 */
export function durationBetween(fromS: number, toS: number, periodS: number): number {
  return phaseIn(toS - fromS, periodS);
}

/** Duty cycle: pulse duration between a rising and the next falling 50 % instant, over the period. */
export function dutyFromInstants(risingS: number, fallingS: number, periodS: number): number {
  return durationBetween(risingS, fallingS, periodS) / periodS;
}

/** Half-width, in bins, of the window around the mode whose centroid refines it (our choice). */
export const MODE_CENTROID_HALF_WIDTH_BINS = 2.5;

/** Histogram-mode state levels of a sampled record, with what the callers check them by. */
export interface HistogramModes {
  lowV: number;
  highV: number;
  /** Samples in the lower and the upper half of the range. */
  lowCount: number;
  highCount: number;
}

/**
 * The modes of the lower and the upper half of a histogram (IEEE Std 181-2011
 * histogram-mode state levels) over [minV, minV + bins·binWidthV], each refined
 * to the centroid of the samples within MODE_CENTROID_HALF_WIDTH_BINS of it
 * (within its half): the bare mode is quantised to a bin, the centroid of a
 * symmetric noise peak is not (common practice, our choice). `counts[b]` and
 * `sums[b]` are the number and the sum of the samples in bin b, so the
 * refinement costs no pass over the samples: a bin the window covers in part
 * counts in proportion, and the window moves onto its own centroid until it
 * stays put (a window off the peak leans towards its own centre).
 */
export function histogramModeLevels(counts: ArrayLike<number>, sums: ArrayLike<number>, minV: number, binWidthV: number): HistogramModes {
  const bins = counts.length;
  const half = bins >> 1;
  const w = MODE_CENTROID_HALF_WIDTH_BINS;
  const mode = (from: number, to: number): { level: number; total: number } => {
    let best = from;
    let total = 0;
    for (let b = from; b < to; b++) {
      total += counts[b];
      if (counts[b] > counts[best]) best = b;
    }
    // Window position in bin coordinates (bin b spans [b, b + 1)).
    let centre = best + 0.5;
    let level = best < to && counts[best] > 0 ? sums[best] / counts[best] : Number.NaN;
    for (let pass = 0; pass < 50; pass++) {
      const lo = Math.max(from, centre - w);
      const hi = Math.min(to, centre + w);
      let n = 0;
      let s = 0;
      for (let b = Math.floor(lo); b < hi; b++) {
        const share = Math.min(b + 1, hi) - Math.max(b, lo);
        n += share * counts[b];
        s += share * sums[b];
      }
      if (!(n > 0)) break;
      level = s / n;
      const next = (level - minV) / binWidthV;
      const moved = Math.abs(next - centre);
      centre = next;
      if (moved < 1e-9) break;
    }
    return { level, total };
  };
  const low = mode(0, half);
  const high = mode(half, bins);
  return { lowV: low.level, highV: high.level, lowCount: low.total, highCount: high.total };
}
