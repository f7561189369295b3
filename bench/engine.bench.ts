/**
 * Time-domain engine figures, each against a baseline measured in this run:
 * 1. engine analyses per second for a typical slewing circuit (a ±12 V clock on a
 *    class-typical slow bipolar op-amp: slew, recovery delay and current limit all
 *    active in the model) — target ≥ 200k/s on one core. Reported both from a
 *    prepared circuit (the engine itself) and end to end (analyzeCircuit:
 *    validation, the two nodal solves, checks);
 * 2. the same steady-state analysis by the independent reference (odex, Hairer's
 *    extrapolation method, events by bisection) at matched accuracy: its
 *    tolerance is set so it agrees with the engine to ~1e-12 — target engine ≥ 100×
 *    faster;
 * 3. the multi-state pieces (capacitance at P and at the output pin: docs/model.md,
 *    strays and leakage) on the same circuit, analyses per CPU-second as a ratio
 *    to the one-capacitor engine measured just before, and their agreement with
 *    odex integrating the same multi-capacitor ODE.
 * Bounded: about 2 s per engine measurement and a fixed number of odex runs.
 * Run: npx tsx bench/engine.bench.ts
 */
import { findBuiltInAmplifier } from '../src/core/amplifiers/archetypes.ts';
import { analyzeCircuit, prepareCircuit } from '../src/core/circuit/analyze.ts';
import { analyzeTimeDomain } from '../src/core/circuit/engine/index.ts';
import type { Circuit } from '../src/core/circuit/types.ts';
import { referenceOscillation } from '../test/core/circuit/engine-odex-reference.ts';

const ENGINE_SECONDS = 2;
const ODEX_RUNS = 8;

// Our own scenario: a ±12 V test-fixture clock on a slow general-purpose bipolar part.
const circuit: Circuit = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 12, negativeV: -12 },
  amplifier: findBuiltInAmplifier('bipolar-split-supply-general')!,
  parts: { rTiming: 10e3, cTiming: 10e-9, rFeedback: 10e3, rGround: 10e3 },
};

/**
 * Rate per wall-clock second and per second of this process's CPU time: on a
 * shared machine the second is the "one core" figure (time the process spent
 * descheduled does not count against it).
 */
function ratePerSecond(seconds: number, batch: number, step: () => number): { rate: number; cpuRate: number; check: number } {
  let n = 0;
  let check = 0;
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  let t: number;
  while ((t = performance.now()) - t0 < seconds * 1000) {
    for (let i = 0; i < batch; i++) check += step();
    n += batch;
  }
  const cpu = process.cpuUsage(c0);
  return { rate: n / ((t - t0) / 1000), cpuRate: n / ((cpu.user + cpu.system) / 1e6), check };
}

const prepared = prepareCircuit(circuit);
// Warm-up (JIT) before timing.
ratePerSecond(0.3, 1000, () => analyzeTimeDomain(prepared).periodS);
const engine = ratePerSecond(ENGINE_SECONDS, 1000, () => analyzeTimeDomain(prepared).periodS);
const endToEnd = ratePerSecond(ENGINE_SECONDS, 500, () => analyzeCircuit(circuit).periodS);

const engineResult = analyzeTimeDomain(prepared);
const initialState = engineResult.powerUp.initialState;
referenceOscillation(circuit, { initialState }); // warm-up
const c0 = process.cpuUsage();
const t0 = performance.now();
let ref = referenceOscillation(circuit, { initialState });
for (let i = 1; i < ODEX_RUNS; i++) ref = referenceOscillation(circuit, { initialState });
const odexSecondsPerAnalysis = (performance.now() - t0) / 1000 / ODEX_RUNS;
const odexCpu = process.cpuUsage(c0);
const odexCpuSecondsPerAnalysis = (odexCpu.user + odexCpu.system) / 1e6 / ODEX_RUNS;
const agreement = Math.max(Math.abs(engineResult.periodS / ref.periodS - 1), Math.abs(engineResult.dutyCycle / ref.dutyCycle - 1));

const fmt = (x: number) => Math.round(x).toLocaleString('en-US');
console.log(`circuit: ${circuit.topology}, ${circuit.amplifier.name}: ${engineResult.frequencyHz.toFixed(2)} Hz (closed form would say ${analyzeCircuit(circuit, { model: 'closed-form' }).frequencyHz.toFixed(2)} Hz)`);
console.log(`engine, prepared circuit:        ${fmt(engine.rate)} analyses/s wall, ${fmt(engine.cpuRate)} per CPU-second (one core; target ≥ 200,000/s)`);
console.log(`engine, end to end (analyze):    ${fmt(endToEnd.rate)} analyses/s wall, ${fmt(endToEnd.cpuRate)} per CPU-second (validation + nodal solves + checks)`);
console.log(`odex reference, same analysis:   ${(odexSecondsPerAnalysis * 1e3).toFixed(2)} ms wall, ${(odexCpuSecondsPerAnalysis * 1e3).toFixed(2)} ms CPU each (${ref.cycles} cycles, ${ref.rhsEvaluations} right-hand-side evaluations)`);
console.log(`agreement engine vs odex:        ${agreement.toExponential(2)} relative (period, duty)`);
console.log(`ratio engine/odex, CPU time:     ${fmt(odexCpuSecondsPerAnalysis * engine.cpuRate)}×  (target ≥ 100×; wall-clock ${fmt(odexSecondsPerAnalysis * engine.rate)}×)`);
console.log(`ratio end-to-end/odex, CPU time: ${fmt(odexCpuSecondsPerAnalysis * endToEnd.cpuRate)}×`);

// 3. The same clock with 47 pF at P and 100 pF on the output pin (behind the part's output resistance).
const strayed: Circuit = { ...circuit, strays: { timingNodeF: 0, thresholdNodeF: 47e-12, outputNodeF: 100e-12, timingLeakageOhm: Infinity, thresholdLeakageOhm: Infinity } };
const preparedStrayed = prepareCircuit(strayed);
ratePerSecond(0.3, 100, () => analyzeTimeDomain(preparedStrayed).periodS);
const multi = ratePerSecond(ENGINE_SECONDS, 100, () => analyzeTimeDomain(preparedStrayed).periodS);
const multiResult = analyzeTimeDomain(preparedStrayed);
const multiRef = referenceOscillation(strayed, { initialState: multiResult.powerUp.initialState });
const multiAgreement = Math.max(Math.abs(multiResult.periodS / multiRef.periodS - 1), Math.abs(multiResult.dutyCycle / multiRef.dutyCycle - 1));
console.log(`multi-state (47 pF at P, 100 pF at the pin): ${fmt(multi.rate)} analyses/s wall, ${fmt(multi.cpuRate)} per CPU-second = ${(multi.cpuRate / engine.cpuRate).toFixed(3)}× the one-capacitor engine; period shift ${(multiResult.periodS / engineResult.periodS - 1).toExponential(2)}, agreement with odex ${multiAgreement.toExponential(2)}`);
if (!Number.isFinite(engine.check + endToEnd.check + multi.check)) process.exitCode = 1;
