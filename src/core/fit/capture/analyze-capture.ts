import { CoreError } from '../../errors.ts';
import { analyzeEdges, intervalStats } from './crossings.ts';
import type { CrossingOptions, IntervalStats } from './crossings.ts';
import { analyzeCapacitorSegments } from './exp-segments.ts';
import type { CapacitorSegmentAnalysis } from './exp-segments.ts';
import { assertFiniteSamples } from './sample-checks.ts';
import { explicitClock, uniformClock } from './sample-clock.ts';
import type { SampleClock } from './sample-clock.ts';
import type { TurningPoint } from './turning-points.ts';

/**
 * Everything a relaxation-oscillator scope capture tells us, from one or both
 * channels: the amplifier output (a square wave) and the timing-capacitor
 * voltage (exponential pieces between the two switching levels).
 *
 * Errors are CoreError('bad-capture') with `details.reason` and a JSON
 * pointer relative to the capture object ('/output', '/timeS/17', ...); the
 * caller prefixes it with where the capture sits in its request.
 */
export interface CaptureInput {
  /** Even sampling interval, s (needed when timeS is absent). */
  sampleIntervalS?: number;
  /** Explicit sample instants, s, strictly increasing; wins over sampleIntervalS. */
  timeS?: ArrayLike<number>;
  /** Amplifier output, V. */
  output?: ArrayLike<number>;
  /** Timing-capacitor voltage, V. */
  capacitor?: ArrayLike<number>;
}

export interface CaptureAnalysisOptions extends CrossingOptions {
  /** Points fitted per capacitor segment (default 2000). */
  maxFitPoints?: number;
  /** Share of each capacitor segment left out of the fit at both ends (default 0.02). */
  guardFraction?: number;
}

export interface CaptureFeatures {
  /** Which channel the period, duty and edges came from. */
  timingSource: 'output' | 'capacitor';
  frequencyHz: number;
  periodS: number;
  /** Standard deviation of the individual periods, s. */
  periodJitterS: number;
  periodMinS: number;
  periodMaxS: number;
  periodCount: number;
  /** Output-high share of the period, 0..1 (from the capacitor alone: its rising share). */
  dutyCycle: number;
  outputHighV?: number;
  outputLowV?: number;
  /** Mean 10-90 % transition durations of the output, s. */
  riseTimeS?: number;
  fallTimeS?: number;
  edgeCount?: number;
  capacitorMinV?: number;
  capacitorMaxV?: number;
  /** Capacitor voltage at the switching instants, averaged, V. */
  upperSwitchV?: number;
  lowerSwitchV?: number;
  /** Fitted time constant of the charging / discharging pieces, s. */
  risingTauS?: number;
  fallingTauS?: number;
  segmentCount?: number;
  sampleCount: number;
  /** Mean sample spacing, s, and the record's length, s. */
  sampleIntervalS: number;
  durationS: number;
  warnings: string[];
}

/** A capacitor record with more than this share of samples at exactly its extreme is clipped. */
const CAPACITOR_CLIPPED_FRACTION = 0.05;
/** ...and more than this many times the samples on the next value in from it. */
const CLIPPED_PLATEAU_RATIO = 4;

function bad(message: string, reason: string, pointer?: string, extra: Record<string, unknown> = {}): CoreError {
  return new CoreError('bad-capture', message, pointer, { reason, ...extra });
}

function toFloat64(xs: ArrayLike<number>): Float64Array {
  return xs instanceof Float64Array ? xs : Float64Array.from(xs);
}

function buildClock(input: CaptureInput, n: number, warnings: string[]): SampleClock {
  const dt = input.sampleIntervalS;
  if (dt !== undefined && !(Number.isFinite(dt) && dt > 0)) {
    throw bad(`sampleIntervalS must be a positive number of seconds, got ${dt}`, 'bad-sample-interval', '/sampleIntervalS');
  }
  if (input.timeS === undefined) {
    if (dt === undefined) throw bad('the capture needs either timeS or sampleIntervalS', 'no-time-base', '/sampleIntervalS');
    return uniformClock(dt, n);
  }
  const t = toFloat64(input.timeS);
  if (t.length !== n) {
    throw bad(`timeS has ${t.length} samples but the channels have ${n}`, 'length-mismatch', '/timeS');
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(t[i])) throw bad(`timeS sample ${i} is ${t[i]}`, 'non-finite-sample', `/timeS/${i}`, { index: i });
    if (i > 0 && !(t[i] > t[i - 1])) {
      throw bad(
        `timeS is not strictly increasing: sample ${i} (${t[i]} s) does not follow sample ${i - 1} (${t[i - 1]} s)`,
        'non-monotonic-time',
        `/timeS/${i}`,
        { index: i },
      );
    }
  }
  if (dt !== undefined) {
    const meanDt = (t[n - 1] - t[0]) / (n - 1);
    if (Math.abs(meanDt - dt) > 0.01 * dt) {
      warnings.push(`sampleIntervalS ${dt} s disagrees with the time column's mean step ${meanDt.toPrecision(6)} s; the time column was used`);
    }
  }
  return explicitClock(t);
}

function capacitorExtremes(v: Float64Array): { minV: number; maxV: number } {
  let minV = Infinity;
  let maxV = -Infinity;
  for (let i = 0; i < v.length; i++) {
    if (v[i] < minV) minV = v[i];
    if (v[i] > maxV) maxV = v[i];
  }
  // Counts at the extremes and at the nearest value inside each extreme.
  let atMin = 0;
  let atMax = 0;
  let nextUp = Infinity;
  let nextUpCount = 0;
  let nextDown = -Infinity;
  let nextDownCount = 0;
  for (let i = 0; i < v.length; i++) {
    const x = v[i];
    if (x === minV) atMin++;
    else if (x < nextUp) {
      nextUp = x;
      nextUpCount = 1;
    } else if (x === nextUp) nextUpCount++;
    if (x === maxV) atMax++;
    else if (x > nextDown) {
      nextDown = x;
      nextDownCount = 1;
    } else if (x === nextDown) nextDownCount++;
  }
  // A clean exponential passes its extreme in a few samples per cycle, and a
  // quantised one spends about as long on the code below the top as on the
  // top code itself. Many samples on exactly the extreme, far more than on the
  // next code, is a plateau: the scope's range cut the peaks off.
  const clippedTop = atMax > CAPACITOR_CLIPPED_FRACTION * v.length && atMax > CLIPPED_PLATEAU_RATIO * nextDownCount;
  const clippedBottom = atMin > CAPACITOR_CLIPPED_FRACTION * v.length && atMin > CLIPPED_PLATEAU_RATIO * nextUpCount;
  if (maxV > minV && (clippedTop || clippedBottom)) {
    const top = clippedTop;
    const share = (top ? atMax : atMin) / v.length;
    throw bad(
      `capacitor is clipped: ${(share * 100).toFixed(1)} % of its samples sit exactly at the record's ${top ? 'maximum' : 'minimum'} ${top ? maxV : minV} V; re-capture with more vertical range`,
      'clipped',
      '/capacitor',
      { railV: top ? maxV : minV, pinnedFraction: share },
    );
  }
  return { minV, maxV };
}

/** Period and duty from the capacitor's turning points (output high while the capacitor charges). */
function timingFromTurningPoints(tps: readonly TurningPoint[]): { period: IntervalStats; dutyCycle: number } {
  const maxima = tps.filter((p) => p.kind === 'max');
  const minima = tps.filter((p) => p.kind === 'min');
  if (maxima.length < 2 && minima.length < 2) {
    const what = tps.length === 0 ? 'no turning point' : tps.length === 1 ? 'one edge only (one turning point)' : 'one edge in each direction only';
    throw bad(`capacitor shows ${what}: at least two switching instants in the same direction (one full period) are needed`, 'too-few-edges', '/capacitor', {
      edgeCount: tps.length,
    });
  }
  const periods: number[] = [];
  for (let k = 1; k < maxima.length; k++) periods.push(maxima[k].timeS - maxima[k - 1].timeS);
  for (let k = 1; k < minima.length; k++) periods.push(minima[k].timeS - minima[k - 1].timeS);
  const duties: number[] = [];
  for (let k = 0; k + 2 < tps.length; k++) {
    const a = tps[k];
    const b = tps[k + 1];
    const c = tps[k + 2];
    const rising = a.kind === 'min' ? b.timeS - a.timeS : c.timeS - b.timeS;
    duties.push(rising / (c.timeS - a.timeS));
  }
  let sum = 0;
  for (const d of duties) sum += d;
  return { period: intervalStats(periods), dutyCycle: sum / duties.length };
}

export function analyzeCapture(input: CaptureInput, options: CaptureAnalysisOptions = {}): CaptureFeatures {
  const warnings: string[] = [];
  if (input.output === undefined && input.capacitor === undefined) {
    throw bad('the capture has no channel: give output, capacitor or both', 'no-channel', '');
  }
  const output = input.output === undefined ? undefined : toFloat64(input.output);
  const capacitor = input.capacitor === undefined ? undefined : toFloat64(input.capacitor);
  if (output !== undefined && capacitor !== undefined && output.length !== capacitor.length) {
    throw bad(`output has ${output.length} samples but capacitor has ${capacitor.length}`, 'length-mismatch', '/capacitor');
  }
  const n = (output ?? capacitor)!.length;
  if (n < 4) throw bad(`the capture has ${n} samples; at least 4 are needed`, 'too-few-samples', output ? '/output' : '/capacitor');
  const clock = buildClock(input, n, warnings);
  if (output !== undefined) assertFiniteSamples(output, 'output', '/output');
  if (capacitor !== undefined) assertFiniteSamples(capacitor, 'capacitor', '/capacitor');
  const capacitorRange = capacitor === undefined ? undefined : capacitorExtremes(capacitor);

  const t0 = clock.kind === 'uniform' ? clock.startS : clock.timeS[0];
  const tEnd = clock.kind === 'uniform' ? clock.startS + (n - 1) * clock.intervalS : clock.timeS[n - 1];
  const durationS = tEnd - t0;
  const sampleIntervalS = durationS / (n - 1);
  const segmentOptions = {
    ...(options.maxFitPoints === undefined ? {} : { maxFitPoints: options.maxFitPoints }),
    ...(options.guardFraction === undefined ? {} : { guardFraction: options.guardFraction }),
    channelName: 'capacitor',
    pointer: '/capacitor',
  };

  let features: CaptureFeatures;
  let segments: CapacitorSegmentAnalysis | undefined;
  if (output !== undefined) {
    const edges = analyzeEdges(output, clock, { ...options, channelName: 'output', pointer: '/output' });
    features = {
      timingSource: 'output',
      frequencyHz: edges.frequencyHz,
      periodS: edges.period.meanS,
      periodJitterS: edges.period.stdS,
      periodMinS: edges.period.minS,
      periodMaxS: edges.period.maxS,
      periodCount: edges.period.count,
      dutyCycle: edges.dutyCycle,
      outputHighV: edges.levels.highV,
      outputLowV: edges.levels.lowV,
      edgeCount: edges.transitions.length,
      sampleCount: n,
      sampleIntervalS,
      durationS,
      warnings,
    };
    if (edges.riseTimeS !== undefined) features.riseTimeS = edges.riseTimeS;
    if (edges.fallTimeS !== undefined) features.fallTimeS = edges.fallTimeS;
    const slowest = Math.max(edges.riseTimeS ?? 0, edges.fallTimeS ?? 0);
    if (slowest > 0.05 * edges.period.meanS) {
      warnings.push(
        `output transitions take ${((slowest / edges.period.meanS) * 100).toFixed(1)} % of the period: edges are slow against the period (slew-limited?)`,
      );
    }
    if (capacitor !== undefined) {
      segments = analyzeCapacitorSegments(capacitor, clock, { ...segmentOptions, edgeTimesS: edges.transitions.map((tr) => tr.timeS) });
    }
  } else {
    segments = analyzeCapacitorSegments(capacitor!, clock, segmentOptions);
    const timing = timingFromTurningPoints(segments.turningPoints ?? []);
    features = {
      timingSource: 'capacitor',
      frequencyHz: 1 / timing.period.meanS,
      periodS: timing.period.meanS,
      periodJitterS: timing.period.stdS,
      periodMinS: timing.period.minS,
      periodMaxS: timing.period.maxS,
      periodCount: timing.period.count,
      dutyCycle: timing.dutyCycle,
      sampleCount: n,
      sampleIntervalS,
      durationS,
      warnings,
    };
    warnings.push('no output channel: period and duty come from the capacitor turning points; the duty cycle assumes the output is high while the capacitor charges');
  }

  if (capacitorRange !== undefined && segments !== undefined) {
    const ext = capacitorRange;
    features.capacitorMinV = ext.minV;
    features.capacitorMaxV = ext.maxV;
    features.segmentCount = segments.segments.length;
    if (segments.upperSwitchV !== undefined) features.upperSwitchV = segments.upperSwitchV;
    if (segments.lowerSwitchV !== undefined) features.lowerSwitchV = segments.lowerSwitchV;
    if (segments.risingTauS !== undefined) features.risingTauS = segments.risingTauS;
    if (segments.fallingTauS !== undefined) features.fallingTauS = segments.fallingTauS;
    warnings.push(...segments.warnings);
    if (segments.segments.length === 0) warnings.push('no complete capacitor segment could be fitted');
  }
  if (features.periodCount < 3) warnings.push(`only ${features.periodCount} period(s) in the record: jitter and averages rest on very few cycles`);
  return features;
}
