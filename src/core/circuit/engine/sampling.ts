/**
 * Waveform samples on a uniform time grid, evaluated exactly from the logged
 * pieces (no integration error, no interpolation): the power-up transient from
 * the walk's log, and beyond it — or without power-up — the repeating cycle.
 */
import { CoreError } from '../../errors.ts';
import { LOG } from './piece-log.ts';
import type { OscillatorWalk, SteadyCycle } from './walker.ts';
import { MAX_STATES, QUANTITY, rowAt, SLOT } from './modal.ts';

const state = new Float64Array(MAX_STATES);

/** Cap on samples per request: 200 000 × 4 series is about 8 MB of JSON. */
export const MAX_WAVEFORM_SAMPLES = 200_000;
export const MAX_WAVEFORM_PERIODS = 1000;

export interface WaveformOptions {
  periods: number;
  samples: number;
  /** Start at power-up (capacitor empty) instead of at a rising decision of the steady cycle. */
  includePowerUp: boolean;
}

export interface WaveformSamples {
  /** Time from the window start (power-up, or a rising decision in steady state), s. */
  timeS: Float64Array;
  capacitorV: Float64Array;
  outputV: Float64Array;
  /** Decision node P (the threshold the capacitor is compared with, before offset), V. */
  decisionV: Float64Array;
}

export function checkWaveformOptions(options: WaveformOptions): void {
  const { periods, samples } = options;
  if (!Number.isInteger(samples) || samples < 2) {
    throw new CoreError('invalid-value', 'samples must be an integer >= 2', '/samples');
  }
  if (samples > MAX_WAVEFORM_SAMPLES) {
    throw new CoreError('limit-exceeded', `At most ${MAX_WAVEFORM_SAMPLES} samples per waveform (asked for ${samples})`, '/samples', {
      maxSamples: MAX_WAVEFORM_SAMPLES,
    });
  }
  if (!Number.isFinite(periods) || periods < 1 || periods > MAX_WAVEFORM_PERIODS) {
    throw new CoreError('invalid-value', `periods must be between 1 and ${MAX_WAVEFORM_PERIODS}`, '/periods');
  }
}

export function sampleWaveform(walk: OscillatorWalk, cycle: SteadyCycle, options: WaveformOptions): WaveformSamples {
  checkWaveformOptions(options);
  const n = options.samples;
  const out: WaveformSamples = {
    timeS: new Float64Array(n),
    capacitorV: new Float64Array(n),
    outputV: new Float64Array(n),
    decisionV: new Float64Array(n),
  };
  const ev = walk.evaluator;
  const log = walk.log;
  const spanS = options.periods * cycle.periodS;
  const windowStartS = options.includePowerUp ? 0 : cycle.risingS;
  // The log ends at the end of the repeating cycle; where the walk extrapolated to the limit
  // cycle (slow slew-limited approach), the logged transient stops being physical there.
  const transientEndS = Number.isNaN(walk.extrapolatedAtS) ? cycle.startS + cycle.periodS : walk.extrapolatedAtS;
  let index = options.includePowerUp ? 0 : cycle.startIndex;
  let loaded = -1;
  for (let k = 0; k < n; k++) {
    const rel = (spanS * k) / (n - 1);
    let t = windowStartS + rel;
    let hi = log.count;
    if (!options.includePowerUp || t >= transientEndS) {
      // Fold into the repeating cycle.
      const phase = (t - cycle.startS) % cycle.periodS;
      t = cycle.startS + phase;
      const lo = cycle.startIndex;
      hi = cycle.endIndex;
      if (index < lo || index >= hi || log.get(index, LOG.startS) > t) index = lo;
    }
    while (index + 1 < hi && log.get(index + 1, LOG.startS) <= t) index++;
    if (index !== loaded) {
      ev.load(index);
      loaded = index;
    }
    const cfg = walk.cache.get(ev.key);
    const local = Math.min(Math.max(t - ev.startS, 0), ev.durationS);
    out.timeS[k] = rel;
    if (cfg.dyn) {
      // A multi-state piece: N, the pin and P from its modes.
      ev.modal.state(local, state);
      const s = ev.modal.s(local);
      out.capacitorV[k] = state[SLOT.N];
      out.outputV[k] = rowAt(cfg.dyn.row(QUANTITY.o), state, s);
      out.decisionV[k] = rowAt(cfg.dyn.row(QUANTITY.p), state, s);
      continue;
    }
    const v = ev.kin.v(local);
    const s = ev.kin.s(local);
    out.timeS[k] = rel;
    out.capacitorV[k] = v;
    out.outputV[k] = cfg.oC + cfg.oV * v + cfg.oS * s;
    out.decisionV[k] = cfg.pC + cfg.pV * v + cfg.pS * s;
  }
  return out;
}
