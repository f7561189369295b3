/**
 * Synthetic two-channel scope records made by the exact time-domain engine's
 * own sampler (waveformOfPrepared): every slew ramp, recovery delay and
 * overshoot as the engine walks it, sampled on a uniform grid, then given the
 * faults of a real record (noise, 8-bit quantisation, channel offsets, a
 * trigger point mid-cycle). The sampler starts its window at a rising decision
 * and spaces `samples` points over `periods` periods, so the period count is
 * chosen to give the wanted sample interval, and the trigger offset is made
 * by dropping the leading samples.
 */
import { analyzeCircuit, prepareCircuit } from '../../../src/core/circuit/analyze.ts';
import { waveformOfPrepared } from '../../../src/core/circuit/engine/index.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import { benchScopeRecord } from './capture-synth.ts';

export interface EngineCaptureOptions {
  sampleIntervalS: number;
  sampleCount: number;
  /** Record starts this far after a rising decision of the steady cycle, s. */
  phaseS?: number;
}

export function engineCapture(circuit: Circuit, options: EngineCaptureOptions): { output: Float64Array; capacitor: Float64Array } {
  const { sampleIntervalS: dt, sampleCount: n } = options;
  const skip = Math.round((options.phaseS ?? 0) / dt);
  const total = n + skip;
  const { periodS } = analyzeCircuit(circuit, { model: 'time-domain' });
  const periods = (dt * (total - 1)) / periodS;
  const { samples } = waveformOfPrepared(prepareCircuit(circuit), { periods, samples: total, includePowerUp: false });
  return { output: samples.outputV.slice(skip), capacitor: samples.capacitorV.slice(skip) };
}

/** A bench record of `truth`: 2 ms at 50 ns, noise, offsets, 8-bit ADCs, triggered 37 µs into a cycle. */
export function engineBenchRecord(truth: Circuit, seed: number) {
  const dt = 50e-9;
  const n = 40_000;
  const cap = engineCapture(truth, { sampleIntervalS: dt, sampleCount: n, phaseS: 37e-6 });
  return benchScopeRecord(cap, dt, seed);
}
