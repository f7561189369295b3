import { CoreError } from '../../errors.ts';

/**
 * State levels of a two-state waveform by the histogram method of
 * IEEE Std 181-2011 (transitions, pulses and related waveforms), clause 5.2.1:
 * build a histogram of the sample values, split it at the midpoint of the
 * record's range, and take the mode of each half as the low and the high state.
 */
export interface StateLevels {
  /** Low state level, V. */
  lowV: number;
  /** High state level, V. */
  highV: number;
  /** highV - lowV, V (IEEE 181 "waveform amplitude"). */
  amplitudeV: number;
  /** Smallest and largest sample of the record, V. */
  minV: number;
  maxV: number;
  /** Histogram bins used over [minV, maxV]. */
  binCount: number;
}

export interface StateLevelOptions {
  /** Override the bin count (an even number >= 4); see `defaultBinCount`. */
  binCount?: number;
  /** Reject a record whose top or bottom state sits at the ADC rail (default true). */
  checkClipping?: boolean;
  /** Used in error messages, e.g. "output". */
  channelName?: string;
  /** JSON pointer of the channel, attached to errors. */
  pointer?: string;
  /** Re-centre the mode windows (default true); a caller that refines the levels itself skips these passes. */
  recentre?: boolean;
}

/**
 * Bin count: IEEE 181 leaves the choice to the user. We take ceil(sqrt(n))
 * (the square-root rule, common practice for histograms), made even so the
 * midpoint falls on a bin edge, and kept within [16, 4096]. For the sample
 * counts scope records have (1e4..1e7) this gives bins finer than an 8-bit
 * code step over the record's range, so each ADC code lands in its own bin
 * and the mode is the most frequent code rather than an alias of two codes.
 */
export function defaultBinCount(sampleCount: number): number {
  const raw = Math.ceil(Math.sqrt(Math.max(1, sampleCount)));
  const clamped = Math.min(4096, Math.max(16, raw));
  return clamped % 2 === 0 ? clamped : clamped + 1;
}

/** Fraction of the range below which the two modes are taken as one state (flat line). */
const MIN_AMPLITUDE_FRACTION_OF_RANGE = 0.25;
/** A state must hold at least this fraction of all samples (and 2 samples) to count as a state. */
const MIN_STATE_FRACTION = 1e-3;
/** Share of a state's samples pinned at the exact record extreme that marks it clipped. */
const CLIPPED_PINNED_FRACTION = 0.5;
/** Half-width, in bins, of the window around the modal bin averaged to refine the mode. */
const MODE_REFINE_HALF_WIDTH_BINS = 2;
/** At most this many re-centring passes of that window. */
const RECENTRE_PASSES = 6;

function badCapture(message: string, options: StateLevelOptions, reason: string, extra: Record<string, unknown> = {}): CoreError {
  return new CoreError('bad-capture', message, options.pointer, {
    reason,
    channel: options.channelName ?? 'channel',
    ...extra,
  });
}

export function stateLevels(values: Float64Array, options: StateLevelOptions = {}): StateLevels {
  const name = options.channelName ?? 'channel';
  const n = values.length;
  if (n < 4) throw badCapture(`${name} has ${n} samples; at least 4 are needed to find state levels`, options, 'too-few-samples');

  let minV = Infinity;
  let maxV = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (v < minV) minV = v;
    if (v > maxV) maxV = v;
  }
  if (!Number.isFinite(minV) || !Number.isFinite(maxV)) {
    throw badCapture(`${name} holds non-finite samples`, options, 'non-finite-sample');
  }
  const rangeV = maxV - minV;
  const scaleV = Math.max(Math.abs(minV), Math.abs(maxV));
  if (rangeV <= 1e-12 * scaleV || rangeV === 0) {
    throw badCapture(`${name} is a flat line: every sample is ${minV} V`, options, 'flat-line', { minV, maxV });
  }

  const binCount = options.binCount ?? defaultBinCount(n);
  if (!Number.isInteger(binCount) || binCount < 4 || binCount % 2 !== 0) {
    throw new CoreError('invalid-value', `binCount must be an even integer >= 4, got ${binCount}`);
  }
  const counts = new Uint32Array(binCount);
  const binScale = binCount / rangeV;
  for (let i = 0; i < n; i++) {
    let b = Math.floor((values[i] - minV) * binScale);
    if (b >= binCount) b = binCount - 1;
    counts[b]++;
  }

  const half = binCount / 2;
  let lowMode = 0;
  let highMode = half;
  let lowTotal = 0;
  let highTotal = 0;
  for (let b = 0; b < half; b++) {
    lowTotal += counts[b];
    if (counts[b] > counts[lowMode]) lowMode = b;
  }
  for (let b = half; b < binCount; b++) {
    highTotal += counts[b];
    if (counts[b] > counts[highMode]) highMode = b;
  }

  const minStateCount = Math.max(2, Math.ceil(MIN_STATE_FRACTION * n));
  if (lowTotal < minStateCount || highTotal < minStateCount) {
    throw badCapture(
      `${name} shows one state only (${lowTotal} samples in the lower half of the range, ${highTotal} in the upper): a flat line with spikes, not a two-level waveform`,
      options,
      'flat-line',
      { lowHalfCount: lowTotal, highHalfCount: highTotal },
    );
  }

  // Refine each mode to the mean of the samples in a few bins around it. The
  // bare mode is quantised to a bin centre; the local mean removes most of
  // that error for a symmetric noise peak (common practice, our choice).
  const lowLo = Math.max(0, lowMode - MODE_REFINE_HALF_WIDTH_BINS);
  const lowHi = Math.min(half - 1, lowMode + MODE_REFINE_HALF_WIDTH_BINS);
  const highLo = Math.max(half, highMode - MODE_REFINE_HALF_WIDTH_BINS);
  const highHi = Math.min(binCount - 1, highMode + MODE_REFINE_HALF_WIDTH_BINS);
  let lowSum = 0;
  let lowN = 0;
  let highSum = 0;
  let highN = 0;
  let pinnedAtMin = 0;
  let pinnedAtMax = 0;
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (v === minV) pinnedAtMin++;
    if (v === maxV) pinnedAtMax++;
    let b = Math.floor((v - minV) * binScale);
    if (b >= binCount) b = binCount - 1;
    if (b >= lowLo && b <= lowHi) {
      lowSum += v;
      lowN++;
    } else if (b >= highLo && b <= highHi) {
      highSum += v;
      highN++;
    }
  }
  // Re-centre: the first window sits on bin edges, up to half a bin off the
  // peak, and a truncated mean leans towards its window's centre; moving the
  // window onto the estimate a few times removes that lean.
  const halfWidthV = ((MODE_REFINE_HALF_WIDTH_BINS + 0.5) * rangeV) / binCount;
  const recentre = options.recentre !== false;
  const lowV = recentre ? recentredMean(values, lowSum / lowN, halfWidthV) : lowSum / lowN;
  const highV = recentre ? recentredMean(values, highSum / highN, halfWidthV) : highSum / highN;
  const amplitudeV = highV - lowV;

  if (amplitudeV < MIN_AMPLITUDE_FRACTION_OF_RANGE * rangeV) {
    throw badCapture(
      `${name} is a flat line: the two histogram modes are ${amplitudeV.toPrecision(3)} V apart, under ${MIN_AMPLITUDE_FRACTION_OF_RANGE * 100} % of the ${rangeV.toPrecision(3)} V range (noise, not two states)`,
      options,
      'flat-line',
      { lowV, highV, rangeV },
    );
  }

  // Clipping: a real state carries noise and spreads over several ADC codes,
  // so only a few samples sit exactly on the record's extreme. If most of one
  // state's samples share the exact extreme while the other state is spread,
  // that state was cut off by the scope's range. (A noiseless record has both
  // states pinned and is not flagged: we cannot tell it from an ideal signal.)
  if (options.checkClipping !== false) {
    const highPinned = pinnedAtMax / highTotal;
    const lowPinned = pinnedAtMin / lowTotal;
    const top = highPinned >= CLIPPED_PINNED_FRACTION && lowPinned < CLIPPED_PINNED_FRACTION;
    const bottom = lowPinned >= CLIPPED_PINNED_FRACTION && highPinned < CLIPPED_PINNED_FRACTION;
    if (top || bottom) {
      const which = top ? 'high' : 'low';
      const railV = top ? maxV : minV;
      const share = top ? highPinned : lowPinned;
      throw badCapture(
        `${name} is clipped: ${(share * 100).toFixed(1)} % of its ${which}-state samples sit exactly at the record's ${top ? 'maximum' : 'minimum'} code ${railV} V (the scope's vertical range cut the waveform off); re-capture with more vertical range`,
        options,
        'clipped',
        { state: which, railV, pinnedFraction: share },
      );
    }
  }

  return { lowV, highV, amplitudeV, minV, maxV, binCount };
}

/** Fixed-point of "mean of the samples within +-halfWidthV of the centre", from startV (a few O(n) passes). */
function recentredMean(values: Float64Array, startV: number, halfWidthV: number): number {
  let centreV = startV;
  for (let pass = 0; pass < RECENTRE_PASSES; pass++) {
    let sum = 0;
    let count = 0;
    const lo = centreV - halfWidthV;
    const hi = centreV + halfWidthV;
    for (let i = 0; i < values.length; i++) {
      const v = values[i];
      if (v >= lo && v <= hi) {
        sum += v;
        count++;
      }
    }
    if (count === 0) break;
    const next = sum / count;
    const moved = Math.abs(next - centreV);
    centreV = next;
    if (moved <= 1e-6 * halfWidthV) break;
  }
  return centreV;
}

/** Voltage at `percent` % of the way from the low to the high state (IEEE 181 reference level). */
export function referenceLevelV(levels: Pick<StateLevels, 'lowV' | 'amplitudeV'>, percent: number): number {
  return levels.lowV + (percent / 100) * levels.amplitudeV;
}
