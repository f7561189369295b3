import { timeAt as timeAtImported, clockLength } from './sample-clock.ts';
import type { SampleClock } from './sample-clock.ts';

/** Module-local bindings: hot per-sample loops call these directly, not through an import binding (CJS transforms make each such call a property read). */
const timeAt = timeAtImported;

/**
 * Turning points (local maxima and minima) of the capacitor voltage, used as
 * segment boundaries when no output channel was captured. Peak detection with
 * hysteresis (common practice): an extreme is only accepted once the waveform
 * has moved away from it by `hysteresisV`, so noise ripples on a slope do not
 * count. A turning point is also only accepted when the waveform had come at
 * least `hysteresisV` towards it beforehand, which drops the record's first
 * sample (or a noise wiggle near it) posing as an extreme.
 */
export interface TurningPoint {
  kind: 'max' | 'min';
  index: number;
  timeS: number;
  valueV: number;
}

export interface TurningPointOptions {
  /** Required excursion, V. Default: `hysteresisFraction` of the record's range. */
  hysteresisV?: number;
  /** Default 0.25 of (max - min): far above noise, well below the swing between switching levels. */
  hysteresisFraction?: number;
  /**
   * Sample noise, V (1σ, quantisation included). When the hysteresis is not
   * well above it (a small swing a few ADC codes high), extremes are sought on
   * a centred running mean of the samples, long enough that the mean's noise
   * is a sixth of the hysteresis (our margin: a 6σ excursion never poses as a
   * turning point). The reported index is the running mean's extreme.
   */
  noiseV?: number;
}

/** Most samples averaged when smoothing: a fraction of the record (a period is far longer on any usable record). */
const MAX_SMOOTHING_SHARE = 1 / 64;
const NOISE_MARGIN = 6;

/** Running-mean length for a hysteresis h over noise σ: (6σ/h)² samples (the mean of w samples has σ/√w). */
export function smoothingLength(hysteresisV: number, noiseV: number, n: number): number {
  if (!(noiseV > 0) || !(hysteresisV > 0)) return 1;
  const w = Math.ceil(((NOISE_MARGIN * noiseV) / hysteresisV) ** 2);
  return Math.max(1, Math.min(w, Math.floor(n * MAX_SMOOTHING_SHARE)));
}

/** Centred running mean over w samples (ends: over the samples there are). */
function runningMean(values: Float64Array, n: number, w: number): Float64Array {
  const out = new Float64Array(n);
  const half = w >> 1;
  let sum = 0;
  let lo = 0;
  let hi = -1;
  for (let i = 0; i < n; i++) {
    const a = Math.max(0, i - half);
    const b = Math.min(n - 1, i + half);
    while (hi < b) sum += values[++hi];
    while (lo < a) sum -= values[lo++];
    out[i] = sum / (b - a + 1);
  }
  return out;
}

export function findTurningPoints(raw: Float64Array, clock: SampleClock, options: TurningPointOptions = {}): TurningPoint[] {
  const n = Math.min(raw.length, clockLength(clock));
  let values = raw;
  const out: TurningPoint[] = [];
  if (n < 3) return out;
  let h = options.hysteresisV;
  if (h === undefined) {
    let minV = Infinity;
    let maxV = -Infinity;
    for (let i = 0; i < n; i++) {
      const v = values[i];
      if (v < minV) minV = v;
      if (v > maxV) maxV = v;
    }
    h = (options.hysteresisFraction ?? 0.25) * (maxV - minV);
  }
  if (!(h > 0)) return out;
  const w = smoothingLength(h, options.noiseV ?? 0, n);
  if (w > 1) values = runningMean(raw, n, w);

  const push = (kind: 'max' | 'min', index: number): void => {
    out.push({ kind, index, timeS: timeAt(clock, index), valueV: values[index] });
  };

  // mode 0: direction unknown; +1: heading for a maximum; -1: heading for a minimum.
  let mode = 0;
  let maxV = values[0];
  let maxI = 0;
  let minV = values[0];
  let minI = 0;
  for (let i = 1; i < n; i++) {
    const v = values[i];
    if (mode === 0) {
      if (v > maxV) {
        maxV = v;
        maxI = i;
      }
      if (v < minV) {
        minV = v;
        minI = i;
      }
      if (v < maxV - h) {
        // Falling now. The running maximum is a true peak only if the
        // waveform rose by h into it (its minimum so far lies before it).
        if (minI < maxI && maxV - minV >= h) push('max', maxI);
        mode = -1;
        minV = v;
        minI = i;
      } else if (v > minV + h) {
        if (maxI < minI && maxV - minV >= h) push('min', minI);
        mode = 1;
        maxV = v;
        maxI = i;
      }
    } else if (mode === 1) {
      if (v > maxV) {
        maxV = v;
        maxI = i;
      } else if (v < maxV - h) {
        push('max', maxI);
        mode = -1;
        minV = v;
        minI = i;
      }
    } else {
      if (v < minV) {
        minV = v;
        minI = i;
      } else if (v > minV + h) {
        push('min', minI);
        mode = 1;
        maxV = v;
        maxI = i;
      }
    }
  }
  return out;
}
