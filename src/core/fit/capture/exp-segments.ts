import { CoreError } from '../../errors.ts';
import { DEFAULT_MAX_FIT_POINTS, evenIndex, exponentialValueAt, fitExponentialBuffers } from './exp-fit.ts';
import type { ExponentialFit } from './exp-fit.ts';
import { assertFiniteSamples } from './sample-checks.ts';
import { clockLength, indexAtTime, timeAt } from './sample-clock.ts';
import type { SampleClock } from './sample-clock.ts';
import { findTurningPoints } from './turning-points.ts';
import type { TurningPoint, TurningPointOptions } from './turning-points.ts';

export { fitExponential, fitExponentialFull, exponentialValueAt } from './exp-fit.ts';
export type { ExponentialFit, FitExponentialOptions } from './exp-fit.ts';

/**
 * The capacitor voltage of a relaxation oscillator is a chain of exponential
 * pieces, one per output state, each running between the two switching
 * levels. This module cuts the capacitor channel at the output edges (or, with
 * no output channel, at the capacitor's own turning points), fits an
 * exponential to every complete piece, and aggregates time constants and
 * switching levels per direction. Partial pieces at the record's ends are
 * skipped: they do not start (or end) on a switching level.
 */
export interface CapacitorSegment {
  startS: number;
  endS: number;
  direction: 'rising' | 'falling';
  tauS: number;
  asymptoteV: number;
  /** Fitted model at startS (the switching level the piece left), V. */
  startV: number;
  /** Fitted model at endS (the switching level that ended it), V. */
  endV: number;
  rmsResidualV: number;
  /** Samples inside the fitted window, and the (decimated) points actually fitted. */
  sampleCount: number;
  fittedPointCount: number;
  tauAtSearchBound: boolean;
}

export interface CapacitorSegmentOptions {
  /**
   * Segment boundaries, s, in increasing order: normally the output's 50 %
   * crossing instants. Absent: the capacitor's turning points are used.
   */
  edgeTimesS?: ArrayLike<number>;
  /**
   * Fraction of each segment left out of the fit at both ends (default 0.02):
   * around a switching instant the output is still slewing and the piece is
   * not yet a clean exponential.
   */
  guardFraction?: number;
  /** Fit at most this many evenly chosen points per segment (default 2000). */
  maxFitPoints?: number;
  turningPointOptions?: TurningPointOptions;
  channelName?: string;
  pointer?: string;
}

export interface CapacitorSegmentAnalysis {
  segments: CapacitorSegment[];
  /** Mean tau of the rising (charging) / falling (discharging) segments, s. */
  risingTauS: number | undefined;
  fallingTauS: number | undefined;
  /** Mean capacitor voltage at the switching instants that end a rise / a fall, V. */
  upperSwitchV: number | undefined;
  lowerSwitchV: number | undefined;
  boundarySource: 'output-edges' | 'turning-points';
  /** The boundary instants used, s. */
  boundaryTimesS: number[];
  /** The turning points found, when they were the boundaries. */
  turningPoints?: TurningPoint[];
  warnings: string[];
}

/** Below this many samples in a fit window a segment is skipped (with a warning). */
const MIN_SEGMENT_SAMPLES = 8;

function meanOf(xs: readonly number[]): number | undefined {
  if (xs.length === 0) return undefined;
  let s = 0;
  for (const x of xs) s += x;
  return s / xs.length;
}

export function analyzeCapacitorSegments(
  values: Float64Array,
  clock: SampleClock,
  options: CapacitorSegmentOptions = {},
): CapacitorSegmentAnalysis {
  const channelName = options.channelName ?? 'capacitor';
  assertFiniteSamples(values, channelName, options.pointer);
  const n = Math.min(values.length, clockLength(clock));
  const guardFraction = options.guardFraction ?? 0.02;
  if (!(guardFraction >= 0 && guardFraction < 0.5)) {
    throw new CoreError('invalid-value', `guardFraction must be in [0, 0.5), got ${guardFraction}`);
  }
  const maxFitPoints = options.maxFitPoints ?? DEFAULT_MAX_FIT_POINTS;
  if (!Number.isInteger(maxFitPoints) || maxFitPoints < MIN_SEGMENT_SAMPLES) {
    throw new CoreError('invalid-value', `maxFitPoints must be an integer >= ${MIN_SEGMENT_SAMPLES}, got ${maxFitPoints}`);
  }

  const warnings: string[] = [];
  let boundaryTimesS: number[];
  let boundarySource: CapacitorSegmentAnalysis['boundarySource'];
  let turningPoints: TurningPoint[] | undefined;
  if (options.edgeTimesS !== undefined) {
    boundarySource = 'output-edges';
    boundaryTimesS = Array.from(options.edgeTimesS);
    for (let k = 1; k < boundaryTimesS.length; k++) {
      if (!(boundaryTimesS[k] > boundaryTimesS[k - 1])) {
        throw new CoreError('invalid-value', `edge times must increase; edge ${k} (${boundaryTimesS[k]} s) is not after edge ${k - 1}`);
      }
    }
  } else {
    boundarySource = 'turning-points';
    turningPoints = findTurningPoints(values, clock, options.turningPointOptions);
    boundaryTimesS = turningPoints.map((tp) => tp.timeS);
  }

  const segments: CapacitorSegment[] = [];
  const bufT = new Float64Array(maxFitPoints);
  const bufV = new Float64Array(maxFitPoints);
  for (let k = 0; k + 1 < boundaryTimesS.length; k++) {
    const startS = boundaryTimesS[k];
    const endS = boundaryTimesS[k + 1];
    const guardS = guardFraction * (endS - startS);
    const first = Math.ceil(indexAtTime(clock, startS + guardS));
    const last = Math.min(n - 1, Math.floor(indexAtTime(clock, endS - guardS)));
    const sampleCount = last - first + 1;
    if (sampleCount < MIN_SEGMENT_SAMPLES) {
      warnings.push(`segment ${k} (${startS.toPrecision(6)} s to ${endS.toPrecision(6)} s) holds ${Math.max(0, sampleCount)} samples; skipped`);
      continue;
    }
    const count = Math.min(sampleCount, maxFitPoints);
    for (let j = 0; j < count; j++) {
      const i = evenIndex(first, last, j, count);
      bufT[j] = timeAt(clock, i);
      bufV[j] = values[i];
    }
    const fit: ExponentialFit = fitExponentialBuffers(bufT, bufV, count);
    const startV = exponentialValueAt(fit, startS);
    const endV = exponentialValueAt(fit, endS);
    if (fit.tauAtSearchBound) {
      warnings.push(`segment ${k} (${startS.toPrecision(6)} s): the fitted time constant sits at the search bound; the piece is not a clear exponential`);
    }
    segments.push({
      startS,
      endS,
      direction: endV >= startV ? 'rising' : 'falling',
      tauS: fit.tauS,
      asymptoteV: fit.asymptoteV,
      startV,
      endV,
      rmsResidualV: fit.rmsResidualV,
      sampleCount,
      fittedPointCount: count,
      tauAtSearchBound: fit.tauAtSearchBound,
    });
  }
  for (let k = 1; k < segments.length; k++) {
    if (segments[k].direction === segments[k - 1].direction) {
      warnings.push(`segments ${k - 1} and ${k} both run ${segments[k].direction}: the boundaries do not match the capacitor's turning points`);
      break;
    }
  }

  const rising = segments.filter((s) => s.direction === 'rising');
  const falling = segments.filter((s) => s.direction === 'falling');
  // Each switching instant is seen by the piece it ends and the piece it
  // starts; pool both estimates.
  const upper = [...rising.map((s) => s.endV), ...falling.map((s) => s.startV)];
  const lower = [...falling.map((s) => s.endV), ...rising.map((s) => s.startV)];
  const result: CapacitorSegmentAnalysis = {
    segments,
    risingTauS: meanOf(rising.map((s) => s.tauS)),
    fallingTauS: meanOf(falling.map((s) => s.tauS)),
    upperSwitchV: meanOf(upper),
    lowerSwitchV: meanOf(lower),
    boundarySource,
    boundaryTimesS,
    warnings,
  };
  if (turningPoints !== undefined) result.turningPoints = turningPoints;
  return result;
}
