/**
 * Fit self-consistency: the service's own noiseless waveforms (the engine's
 * sampler, as /v1/waveform gives them) fitted against the circuit that made
 * them agree with it — χ² within its 95 % bound (Wilson–Hilferty) — for edges
 * from instant to a third of the period. The capture analysis and the forward
 * model read the figures with one set of definitions
 * (src/core/fit/definitions/scope-definitions.ts), so the χ² is ~0, not just
 * under the bound; the check is the bound (the criterion). With a
 * capacitance at P or at the pin the pieces are multi-state (engine/modal.ts)
 * and the forward model reads the capacitor through their rows.
 */
import { describe, expect, it } from 'vitest';
import { BUILT_IN_AMPLIFIERS, findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import type { AmplifierModel } from '../../../src/core/amplifiers/model.ts';
import { analyzeCircuit, prepareCircuit } from '../../../src/core/circuit/analyze.ts';
import { waveformOfPrepared } from '../../../src/core/circuit/engine/index.ts';
import { NO_STRAYS } from '../../../src/core/circuit/strays.ts';
import { TOPOLOGIES } from '../../../src/core/circuit/topologies/index.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import { CoreError } from '../../../src/core/errors.ts';
import { analyzeCapture } from '../../../src/core/fit/capture/analyze-capture.ts';
import { fitCircuit } from '../../../src/core/fit/index.ts';

const slowBipolar = findBuiltInAmplifier('bipolar-single-supply-general')!;
const openDrainBipolar = findBuiltInAmplifier('comparator-open-drain-bipolar')!;
const fastCmos = findBuiltInAmplifier('cmos-rrio-fast')!;
const board = (amplifier: typeof slowBipolar, cTimingF: number): Circuit => ({
  topology: 'three-resistor-divider',
  supply: { positiveV: 12, negativeV: 0 },
  amplifier,
  parts: { rTiming: 10e3, cTiming: cTimingF, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 },
});

describe('the fit of the service own noiseless waveforms', () => {
  for (const [name, circuit] of [
    ['fast CMOS, 10 nF (edges ~1 % of the period)', board(fastCmos, 10e-9)],
    ['slow bipolar, 10 nF (edges ~16 %)', board(slowBipolar, 10e-9)],
    ['slow bipolar, 3 nF (edges ~33 %)', board(slowBipolar, 3e-9)],
    ['fast CMOS, 680 pF, 47 pF at the threshold node P (multi-state pieces)', { ...board(fastCmos, 680e-12), strays: { ...NO_STRAYS, thresholdNodeF: 47e-12 } }],
    [
      'open drain, 1 nF, 100 pF on the pin behind a 1 kΩ pull-up (multi-state pieces)',
      {
        topology: 'open-drain-pullup',
        supply: { positiveV: 5, negativeV: 0 },
        amplifier: openDrainBipolar,
        parts: { rPullup: 1e3, rTiming: 10e3, cTiming: 1e-9, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 },
        strays: { ...NO_STRAYS, outputNodeF: 100e-12 },
      },
    ],
  ] as const satisfies readonly (readonly [string, Circuit])[]) {
    it(`${name}: agrees with the nominal circuit`, () => {
      const analysis = analyzeCircuit(circuit);
      const edge = Math.max(analysis.edges?.riseSettleS ?? 0, analysis.edges?.fallSettleS ?? 0) / analysis.periodS;
      expect(edge).toBeLessThan(0.4);
      const w = waveformOfPrepared(prepareCircuit(circuit), { periods: 12, samples: 120_000, includePowerUp: false });
      const r = fitCircuit({ circuit, capture: { sampleIntervalS: w.samples.timeS[1], output: w.samples.outputV, capacitor: w.samples.capacitorV } });
      expect(r.diagnosis.verdict.nominalChiSquare).toBeLessThan(r.diagnosis.verdict.chiSquareBound95);
      expect(r.diagnosis.verdict.agreesWithNominal).toBe(true);
    });
  }
});

/**
 * The analysis' output figures against the capture analysis of the service's
 * own noiseless, densely sampled waveform of the same circuit: one definition
 * (src/core/scope/ieee181.ts, IEEE Std 181-2011 terms), so they agree to what
 * the sampling leaves open. Random circuits of every registered topology
 * (roles drawn from the registry, optional ones in random subsets), class
 * archetypes of the right output stage with random slew limit, delay and
 * output resistance, and random strays at P and at the pin (open drain with
 * and without them: a released pin then charges through its pull-up, without
 * them it jumps and creeps up its tilted top). A fixed-seed generator keeps
 * every run on the same circuits.
 */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32;
}

function randomCircuit(rnd: () => number, topologyIndex: number, withStrays: boolean): Circuit | undefined {
  const topology = TOPOLOGIES[topologyIndex];
  const logU = (lo: number, hi: number) => Math.exp(Math.log(lo) + rnd() * (Math.log(hi) - Math.log(lo)));
  const parts: Record<string, number> = {};
  for (const [role, spec] of Object.entries(topology.roles)) {
    if (!spec.required && rnd() < 0.5) continue;
    parts[role] = spec.kind === 'capacitor' ? logU(1e-9, 47e-9) : spec.purpose === 'output-level' ? logU(470, 10e3) : logU(2.2e3, 220e3);
  }
  const stage = topology.needsOpenDrain ? 'open-drain' : 'push-pull';
  const candidates = BUILT_IN_AMPLIFIERS.filter((a) => a.outputStage === stage);
  const base = candidates[Math.floor(rnd() * candidates.length)];
  const v = 5 + 10 * rnd();
  const amplifier: AmplifierModel = {
    ...base,
    id: 'random',
    figuresBasis: 'caller-supplied',
    supplyMinV: 0,
    supplyMaxV: Infinity,
    slewRateVPerS: rnd() < 0.4 ? Infinity : logU(0.5e6, 30e6),
    recoveryDelayS: rnd() < 0.5 ? 0 : logU(0.05e-6, 2e-6),
    outputResistanceOhm: rnd() < 0.5 ? base.outputResistanceOhm : logU(10, 300),
  };
  const strays = withStrays ? { ...NO_STRAYS, thresholdNodeF: rnd() < 0.5 ? 0 : logU(5e-12, 50e-12), outputNodeF: logU(10e-12, 200e-12) } : NO_STRAYS;
  const circuit: Circuit = { topology: topology.id, supply: { positiveV: v, negativeV: rnd() < 0.5 ? -v : 0 }, amplifier, parts, strays };
  try {
    const a = analyzeCircuit(circuit);
    // Edges well inside each state, and each state a few hundred samples long in the record below: otherwise
    // there is no state to read a level in (a near-latching draw has pulses shorter than a sample).
    if (!(Math.max(a.transitions.riseTimeS, a.transitions.fallTimeS) < 0.25 * Math.min(a.timeHighS, a.timeLowS))) return undefined;
    if (!(Math.min(a.dutyCycle, 1 - a.dutyCycle) > 0.02)) return undefined;
    return circuit;
  } catch (err) {
    if (err instanceof CoreError) return undefined; // a role subset the topology refuses, or a circuit that latches
    throw err;
  }
}

const PER_TOPOLOGY = 6;
const PERIODS = 8;
const SAMPLES = 200_000;

describe('the analysis reads its own figures as the capture analysis reads its waveform, every registered topology', () => {
  for (let t = 0; t < TOPOLOGIES.length; t++) {
    for (const withStrays of [false, true]) {
      const id = TOPOLOGIES[t].id;
      it(`${id}, ${withStrays ? 'strays at P and at the pin' : 'no strays'}: ${PER_TOPOLOGY} random circuits`, { timeout: 120_000 }, () => {
        const rnd = lcg(4200 + 2 * t + (withStrays ? 1 : 0));
        let done = 0;
        for (let k = 0; done < PER_TOPOLOGY && k < 500; k++) {
          const circuit = randomCircuit(rnd, t, withStrays);
          if (!circuit) continue;
          done++;
          const a = analyzeCircuit(circuit);
          const w = waveformOfPrepared(prepareCircuit(circuit), { periods: PERIODS, samples: SAMPLES, includePowerUp: false });
          const v = w.samples.outputV;
          const dtS = w.samples.timeS[1] - w.samples.timeS[0];
          const c = analyzeCapture({ sampleIntervalS: dtS, output: v });
          const { highV, lowV } = a.output;
          // A level is read at the sample interval in which the output leaves its state: off by at most the
          // state's motion over one sample, here bounded by the largest step between neighbouring samples
          // beyond the 90 % (high) or under the 10 % (low) reference level.
          let highStepV = 0;
          let lowStepV = 0;
          for (let i = 1; i < v.length; i++) {
            const stepV = Math.abs(v[i] - v[i - 1]);
            if (v[i] > lowV + 0.9 * (highV - lowV) && v[i - 1] > lowV + 0.9 * (highV - lowV)) highStepV = Math.max(highStepV, stepV);
            if (v[i] < lowV + 0.1 * (highV - lowV) && v[i - 1] < lowV + 0.1 * (highV - lowV)) lowStepV = Math.max(lowStepV, stepV);
          }
          const rounding = 1e-9 * (Math.abs(highV) + Math.abs(lowV));
          const label = JSON.stringify({ topology: circuit.topology, parts: circuit.parts, strays: circuit.strays, slew: circuit.amplifier.slewRateVPerS, base: circuit.amplifier.name });
          expect(Math.abs(c.outputHighV! - highV), label).toBeLessThanOrEqual(highStepV + rounding);
          expect(Math.abs(c.outputLowV! - lowV), label).toBeLessThanOrEqual(lowStepV + rounding);
          // Instants are interpolated linearly between samples: each within a sample interval of the exact
          // crossing (its level moved by the level's error above moves it by at most about one more, on an edge
          // no slower than the state's own motion). Duty: two instants per period; a 10–90 % duration: two.
          expect(Math.abs(c.dutyCycle! - a.dutyCycle), label).toBeLessThanOrEqual((4 * dtS) / a.periodS);
          expect(Math.abs(c.riseTimeS! - a.transitions.riseTimeS), label).toBeLessThanOrEqual(4 * dtS);
          expect(Math.abs(c.fallTimeS! - a.transitions.fallTimeS), label).toBeLessThanOrEqual(4 * dtS);
        }
        expect(done).toBe(PER_TOPOLOGY);
      });
    }
  }
});
