/**
 * Synthetic two-channel captures of a whole circuit for the fit tests, built
 * here from the closed-form piece data (per-state time constant, asymptote and
 * switching level, all affine in the output-stage source) plus EXPLICIT slew
 * ramps and recovery delays, solved exactly: within a piece the capacitor obeys
 *   dv/dt = (a(t) − v)/τ with the asymptote a(t) = a0 + k·t moving linearly
 * while the source ramps, whose solution is the textbook first-order response
 * to a ramp input, v(t) = a0 + k(t − τ) + (v0 − a0 + kτ)·e^(−t/τ).
 * This is deliberately a different construction from the fit's forward model
 * (which folds the ramp into an effective step delay), so the tests measure
 * that approximation too.
 */
import { prepareCircuit } from '../../../src/core/circuit/analyze.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import { evalAffine } from '../../../src/core/circuit/state-model.ts';

interface Piece {
  startS: number;
  durationS: number;
  v0: number;
  /** Asymptote at piece start and its slope, V and V/s. */
  a0: number;
  k: number;
  /** Source fraction between low (0) and high (1) at start, and its slope per second. */
  f0: number;
  df: number;
}

export interface SynthOptions {
  sampleIntervalS: number;
  sampleCount: number;
  /** Record starts this far into the steady-state cycle (a trigger point mid-cycle), s. */
  phaseS?: number;
}

export function synthesizeCapture(circuit: Circuit, options: SynthOptions): { output: Float64Array; capacitor: Float64Array } {
  const { high, low } = prepareCircuit(circuit);
  if (Math.abs(high.tauS - low.tauS) > 1e-12 * high.tauS) throw new Error('synth: both states must share one time constant');
  const tau = high.tauS;
  const amp = circuit.amplifier;
  const swing = high.sourceV - low.sourceV;
  const rampS = Number.isFinite(amp.slewRateVPerS) ? Math.abs(swing) / amp.slewRateVPerS : 0;
  const delayS = amp.recoveryDelayS;
  const aOf = (f: number) => low.asymptoteV + f * (high.asymptoteV - low.asymptoteV);
  const pieces: Piece[] = [];
  const total = (options.phaseS ?? 0) + options.sampleIntervalS * options.sampleCount + 10 * tau;
  // Warm up from the lower switching level, output high; steady state comes within a few cycles.
  let t = 0;
  let v = low.switchingV;
  let state: 'high' | 'low' = 'high';
  const add = (durationS: number, f0: number, df: number) => {
    const a0 = aOf(f0);
    const k = aOf(f0 + df) - a0; // df is per second, so this is the asymptote's slope, V/s
    pieces.push({ startS: t, durationS, v0: v, a0, k, f0, df });
    v = a0 + k * (durationS - tau) + (v - a0 + k * tau) * Math.exp(-durationS / tau);
    t += durationS;
  };
  const warmupS = 20 * tau;
  while (t < total + warmupS) {
    const s = state === 'high' ? high : low;
    const f = state === 'high' ? 1 : 0;
    // Settled: run to the switching level, then the recovery delay, then the ramp to the other level.
    const dwell = s.tauS * Math.log((s.asymptoteV - v) / (s.asymptoteV - s.switchingV));
    add(dwell, f, 0);
    if (delayS > 0) add(delayS, f, 0);
    if (rampS > 0) add(rampS, f, (f === 1 ? -1 : 1) / rampS);
    state = state === 'high' ? 'low' : 'high';
  }
  const startS = warmupS + (options.phaseS ?? 0);
  const output = new Float64Array(options.sampleCount);
  const capacitor = new Float64Array(options.sampleCount);
  let p = 0;
  for (let i = 0; i < options.sampleCount; i++) {
    const ti = startS + i * options.sampleIntervalS;
    while (p + 1 < pieces.length && pieces[p].startS + pieces[p].durationS <= ti) p++;
    const pc = pieces[p];
    const u = ti - pc.startS;
    const vc = pc.a0 + pc.k * (u - tau) + (pc.v0 - pc.a0 + pc.k * tau) * Math.exp(-u / tau);
    const f = Math.min(1, Math.max(0, pc.f0 + pc.df * u));
    // The pin is affine in (v, source): interpolate between the two states' pin lines.
    const pinHigh = evalAffine(high.outputPin, vc);
    const pinLow = evalAffine(low.outputPin, vc);
    capacitor[i] = vc;
    output[i] = pinLow + f * (pinHigh - pinLow);
  }
  return { output, capacitor };
}
