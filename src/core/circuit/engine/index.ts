/**
 * The time-domain engine (DESIGN §3.2): walk the circuit from power-up through
 * exactly solved linear pieces until the switching state repeats, then read
 * the figures off the repeating cycle.
 */
import type { PreparedCircuit } from '../analyze.ts';
import { powerUpState, requireHysteresis } from '../closed-form.ts';
import { nominalEdgeTimes } from '../frequency-ceiling.ts';
import type { OscillationFigures } from '../result.ts';
import { figuresFromWalk, type TimeDomainFigures, type WalkExtras } from './figures.ts';
import { checkWaveformOptions, sampleWaveform, type WaveformOptions, type WaveformSamples } from './sampling.ts';
import { OscillatorWalk, type SteadyCycle } from './walker.ts';

export { MAX_WAVEFORM_PERIODS, MAX_WAVEFORM_SAMPLES, checkWaveformOptions, type WaveformOptions, type WaveformSamples } from './sampling.ts';
export { MAX_CYCLES, STEADY_STATE_TOLERANCE, type SteadyCycle } from './walker.ts';
export type { TimeDomainFigures, WalkExtras } from './figures.ts';
export { CLAMP_RESISTANCE_OHM } from './configs.ts';

export interface TimeDomainRun {
  walk: OscillatorWalk;
  cycle: SteadyCycle;
  figures: TimeDomainFigures;
  extras: WalkExtras;
}

/**
 * Without hysteresis there is nothing to oscillate between, whatever the
 * dynamics: the same refusal (and reason) the closed form gives.
 */
function requireHysteresisOf(prepared: PreparedCircuit): void {
  requireHysteresis(prepared.high.switchingV, prepared.low.switchingV);
}

function walkToSteadyState(walk: OscillatorWalk, prepared: PreparedCircuit): SteadyCycle {
  requireHysteresisOf(prepared);
  walk.reset(prepared);
  walk.powerUp(powerUpState(prepared.high, prepared.low).initialState);
  return walk.runToSteadyState();
}

/** Walk from power-up to the steady cycle and derive every figure (a fresh walk the caller may keep). */
export function simulateTimeDomain(prepared: PreparedCircuit): TimeDomainRun {
  const walk = new OscillatorWalk();
  const cycle = walkToSteadyState(walk, prepared);
  const extras: WalkExtras = { outputMidV: Number.NaN };
  const figures = figuresFromWalk(walk, cycle, nominalEdgeTimes(prepared), extras);
  return { walk, cycle, figures, extras };
}

/**
 * One walk object reused by every analysis: the engine is synchronous and
 * nothing of a walk escapes analyzeTimeDomain, so recycling its buffers and
 * configuration models keeps a stream of analyses nearly allocation-free.
 */
const sharedWalk = new OscillatorWalk();

/** The analysis figures from the engine (the shape the closed form gives, plus measured edges). */
export function analyzeTimeDomain(prepared: PreparedCircuit): OscillationFigures {
  const cycle = walkToSteadyState(sharedWalk, prepared);
  return figuresFromWalk(sharedWalk, cycle, undefined);
}

export interface WaveformResult {
  samples: WaveformSamples;
  figures: TimeDomainFigures;
}

export function waveformOfPrepared(prepared: PreparedCircuit, options: WaveformOptions): WaveformResult {
  checkWaveformOptions(options);
  const run = simulateTimeDomain(prepared);
  return { samples: sampleWaveform(run.walk, run.cycle, options), figures: run.figures };
}
