/**
 * The prepared (compiled) model, measured against baselines taken in the same run:
 * Rates are per CPU second of this process (the machine is shared).
 * 1. Monte Carlo on a slew- and delay-limited circuit (edges 5–20 % of the period), samples/s in one
 *    thread, beside the closed-form special case of the same circuit — target ≥ 500 k/s and ratio ≥ 0.25;
 *    and the same samples walked from power-up (the path before the steady-state start) as a baseline;
 * 2. a closed-form-eligible circuit (no amplifier effect): evaluations/s — target: no slower than the
 *    compiled closed form before the one-model change, represented by the yardstick in
 *    closed-form-yardstick.ts (bench-only: what that evaluator did per vector) measured in the same run;
 * (BOM checks with the full model, every design distinct: bench/bom.bench.ts.)
 */
import { findBuiltInAmplifier } from '../src/core/amplifiers/archetypes.ts';
import { prepareModel } from '../src/core/circuit/analyze.ts';
import { EVALUATION_STATUS, OUTPUT_LENGTH, sharedWalk, walkToCycle, readTiming } from '../src/core/circuit/engine/prepared.ts';
import type { Circuit } from '../src/core/circuit/types.ts';
import { drawSamples } from '../src/core/tolerance/monte-carlo.ts';
import type { SampleEvaluator } from '../src/core/tolerance/sample-evaluator.ts';
import type { ToleranceRequest } from '../src/core/tolerance/index.ts';
import { buildVariationModel } from '../src/core/tolerance/variation-model.ts';
import { ClosedFormYardstick } from './closed-form-yardstick.ts';

// Our own scenario: a ±5 V split-rail clock (~6.5 kHz) on a slow amplifier: 0.5 V/µs across 10 V plus 1 µs delay, edges ~15 % of the period.
const ideal = findBuiltInAmplifier('ideal')!;
const slow: Circuit = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 5, negativeV: -5 },
  amplifier: { ...ideal, slewRateVPerS: 0.5e6, recoveryDelayS: 1e-6 },
  parts: { rTiming: 10e3, cTiming: 10e-9, rFeedback: 20e3, rGround: 10e3 },
};
const request: ToleranceRequest = {
  circuit: slow,
  tolerances: { rTiming: 0.01, cTiming: 0.05, rFeedback: 0.01, rGround: 0.01 },
  supplyTolerance: 0.05,
  amplifierSpreads: { slewRateVPerS: 0.2, recoveryDelayS: 0.3 },
};

function mcRate(evaluator: SampleEvaluator, samples: number): { rate: number; latched: number } {
  const model = buildVariationModel(request, evaluator.parameters, evaluator.nominal, evaluator.model);
  // Per CPU second of this process: the machine is shared, and the wall clock counts waiting for a core.
  const c0 = process.cpuUsage();
  const drawn = drawSamples(model, evaluator, { samples, seed: 1, distribution: 'normal', sigmaPerTolerance: 1 / 3 });
  const cpu = process.cpuUsage(c0);
  return { rate: samples / ((cpu.user + cpu.system) / 1e6), latched: drawn.latched };
}

// ---- 1. Monte Carlo, slew- and delay-limited
const full = prepareModel(slow);
const closed = prepareModel(slow, { model: 'closed-form' });
{
  const out = new Float64Array(OUTPUT_LENGTH);
  full.evaluate(full.nominal, out);
  const edgeShare = (0.5 * (10 / 0.5e6) + 1e-6) / out[0];
  console.log(`slew-limited circuit: ${(1 / out[0]).toFixed(1)} Hz, edge (delay + full slew) ${(100 * (1e-6 + 10 / 0.5e6) * (1 / out[0])).toFixed(1)} % of the period (half-swing share ${(100 * edgeShare).toFixed(1)} %), effects ${full.effects.join(', ')}`);
}
mcRate(full, 50_000); // warm-up (JIT)
mcRate(closed, 200_000);
// Best of MC_ROUNDS, the two paths alternating: rounds of one process on these machines range over ±20 %,
// and a shared machine only ever slows a round down, so the best round of each is the closest to an idle core.
const MC_ROUNDS = 5;
let td = { rate: 0, latched: 0 };
let cf = { rate: 0, latched: 0 };
for (let round = 0; round < MC_ROUNDS; round++) {
  const t = mcRate(full, 200_000);
  if (t.rate > td.rate) td = t;
  const c = mcRate(closed, 600_000);
  if (c.rate > cf.rate) cf = c;
}
// Baseline: the same walk from power-up for every sample (no steady-state start).
const fromPowerUp: SampleEvaluator = {
  ...full,
  parameters: full.parameters,
  nominal: full.nominal,
  model: full.model,
  effects: full.effects,
  indexOf: (n) => full.indexOf(n),
  evaluate(values, out) {
    try {
      const cycle = walkToCycle(sharedWalk, full.shape, values, true);
      readTiming(sharedWalk, cycle, out, false);
      return EVALUATION_STATUS.ok;
    } catch {
      out.fill(Number.NaN);
      return EVALUATION_STATUS.latched;
    }
  },
};
// Its own warm-up: the steady-state start answers through the cycle replay, so the general walk's code is
// not hot yet when this baseline starts.
mcRate(fromPowerUp, 20_000);
const pu = mcRate(fromPowerUp, 50_000);
console.log(`Monte Carlo, full model (slew + delay)  : ${(td.rate / 1e3).toFixed(0)} k samples/s (target >= 500 k/s) ${td.rate >= 5e5 ? 'MET' : 'MISSED'}`);
console.log(`Monte Carlo, closed-form special case   : ${(cf.rate / 1e3).toFixed(0)} k samples/s (baseline, same circuit, same run)`);
console.log(`ratio full / closed form                : ${(td.rate / cf.rate).toFixed(3)} (target >= 0.25; 0.11 before the cycle replay, commit 84aeb13) ${td.rate / cf.rate >= 0.25 ? 'MET' : 'MISSED'}`);
console.log(`Monte Carlo, walked from power-up       : ${(pu.rate / 1e3).toFixed(0)} k samples/s (baseline: steady-state start x${(td.rate / pu.rate).toFixed(1)})`);

// ---- 2. closed-form-eligible circuit, against the yardstick of the deleted compiled closed form (same run)
const eligible = prepareModel({ ...slow, amplifier: ideal });
const yardstick = new ClosedFormYardstick(eligible.shape);
{
  const values = Float64Array.from(eligible.nominal);
  const out = new Float64Array(OUTPUT_LENGTH);
  const iR = eligible.indexOf('rTiming');
  // Both evaluate the same stream of vectors (rTiming stepped by ppm); they must agree before they are timed.
  let worst = 0;
  for (let i = 0; i < 1024; i++) {
    values[iR] = 10e3 * (1 + i * 1e-6);
    eligible.evaluate(values, out);
    const periodS = out[0];
    yardstick.evaluate(values, out);
    worst = Math.max(worst, Math.abs(out[0] / periodS - 1));
  }
  const rateOf = (evaluate: (values: Float64Array, out: Float64Array) => unknown): number => {
    let n = 0;
    const started = performance.now();
    const c0 = process.cpuUsage();
    while (performance.now() - started < 400) {
      for (let i = 0; i < 10_000; i++) {
        values[iR] = 10e3 * (1 + ((n + i) & 1023) * 1e-6);
        evaluate(values, out);
      }
      n += 10_000;
    }
    const cpu = process.cpuUsage(c0);
    return n / ((cpu.user + cpu.system) / 1e6);
  };
  // Alternating rounds, best of each: a shared machine only ever slows a round down.
  let prepared = 0;
  let reference = 0;
  for (let round = 0; round < 5; round++) {
    prepared = Math.max(prepared, rateOf((v, o) => eligible.evaluate(v, o)));
    reference = Math.max(reference, rateOf((v, o) => yardstick.evaluate(v, o)));
  }
  console.log(`closed-form-eligible, prepared evaluate : ${(prepared / 1e6).toFixed(2)} million/s per CPU second (model ${eligible.model})`);
  console.log(`  yardstick (the deleted compiled closed form: two solves + two logarithms): ${(reference / 1e6).toFixed(2)} million/s, same run; periods agree to ${worst.toExponential(1)}`);
  console.log(`  ratio prepared / yardstick            : ${(prepared / reference).toFixed(2)} (target >= 1) ${prepared >= reference ? 'MET' : 'MISSED'}`);
}
