/**
 * The cycle replay (engine/cycle-replay.ts, docs/model.md §4) is the walk compiled for vectors near a
 * nominal, not a second model. Held here
 * - to the walk itself: from the same steady start, the replayed cycle and every logged piece are the
 *   walk's bit for bit (but ∫v dt, which it leaves out), so are the pins it records and the timing
 *   figures read off them;
 * - to analyzeCircuit (1e-12), like every prepared evaluation, and for a few vectors to the independent
 *   reference — odex (Hairer & Wanner's ODEX extrapolation integrator, npm registry) integrating the same
 *   circuit ODE (engine-odex-reference.ts) — to 1e-6;
 * - and on its way out: a vector that leaves the nominal's piece sequence is answered by the walk.
 * Circuits are drawn from the registry's push-pull topologies with class-typical archetypes (their
 * current limits and clamps stay in as event functions the replay must watch) and a random slew rate and
 * recovery delay on top; a fixed-seed generator keeps every run on the same circuits.
 */
import { describe, expect, it } from 'vitest';
import { analyzeCircuit, BUILT_IN_AMPLIFIERS, CoreError, prepareModel, TOPOLOGIES, type Circuit } from '../../../src/core/index.ts';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import { compileCycleReplay, OUTPUT_LENGTH, OUTPUT_SLOT, readTiming, walkToCycle, type PreparedModel } from '../../../src/core/circuit/engine/prepared.ts';
import { CyclePins } from '../../../src/core/circuit/engine/figures.ts';
import { LOG, LOG_STRIDE } from '../../../src/core/circuit/engine/piece-log.ts';
import { OscillatorWalk, SteadyStart } from '../../../src/core/circuit/engine/walker.ts';
import { referenceOscillation } from './engine-odex-reference.ts';

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32;
}

const logU = (rnd: () => number, lo: number, hi: number) => Math.exp(Math.log(lo) + rnd() * (Math.log(hi) - Math.log(lo)));

/** A push-pull circuit of `topology` with a finite slew rate and a recovery delay, or undefined when it does not oscillate. */
function slewingCircuit(rnd: () => number, topology: (typeof TOPOLOGIES)[number]): Circuit | undefined {
  const parts: Record<string, number> = {};
  for (const [role, spec] of Object.entries(topology.roles)) {
    if (!spec.required && rnd() < 0.5) continue;
    parts[role] = spec.kind === 'capacitor' ? logU(rnd, 1e-9, 47e-9) : logU(rnd, 4.7e3, 220e3);
  }
  const candidates = BUILT_IN_AMPLIFIERS.filter((a) => a.outputStage === 'push-pull');
  const base = candidates[Math.floor(rnd() * candidates.length)];
  const v = 5 + 10 * rnd();
  const circuit: Circuit = {
    topology: topology.id,
    supply: { positiveV: v, negativeV: rnd() < 0.5 ? -v : 0 },
    amplifier: { ...base, id: 'random', figuresBasis: 'caller-supplied', supplyMinV: 0, supplyMaxV: Infinity, slewRateVPerS: logU(rnd, 0.3e6, 30e6), recoveryDelayS: logU(rnd, 0.05e-6, 3e-6) },
    parts,
  };
  try {
    analyzeCircuit(circuit);
    return circuit;
  } catch (err) {
    if (err instanceof CoreError) return undefined;
    throw err;
  }
}

/** The nominal's steady start and its compiled replay, on walks of their own. */
function startAndReplay(p: PreparedModel) {
  const walk = new OscillatorWalk();
  walkToCycle(walk, p.shape, p.nominal, true);
  const start = walk.snapshot(new SteadyStart());
  return { start, replay: compileCycleReplay(new OscillatorWalk(), p.shape, p.nominal, true, start) };
}

/** The vector with every part, the supply, the slew rate and the delay moved by a few per cent. */
function nearby(rnd: () => number, p: PreparedModel): Float64Array {
  const values = Float64Array.from(p.nominal);
  const spread = (name: string, fraction: number) => {
    const i = p.indexOf(name);
    if (i >= 0) values[i] *= 1 + fraction * (2 * rnd() - 1);
  };
  for (const role of Object.keys(p.circuit.parts)) spread(role, 0.03);
  spread('supplyPositiveV', 0.05);
  spread('supplyNegativeV', 0.05);
  spread('slewRateVPerS', 0.2);
  spread('recoveryDelayS', 0.3);
  return values;
}

const rel = (a: number, b: number) => Math.abs(a / b - 1);

/** The prepared model's figures for `values` against analyzeCircuit of the same circuit (1e-12). */
function expectAnalyzeFigures(p: PreparedModel, values: Float64Array, label: string): void {
  const out = new Float64Array(OUTPUT_LENGTH);
  expect(p.evaluate(values, out), label).toBe(0);
  const c = p.circuitAt(values);
  const a = analyzeCircuit(c);
  const span = c.supply.positiveV - c.supply.negativeV;
  expect(rel(out[OUTPUT_SLOT.periodS], a.periodS), `${label} period`).toBeLessThanOrEqual(1e-12);
  expect(Math.abs(out[OUTPUT_SLOT.dutyCycle] - a.dutyCycle), `${label} duty`).toBeLessThanOrEqual(1e-12);
  expect(Math.abs(out[OUTPUT_SLOT.highV] - a.output.highV), `${label} highV`).toBeLessThanOrEqual(1e-12 * span);
  expect(Math.abs(out[OUTPUT_SLOT.lowV] - a.output.lowV), `${label} lowV`).toBeLessThanOrEqual(1e-12 * span);
}

// Every field the walk logs for a one-node piece but ∫v dt, which the replay leaves out (no timing figure reads it).
const LOGGED_FIELDS = [LOG.startS, LOG.durationS, LOG.v0, LOG.s0, LOG.rate, LOG.key, LOG.logic, LOG.target, LOG.vEnd, LOG.end];

describe('cycle replay = the walk from the same start, bit for bit', () => {
  const pushPull = TOPOLOGIES.filter((t) => !t.needsOpenDrain);
  for (const topology of pushPull) {
    it(`${topology.id}: random slewing, delayed circuits and vectors near them`, { timeout: 60_000 }, () => {
      const rnd = lcg(77 + topology.id.length);
      let circuits = 0;
      let replayable = 0;
      let replayed = 0;
      let odexChecked = 0;
      for (let k = 0; circuits < 10 && k < 400; k++) {
        const c = slewingCircuit(rnd, topology);
        if (!c) continue;
        circuits++;
        const p = prepareModel(c);
        const { start, replay } = startAndReplay(p);
        if (!replay) continue;
        replayable++;
        for (let j = 0; j < 20; j++) {
          const values = nearby(rnd, p);
          const walk = new OscillatorWalk();
          const walked = walkToCycle(walk, p.shape, values, true, start, false);
          const own = new OscillatorWalk();
          const cycle = replay.run(own, values, start);
          if (!cycle) continue;
          replayed++;
          expect({ ...cycle }).toEqual({ ...walked });
          for (let i = 0; i < cycle.endIndex; i++) {
            for (const f of LOGGED_FIELDS) expect(Object.is(own.log.data[i * LOG_STRIDE + f], walk.log.data[i * LOG_STRIDE + f]), `piece ${i} field ${f}`).toBe(true);
          }
          const fromWalk = new Float64Array(OUTPUT_LENGTH);
          const fromReplay = new Float64Array(OUTPUT_LENGTH);
          readTiming(walk, walked, fromWalk, true);
          // The pins the replay recorded as it logged are the ones figures.ts solves off the log.
          const solved = new CyclePins().of(own, cycle);
          for (let k = 0; k < cycle.endIndex; k++) {
            expect(Object.is(replay.pins.start(k), solved.start(k)), `pin at the start of piece ${k}`).toBe(true);
            expect(Object.is(replay.pins.end(k), solved.end(k)), `pin at the end of piece ${k}`).toBe(true);
          }
          readTiming(own, cycle, fromReplay, true, replay.pins);
          expect(Array.from(fromReplay)).toEqual(Array.from(fromWalk));
          expectAnalyzeFigures(p, values, `${JSON.stringify(c)} vector ${j}`);
          if (odexChecked < 2 && !p.effects.includes('input-clamp')) {
            odexChecked++;
            const ref = referenceOscillation(p.circuitAt(values), { initialState: analyzeCircuit(p.circuitAt(values)).powerUp.initialState });
            expect(rel(cycle.periodS, ref.periodS), 'odex period').toBeLessThan(1e-6);
            expect(Math.abs(fromReplay[OUTPUT_SLOT.dutyCycle] - ref.dutyCycle), 'odex duty').toBeLessThan(1e-6);
          }
        }
      }
      expect(circuits).toBe(10);
      // Steering diodes switch inside every cycle (a diode event ends a piece): that topology is walked.
      if (topology.diodeCount > 0) {
        expect(replayable).toBe(0);
      } else {
        expect(replayable).toBeGreaterThan(5);
        expect(replayed).toBeGreaterThan(100);
        expect(odexChecked).toBe(2);
      }
    });
  }
});

describe('cycle replay hands vectors that leave the nominal sequence to the walk', () => {
  // Our own circuit: a ±5 V clock on a slow amplifier (0.5 V/µs, 1 µs delay), edges ~12 % of the period.
  const circuit: Circuit = {
    topology: 'two-resistor-feedback',
    supply: { positiveV: 5, negativeV: -5 },
    amplifier: { ...findBuiltInAmplifier('ideal')!, slewRateVPerS: 0.5e6, recoveryDelayS: 1e-6 },
    parts: { rTiming: 10e3, cTiming: 10e-9, rFeedback: 20e3, rGround: 10e3 },
  };
  const p = prepareModel(circuit);
  const { start, replay } = startAndReplay(p);
  const leaving: [string, (values: Float64Array) => void][] = [
    // Edges longer than half the period: the threshold is crossed while the output still ramps.
    ['a slew rate 20 times slower', (values) => (values[p.indexOf('slewRateVPerS')] /= 20)],
    // The delay then follows the input slope (amplifiers/propagation-delay.ts): not the replay's constant delay.
    ['an overdrive-dependent delay', (values) => (values[p.indexOf('overdriveDelayChargeVS')] = 1e-12)],
    // No delay pieces at all: the start's pending flip does not carry over.
    ['no recovery delay', (values) => (values[p.indexOf('recoveryDelayS')] = 0)],
    // A current limit that the swing into the capacitor reaches: an event ends a piece.
    ['a current limit the output reaches', (values) => (values[p.indexOf('outputCurrentLimitA')] = 0.3e-3)],
  ];
  it('compiles the nominal cycle (delay, ramp, exponential per state)', () => {
    expect(replay).toBeDefined();
    const own = new OscillatorWalk();
    const cycle = replay!.run(own, p.nominal, start)!;
    expect(cycle.endIndex).toBe(6);
    expect(Array.from({ length: 6 }, (_, i) => own.log.data[i * LOG_STRIDE + LOG.end])).toEqual([-1, -2, 0, -1, -2, 0]);
  });
  // The replay skips the event functions of a cycle only when none can come near its boundary
  // (cycle-replay.ts quietEvents): a current limit at the cycle's own peak output current, analyzeCircuit's
  // figure, must still be watched — reached just below the peak, missed just above it.
  const peakA = (() => {
    const a = analyzeCircuit(circuit);
    return Math.max(a.currents.outputPeakSourceA, a.currents.outputPeakSinkA);
  })();
  it('a current limit 0.1 % below the peak output current: reached, the replay declines', () => {
    const values = Float64Array.from(p.nominal);
    values[p.indexOf('outputCurrentLimitA')] = 0.999 * peakA;
    expect(replay!.run(new OscillatorWalk(), values, start)).toBeUndefined();
  });
  it('a current limit 0.1 % above the peak output current: watched, never reached, the replay = the walk bit for bit', () => {
    const values = Float64Array.from(p.nominal);
    values[p.indexOf('outputCurrentLimitA')] = 1.001 * peakA;
    const walk = new OscillatorWalk();
    const walked = walkToCycle(walk, p.shape, values, true, start, false);
    const own = new OscillatorWalk();
    const cycle = replay!.run(own, values, start);
    expect(cycle).toBeDefined();
    expect({ ...cycle }).toEqual({ ...walked });
    for (let i = 0; i < cycle!.endIndex; i++) {
      for (const f of LOGGED_FIELDS) expect(Object.is(own.log.data[i * LOG_STRIDE + f], walk.log.data[i * LOG_STRIDE + f]), `piece ${i} field ${f}`).toBe(true);
    }
    expectAnalyzeFigures(p, values, 'limit just above the peak');
  });
  for (const [label, change] of leaving) {
    it(`${label}: the replay declines, the walk answers as analyzeCircuit does`, () => {
      const values = Float64Array.from(p.nominal);
      change(values);
      expect(replay!.run(new OscillatorWalk(), values, start)).toBeUndefined();
      expectAnalyzeFigures(p, values, label);
    });
  }
});
