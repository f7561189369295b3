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
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import { analyzeCircuit, prepareCircuit } from '../../../src/core/circuit/analyze.ts';
import { waveformOfPrepared } from '../../../src/core/circuit/engine/index.ts';
import { NO_STRAYS } from '../../../src/core/circuit/strays.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
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
