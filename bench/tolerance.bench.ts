/**
 * Monte Carlo throughput:
 * 1. samples per second in one thread on the closed-form path (the prepared model's special case), per wall
 *    and per CPU second, against the same Monte Carlo evaluating each sample with closedFormFigures (the
 *    uncompiled reference path) — target ≥ 2 million/s; and the same circuit on a slew- and delay-limited
 *    amplifier (the full walk) as a ratio to it;
 * 2. a 1e6-sample POST /v1/tolerance end to end over HTTP on 127.0.0.1 (worker thread included) against the same
 *    analysis called in-process in the same run — target ≤ 2 s.
 * The Monte Carlo rates of 1. are each the best of ROUNDS runs, by wall clock and by CPU time (the machine is
 * shared and the JIT settles over the first runs: a single run read about 30 % below the steady rate).
 */
import type { AddressInfo } from 'node:net';
import { findBuiltInAmplifier } from '../src/core/amplifiers/archetypes.ts';
import { chooseModel, closedFormFigures } from '../src/core/index.ts';
import type { Circuit } from '../src/core/circuit/types.ts';
import { drawSamples } from '../src/core/tolerance/monte-carlo.ts';
import { createSampleEvaluator, type SampleEvaluator } from '../src/core/tolerance/sample-evaluator.ts';
import { runToleranceAnalysis, type ToleranceRequest } from '../src/core/tolerance/index.ts';
import { buildVariationModel } from '../src/core/tolerance/variation-model.ts';
import { EVALUATION_STATUS } from '../src/core/circuit/engine/prepared.ts';
import { buildApp } from '../src/http/app.ts';
import { openSqliteStore } from '../src/store/index.ts';

// Our own scenario: a ±5 V split-rail 5 kHz sensor excitation clock, 1 % resistors, 5 % C0G, ±5 % supply, 0..70 °C.
const circuit: Circuit = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 5, negativeV: -5 },
  amplifier: findBuiltInAmplifier('ideal')!,
  parts: { rTiming: 10e3, cTiming: 10e-9, rFeedback: 20e3, rGround: 10e3 },
};
const request: ToleranceRequest = {
  circuit,
  tolerances: { rTiming: 0.01, cTiming: 0.05, rFeedback: 0.01, rGround: 0.01 },
  temperature: { minC: 0, maxC: 70 },
  temperatureCoefficients: { cTiming: { dielectric: 'C0G' }, rTiming: { tempcoPpmPerK: 100 } },
  supplyTolerance: 0.05,
  monteCarlo: { samples: 1_000_000, seed: 1, distribution: 'normal' },
  spec: { frequencyHz: 7200, frequencyTolerance: 0.05 },
};

function mcRate(req: ToleranceRequest, samples: number, evaluatorOverride?: (ev: SampleEvaluator) => SampleEvaluator) {
  let evaluator = createSampleEvaluator(req.circuit, req.model ?? 'auto');
  if (evaluatorOverride) evaluator = evaluatorOverride(evaluator);
  const model = buildVariationModel(req, evaluator.parameters, evaluator.nominal, evaluator.model);
  const c0 = process.cpuUsage();
  const drawn = drawSamples(model, evaluator, { samples, seed: 1, distribution: 'normal', sigmaPerTolerance: 1 / 3 });
  const cpu = process.cpuUsage(c0);
  // Per wall second and per CPU second of this process (on a shared machine the wall clock counts waiting for a core).
  return { rate: samples / drawn.elapsedS, cpuRate: samples / ((cpu.user + cpu.system) / 1e6), model: evaluator.model };
}

/** Rounds per rate: the best one is reported (a shared machine only ever slows a round down). */
const ROUNDS = 3;

/** Best of ROUNDS runs, by wall clock and by CPU time separately (as bench/bom.bench.ts does). */
function bestRate(run: () => ReturnType<typeof mcRate>): ReturnType<typeof mcRate> {
  let best = run();
  for (let round = 1; round < ROUNDS; round++) {
    const r = run();
    best = { ...best, rate: Math.max(best.rate, r.rate), cpuRate: Math.max(best.cpuRate, r.cpuRate) };
  }
  return best;
}

// ---- 1. samples per second in one thread
mcRate(request, 100_000); // warm-up
const compiled = bestRate(() => mcRate(request, 1_000_000));
// Baseline: identical sampling, each sample through closedFormFigures on a rebuilt circuit.
const baseline = bestRate(() => mcRate(request, 20_000, (ev) => {
  return {
    ...ev,
    evaluate: (values, out) => {
      const c: Circuit = { ...circuit, parts: { rTiming: values[0], cTiming: values[1], rFeedback: values[2], rGround: values[3] }, supply: { positiveV: values[4], negativeV: values[5] } };
      try {
        const f = closedFormFigures(c);
        out[0] = f.periodS;
        out[1] = f.dutyCycle;
        return EVALUATION_STATUS.ok;
      } catch {
        return EVALUATION_STATUS.latched;
      }
    },
  };
}));
console.log(`Monte Carlo, closed form, compiled    : best of ${ROUNDS}: ${(compiled.rate / 1e6).toFixed(2)} million samples/s wall, ${(compiled.cpuRate / 1e6).toFixed(2)} per CPU second (target >= 2 million/s) ${compiled.cpuRate >= 2e6 ? 'MET' : 'MISSED'}`);
console.log(`Monte Carlo, closedFormFigures/sample : best of ${ROUNDS}: ${(baseline.rate / 1e6).toFixed(3)} million samples/s (baseline)`);
console.log(`ratio                                 : ${(compiled.rate / baseline.rate).toFixed(1)}x`);

const slewLimited: Circuit = { ...circuit, amplifier: { ...circuit.amplifier, slewRateVPerS: 0.5e6, recoveryDelayS: 1e-6 } };
if (chooseModel(slewLimited, 'auto') === 'time-domain') {
  const slewRequest: ToleranceRequest = { ...request, circuit: slewLimited, amplifierSpreads: { slewRateVPerS: 0.2, recoveryDelayS: 0.3 } };
  mcRate(slewRequest, 20_000); // warm-up (JIT), as for the closed form
  const td = mcRate(slewRequest, 200_000);
  console.log(
    `Monte Carlo, slew + delay (full model): ${(td.cpuRate / 1e3).toFixed(0)} k samples per CPU second, ${(td.cpuRate / compiled.cpuRate).toFixed(3)}x the closed form (prepared bench: target >= 0.25)`,
  );
} else {
  console.log('Monte Carlo, time-domain engine       : no engine registered; the closed form answers slew-limited circuits');
}

// ---- 2. 1e6 samples end to end over HTTP
const inProcessStarted = performance.now();
runToleranceAnalysis(request);
const inProcessS = (performance.now() - inProcessStarted) / 1000;

const app = await buildApp({ store: openSqliteStore(':memory:'), config: { apiKeys: undefined, workerThreads: 1 } });
await app.listen({ host: '127.0.0.1', port: 0 });
try {
  const url = `http://127.0.0.1:${(app.server.address() as AddressInfo).port}/v1/tolerance`;
  const wire = { ...request, circuit: { ...circuit, amplifier: 'ideal' } };
  const post = async (samples: number) => {
    const started = performance.now();
    const res = await fetch(url, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ ...wire, monteCarlo: { ...wire.monteCarlo, samples } }) });
    const json = (await res.json()) as { monteCarlo: { samplesPerSecond: number; yield: number } };
    if (res.status !== 200) throw new Error(`HTTP ${res.status}: ${JSON.stringify(json)}`);
    return { s: (performance.now() - started) / 1000, json };
  };
  // The load shedder answers 503 while its event-loop samples still show the in-process run above (or a
  // busy shared machine); /healthz is never shed, so retry the warm-up itself until the service takes it.
  for (let attempt = 0; ; attempt++) {
    try {
      await post(100_000); // warm-up: starts the worker thread and its JIT
      break;
    } catch (err) {
      if (attempt >= 50 || !String(err).includes('HTTP 503')) throw err;
      await new Promise((r) => setTimeout(r, 200));
    }
  }
  const runs = [await post(1_000_000), await post(1_000_000), await post(1_000_000)];
  const best = Math.min(...runs.map((r) => r.s));
  console.log(`in-process runToleranceAnalysis, 1e6  : ${inProcessS.toFixed(2)} s (baseline)`);
  console.log(`POST /v1/tolerance, 1e6 samples       : best ${best.toFixed(2)} s of ${runs.map((r) => r.s.toFixed(2)).join(', ')} (target <= 2 s) ${best <= 2 ? 'MET' : 'MISSED'}`);
  console.log(`  in the worker                       : ${(runs[0].json.monteCarlo.samplesPerSecond / 1e6).toFixed(2)} million samples/s`);
  console.log(`ratio HTTP / in-process               : ${(best / inProcessS).toFixed(2)}`);
} finally {
  await app.close();
}
