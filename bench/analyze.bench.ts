/**
 * Foundation figures:
 * 1. core closed-form evaluations per second, the compiled evaluator against
 *    closedFormFigures (the reference path) on the same circuit — target ≥ 2 million/s;
 * 2. POST /v1/analyze throughput over real HTTP on 127.0.0.1 (autocannon)
 *    against a bare fastify route parsing the same body in the same run — target ratio ≥ 0.5.
 * Bounded: about 2 s per core measurement and 3 s per HTTP run; loopback only.
 */
import autocannon from 'autocannon';
import Fastify from 'fastify';
import type { AddressInfo } from 'node:net';
import { findBuiltInAmplifier } from '../src/core/amplifiers/archetypes.ts';
import { closedFormFigures, prepareModel } from '../src/core/circuit/analyze.ts';
import { OUTPUT_LENGTH } from '../src/core/circuit/engine/prepared.ts';
import type { Circuit } from '../src/core/circuit/types.ts';
import { buildApp } from '../src/http/app.ts';
import { openSqliteStore } from '../src/store/index.ts';

const CORE_SECONDS = 2;
const HTTP_SECONDS = 3;

// Our own scenario: a 3.3 V single-rail wake-up timer on a class-typical CMOS rail-to-rail part.
const circuit: Circuit = {
  topology: 'three-resistor-divider',
  supply: { positiveV: 3.3, negativeV: 0 },
  amplifier: findBuiltInAmplifier('cmos-rro-micropower')!,
  parts: { rTiming: 47e3, cTiming: 22e-9, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 },
};

function ratePerSecond(seconds: number, batch: number, step: (i: number) => number): { rate: number; check: number } {
  let n = 0;
  let check = 0;
  const started = performance.now();
  while (performance.now() - started < seconds * 1000) {
    for (let i = 0; i < batch; i++) check += step(n + i);
    n += batch;
  }
  return { rate: n / ((performance.now() - started) / 1000), check };
}

// ---- 1. core evaluations per second
const evaluator = prepareModel(circuit, { model: 'closed-form' });
const values = Float64Array.from(evaluator.nominal);
const out = new Float64Array(OUTPUT_LENGTH);
const iR = evaluator.indexOf('rTiming');
// Vary one value per call so nothing can be hoisted out of the loop.
const fast = ratePerSecond(CORE_SECONDS, 10_000, (i) => {
  values[iR] = 47e3 * (1 + (i & 1023) * 1e-6);
  evaluator.evaluate(values, out);
  return out[0];
});
const reference = ratePerSecond(CORE_SECONDS, 1_000, (i) => closedFormFigures({ ...circuit, parts: { ...circuit.parts, rTiming: 47e3 * (1 + (i & 1023) * 1e-6) } }).periodS);
console.log(`core closed form, compiled evaluator : ${(fast.rate / 1e6).toFixed(2)} million/s (target >= 2 million/s) ${fast.rate >= 2e6 ? 'MET' : 'MISSED'}`);
console.log(`core closed form, closedFormFigures  : ${(reference.rate / 1e6).toFixed(3)} million/s (baseline)`);
console.log(`ratio compiled / closedFormFigures   : ${(fast.rate / reference.rate).toFixed(1)}x`);

// ---- 2. HTTP throughput against a bare route
// Two bodies: an archetype with finite slew (answered by the time-domain engine) and the ideal amplifier
// (answered by the closed form, the foundation's case). Both are reported; neither is cached anywhere.
const engineBody = JSON.stringify({ ...circuit, amplifier: 'cmos-rro-micropower' });
const closedFormBody = JSON.stringify({ ...circuit, amplifier: 'ideal' });

async function measure(url: string, body = engineBody): Promise<{ rps: number; non2xx: number; errors: number; p99Ms: number }> {
  const r = await autocannon({ url, method: 'POST', headers: { 'content-type': 'application/json' }, body, duration: HTTP_SECONDS, connections: 10 });
  return { rps: r.requests.average, non2xx: r.non2xx, errors: r.errors, p99Ms: r.latency.p99 };
}

const bare = Fastify({ logger: false });
bare.post('/bare', async () => ({ frequencyHz: 1, dutyCycle: 0.5 }));
await bare.listen({ host: '127.0.0.1', port: 0 });
const app = await buildApp({ store: openSqliteStore(':memory:'), config: { apiKeys: undefined } });
await app.listen({ host: '127.0.0.1', port: 0 });
try {
  const barePort = (bare.server.address() as AddressInfo).port;
  const appPort = (app.server.address() as AddressInfo).port;
  await measure(`http://127.0.0.1:${appPort}/v1/analyze`); // warm-up (JIT, schema compilation)
  const baseline = await measure(`http://127.0.0.1:${barePort}/bare`);
  const analyzed = await measure(`http://127.0.0.1:${appPort}/v1/analyze`);
  const closed = await measure(`http://127.0.0.1:${appPort}/v1/analyze`, closedFormBody);
  console.log(`bare fastify POST                    : ${baseline.rps.toFixed(0)} req/s, p99 ${baseline.p99Ms} ms (baseline)`);
  console.log(`POST /v1/analyze, engine (archetype) : ${analyzed.rps.toFixed(0)} req/s, p99 ${analyzed.p99Ms} ms, non-2xx ${analyzed.non2xx}, errors ${analyzed.errors}`);
  console.log(`POST /v1/analyze, closed form (ideal): ${closed.rps.toFixed(0)} req/s, p99 ${closed.p99Ms} ms, non-2xx ${closed.non2xx}, errors ${closed.errors}`);
  for (const [name, r] of [['engine', analyzed], ['closed form', closed]] as const) {
    const ratio = r.rps / baseline.rps;
    console.log(`ratio /v1/analyze (${name}) / bare${' '.repeat(12 - name.length)}: ${ratio.toFixed(3)} (target >= 0.5) ${ratio >= 0.5 ? 'MET' : 'MISSED'}`);
  }
} finally {
  await app.close();
  await bare.close();
}
