/**
 * Capacitance at the threshold node P, at the output pin and the amplifier's input capacitance beside a
 * class II C(V) timing capacitor (docs/model.md, "more than one capacitive node with a C(V) capacitor"):
 * the collocation pieces of engine/modal-curved.ts against the odex reference integrator
 * (engine-odex-reference.ts: Hairer & Wanner's ODEX from the npm registry, its own nodal solve and
 * amplifier behaviour, integrating the same multi-capacitor ODE with C(v) at N; only the curve is shared).
 * Issue target: ≤ 1e-6 relative on period, duty and levels.
 */
import { describe, expect, it } from 'vitest';
import { analyzeCircuit, findBuiltInAmplifier, prepareModel, type AmplifierModel, type Circuit } from '../../../src/core/index.ts';
import { resolveCapacitor } from '../../../src/core/parts/capacitor/index.ts';
import { NO_STRAYS, type Strays } from '../../../src/core/circuit/strays.ts';
import { OUTPUT_LENGTH, OUTPUT_SLOT } from '../../../src/core/circuit/engine/prepared.ts';
import { referenceOscillation } from './engine-odex-reference.ts';

const ideal = findBuiltInAmplifier('ideal')!;
const strays = (s: Partial<Strays>): Strays => ({ ...NO_STRAYS, ...s });
const rel = (a: number, b: number) => Math.abs(a / b - 1);
// An X7R-like small-case part (class-typical curve, from memory: docs/model.md), run near its rating.
const x7r = (value: string) => resolveCapacitor({ value, dielectric: 'X7R', ratedVoltageV: 6.3, caseSize: '0402' });
const c2n2 = x7r('2.2n');
const c4n7 = x7r('4.7n');

const cases: { name: string; circuit: Circuit }[] = [
  {
    name: 'single-supply divider, input capacitance at P (and N) and board capacitance at P, slew-limited output (ramp pieces)',
    circuit: {
      topology: 'three-resistor-divider',
      supply: { positiveV: 5, negativeV: 0 },
      amplifier: { ...ideal, outputResistanceOhm: 50, inputCapacitanceF: 100e-12, slewRateVPerS: 2e6 },
      parts: { rTiming: 15e3, cTiming: c4n7.capacitanceF, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 },
      capacitorShape: c4n7.shape,
      strays: strays({ thresholdNodeF: 220e-12 }),
    },
  },
  {
    name: 'open-drain pull-up: the pin an RC through the pull-up, capacitance at P, leakage at P',
    circuit: {
      topology: 'open-drain-pullup',
      supply: { positiveV: 5, negativeV: 0 },
      amplifier: { ...ideal, outputStage: 'open-drain' } as AmplifierModel,
      parts: { rPullup: 2.2e3, rTiming: 100e3, cTiming: c2n2.capacitanceF, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 },
      capacitorShape: c2n2.shape,
      strays: strays({ outputNodeF: 330e-12, thresholdNodeF: 150e-12, thresholdLeakageOhm: 10e6 }),
    },
  },
  {
    name: 'open-drain pull-up with the amplifier input capacitance only',
    circuit: {
      topology: 'open-drain-pullup',
      supply: { positiveV: 3.3, negativeV: 0 },
      amplifier: { ...ideal, outputStage: 'open-drain', inputCapacitanceF: 47e-12 } as AmplifierModel,
      parts: { rPullup: 4.7e3, rTiming: 47e3, cTiming: c2n2.capacitanceF, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 },
      capacitorShape: c2n2.shape,
    },
  },
];

describe('strays at P and at the pin beside a C(V) timing capacitor, against odex (the same ODE)', () => {
  for (const { name, circuit } of cases) {
    it(`${name}: period, duty, threshold and levels within 1e-6`, { timeout: 300_000 }, () => {
      const engine = analyzeCircuit(circuit);
      const ref = referenceOscillation(circuit, { tolerance: 1e-11 });
      expect(rel(engine.periodS, ref.periodS)).toBeLessThan(1e-6);
      expect(Math.abs(engine.dutyCycle - ref.dutyCycle)).toBeLessThan(1e-6);
      expect(rel(engine.thresholds.upperV, ref.upperV)).toBeLessThan(1e-6);
      expect(rel(engine.thresholds.lowerV, ref.lowerV)).toBeLessThan(1e-6);
      expect(rel(engine.output.highV, ref.highV)).toBeLessThan(1e-6);
      expect(Math.abs(engine.output.lowV - ref.lowV)).toBeLessThan(1e-6 * circuit.supply.positiveV);
    });
  }

  it('the curve matters here: the same strays with a linear capacitor of the same marked value give another period', () => {
    const { circuit } = cases[1];
    const curved = analyzeCircuit(circuit);
    const linear = analyzeCircuit({ ...circuit, capacitorShape: undefined });
    expect(rel(curved.periodS, linear.periodS)).toBeGreaterThan(0.05);
  });

  it('a piece that never reaches its threshold latches (no-oscillation with the asymptote), proven by the energy bound, not cut off by a segment budget', () => {
    // Leakage at N pulls the high-state asymptote to 5 V·20k/(22k + 20k) = 2.38 V, below the 3.33 V upper threshold (hand divider).
    const circuit: Circuit = {
      topology: 'three-resistor-divider',
      supply: { positiveV: 5, negativeV: 0 },
      amplifier: { ...ideal, outputResistanceOhm: 50 },
      parts: { rTiming: 22e3, cTiming: c4n7.capacitanceF, rTop: 68e3, rBottom: 68e3, rFeedback: 68e3 },
      capacitorShape: c4n7.shape,
      strays: strays({ thresholdNodeF: 47e-12, outputNodeF: 100e-12, timingLeakageOhm: 20e3 }),
    };
    expect(() => analyzeCircuit(circuit)).toThrow(expect.objectContaining({ code: 'no-oscillation', message: expect.stringContaining('latches high') }));
  });

  it('the prepared form (tolerance, BOM checks, fit) gives analyze\'s answer for perturbed vectors', { timeout: 60_000 }, () => {
    const { circuit } = cases[1];
    const model = prepareModel(circuit);
    const out = new Float64Array(OUTPUT_LENGTH);
    for (let k = 0; k < 4; k++) {
      const values = Float64Array.from(model.nominal);
      for (const name of ['rTiming', 'cTiming', 'rPullup', 'thresholdNodeF', 'outputNodeF']) values[model.indexOf(name)] *= 1 + 0.1 * Math.sin(k * 7.3 + name.length);
      expect(model.evaluate(values, out)).toBe(0);
      const analyzed = analyzeCircuit(model.circuitAt(values));
      expect(rel(out[OUTPUT_SLOT.periodS], analyzed.periodS)).toBeLessThan(1e-9);
      expect(Math.abs(out[OUTPUT_SLOT.dutyCycle] - analyzed.dutyCycle)).toBeLessThan(1e-9);
    }
  });
});
