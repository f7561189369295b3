/**
 * Drift of the active parts in the tolerance analysis: the steering diodes'
 * forward drop (about −2 mV/K, the silicon junction figure — common practice)
 * and the amplifier's drift figures move with the board temperature at every
 * corner and Monte Carlo sample.
 *
 * Reference: the odex integrator (test/core/circuit/engine-odex-reference.ts:
 * the circuit ODE integrated in time, nothing of the engine shared) run at the
 * corner diode drops and corner part values.
 */
import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import { runToleranceAnalysis, type Corner } from '../../../src/core/tolerance/index.ts';
import { referenceOscillation } from '../circuit/engine-odex-reference.ts';

const ideal = findBuiltInAmplifier('ideal')!;
/** A diode-steered clock at 5 V: 4.7 kΩ charge, 47 kΩ discharge, 10 nF, thresholds from three 100 kΩ. */
const steered: Circuit = {
  topology: 'diode-steered',
  supply: { positiveV: 5, negativeV: 0 },
  amplifier: ideal,
  parts: { rCharge: 4.7e3, rDischarge: 47e3, cTiming: 10e-9, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 },
};
const DIODE_R_OHM = 10; // the default steering diode's resistance (0.6 V, 10 Ω)

/** The circuit a corner describes, with its forward drop, for the reference integrator. */
function atCorner(corner: Corner): Circuit {
  const { diodeForwardDropV, ...parts } = corner.values;
  return { ...steered, parts: { ...steered.parts, ...parts }, diode: { forwardDropV: diodeForwardDropV, resistanceOhm: DIODE_R_OHM } };
}

function referenceFrequencyHz(c: Circuit): number {
  return 1 / referenceOscillation(c, { tolerance: 1e-11 }).periodS;
}

describe('steering-diode drift in /v1/tolerance', () => {
  const run = runToleranceAnalysis({
    circuit: steered,
    tolerances: { rCharge: 0.01, rDischarge: 0.01 },
    temperature: { minC: -40, maxC: 85 },
    monteCarlo: { samples: 4000, seed: 3 },
  });

  it('the diode drift alone moves the clock about 16 % over −40…85 °C (odex at 0.73 V and 0.48 V)', () => {
    // −2 mV/K from 0.6 V at 25 °C: 0.73 V at −40 °C, 0.48 V at 85 °C.
    const cold = referenceFrequencyHz({ ...steered, diode: { forwardDropV: 0.6 + 0.002 * 65, resistanceOhm: DIODE_R_OHM } });
    const hot = referenceFrequencyHz({ ...steered, diode: { forwardDropV: 0.6 - 0.002 * 60, resistanceOhm: DIODE_R_OHM } });
    const diodeSpan = (hot - cold) / run.nominal.frequencyHz;
    expect(diodeSpan).toBeGreaterThan(0.15);
    expect(diodeSpan).toBeLessThan(0.17);
    // The worst case covers it (and the 1 % resistors on top).
    expect(run.worstCase.frequencyMinHz).toBeLessThan(cold);
    expect(run.worstCase.frequencyMaxHz).toBeGreaterThan(hot);
    expect((run.worstCase.frequencyMaxHz - run.worstCase.frequencyMinHz) / run.nominal.frequencyHz).toBeGreaterThan(diodeSpan);
  });

  it('the extreme corners sit at the temperature ends with the drifted drop, and odex agrees there to 1e-6', () => {
    const { frequencyMin, frequencyMax } = run.worstCase.corners;
    expect(frequencyMin.temperatureC).toBe(-40);
    expect(frequencyMin.values.diodeForwardDropV).toBeCloseTo(0.73, 12);
    expect(frequencyMax.temperatureC).toBe(85);
    expect(frequencyMax.values.diodeForwardDropV).toBeCloseTo(0.48, 12);
    for (const corner of [frequencyMin, frequencyMax]) {
      expect(Math.abs(corner.frequencyHz / referenceFrequencyHz(atCorner(corner)) - 1)).toBeLessThan(1e-6);
    }
  });

  it('Monte Carlo draws the temperature too: its spread is the diode drift, inside the worst case', () => {
    const f = run.monteCarlo.frequencyHz!;
    expect(f.min).toBeGreaterThanOrEqual(run.worstCase.frequencyMinHz);
    expect(f.max).toBeLessThanOrEqual(run.worstCase.frequencyMaxHz);
    // Uniform temperature over 125 K with a near-linear response: the samples fill most of the span.
    expect((f.max - f.min) / run.nominal.frequencyHz).toBeGreaterThan(0.14);
  });

  it('names the effect: the drift list, the corner values and the sensitivity of the drop', () => {
    expect(run.temperatureDrifts).toEqual([
      expect.objectContaining({ parameter: 'diodeForwardDropV', source: 'steering-diodes', valueAtReference: 0.6 }),
    ]);
    expect(run.temperatureDrifts[0].valueMin).toBeCloseTo(0.48, 12);
    expect(run.temperatureDrifts[0].valueMax).toBeCloseTo(0.73, 12);
    const drop = run.sensitivities.find((s) => s.role === 'diodeForwardDropV');
    expect(drop?.kind).toBe('diode');
    expect(drop!.sensitivity).toBeLessThan(0); // a larger drop leaves less voltage to charge with: slower
    expect(run.varianceSources[0]).toMatchObject({ source: 'temperature', kind: 'temperature' });
    expect(run.notes.map((n) => n.code)).not.toContain('temperature-without-coefficients');
  });
});

describe('amplifier drift figures at the temperature corners', () => {
  // A JFET-input part on split rails: bias current doubling every 10 K (common practice for gate leakage).
  const jfet = findBuiltInAmplifier('jfet-input-general')!;
  const circuit: Circuit = {
    topology: 'two-resistor-feedback',
    supply: { positiveV: 12, negativeV: -12 },
    amplifier: jfet,
    parts: { rTiming: 1e6, cTiming: 1e-9, rFeedback: 1e6, rGround: 1e6 },
  };
  const run = runToleranceAnalysis({ circuit, tolerances: {}, temperature: { minC: -40, maxC: 85 }, monteCarlo: { samples: 200, seed: 1 } }, { parts: { sensitivities: false } });
  const drift = Object.fromEntries(run.temperatureDrifts.map((d) => [d.parameter, d]));

  it('bias current ×2^(ΔT/10 K), offset ± its drift × ΔT, headroom + its drift × ΔT', () => {
    expect(drift.inputBiasCurrentA.valueMax).toBeCloseTo(jfet.inputBiasCurrentA * 2 ** (60 / jfet.inputBiasDoublingK), 20);
    expect(drift.inputBiasCurrentA.valueMin).toBeCloseTo(jfet.inputBiasCurrentA * 2 ** (-65 / jfet.inputBiasDoublingK), 24);
    const offsetSwing = jfet.inputOffsetDriftVPerK * 65;
    expect(drift.inputOffsetV.valueMin).toBeCloseTo(jfet.inputOffsetV - offsetSwing, 12);
    expect(drift.inputOffsetV.valueMax).toBeCloseTo(jfet.inputOffsetV + offsetSwing, 12);
    const h = [-65, 60].map((dT) => Math.max(0, jfet.outputHeadroomHighV + jfet.outputHeadroomDriftVPerK * dT));
    expect(drift.outputHeadroomHighV.valueMin).toBeCloseTo(Math.min(...h), 12);
    expect(drift.outputHeadroomHighV.valueMax).toBeCloseTo(Math.max(...h), 12);
  });

  it('the corners carry the drifted figures: at 85 °C the bias current is 64× its 25 °C value', () => {
    const corners = Object.values(run.worstCase.corners);
    const hot = corners.find((c) => c.temperatureC === 85);
    expect(hot).toBeDefined();
    expect(hot!.values.inputBiasCurrentA / jfet.inputBiasCurrentA).toBeCloseTo(64, 9);
    // The offset's drift sign is its own dimension: a corner takes either end.
    expect(Math.abs(hot!.values.inputOffsetV - jfet.inputOffsetV)).toBeCloseTo(jfet.inputOffsetDriftVPerK * 60, 12);
  });

  it('the worst case moves with temperature although no part has a tempco', () => {
    expect(run.worstCase.frequencyMaxHz).toBeGreaterThan(run.nominal.frequencyHz);
    expect(run.worstCase.frequencyMinHz).toBeLessThan(run.nominal.frequencyHz);
  });
});
