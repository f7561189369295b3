/**
 * The time-domain engine (docs/model.md §2): walk the circuit from power-up
 * through exactly solved linear pieces until the switching state repeats, then
 * read the figures off the repeating cycle. Every answer of the service comes
 * from this walk; prepared.ts is its compiled form for many parameter vectors.
 */
import type { PreparedCircuit } from '../analyze.ts';
import { figuresFromWalk, type FigureContext, type TimeDomainFigures, type WalkExtras } from './figures.ts';
import { sharedWalk, walkToCycle } from './prepared.ts';
import { checkWaveformOptions, sampleWaveform, type WaveformOptions, type WaveformSamples } from './sampling.ts';
import { nominalEdgeTimes } from '../frequency-ceiling.ts';
import type { OscillatorWalk, SteadyCycle } from './walker.ts';

export { MAX_WAVEFORM_PERIODS, MAX_WAVEFORM_SAMPLES, checkWaveformOptions, type WaveformOptions, type WaveformSamples } from './sampling.ts';
export { MAX_CYCLES, STEADY_STATE_TOLERANCE, type SteadyCycle } from './walker.ts';
export type { TimeDomainFigures, WalkExtras } from './figures.ts';
export { CLAMP_RESISTANCE_OHM } from './compiled-network.ts';

export interface TimeDomainRun {
  walk: OscillatorWalk;
  cycle: SteadyCycle;
  figures: TimeDomainFigures;
  extras: WalkExtras;
}

export function figureContext(prepared: PreparedCircuit): FigureContext {
  return {
    high: prepared.high,
    low: prepared.low,
    quiescentCurrentA: prepared.circuit.amplifier.quiescentCurrentA,
    inputBiasCurrentA: prepared.circuit.amplifier.inputBiasCurrentA,
    nominalEdges: nominalEdgeTimes(prepared),
    effects: prepared.effects,
  };
}

/**
 * Walk from power-up to the steady cycle and derive every figure. The walk is
 * the thread's shared one: read what you need from it before the next analysis.
 */
export function simulateTimeDomain(prepared: PreparedCircuit): TimeDomainRun {
  const walk = sharedWalk;
  const cycle = walkToCycle(walk, prepared.shape, prepared.values, prepared.dynamics);
  const extras: WalkExtras = { outputMidV: Number.NaN };
  const figures = figuresFromWalk(walk, cycle, figureContext(prepared), extras);
  return { walk, cycle, figures, extras };
}

/** The analysis figures (with the measured edges). */
export function analyzeTimeDomain(prepared: PreparedCircuit): TimeDomainFigures {
  return simulateTimeDomain(prepared).figures;
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
