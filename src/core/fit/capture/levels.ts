import { CoreError } from '../../errors.ts';
import { histogramModeLevels, referenceLevelV as sharedReferenceLevelV } from '../../scope/ieee181.ts';

/**
 * State levels of a two-state waveform by the histogram method of
 * IEEE Std 181-2011 (transitions, pulses and related waveforms), clause 5.2.1:
 * build a histogram of the sample values, split it at the midpoint of the
 * record's range, and take the mode of each half as the low and the high state
 * (the definition every answer uses: ../../scope/ieee181.ts).
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
  return stateLevelsInRange(values, minV, maxV, options);
}

/**
 * stateLevels for a record whose smallest and largest samples are known (the
 * capture analysis finds them while it checks the samples): one pass over the
 * samples builds the histogram with each bin's sum, and the modes and their
 * refinement come from the bins (../../scope/ieee181.ts, histogramModeLevels).
 */
export function stateLevelsInRange(values: Float64Array, minV: number, maxV: number, options: StateLevelOptions = {}): StateLevels {
  const name = options.channelName ?? 'channel';
  const n = values.length;
  if (n < 4) throw badCapture(`${name} has ${n} samples; at least 4 are needed to find state levels`, options, 'too-few-samples');
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
  const counts = new Float64Array(binCount);
  const sums = new Float64Array(binCount);
  const binScale = binCount / rangeV;
  const lastBin = binCount - 1;
  for (let i = 0; i < n; i++) {
    const v = values[i];
    const b = Math.min(lastBin, Math.floor((v - minV) * binScale));
    counts[b]++;
    sums[b] += v;
  }
  const modes = histogramModeLevels(counts, sums, minV, rangeV / binCount);
  const lowTotal = modes.lowCount;
  const highTotal = modes.highCount;

  const minStateCount = Math.max(2, Math.ceil(MIN_STATE_FRACTION * n));
  if (lowTotal < minStateCount || highTotal < minStateCount) {
    throw badCapture(
      `${name} shows one state only (${lowTotal} samples in the lower half of the range, ${highTotal} in the upper): a flat line with spikes, not a two-level waveform`,
      options,
      'flat-line',
      { lowHalfCount: lowTotal, highHalfCount: highTotal },
    );
  }
  const lowV = modes.lowV;
  const highV = modes.highV;
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
  // Samples exactly at an extreme lie in the end bins: only when an end bin holds half its state's samples
  // can the state be pinned, and only then are they counted (one more pass, rare).
  const mayBePinned = counts[0] >= CLIPPED_PINNED_FRACTION * lowTotal || counts[lastBin] >= CLIPPED_PINNED_FRACTION * highTotal;
  if (options.checkClipping !== false && mayBePinned) {
    let pinnedAtMin = 0;
    let pinnedAtMax = 0;
    for (let i = 0; i < n; i++) {
      const v = values[i];
      pinnedAtMin += v === minV ? 1 : 0;
      pinnedAtMax += v === maxV ? 1 : 0;
    }
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

/** Voltage at `percent` % of the way from the low to the high state (IEEE 181 reference level). */
export function referenceLevelV(levels: Pick<StateLevels, 'lowV' | 'amplitudeV'>, percent: number): number {
  return sharedReferenceLevelV(levels.lowV, levels.lowV + levels.amplitudeV, percent / 100);
}
