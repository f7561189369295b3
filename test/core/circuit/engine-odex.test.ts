/**
 * Property test: the event-driven engine against an independent general-purpose
 * ODE integrator (odex — Hairer & Wanner's ODEX extrapolation method, npm
 * registry) integrating the same circuit ODE with event location by bisection
 * (engine-odex-reference.ts). Random circuits over the four topologies and the
 * non-idealities the engine models; period and duty must agree within 1e-6.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { analyzeCircuit, BUILT_IN_AMPLIFIERS, CoreError, type AmplifierModel, type Circuit } from '../../../src/core/index.ts';
import { referenceOscillation } from './engine-odex-reference.ts';

const SEED = 20240611;
const RUNS = 24;

const logUniform = (lo: number, hi: number) => fc.double({ min: Math.log(lo), max: Math.log(hi), noNaN: true }).map(Math.exp);
const pushPull = BUILT_IN_AMPLIFIERS.filter((a) => a.outputStage === 'push-pull' && a.id !== 'ideal');
const openDrain = BUILT_IN_AMPLIFIERS.filter((a) => a.outputStage === 'open-drain');

/** Non-idealities drawn on top of a class-typical archetype: each may be switched on, off, or resized. */
const dynamics = (base: fc.Arbitrary<AmplifierModel>) =>
  fc.record({
    base,
    slew: fc.oneof(fc.constant(Infinity), logUniform(0.3e6, 30e6)),
    delay: fc.oneof(fc.constant(0), logUniform(0.05e-6, 5e-6)),
    limit: fc.oneof(fc.constant(Infinity), logUniform(0.3e-3, 5e-3)),
    clamp: fc.oneof(fc.constant(Infinity), fc.double({ min: 0.6, max: 1.5, noNaN: true })),
    bias: fc.double({ min: -100e-9, max: 100e-9, noNaN: true }),
  }).map(({ base, slew, delay, limit, clamp, bias }) => ({
    ...base,
    id: 'random',
    figuresBasis: 'caller-supplied' as const,
    slewRateVPerS: slew,
    recoveryDelayS: delay,
    outputCurrentLimitA: limit,
    differentialClampV: base.outputStage === 'open-drain' ? Infinity : clamp,
    inputBiasCurrentA: bias,
  }));

const split = fc.record({
  v: fc.double({ min: 5, max: 15, noNaN: true }),
  rFeedback: logUniform(10e3, 100e3),
  rGround: logUniform(5e3, 100e3),
});
const divider = fc.record({
  v: fc.double({ min: 5, max: 15, noNaN: true }),
  rTop: logUniform(20e3, 200e3),
  rBottom: logUniform(20e3, 200e3),
  rFeedback: logUniform(20e3, 200e3),
});
const timing = fc.record({ r: logUniform(4.7e3, 100e3), c: logUniform(1e-9, 47e-9) });

const circuitArb: fc.Arbitrary<Circuit> = fc.oneof(
  fc.record({ n: split, t: timing, amp: dynamics(fc.constantFrom(...pushPull)) }).map(({ n, t, amp }) => ({
    topology: 'two-resistor-feedback',
    supply: { positiveV: n.v, negativeV: -n.v },
    amplifier: amp,
    parts: { rTiming: t.r, cTiming: t.c, rFeedback: n.rFeedback, rGround: n.rGround },
  })),
  fc.record({ n: divider, t: timing, amp: dynamics(fc.constantFrom(...pushPull)), load: fc.option(logUniform(2e3, 50e3), { nil: undefined }) }).map(({ n, t, amp, load }) => ({
    topology: 'three-resistor-divider',
    supply: { positiveV: n.v, negativeV: 0 },
    amplifier: amp,
    parts: { rTiming: t.r, cTiming: t.c, rTop: n.rTop, rBottom: n.rBottom, rFeedback: n.rFeedback },
    ...(load ? { load: { resistanceOhm: load, returnV: 0 } } : {}),
  })),
  fc
    .record({
      n: split,
      t: timing,
      rd: logUniform(4.7e3, 100e3),
      amp: dynamics(fc.constantFrom(...pushPull)),
      diode: fc.record({ forwardDropV: fc.double({ min: 0.2, max: 0.8, noNaN: true }), resistanceOhm: fc.double({ min: 0, max: 50, noNaN: true }) }),
    })
    .map(({ n, t, rd, amp, diode }) => ({
      topology: 'diode-steered',
      supply: { positiveV: n.v, negativeV: -n.v },
      amplifier: amp,
      parts: { rCharge: t.r, rDischarge: rd, cTiming: t.c, rFeedback: n.rFeedback, rGround: n.rGround },
      diode,
    })),
  fc.record({ n: divider, t: timing, amp: dynamics(fc.constantFrom(...openDrain)), pull: logUniform(1e3, 10e3) }).map(({ n, t, amp, pull }) => ({
    topology: 'open-drain-pullup',
    supply: { positiveV: n.v, negativeV: 0 },
    amplifier: amp,
    parts: { rPullup: pull, rTiming: t.r, cTiming: t.c, rTop: n.rTop, rBottom: n.rBottom, rFeedback: n.rFeedback },
  })),
);

describe('engine vs odex (independent integrator with bisection event location)', () => {
  it(`period and duty agree within 1e-6 over ${RUNS} random circuits`, { timeout: 300_000 }, () => {
    const seen = new Set<string>();
    let compared = 0;
    let worst = 0;
    fc.assert(
      fc.property(circuitArb, (circuit) => {
        let engine;
        try {
          engine = analyzeCircuit(circuit, { model: 'time-domain' });
        } catch (e) {
          // Circuits that latch are outside this property (they are tested on their own).
          fc.pre(!(e instanceof CoreError && e.code === 'no-oscillation'));
          throw e;
        }
        const ref = referenceOscillation(circuit, { initialState: engine.powerUp.initialState });
        seen.add(circuit.topology);
        compared++;
        worst = Math.max(worst, Math.abs(engine.periodS / ref.periodS - 1), Math.abs(engine.dutyCycle / ref.dutyCycle - 1));
        if (process.env.ENGINE_ODEX_VERBOSE) console.log(circuit.topology, circuit.amplifier.slewRateVPerS, circuit.amplifier.recoveryDelayS, circuit.amplifier.outputCurrentLimitA, circuit.amplifier.differentialClampV, engine.periodS, ref.periodS, engine.dutyCycle, ref.dutyCycle, engine.currents.outputPeakSourceA);
        expect(Math.abs(engine.periodS / ref.periodS - 1)).toBeLessThan(1e-6);
        expect(Math.abs(engine.dutyCycle / ref.dutyCycle - 1)).toBeLessThan(1e-6);
      }),
      { seed: SEED, numRuns: RUNS, endOnFailure: true },
    );
    expect(seen.size).toBe(4);
    expect(compared).toBeGreaterThanOrEqual(20);
    expect(worst).toBeLessThan(1e-6);
  });
});
