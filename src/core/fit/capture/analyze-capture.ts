import { CoreError } from '../../errors.ts';
import type { CrossingOptions, IntervalStats } from './crossings.ts';
import { stateLevelsInRange } from './levels.ts';
import { readCapacitor, readOutput, sampleNoiseV, type Spread } from './scope-readings.ts';
import { assertFiniteSamples } from './sample-checks.ts';
import { explicitClock, uniformClock } from './sample-clock.ts';
import type { SampleClock } from './sample-clock.ts';
import { findTurningPoints } from './turning-points.ts';

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

export type CaptureAnalysisOptions = CrossingOptions;

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
  /** Output-high share of the period between 50 % crossings, 0..1 (output channel only). */
  dutyCycle?: number;
  outputHighV?: number;
  outputLowV?: number;
  /** Mean 10-90 % transition durations of the output, s. */
  riseTimeS?: number;
  fallTimeS?: number;
  edgeCount?: number;
  /** Capacitor turning points (local fits on both sides), averaged, V. */
  capacitorMinV?: number;
  capacitorMaxV?: number;
  /** Windowed time constants of the charging / discharging segments, s. */
  risingTauS?: number;
  fallingTauS?: number;
  /** Share of the period the capacitor spends above the middle of its range, 0..1. */
  capacitorAboveMidShare?: number;
  turningPointCount?: number;
  sampleCount: number;
  /** Mean sample spacing, s, and the record's length, s. */
  sampleIntervalS: number;
  durationS: number;
  warnings: string[];
  /**
   * ADC step of each channel: the smallest non-zero difference between neighbouring samples (noise makes a
   * quantised record toggle between adjacent codes; tiny and harmless on an unquantised one). For the
   * uncertainties; not reported.
   */
  sampleSteps: { outputV?: number; capacitorV?: number };
  /** Spread of the per-cycle readings behind each figure (for the uncertainties; not reported). */
  spreads: Partial<Record<'dutyCycle' | 'riseTimeS' | 'fallTimeS' | 'capacitorMaxV' | 'capacitorMinV' | 'risingTauS' | 'fallingTauS' | 'capacitorAboveMidShare', Spread>>;
}

/** A capacitor record with more than this share of samples at exactly its extreme is clipped. */
const CAPACITOR_CLIPPED_FRACTION = 0.05;
/** ...and more than this many times the samples on the next value in from it. */
const CLIPPED_PLATEAU_RATIO = 4;

/** Turning points need an excursion of this share of the capacitor's range (as findTurningPoints' default). */
const TURNING_POINT_HYSTERESIS = 0.25;

/** Sample intervals a scope can have: 1 fs to 1000 s (our bounds, far beyond any instrument's). */
export const MIN_SAMPLE_INTERVAL_S = 1e-15;
export const MAX_SAMPLE_INTERVAL_S = 1e3;

function bad(message: string, reason: string, pointer?: string, extra: Record<string, unknown> = {}): CoreError {
  return new CoreError('bad-capture', message, pointer, { reason, ...extra });
}

function toFloat64(xs: ArrayLike<number>): Float64Array {
  return xs instanceof Float64Array ? xs : Float64Array.from(xs);
}

function buildClock(input: CaptureInput, n: number, warnings: string[]): SampleClock {
  const dt = input.sampleIntervalS;
  if (dt !== undefined && !(Number.isFinite(dt) && dt >= MIN_SAMPLE_INTERVAL_S && dt <= MAX_SAMPLE_INTERVAL_S)) {
    throw bad(`sampleIntervalS must be from ${MIN_SAMPLE_INTERVAL_S} s to ${MAX_SAMPLE_INTERVAL_S} s, got ${dt}`, 'bad-sample-interval', '/sampleIntervalS');
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

/** Smallest and largest sample and the ADC step (see CaptureFeatures.sampleSteps), checking every sample is finite, in one pass. */
function channelRange(values: Float64Array, channel: string, pointer: string): { minV: number; maxV: number; stepV: number } {
  let minV = Infinity;
  let maxV = -Infinity;
  let stepV = Infinity;
  let previous = values[0];
  // Math.min/max rather than compare-and-branch (no mispredicted branches on noisy records); the step's
  // test is rarely true once the step is found, so it predicts well.
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    minV = Math.min(minV, v);
    maxV = Math.max(maxV, v);
    const d = Math.abs(v - previous);
    previous = v;
    if (d < stepV && d > 0) stepV = d;
  }
  // Math.min/max carry a NaN through and an infinity becomes an extreme: the slow check names the sample.
  if (!Number.isFinite(minV) || !Number.isFinite(maxV)) assertFiniteSamples(values, channel, pointer);
  return { minV, maxV, stepV: Number.isFinite(stepV) ? stepV : 0 };
}

/** Throws when the capacitor record is cut off at its top or bottom (extremes known). */
function checkCapacitorClipping(v: Float64Array, minV: number, maxV: number): void {
  let atMin = 0;
  let atMax = 0;
  for (let i = 0; i < v.length; i++) {
    const x = v[i];
    atMin += x === minV ? 1 : 0;
    atMax += x === maxV ? 1 : 0;
  }
  // Only a record with many samples on an extreme can be clipped: then count the next value in from each.
  const pinnedFloor = CAPACITOR_CLIPPED_FRACTION * v.length;
  if (!(atMax > pinnedFloor || atMin > pinnedFloor)) return;
  let nextUp = Infinity;
  let nextUpCount = 0;
  let nextDown = -Infinity;
  let nextDownCount = 0;
  for (let i = 0; i < v.length; i++) {
    const x = v[i];
    if (x !== minV) {
      if (x < nextUp) {
        nextUp = x;
        nextUpCount = 1;
      } else if (x === nextUp) nextUpCount++;
    }
    if (x !== maxV) {
      if (x > nextDown) {
        nextDown = x;
        nextDownCount = 1;
      } else if (x === nextDown) nextDownCount++;
    }
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
}

type SpreadFigure = keyof CaptureFeatures['spreads'];

/** Each reading present becomes its figure (the mean) and its spread (for the uncertainties). */
function copyReadings(features: CaptureFeatures, spreads: CaptureFeatures['spreads'], readings: Partial<Record<SpreadFigure, Spread | undefined>>): void {
  for (const key of Object.keys(readings) as SpreadFigure[]) {
    const reading = readings[key];
    if (reading === undefined) continue;
    features[key] = reading.mean;
    spreads[key] = reading;
  }
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
  const outputRange = output === undefined ? undefined : channelRange(output, 'output', '/output');
  const capacitorRange = capacitor === undefined ? undefined : channelRange(capacitor, 'capacitor', '/capacitor');
  if (capacitor !== undefined) checkCapacitorClipping(capacitor, capacitorRange!.minV, capacitorRange!.maxV);

  const t0 = clock.kind === 'uniform' ? clock.startS : clock.timeS[0];
  const tEnd = clock.kind === 'uniform' ? clock.startS + (n - 1) * clock.intervalS : clock.timeS[n - 1];
  const durationS = tEnd - t0;
  const sampleIntervalS = durationS / (n - 1);
  if (!(sampleIntervalS >= MIN_SAMPLE_INTERVAL_S) || !Number.isFinite(durationS)) {
    throw bad(`the record spans ${durationS} s over ${n} samples: not a usable time base`, 'bad-sample-interval', input.timeS !== undefined ? '/timeS' : '/sampleIntervalS');
  }

  const spreads: CaptureFeatures['spreads'] = {};
  const timing = (timingSource: CaptureFeatures['timingSource'], period: IntervalStats): CaptureFeatures => ({
    timingSource,
    frequencyHz: 1 / period.meanS,
    periodS: period.meanS,
    periodJitterS: period.stdS,
    periodMinS: period.minS,
    periodMaxS: period.maxS,
    periodCount: period.count,
    sampleCount: n,
    sampleIntervalS,
    durationS,
    warnings,
    sampleSteps: {
      ...(outputRange ? { outputV: outputRange.stepV } : {}),
      ...(capacitorRange ? { capacitorV: capacitorRange.stepV } : {}),
    },
    spreads,
  });
  let features: CaptureFeatures;
  if (output !== undefined) {
    // IEEE 181 histogram-mode state levels (../../scope/ieee181.ts), then the reference instants between them.
    const levels = stateLevelsInRange(output, outputRange!.minV, outputRange!.maxV, { channelName: 'output', pointer: '/output' });
    const read = readOutput(output, clock, levels.highV, levels.lowV, options, outputRange!.stepV);
    const period = read.period;
    if (!(period.count >= 1)) {
      const t = read.transitions;
      const what = t.length === 0 ? 'no complete edge' : t.length === 1 ? `one edge only (${t[0].direction} at ${t[0].timeS.toPrecision(6)} s)` : 'one edge in each direction only';
      throw bad(`output shows ${what}: at least two edges in the same direction (one full period) are needed; capture a longer record`, 'too-few-edges', '/output', {
        channel: 'output',
        edgeCount: t.length,
      });
    }
    features = { ...timing('output', period), outputHighV: read.highV, outputLowV: read.lowV, edgeCount: read.transitions.length };
    copyReadings(features, spreads, { dutyCycle: read.duty, riseTimeS: read.rise, fallTimeS: read.fall });
    const slowest = Math.max(features.riseTimeS ?? 0, features.fallTimeS ?? 0);
    if (slowest > 0.05 * features.periodS) {
      warnings.push(`output transitions take ${((slowest / features.periodS) * 100).toFixed(1)} % of the period: edges are slow against the period (slew-limited?)`);
    }
  }
  if (capacitor !== undefined) {
    const noiseV = sampleNoiseV(capacitor, n, capacitorRange!.stepV);
    const turning = findTurningPoints(capacitor, clock, { hysteresisV: TURNING_POINT_HYSTERESIS * (capacitorRange!.maxV - capacitorRange!.minV), noiseV });
    const maxima = turning.filter((p) => p.kind === 'max').length;
    const minima = turning.filter((p) => p.kind === 'min').length;
    if (output === undefined && maxima < 2 && minima < 2) {
      const what = turning.length === 0 ? 'no turning point' : turning.length === 1 ? 'one edge only (one turning point)' : 'one edge in each direction only';
      throw bad(`capacitor shows ${what}: at least two switching instants in the same direction (one full period) are needed`, 'too-few-edges', '/capacitor', {
        edgeCount: turning.length,
      });
    }
    let periodHintS = features! ? features.periodS : Number.NaN;
    if (!Number.isFinite(periodHintS)) periodHintS = turning.length > 2 ? (2 * (turning[turning.length - 1].timeS - turning[0].timeS)) / (turning.length - 1) : durationS;
    const read = readCapacitor(capacitor, clock, turning, periodHintS, capacitorRange!.stepV, noiseV);
    if (features! === undefined) {
      if (read.period === undefined) throw bad('capacitor turning points too close to the record ends to time a full period', 'too-few-edges', '/capacitor', { edgeCount: turning.length });
      features = timing('capacitor', read.period);
      warnings.push('no output channel: the period comes from the capacitor turning points; the duty cycle is read as the share of the period the capacitor spends above its mid level');
    }
    const f = features;
    f.turningPointCount = read.turningPointCount;
    copyReadings(f, spreads, {
      capacitorMaxV: read.maxV,
      capacitorMinV: read.minV,
      risingTauS: read.risingTau,
      fallingTauS: read.fallingTau,
      capacitorAboveMidShare: read.aboveMidShare,
    });
    if (read.risingTau === undefined && read.fallingTau === undefined) warnings.push('no complete capacitor stretch between two turning points: no time constant');
  }
  const f = features!;
  if (f.periodCount < 3) warnings.push(`only ${f.periodCount} period(s) in the record: jitter and averages rest on very few cycles`);
  return f;
}
