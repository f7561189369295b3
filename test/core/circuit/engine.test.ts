/**
 * The time-domain engine against the closed form (where both apply), its
 * infinite-slew limit, a slow amplifier, latching circuits, and the frequency
 * ceiling. The exactness of the engine itself is checked against an
 * independent integrator in engine-odex.test.ts.
 */
import { describe, expect, it } from 'vitest';
import {
  analyzeCircuit,
  findBuiltInAmplifier,
  IDEAL_FIGURES,
  prepareCircuit,
  simulateTimeDomain,
  waveformOfPrepared,
  type AmplifierModel,
  type Circuit,
} from '../../../src/core/index.ts';
import { CoreError } from '../../../src/core/errors.ts';
import { referenceOscillation } from './engine-odex-reference.ts';

const ideal = findBuiltInAmplifier('ideal')!;
const amp = (overrides: Partial<AmplifierModel>): AmplifierModel => ({ ...ideal, ...IDEAL_FIGURES, ...overrides, id: 'test', figuresBasis: 'caller-supplied' }) as AmplifierModel;

/** Static non-idealities only (no slew, delay, limit or clamp): the closed form is exact here too. */
const staticAmp = amp({ outputHeadroomHighV: 0.8, outputHeadroomLowV: 0.3, outputResistanceOhm: 60, inputBiasCurrentA: 40e-9, inputOffsetV: 2e-3 });

// Our own scenarios, one per topology.
const circuits: Record<string, Circuit> = {
  split: { topology: 'two-resistor-feedback', supply: { positiveV: 12, negativeV: -12 }, amplifier: staticAmp, parts: { rTiming: 15e3, cTiming: 22e-9, rFeedback: 27e3, rGround: 10e3 } },
  divider: {
    topology: 'three-resistor-divider',
    supply: { positiveV: 5, negativeV: 0 },
    amplifier: staticAmp,
    parts: { rTiming: 47e3, cTiming: 3.3e-9, rTop: 100e3, rBottom: 68e3, rFeedback: 150e3 },
    load: { resistanceOhm: 4.7e3, returnV: 0 },
  },
  steered: {
    topology: 'diode-steered',
    supply: { positiveV: 9, negativeV: -9 },
    amplifier: staticAmp,
    parts: { rCharge: 8.2e3, rDischarge: 56e3, cTiming: 10e-9, rFeedback: 22e3, rGround: 15e3 },
    diode: { forwardDropV: 0.62, resistanceOhm: 8 },
  },
  openDrain: {
    topology: 'open-drain-pullup',
    supply: { positiveV: 3.3, negativeV: 0 },
    amplifier: amp({ outputStage: 'open-drain', outputHeadroomLowV: 0.12, outputResistanceOhm: 20, inputBiasCurrentA: -20e-9 }),
    parts: { rPullup: 3.3e3, rTiming: 33e3, cTiming: 6.8e-9, rTop: 220e3, rBottom: 220e3, rFeedback: 220e3 },
  },
};

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('an amplifier without dynamic limits: the model is its closed-form special case either way', () => {
  for (const [name, circuit] of Object.entries(circuits)) {
    it(`${name}: every timing and level figure agrees to 1e-9 relative`, () => {
      const cf = analyzeCircuit(circuit, { model: 'closed-form' });
      const td = analyzeCircuit(circuit, { model: 'time-domain' });
      // No slew, delay, clamp or limit: no effect is active, so both answers name the closed form.
      expect(cf.model).toBe('closed-form');
      expect(td.model).toBe('closed-form');
      expect(td.modelEffects).toEqual([]);
      for (const key of ['periodS', 'frequencyHz', 'dutyCycle', 'timeHighS', 'timeLowS', 'firstEdgeS'] as const) {
        expect(rel(td[key], cf[key]), key).toBeLessThan(1e-9);
      }
      for (const [a, b] of [
        [td.thresholds.upperV, cf.thresholds.upperV],
        [td.thresholds.lowerV, cf.thresholds.lowerV],
        [td.output.highV, cf.output.highV],
        [td.currents.outputPeakSourceA, cf.currents.outputPeakSourceA],
        [td.currents.outputPeakSinkA, cf.currents.outputPeakSinkA],
        [td.currents.supplyAverageA, cf.currents.supplyAverageA],
        [td.states.high.tauS, cf.states.high.tauS],
        [td.states.low.asymptoteV, cf.states.low.asymptoteV],
      ]) {
        expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-9 * Math.max(Math.abs(b), 1e-12));
      }
      expect(Math.abs(td.output.lowV - cf.output.lowV)).toBeLessThan(1e-9 * circuit.supply.positiveV);
      expect(td.powerUp).toEqual(cf.powerUp);
    });
  }

  it('the automatic choice is the closed form for such an amplifier and the engine once it slews', () => {
    expect(analyzeCircuit(circuits.split).model).toBe('closed-form');
    expect(analyzeCircuit({ ...circuits.split, amplifier: { ...staticAmp, slewRateVPerS: 5e6 } }).model).toBe('time-domain');
  });
});

describe('infinite-slew limit', () => {
  it('converges to the closed form as the slew rate grows without bound', () => {
    const base = circuits.split;
    const cf = analyzeCircuit(base, { model: 'closed-form' });
    const errors = [1e6, 1e7, 1e8, 1e9, 1e10, 1e12].map((sr) => rel(analyzeCircuit({ ...base, amplifier: { ...staticAmp, slewRateVPerS: sr } }).periodS, cf.periodS));
    for (let i = 1; i < errors.length; i++) expect(errors[i]).toBeLessThan(errors[i - 1]);
    // The lengthening shrinks like 1/SR (the slew time is swing/SR); at 1e12 V/s it is far below 1e-6.
    expect(errors[3] / errors[2]).toBeGreaterThan(0.05);
    expect(errors[3] / errors[2]).toBeLessThan(0.2);
    expect(errors[errors.length - 1]).toBeLessThan(1e-6);
  });
});

describe('slow general-purpose amplifier at tens of kHz', () => {
  // Class-typical bipolar single-supply op-amp: 0.4 V/µs, 4 µs recovery (archetype table, from memory of the trade).
  const slow = findBuiltInAmplifier('bipolar-single-supply-general')!;
  const clock: Circuit = {
    topology: 'three-resistor-divider',
    supply: { positiveV: 12, negativeV: 0 },
    amplifier: slow,
    parts: { rTiming: 6.8e3, cTiming: 10e-9, rTop: 47e3, rBottom: 47e3, rFeedback: 47e3 },
  };

  it('runs far slower than the closed form predicts, and the check says it is slew-limited', () => {
    const cf = analyzeCircuit(clock, { model: 'closed-form' });
    const td = analyzeCircuit(clock);
    expect(cf.frequencyHz).toBeGreaterThan(10e3); // designed for tens of kHz
    expect(td.model).toBe('time-domain');
    // Each edge takes the recovery delay plus a ~10 V swing at 0.4 V/µs (~25 µs) against a ~90 µs
    // period: the period must lengthen by tens of percent (common practice: edges not small against T).
    expect(td.periodS / cf.periodS).toBeGreaterThan(1.2);
    const check = td.checks.find((c) => c.code === 'slew-limited');
    expect(check).toBeDefined();
    expect(check!.severity).toBe('warning');
    expect(td.edges!.riseSettleS).toBeCloseTo(slow.recoveryDelayS + (12 - 1.5 - 0.02) / slow.slewRateVPerS, 12);
    expect(td.frequencyCeilingHz).toBeCloseTo(0.05 / td.edges!.riseSettleS, 6);
    expect(td.frequencyHz).toBeGreaterThan(td.frequencyCeilingHz!);
  });

  it('the lengthened period is the exact one: the independent integrator agrees', () => {
    const td = analyzeCircuit(clock);
    const ref = referenceOscillation(clock, { initialState: td.powerUp.initialState });
    expect(rel(td.periodS, ref.periodS)).toBeLessThan(1e-6);
    expect(rel(td.dutyCycle, ref.dutyCycle)).toBeLessThan(1e-6);
  });

  it('a stricter edge fraction lowers the ceiling; a relaxed one silences the check', () => {
    const strict = analyzeCircuit(clock, { edgeFractionLimit: 0.01 });
    const relaxed = analyzeCircuit(clock, { edgeFractionLimit: 0.5 });
    expect(strict.frequencyCeilingHz! / relaxed.frequencyCeilingHz!).toBeCloseTo(0.02, 12);
    expect(relaxed.checks.some((c) => c.code === 'slew-limited')).toBe(false);
    expect(() => analyzeCircuit(clock, { edgeFractionLimit: 0 })).toThrow(CoreError);
  });

  it('a fast part in the same circuit is not slew-limited and has no ceiling below its frequency', () => {
    const fast = analyzeCircuit({ ...clock, amplifier: findBuiltInAmplifier('comparator-push-pull-cmos')!, supply: { positiveV: 5, negativeV: 0 } });
    expect(fast.checks.some((c) => c.code === 'slew-limited')).toBe(false);
    expect(fast.frequencyCeilingHz!).toBeGreaterThan(fast.frequencyHz);
  });
});

describe('circuits that latch', () => {
  function expectLatch(circuit: Circuit, state: 'high' | 'low', pattern: RegExp) {
    try {
      analyzeCircuit(circuit, { model: 'time-domain' });
      expect.unreachable('should latch');
    } catch (e) {
      expect(e).toBeInstanceOf(CoreError);
      const err = e as CoreError;
      expect(err.code).toBe('no-oscillation');
      expect(err.details?.stuckState).toBe(state);
      expect(err.message).toMatch(pattern);
    }
  }

  it('says which state sticks when the output is too weak to reach the threshold', () => {
    // 1 kΩ output into 100 Ω: the high level is 5·100/1100 ≈ 0.45 V, the upper threshold ≈ 1.8 V.
    expectLatch(
      {
        topology: 'three-resistor-divider',
        supply: { positiveV: 5, negativeV: 0 },
        amplifier: amp({ outputResistanceOhm: 1000, slewRateVPerS: 2e6, recoveryDelayS: 1e-6 }),
        load: { resistanceOhm: 100, returnV: 0 },
        parts: { rTiming: 10e3, cTiming: 10e-9, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 },
      },
      'high',
      /latches high: in the high state the capacitor settles at .* which does not reach the upper threshold/,
    );
  });

  it('names the current limit when it is what holds the output back', () => {
    // A 5 µA limit cannot lift the pin (and so the capacitor) anywhere near the ~2.4 V upper threshold
    // the divider sets on a 5 V rail.
    expectLatch({ ...circuits.divider, amplifier: amp({ outputCurrentLimitA: 5e-6, slewRateVPerS: 1e7 }) }, 'high', /in current limit/);
  });
});

describe('slew-limited approach to the limit cycle', () => {
  it('a near-zero hysteresis with finite slew still settles (extrapolated) instead of walking for ever', () => {
    // β ≈ 4e-8: the output turns long before it reaches a rail, the swing shrinks only slowly
    // from cycle to cycle; the walk must still end inside its bound with a finite, small swing.
    const c = { ...circuits.split, parts: { ...circuits.split.parts, rGround: 1e-3 }, amplifier: amp({ slewRateVPerS: 1e6, outputResistanceOhm: 60, inputOffsetV: 2e-3 }) };
    const r = analyzeCircuit(c);
    expect(r.model).toBe('time-domain');
    expect(Number.isFinite(r.frequencyHz)).toBe(true);
    expect(r.output.swingV).toBeLessThan(1);
    expect(r.checks.some((x) => x.code === 'slew-limited')).toBe(true);
  });

  it('where the output turns before saturating, the independent integrator agrees', () => {
    const c = { ...circuits.split, parts: { ...circuits.split.parts, rGround: 300 }, amplifier: amp({ slewRateVPerS: 1e6, outputResistanceOhm: 60, inputOffsetV: 2e-3, recoveryDelayS: 1e-6 }) };
    const td = analyzeCircuit(c);
    // Never reaches its saturation level: the high level is where the output turns.
    expect(td.output.highV).toBeLessThan(c.supply.positiveV - c.amplifier.outputHeadroomHighV - 0.01);
    const ref = referenceOscillation(c, { initialState: td.powerUp.initialState });
    expect(Math.abs(td.output.highV - ref.highV)).toBeLessThan(1e-6 * c.supply.positiveV);
    expect(rel(td.periodS, ref.periodS)).toBeLessThan(1e-6);
    expect(rel(td.dutyCycle, ref.dutyCycle)).toBeLessThan(1e-6);
  });
});

describe('power-up and waveforms', () => {
  it('the first edge comes one delay after the first decision when the output jumps', () => {
    const delayed = { ...circuits.split, amplifier: amp({ outputResistanceOhm: 60, outputHeadroomHighV: 0.8, outputHeadroomLowV: 0.3, inputBiasCurrentA: 40e-9, inputOffsetV: 2e-3, recoveryDelayS: 3e-6 }) };
    const cf = analyzeCircuit(circuits.split, { model: 'closed-form' });
    const td = analyzeCircuit(delayed);
    // Same first charge from 0 V (the delay comes after the decision), then the output moves.
    expect(td.firstEdgeS - cf.firstEdgeS).toBeCloseTo(3e-6, 12);
  });

  it('samples are exact piece values: capacitor continuous, thresholds crossed at the decisions', () => {
    const prepared = prepareCircuit({ ...circuits.steered, amplifier: findBuiltInAmplifier('bipolar-split-supply-general')! });
    const { samples, figures } = waveformOfPrepared(prepared, { periods: 2, samples: 4001, includePowerUp: false });
    const v = samples.capacitorV;
    let maxJump = 0;
    for (let i = 1; i < v.length; i++) maxJump = Math.max(maxJump, Math.abs(v[i] - v[i - 1]));
    expect(maxJump).toBeLessThan(0.05 * figures.thresholds.hysteresisV); // no jumps in a capacitor voltage
    expect(Math.max(...v)).toBeCloseTo(figures.capacitor.maxV, 3);
    expect(Math.min(...v)).toBeCloseTo(figures.capacitor.minV, 3);
  });

  it('reports the steady cycle it found and how the walk got there', () => {
    const run = simulateTimeDomain(prepareCircuit({ ...circuits.split, amplifier: findBuiltInAmplifier('bipolar-split-supply-general')! }));
    expect(run.cycle.periodS).toBe(run.figures.periodS);
    expect(run.cycle.endIndex).toBeGreaterThan(run.cycle.startIndex);
    expect(run.extras.outputMidV).toBeCloseTo((run.figures.output.highV + run.figures.output.lowV) / 2, 12);
  });
});
