/**
 * The capture side of the shared figure definitions (../../scope/ieee181.ts for
 * the output, ../definitions/scope-definitions.ts for the capacitor): output
 * reference-level instants, capacitor turning points and windowed time constants, read off
 * sampled, noisy, quantised records. Every pass is a loop over the typed array;
 * nothing is copied.
 */
import {
  EXTREME_WINDOW_SHARE,
  CROSSING_WINDOW_SHARE,
  TAU_WINDOW_HIGH,
  TAU_WINDOW_LOW,
  tauFromWindowMeans,
} from '../definitions/scope-definitions.ts';
import { findTransitions, intervalStats, type CrossingOptions, type IntervalStats, type Transition } from './crossings.ts';
import { clockLength, indexAtTime as indexAtTimeImported, timeAt as timeAtImported, type SampleClock } from './sample-clock.ts';
import type { TurningPoint } from './turning-points.ts';

/** Module-local bindings: hot per-sample loops call these directly, not through an import binding (CJS transforms make each such call a property read). */
const timeAt = timeAtImported;
const indexAtTime = indexAtTimeImported;

export interface Spread {
  mean: number;
  /** Standard deviation of the individual readings (0 with one). */
  sd: number;
  count: number;
}

function spread(xs: readonly number[]): Spread | undefined {
  const finite = xs.filter(Number.isFinite);
  if (finite.length === 0) return undefined;
  const s = intervalStats(finite);
  return { mean: s.meanS, sd: s.stdS, count: s.count };
}

export interface OutputReadings {
  highV: number;
  lowV: number;
  transitions: Transition[];
  period: IntervalStats;
  duty: Spread | undefined;
  rise: Spread | undefined;
  fall: Spread | undefined;
}

/** Share of each state, before the output leaves it, that the end-of-state fit reads (our choice). */
const STATE_END_SHARE = 0.3;
/**
 * The end-of-state fit keeps this share of each neighbouring 10–90 % duration
 * away from the 10 %/90 % instants: twice the stretch a straight ramp spends
 * between 0 % and 10 % (our choice). A released open drain's rise is mostly
 * its tilted top creeping to 90 %, so a whole duration could swallow the state.
 */
const STATE_CLEARANCE_SHARE = 0.25;
/** Fewest samples an end-of-state fit takes. */
const STATE_END_MIN_SAMPLES = 8;
/**
 * The output has left its state once a sample runs past the state's own fit,
 * towards the other state, by this share of the amplitude (our choice: a
 * ramp leaving the state is then 0.1 % of its way in) or by
 * DEPARTURE_NOISE_MULTIPLE times the state's scatter about that fit (its
 * noise σ) / DEPARTURE_STEP_MULTIPLE ADC steps,
 * whichever is larger (noise alone then does not trip it; common practice).
 */
const DEPARTURE_AMPLITUDE_SHARE = 1e-3;
const DEPARTURE_NOISE_MULTIPLE = 6;
const DEPARTURE_STEP_MULTIPLE = 2;

/**
 * A level read from a state's end is good to this share of the amplitude
 * (our choice): the end-of-state refit takes as many samples as its scatter
 * needs for that, at least STATE_END_MIN_SAMPLES.
 */
const LEVEL_RESOLUTION_SHARE = 1e-5;
/** A sample runs past the fit before it when it leaves it by more than this many times the scatter (our choice). */
const SCATTER_MULTIPLE = 3;
/** Variance of a least-squares quadratic's value at the end of its window, in units of σ²/N (9 for many evenly spaced samples). */
const END_VALUE_VARIANCE_FACTOR = 9;

/** RMS of the samples [i0, i1] about a quadratic fit `q` in u = t − t0, V. */
function fitScatterV(values: Float64Array, clock: SampleClock, i0: number, i1: number, t0: number, q: readonly number[]): number {
  let ss = 0;
  for (let i = i0; i <= i1; i++) {
    const u = timeAt(clock, i) - t0;
    const r = values[i] - (q[0] + u * (q[1] + u * q[2]));
    ss += r * r;
  }
  return Math.sqrt(ss / Math.max(1, i1 - i0 - 2));
}

/**
 * The state levels as the shared definition reads them on the exact cycle
 * (../../scope/ieee181.ts): the pin at the instant the output starts to leave
 * the state. On samples, per state: a quadratic through the samples of its
 * last STATE_END_SHARE (clear of both transitions, STATE_CLEARANCE_SHARE),
 * followed forward to the first sample that runs past it towards
 * the other state (DEPARTURE_*): the output left the state between that
 * sample and the one before, or a few samples earlier where those already
 * leave the fit over the samples before them by more than the state's scatter
 * (a ramp's first millivolts); a fit over the samples up to the last one still
 * in the state (as many as the scatter needs, LEVEL_RESOLUTION_SHARE), read
 * half a sample after it, is the level. The departure is found, not assumed from the
 * transition's shape: a released open drain leaves its low state with a jump
 * and then creeps up its tilted top, so its 10–90 % duration (a stretch of
 * the tilt) says nothing about where the low state ended; a slew ramp, an RC
 * edge and a jump are all found within a sample of their start. A flat top
 * reads its mean, as the histogram mode does. Undefined when no state holds
 * enough samples.
 */
function endOfStateLevels(values: Float64Array, clock: SampleClock, transitions: readonly Transition[], amplitudeV: number, stepV: number): { highV?: number; lowV?: number } {
  const n = Math.min(values.length, clockLength(clock));
  const highs: number[] = [];
  const lows: number[] = [];
  for (let k = 1; k < transitions.length; k++) {
    const arrive = transitions[k - 1];
    const leave = transitions[k];
    const fromS = arrive.endS + STATE_CLEARANCE_SHARE * arrive.durationS;
    const toS = leave.startS - STATE_CLEARANCE_SHARE * leave.durationS;
    const stateS = toS - fromS;
    if (!(stateS > 0)) continue;
    const i1 = Math.min(n - 1, Math.floor(indexAtTime(clock, toS)));
    const i0 = Math.max(0, Math.ceil(indexAtTime(clock, toS - STATE_END_SHARE * stateS)));
    const iFirst = Math.max(0, Math.ceil(indexAtTime(clock, fromS)));
    if (i1 - i0 + 1 < STATE_END_MIN_SAMPLES) continue;
    const t0 = timeAt(clock, i1);
    const q = quadraticFit(values, clock, i0, i1, t0);
    if (!q || !Number.isFinite(q[0])) continue;
    // Towards the other state: a rising departure leaves the low state, a falling one the high state.
    const sign = leave.direction === 'rising' ? 1 : -1;
    // The state's own scatter about its fit: its noise (and, noiseless, how well a quadratic follows it).
    const scatterV = fitScatterV(values, clock, i0, i1, t0, q);
    const departureV = Math.max(DEPARTURE_AMPLITUDE_SHARE * Math.abs(amplitudeV), DEPARTURE_NOISE_MULTIPLE * scatterV, DEPARTURE_STEP_MULTIPLE * stepV);
    const last = Math.min(n - 1, leave.index);
    let i = i1 + 1;
    for (; i <= last; i++) {
      const u = timeAt(clock, i) - t0;
      if (sign * (values[i] - (q[0] + u * (q[1] + u * q[2]))) > departureV) break;
    }
    if (i > last) continue;
    // The fit again, over samples ending at the last one still in the state: the level is then read half a
    // sample past the fit, not extrapolated over the clearance. As few samples as the scatter about the
    // first fit allows (LEVEL_RESOLUTION_SHARE): a quadratic bends away from a curved tail at its ends.
    const wanted = Math.ceil(END_VALUE_VARIANCE_FACTOR * (scatterV / (LEVEL_RESOLUTION_SHARE * Math.abs(amplitudeV))) ** 2);
    const width = Math.min(i1 - i0 + 1, Math.max(STATE_END_MIN_SAMPLES, wanted));
    // The samples just before the one that tripped the test may already be on their way (a ramp's first
    // millivolts, rounded by the pin's RC): step back while a sample runs past the fit over the samples
    // before it by more than the state's scatter.
    // The sliding window stays several times longer than the stretch it may step back over (the departure
    // lies past i1), so a departing stretch cannot bend it; no longer than the first window.
    const slideWidth = Math.min(i1 - i0 + 1, Math.max(4 * STATE_END_MIN_SAMPLES, 4 * (i - i1)));
    const j1 = lastSampleInState(values, clock, i1, i - 1, slideWidth, iFirst, sign, SCATTER_MULTIPLE * scatterV + 1e-12 * Math.abs(amplitudeV));
    const j0 = Math.max(iFirst, j1 + 1 - width);
    const tEnd = timeAt(clock, j1);
    const refit = j1 > i1 && j1 - j0 + 1 >= STATE_END_MIN_SAMPLES ? quadraticFit(values, clock, j0, j1, tEnd) : undefined;
    const fit = refit && Number.isFinite(refit[0]) ? refit : q;
    const u = 0.5 * (tEnd + timeAt(clock, j1 + 1)) - (fit === q ? t0 : tEnd);
    const levelV = fit[0] + u * (fit[1] + u * fit[2]);
    if (!Number.isFinite(levelV)) continue;
    (sign < 0 ? highs : lows).push(levelV);
  }
  const mean = (xs: number[]) => (xs.length === 0 ? undefined : xs.reduce((a, b) => a + b, 0) / xs.length);
  const out: { highV?: number; lowV?: number } = {};
  const h = mean(highs);
  const l = mean(lows);
  if (h !== undefined) out.highV = h;
  if (l !== undefined) out.lowV = l;
  return out;
}

/**
 * Reference instants of the output between its state levels
 * (../../scope/ieee181.ts): the histogram-mode levels find the transitions,
 * the end-of-state levels (endOfStateLevels) replace them, and the
 * transitions are found again between those; then per cycle the period
 * (like-direction 50 % instants), the duty cycle (rising to falling 50 %
 * instant over the cycle) and the 10–90 % durations. `stepV`: the channel's
 * ADC step (0 when unquantised), for the departure test.
 */
export function readOutput(values: Float64Array, clock: SampleClock, modeHighV: number, modeLowV: number, crossing: CrossingOptions = {}, stepV = 0): OutputReadings {
  let highV = modeHighV;
  let lowV = modeLowV;
  let transitions = findTransitions(values, clock, { lowV, amplitudeV: highV - lowV }, crossing);
  const ends = endOfStateLevels(values, clock, transitions, highV - lowV, stepV);
  // Only a refinement: levels that would not keep the two states apart leave the modes in place.
  if (ends.highV !== undefined && ends.lowV !== undefined && ends.highV - ends.lowV > 0.5 * (modeHighV - modeLowV)) {
    highV = ends.highV;
    lowV = ends.lowV;
    transitions = findTransitions(values, clock, { lowV, amplitudeV: highV - lowV }, crossing);
  }
  const periods: number[] = [];
  const duties: number[] = [];
  const rises: number[] = [];
  const falls: number[] = [];
  let lastRiseS = Number.NaN;
  let lastFallS = Number.NaN;
  for (let k = 0; k < transitions.length; k++) {
    const a = transitions[k];
    if (a.direction === 'rising') {
      if (!Number.isNaN(lastRiseS)) periods.push(a.timeS - lastRiseS);
      lastRiseS = a.timeS;
      rises.push(a.durationS);
    } else {
      if (!Number.isNaN(lastFallS)) periods.push(a.timeS - lastFallS);
      lastFallS = a.timeS;
      falls.push(a.durationS);
    }
    if (k + 2 < transitions.length) {
      // Transitions alternate: a, b, c span one cycle; the high part is rise → fall.
      const cycleS = transitions[k + 2].timeS - a.timeS;
      const partS = transitions[k + 1].timeS - a.timeS;
      duties.push(a.direction === 'rising' ? partS / cycleS : 1 - partS / cycleS);
    }
  }
  return { highV, lowV, transitions, period: intervalStats(periods), duty: spread(duties), rise: spread(rises), fall: spread(falls) };
}

/**
 * Running sums of the normal equations of a least-squares quadratic y ≈ c0 + c1·u + c2·u², solved by
 * Cramer's rule: one implementation for the one-off fits (quadraticFit) and the sliding window
 * (lastSampleInState). One scratch instance: the callers never interleave.
 */
class QuadraticMoments {
  s0 = 0;
  s1 = 0;
  s2 = 0;
  s3 = 0;
  s4 = 0;
  y0 = 0;
  y1 = 0;
  y2 = 0;
  c0 = 0;
  c1 = 0;
  c2 = 0;

  reset(): this {
    this.s0 = this.s1 = this.s2 = this.s3 = this.s4 = this.y0 = this.y1 = this.y2 = 0;
    return this;
  }

  add(u: number, y: number): void {
    const u2 = u * u;
    this.s0 += 1;
    this.s1 += u;
    this.s2 += u2;
    this.s3 += u2 * u;
    this.s4 += u2 * u2;
    this.y0 += y;
    this.y1 += y * u;
    this.y2 += y * u2;
  }

  /** The sample (uIn, yIn) joins the window and (uOut, yOut) leaves it (the count stays). */
  slide(uIn: number, yIn: number, uOut: number, yOut: number): void {
    const o2 = uOut * uOut;
    const i2 = uIn * uIn;
    this.s1 += uIn - uOut;
    this.s2 += i2 - o2;
    this.s3 += i2 * uIn - o2 * uOut;
    this.s4 += i2 * i2 - o2 * o2;
    this.y0 += yIn - yOut;
    this.y1 += yIn * uIn - yOut * uOut;
    this.y2 += yIn * i2 - yOut * o2;
  }

  /** c0, c1, c2 from the sums; false when the system is singular. */
  solve(): boolean {
    const { s0, s1, s2, s3, s4, y0, y1, y2 } = this;
    const det = s0 * (s2 * s4 - s3 * s3) - s1 * (s1 * s4 - s3 * s2) + s2 * (s1 * s3 - s2 * s2);
    if (!(Math.abs(det) > 0)) return false;
    this.c0 = (y0 * (s2 * s4 - s3 * s3) - s1 * (y1 * s4 - s3 * y2) + s2 * (y1 * s3 - s2 * y2)) / det;
    this.c1 = (s0 * (y1 * s4 - y2 * s3) - y0 * (s1 * s4 - s3 * s2) + s2 * (s1 * y2 - y1 * s2)) / det;
    this.c2 = (s0 * (s2 * y2 - s3 * y1) - s1 * (s1 * y2 - s2 * y1) + y0 * (s1 * s3 - s2 * s2)) / det;
    return true;
  }
}

const moments = new QuadraticMoments();

/**
 * Going back from sample `from` towards `stop`: the first sample that does not
 * run past (in the direction `sign`) the least-squares quadratic through the
 * `width` samples before it by more than `toleranceV`. The window slides one
 * sample per step with running sums (time scaled to the window, values taken
 * about the first sample's, so the normal equations stay well conditioned).
 */
function lastSampleInState(values: Float64Array, clock: SampleClock, stop: number, from: number, width: number, first: number, sign: number, toleranceV: number): number {
  const tRef = timeAt(clock, from);
  const scaleS = timeAt(clock, from) - timeAt(clock, Math.max(first, from - width));
  if (!(scaleS > 0)) return from;
  const yRef = values[from];
  const m = moments.reset();
  let j = from;
  if (j - width < first) return j;
  for (let k = j - width; k < j; k++) m.add((timeAt(clock, k) - tRef) / scaleS, values[k] - yRef);
  while (j > stop && j - width - 1 >= first) {
    if (!m.solve()) break;
    const uj = (timeAt(clock, j) - tRef) / scaleS;
    if (!(sign * (values[j] - yRef - (m.c0 + uj * (m.c1 + uj * m.c2))) > toleranceV)) break;
    // Slide the window one sample back: sample j − 1 leaves it, j − width − 1 joins.
    m.slide((timeAt(clock, j - width - 1) - tRef) / scaleS, values[j - width - 1] - yRef, (timeAt(clock, j - 1) - tRef) / scaleS, values[j - 1] - yRef);
    j--;
  }
  return j;
}

/** Least-squares quadratic through samples [i0, i1] in u = t − t0: [c0, c1, c2] (undefined if singular). */
function quadraticFit(values: Float64Array, clock: SampleClock, i0: number, i1: number, t0: number): [number, number, number] | undefined {
  const m = moments.reset();
  for (let i = i0; i <= i1; i++) m.add(timeAt(clock, i) - t0, values[i]);
  return m.solve() ? [m.c0, m.c1, m.c2] : undefined;
}

const SCAN_STEPS = 64;

/**
 * A turning point from noisy samples: quadratic fits on each side of it, and
 * the extreme of their lower (for a maximum) envelope — exact for a corner
 * (an instant edge) and for a smooth peak alike. One refit around the found instant.
 */
function refineTurningPoint(values: Float64Array, clock: SampleClock, index: number, kind: 'max' | 'min', halfWidth: number): { timeS: number; valueV: number } | undefined {
  const n = Math.min(values.length, clockLength(clock));
  let p = index;
  let best: { timeS: number; valueV: number } | undefined;
  for (let pass = 0; pass < 2; pass++) {
    if (p - halfWidth < 0 || p + halfWidth > n - 1) return undefined;
    const t0 = timeAt(clock, p);
    const left = quadraticFit(values, clock, p - halfWidth, p, t0);
    const right = quadraticFit(values, clock, p, p + halfWidth, t0);
    if (!left || !right) return undefined;
    const span = (timeAt(clock, p + (halfWidth >> 1)) - timeAt(clock, p - (halfWidth >> 1))) / 2;
    const sign = kind === 'max' ? 1 : -1;
    let bestScore = -Infinity;
    for (let k = 0; k <= SCAN_STEPS; k++) {
      const u = -span + (2 * span * k) / SCAN_STEPS;
      const l = left[0] + u * (left[1] + u * left[2]);
      const r = right[0] + u * (right[1] + u * right[2]);
      const score = sign * Math.min(sign * l, sign * r);
      if (sign * score > bestScore) {
        bestScore = sign * score;
        best = { timeS: t0 + u, valueV: score };
      }
    }
    const next = Math.round(indexAtTime(clock, best!.timeS));
    if (next === p) break;
    p = next;
  }
  return best;
}

/** ∫ of the linear interpolant of the samples over [a, b] (inside the record). */
function sampleIntegral(values: Float64Array, clock: SampleClock, a: number, b: number): number {
  const fa = indexAtTime(clock, a);
  const fb = indexAtTime(clock, b);
  const ia = Math.floor(fa);
  const ib = Math.floor(fb);
  const at = (f: number) => {
    const i = Math.floor(f);
    const w = f - i;
    return w === 0 ? values[i] : values[i] + w * (values[i + 1] - values[i]);
  };
  if (ia === ib) return ((at(fa) + at(fb)) / 2) * (b - a);
  let total = ((at(fa) + values[ia + 1]) / 2) * (timeAt(clock, ia + 1) - a);
  for (let i = ia + 1; i < ib; i++) total += ((values[i] + values[i + 1]) / 2) * (timeAt(clock, i + 1) - timeAt(clock, i));
  total += ((values[ib] + at(fb)) / 2) * (b - timeAt(clock, ib));
  return total;
}

/** First index in [from, to] whose sample is at or past levelV in the direction of travel (to + 1: none). */
function firstPast(values: Float64Array, from: number, to: number, levelV: number, rising: boolean): number {
  let i = from;
  if (rising) while (i <= to && values[i] < levelV) i++;
  else while (i <= to && values[i] > levelV) i++;
  return i;
}

/**
 * Instant the samples cross levelV between indices [from, to] in the given
 * direction: the first sample past the level, then a local quadratic fit over
 * ±halfWidth samples solved for the level (noise averages out; a noisy record
 * that wiggles across the level still gives one instant). On a small swing
 * the first sample past the level can be a noise or quantisation excursion
 * far ahead of the crossing: the fit is re-centred on its own root until it
 * stays within a sample (a few rounds), so the answer is where the fitted
 * curve crosses, not where the noise first did.
 */
function levelCrossing(values: Float64Array, clock: SampleClock, from: number, to: number, levelV: number, rising: boolean, halfWidth: number): number {
  const n = Math.min(values.length, clockLength(clock));
  let i = firstPast(values, from, to, levelV, rising);
  if (i > to) return Number.NaN;
  for (let round = 0; round < RECENTRE_ROUNDS; round++) {
    if (i - halfWidth < 0 || i + halfWidth > n - 1) return Number.NaN;
    const t0 = timeAt(clock, i);
    const q = quadraticFit(values, clock, i - halfWidth, i + halfWidth, t0);
    if (!q) return Number.NaN;
    // Root of c0 − level + c1·u + c2·u² nearest u = 0 (Newton from 0 converges on the steep part).
    let u = 0;
    for (let k = 0; k < 20; k++) {
      const f = q[0] - levelV + u * (q[1] + u * q[2]);
      const d = q[1] + 2 * u * q[2];
      if (!(Math.abs(d) > 0)) return Number.NaN;
      const step = f / d;
      u -= step;
      if (Math.abs(step) < 1e-12 * (Math.abs(u) + (timeAt(clock, i + 1) - t0))) break;
    }
    const spanS = timeAt(clock, i + halfWidth) - t0;
    if (!(Math.abs(u) <= spanS)) return Number.NaN;
    const next = Math.round(indexAtTime(clock, t0 + u));
    if (Math.abs(next - i) <= 1) return t0 + u;
    i = next;
  }
  return Number.NaN;
}

/** Re-centring rounds of a level crossing's local fit (each moves it at most its half-width). */
const RECENTRE_ROUNDS = 4;

export interface CapacitorReadings {
  maxV: Spread | undefined;
  minV: Spread | undefined;
  risingTau: Spread | undefined;
  fallingTau: Spread | undefined;
  aboveMidShare: Spread | undefined;
  /** Period from same-direction mid-level crossings. */
  period: IntervalStats | undefined;
  turningPointCount: number;
}

/**
 * Sample noise, V (1σ): the mean absolute second difference over the record,
 * which for white noise of σ is σ·√6·√(2/π) (the signal's own curvature is
 * negligible at scope sampling rates except at a few corner samples). A
 * quantised record's rounding error counts too, at least step/√12 (the
 * uniform rounding error of an ADC, common practice).
 */
export function sampleNoiseV(values: Float64Array, n: number, stepV: number): number {
  let sum = 0;
  for (let i = 1; i + 1 < n; i++) sum += Math.abs(values[i + 1] - 2 * values[i] + values[i - 1]);
  const sigma = n > 2 ? sum / (n - 2) / (Math.sqrt(6) * Math.sqrt(2 / Math.PI)) : 0;
  return Math.max(sigma, stepV / Math.sqrt(12));
}

/**
 * A level crossing's local fit must see the signal move well beyond the noise
 * and the ADC step, or a small-swing record (a tiny hysteresis: a triangle a
 * few codes high) gives a flat run of one code and no crossing: at least
 * ±CROSSING_NOISE_MULTIPLE noise σ and ±CROSSING_STEP_MULTIPLE steps
 * vertically (our choice), never beyond a quarter of the stretch.
 */
const CROSSING_NOISE_MULTIPLE = 4;
const CROSSING_STEP_MULTIPLE = 2;

/** `stepV`, `noiseV`: the channel's ADC step (0 when unquantised) and sample noise (sampleNoiseV), for the crossing windows. */
export function readCapacitor(values: Float64Array, clock: SampleClock, turningPoints: readonly TurningPoint[], periodHintS: number, stepV = 0, noiseV = 0): CapacitorReadings {
  const n = Math.min(values.length, clockLength(clock));
  const dt = (timeAt(clock, n - 1) - timeAt(clock, 0)) / (n - 1);
  const halfWidth = Math.max(4, Math.round((EXTREME_WINDOW_SHARE * periodHintS) / dt));
  const crossWidth = Math.max(3, Math.round((CROSSING_WINDOW_SHARE * periodHintS) / dt));
  const verticalV = Math.max(CROSSING_NOISE_MULTIPLE * noiseV, CROSSING_STEP_MULTIPLE * stepV);
  const refined: { kind: 'max' | 'min'; index: number; timeS: number; valueV: number }[] = [];
  for (const tp of turningPoints) {
    const r = refineTurningPoint(values, clock, tp.index, tp.kind, halfWidth);
    if (r) refined.push({ kind: tp.kind, index: tp.index, ...r });
  }
  const maxV = spread(refined.filter((p) => p.kind === 'max').map((p) => p.valueV));
  const minV = spread(refined.filter((p) => p.kind === 'min').map((p) => p.valueV));
  const out: CapacitorReadings = { maxV, minV, risingTau: undefined, fallingTau: undefined, aboveMidShare: undefined, period: undefined, turningPointCount: refined.length };
  if (!maxV || !minV) return out;
  const rangeV = maxV.mean - minV.mean;
  const low = minV.mean + TAU_WINDOW_LOW * rangeV;
  const mid = minV.mean + 0.5 * rangeV;
  const high = minV.mean + TAU_WINDOW_HIGH * rangeV;
  const rising: number[] = [];
  const falling: number[] = [];
  // Mid-level instants by stretch (the k-th pair of turning points; NaN where none was read): periods
  // only between stretches two apart, so a crossing not read never merges two periods into one.
  const mids = new Float64Array(Math.max(0, turningPoints.length - 1)).fill(Number.NaN);
  const tauOver = (a: number, b: number) => {
    const h = (b - a) / 3;
    if (!(h > 2 * dt)) return Number.NaN;
    return tauFromWindowMeans(sampleIntegral(values, clock, a, a + h) / h, sampleIntegral(values, clock, a + h, a + 2 * h) / h, sampleIntegral(values, clock, a + 2 * h, b) / h, h);
  };
  // Between turning points the stretch is monotone (up to noise): cross the three levels in order.
  for (let k = 0; k + 1 < turningPoints.length; k++) {
    const a = turningPoints[k];
    const b = turningPoints[k + 1];
    if (a.kind === b.kind) continue;
    const up = a.kind === 'min';
    const [first, last] = up ? [low, high] : [high, low];
    // The stretch's mean slope, samples per volt: the window that spans the noise and the ADC step.
    const perVolt = (b.index - a.index) / Math.max(Math.abs(b.valueV - a.valueV), Number.MIN_VALUE);
    const width = Math.min(Math.max(crossWidth, Math.ceil(verticalV * perVolt)), Math.max(crossWidth, (b.index - a.index) >> 2));
    // The levels lie in order along the stretch: each search starts where the one before found its level
    // (the first sample past a further level cannot come earlier), so the stretch is read once.
    const i1 = firstPast(values, a.index, b.index, first, up);
    const im = firstPast(values, i1, b.index, mid, up);
    const t1 = levelCrossing(values, clock, i1, b.index, first, up, width);
    const tm = levelCrossing(values, clock, im, b.index, mid, up, width);
    const t2 = levelCrossing(values, clock, firstPast(values, im, b.index, last, up), b.index, last, up, width);
    mids[k] = tm;
    if (Number.isFinite(t1) && Number.isFinite(t2)) (up ? rising : falling).push(tauOver(t1, t2));
  }
  const periods: number[] = [];
  const shares: number[] = [];
  for (let k = 0; k + 2 < mids.length; k++) {
    const cycleS = mids[k + 2] - mids[k];
    if (!Number.isFinite(cycleS)) continue;
    periods.push(cycleS);
    // An upward stretch to the next upward one: the part above the mid level is up → down.
    if (turningPoints[k].kind === 'min' && Number.isFinite(mids[k + 1])) shares.push((mids[k + 1] - mids[k]) / cycleS);
  }
  out.risingTau = spread(rising);
  out.fallingTau = spread(falling);
  out.aboveMidShare = spread(shares);
  if (periods.length > 0) out.period = intervalStats(periods);
  return out;
}
