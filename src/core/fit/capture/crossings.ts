import { CoreError } from '../../errors.ts';
import { referenceLevelV, stateLevels } from './levels.ts';
import type { StateLevels } from './levels.ts';
import { assertFiniteSamples } from './sample-checks.ts';
import { clockLength } from './sample-clock.ts';
import type { SampleClock } from './sample-clock.ts';


/**
 * Reference-level crossings and transitions of a two-state waveform, with the
 * terms of IEEE Std 181-2011: reference levels are percentages of the waveform
 * amplitude above the low state (clause 5.3.2), the 50 % crossing is the
 * transition's time instant, and the transition duration is the time between
 * the 10 % and the 90 % reference-level instants (clause 5.3.3).
 *
 * Hysteresis against noise (our rule, documented here): a transition only
 * counts once the waveform has gone all the way from one state band to the
 * other, i.e. from at or below the lower reference level (10 %) to at or above
 * the upper one (90 %) for a rising transition, and the reverse for a falling
 * one. Noise that wiggles around the 50 % level without reaching the far band
 * never makes an edge. Within a confirmed transition the reported instants are
 * the LAST crossing of each level before the transition completed (the last
 * exit from the departing band, the last crossing of the reference level), so
 * a noisy edge that recrosses a level is timed by its final passage.
 * Every instant is linearly interpolated between the two samples around it.
 */
export type EdgeDirection = 'rising' | 'falling';

export interface Transition {
  direction: EdgeDirection;
  /** Instant of the reference-level crossing (50 % unless asked otherwise), s. */
  timeS: number;
  /** Instant the waveform left the departing state band (10 % rising, 90 % falling), s. */
  startS: number;
  /** Instant it reached the arriving band (90 % rising, 10 % falling), s. */
  endS: number;
  /** endS - startS: the lower-to-upper (10-90 %) transition duration, s. */
  durationS: number;
  /** First sample index at or past the arriving band. */
  index: number;
}

export interface CrossingOptions {
  /** Reference level for the transition instant, % of amplitude (default 50). */
  referencePercent?: number;
  /** Lower hysteresis / transition-duration level, % (default 10). */
  lowerPercent?: number;
  /** Upper hysteresis / transition-duration level, % (default 90). */
  upperPercent?: number;
}

function resolvePercents(options: CrossingOptions): { refP: number; lowP: number; highP: number } {
  const refP = options.referencePercent ?? 50;
  const lowP = options.lowerPercent ?? 10;
  const highP = options.upperPercent ?? 90;
  if (![refP, lowP, highP].every(Number.isFinite) || !(lowP < highP) || refP < lowP || refP > highP) {
    throw new CoreError(
      'invalid-value',
      `reference levels must satisfy lowerPercent <= referencePercent <= upperPercent with lower < upper; got ${lowP} / ${refP} / ${highP}`,
    );
  }
  return { refP, lowP, highP };
}

/**
 * All complete transitions of `values`, in time order; they alternate in
 * direction by construction. O(n), no allocation beyond the result list.
 */
export function findTransitions(
  values: Float64Array,
  clock: SampleClock,
  levels: Pick<StateLevels, 'lowV' | 'amplitudeV'>,
  options: CrossingOptions = {},
): Transition[] {
  const { refP, lowP, highP } = resolvePercents(options);
  const refV = referenceLevelV(levels, refP);
  const lowBandV = referenceLevelV(levels, lowP);
  const highBandV = referenceLevelV(levels, highP);
  const n = Math.min(values.length, clockLength(clock));
  const out: Transition[] = [];
  if (n === 0) return out;

  // state: -1 low band reached last, +1 high band reached last, 0 not yet known.
  let state = values[0] <= lowBandV ? -1 : values[0] >= highBandV ? 1 : 0;
  let lastRefUpS = NaN;
  let lastRefDownS = NaN;
  let lastLeaveLowS = NaN;
  let lastLeaveHighS = NaN;
  // The hot loop of every capture: sample instants computed inline for an even clock.
  const uniform = clock.kind === 'uniform';
  const startS = uniform ? clock.startS : 0;
  const stepS = uniform ? clock.intervalS : 0;
  const times = uniform ? undefined : clock.timeS;
  let tPrev: number;
  let vPrev = values[0];

  for (let i = 1; i < n; i++) {
    const v = values[i];
    // Most samples sit inside the band of the state last reached, as did the one before: nothing can
    // happen there (no level is crossed), and skipping them keeps noise from costing a branch per level.
    if (state === 1 ? v >= highBandV && vPrev >= highBandV : state === -1 && v <= lowBandV && vPrev <= lowBandV) {
      vPrev = v;
      continue;
    }
    const t = uniform ? startS + i * stepS : times![i];
    tPrev = uniform ? startS + (i - 1) * stepS : times![i - 1];
    if (v > vPrev) {
      if (vPrev <= lowBandV && v > lowBandV) lastLeaveLowS = tPrev + ((lowBandV - vPrev) * (t - tPrev)) / (v - vPrev);
      if (vPrev < refV && v >= refV) lastRefUpS = tPrev + ((refV - vPrev) * (t - tPrev)) / (v - vPrev);
      if (v >= highBandV) {
        if (state === -1) {
          const endS = vPrev < highBandV ? tPrev + ((highBandV - vPrev) * (t - tPrev)) / (v - vPrev) : tPrev;
          out.push({ direction: 'rising', timeS: lastRefUpS, startS: lastLeaveLowS, endS, durationS: endS - lastLeaveLowS, index: i });
        }
        state = 1;
      }
    } else if (v < vPrev) {
      if (vPrev >= highBandV && v < highBandV) lastLeaveHighS = tPrev + ((highBandV - vPrev) * (t - tPrev)) / (v - vPrev);
      if (vPrev > refV && v <= refV) lastRefDownS = tPrev + ((refV - vPrev) * (t - tPrev)) / (v - vPrev);
      if (v <= lowBandV) {
        if (state === 1) {
          const endS = vPrev > lowBandV ? tPrev + ((lowBandV - vPrev) * (t - tPrev)) / (v - vPrev) : tPrev;
          out.push({ direction: 'falling', timeS: lastRefDownS, startS: lastLeaveHighS, endS, durationS: endS - lastLeaveHighS, index: i });
        }
        state = -1;
      }
    } else if (state === 0) {
      if (v <= lowBandV) state = -1;
      else if (v >= highBandV) state = 1;
    }
    vPrev = v;
  }
  return out;
}

export interface ReferenceCrossing {
  direction: EdgeDirection;
  timeS: number;
  index: number;
}

/** Crossings of an arbitrary reference level (% of amplitude), with the 10-90 % hysteresis above. */
export function findReferenceCrossings(
  values: Float64Array,
  clock: SampleClock,
  levels: Pick<StateLevels, 'lowV' | 'amplitudeV'>,
  options: CrossingOptions = {},
): ReferenceCrossing[] {
  return findTransitions(values, clock, levels, options).map((tr) => ({ direction: tr.direction, timeS: tr.timeS, index: tr.index }));
}

export interface IntervalStats {
  meanS: number;
  /** Sample standard deviation (n-1); 0 with a single interval. For periods this is the period jitter. */
  stdS: number;
  minS: number;
  maxS: number;
  count: number;
}

/** Mean / std / min / max of a list of intervals (seconds). */
export function intervalStats(intervalsS: readonly number[]): IntervalStats {
  const count = intervalsS.length;
  let sum = 0;
  let minS = Infinity;
  let maxS = -Infinity;
  for (const d of intervalsS) {
    sum += d;
    if (d < minS) minS = d;
    if (d > maxS) maxS = d;
  }
  const meanS = sum / count;
  let ss = 0;
  for (const d of intervalsS) ss += (d - meanS) * (d - meanS);
  return { meanS, stdS: count > 1 ? Math.sqrt(ss / (count - 1)) : 0, minS, maxS, count };
}

export interface EdgeAnalysis {
  levels: StateLevels;
  transitions: Transition[];
  /** Periods from successive same-direction transitions (both directions pooled). */
  period: IntervalStats;
  frequencyHz: number;
  /** Time above the reference level over the period, averaged over complete cycles, 0..1. */
  dutyCycle: number;
  dutyCycleCount: number;
  /** Mean 10-90 % duration of the rising transitions, s (undefined if none). */
  riseTimeS: number | undefined;
  fallTimeS: number | undefined;
  riseCount: number;
  fallCount: number;
}

export interface EdgeAnalysisOptions extends CrossingOptions {
  /** Precomputed state levels; computed by the histogram method when absent. */
  levels?: StateLevels;
  channelName?: string;
  pointer?: string;
}

function mean(xs: readonly number[]): number | undefined {
  if (xs.length === 0) return undefined;
  let s = 0;
  for (const x of xs) s += x;
  return s / xs.length;
}

/**
 * Period, jitter, duty cycle and transition durations of a square-ish
 * waveform such as the amplifier output. Throws CoreError('bad-capture') for
 * non-finite samples and when fewer than two same-direction edges exist.
 */
export function analyzeEdges(values: Float64Array, clock: SampleClock, options: EdgeAnalysisOptions = {}): EdgeAnalysis {
  const channelName = options.channelName ?? 'channel';
  assertFiniteSamples(values, channelName, options.pointer);
  const levels =
    options.levels ??
    stateLevels(values, {
      channelName,
      ...(options.pointer === undefined ? {} : { pointer: options.pointer }),
    });
  const transitions = findTransitions(values, clock, levels, options);
  const rising = transitions.filter((t) => t.direction === 'rising');
  const falling = transitions.filter((t) => t.direction === 'falling');

  if (rising.length < 2 && falling.length < 2) {
    const what =
      transitions.length === 0
        ? 'no complete edge'
        : transitions.length === 1
          ? `one edge only (${transitions[0].direction} at ${transitions[0].timeS.toPrecision(6)} s)`
          : 'one edge in each direction only';
    throw new CoreError(
      'bad-capture',
      `${channelName} shows ${what}: at least two edges in the same direction (one full period) are needed; capture a longer record`,
      options.pointer,
      { reason: 'too-few-edges', channel: channelName, edgeCount: transitions.length },
    );
  }

  const periods: number[] = [];
  for (let k = 1; k < rising.length; k++) periods.push(rising[k].timeS - rising[k - 1].timeS);
  for (let k = 1; k < falling.length; k++) periods.push(falling[k].timeS - falling[k - 1].timeS);
  const period = intervalStats(periods);

  // Duty per complete cycle. Transitions alternate, so a cycle is three
  // consecutive transitions; anchor on rising edges when such a cycle exists.
  const duties: number[] = [];
  for (let k = 0; k + 2 < transitions.length; k++) {
    const a = transitions[k];
    const b = transitions[k + 1];
    const c = transitions[k + 2];
    if (a.direction !== 'rising') continue;
    duties.push((b.timeS - a.timeS) / (c.timeS - a.timeS));
  }
  if (duties.length === 0) {
    for (let k = 0; k + 2 < transitions.length; k++) {
      const a = transitions[k];
      if (a.direction !== 'falling') continue;
      const lowS = transitions[k + 1].timeS - a.timeS;
      duties.push(1 - lowS / (transitions[k + 2].timeS - a.timeS));
    }
  }

  const riseTimeS = mean(rising.map((t) => t.durationS));
  const fallTimeS = mean(falling.map((t) => t.durationS));
  return {
    levels,
    transitions,
    period,
    frequencyHz: 1 / period.meanS,
    dutyCycle: mean(duties) ?? NaN,
    dutyCycleCount: duties.length,
    riseTimeS,
    fallTimeS,
    riseCount: rising.length,
    fallCount: falling.length,
  };
}
