/**
 * The service under a mixed heavy load, seen from outside (the real server
 * process on 127.0.0.1, started as in production from src/server.ts):
 *
 * 1. /healthz polled every 20 ms on a keep-alive connection for 20 s while
 *    three clients loop over analyze, design, tolerance (1e5 Monte Carlo
 *    samples), waveform and BOM checks (100 assemblies). Printed: errors
 *    (target 0), requests done, /healthz p50/p99 against the same poll with no
 *    heavy work measured first in this run (target p99 ≤ 50 ms).
 * 2. Memory for one 60 MB capture upload to /v1/fit: peak RSS above the idle
 *    baseline against the body size (target ≤ 3×), and RSS 10 s after the
 *    answer (target within 50 MB of the baseline). The baseline is the warm
 *    idle service (both worker threads started by a small fit). RSS is read
 *    from /proc/<pid>/status (Linux).
 *
 * `--memory-only` runs part 2 alone.
 */
import { readFileSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { findBuiltInAmplifier } from '../src/core/amplifiers/archetypes.ts';
import { resolveAmplifier } from '../src/core/amplifiers/resolve.ts';
import type { Circuit } from '../src/core/circuit/types.ts';
import { synthesizeCapture } from '../test/core/fit/estimate-capture-synth.ts';
import { percentile, pollHealth, type HealthSample } from '../test/http/fixtures/health-poll.ts';
import { analyzeRequest, bomRequest, designRequest, toleranceRequest, waveformRequest, type HeavyRequest } from '../test/http/fixtures/heavy-requests.ts';
import { rawRequest } from '../test/http/fixtures/raw-http.ts';
import { killHard, startServer } from '../test/http/fixtures/server-process.ts';

const MIX_S = 20;
const CLIENTS = 3;
const IDLE_POLL_S = 5;
const POLL_INTERVAL_MS = 20;

const dir = mkdtempSync(path.join(tmpdir(), 'tickwright-load-'));
// LOG_LEVEL info (as deployed): the fixture waits for fastify's "Server listening" line.
const server = await startServer(path.join(dir, 'tickwright.db'), { TICKWRIGHT_MAX_EVENT_LOOP_DELAY_MS: '1000' }, 120_000);
const port = Number(new URL(server.baseUrl).port);
const pid = server.child.pid!;

function rssBytes(): number {
  const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
  return m ? Number(m[1]) * 1024 : NaN;
}
const mb = (bytes: number) => `${(bytes / 1024 / 1024).toFixed(0)} MB`;

function send(req: HeavyRequest, timeoutMs = 120_000) {
  return rawRequest(port, `${req.method} ${req.path} HTTP/1.1\r\nhost: 127.0.0.1\r\ncontent-type: ${req.contentType}`, req.body, timeoutMs);
}

function summary(samples: HealthSample[]): string {
  const ms = samples.map((s) => s.ms);
  const failed = samples.filter((s) => s.status !== 200).length;
  return `${samples.length} polls, ${failed} not 200, p50 ${percentile(ms, 0.5).toFixed(1)} ms, p99 ${percentile(ms, 0.99).toFixed(1)} ms, max ${Math.max(...ms).toFixed(1)} ms`;
}

try {
  // `--memory-only`: skip the mixed load (part 1) and measure the upload alone.
  if (!process.argv.includes('--memory-only')) {
    const mix = [analyzeRequest(), designRequest(), toleranceRequest(100_000), waveformRequest(50_000), bomRequest(100)];
    // Warm-up: schemas compiled, worker threads started.
    for (const req of mix) await send(req);

    // ---- 1a. the baseline: /healthz with nothing else running
    const idle = pollHealth(port, POLL_INTERVAL_MS);
    await new Promise((r) => setTimeout(r, IDLE_POLL_S * 1000));
    const idleSamples = await idle.stop();

    // ---- 1b. the mix
    const poll = pollHealth(port, POLL_INTERVAL_MS);
    const until = performance.now() + MIX_S * 1000;
    const counts = new Map<string, { done: number; errors: number; statuses: Set<number> }>();
    await Promise.all(
      Array.from({ length: CLIENTS }, async (_, client) => {
        for (let i = client; performance.now() < until; i++) {
          const req = mix[i % mix.length];
          const entry = counts.get(req.name) ?? { done: 0, errors: 0, statuses: new Set<number>() };
          counts.set(req.name, entry);
          const status = await send(req).then((r) => r.status, () => 0);
          entry.done++;
          if (status !== 200) {
            entry.errors++;
            entry.statuses.add(status);
          }
        }
      }),
    );
    const busySamples = await poll.stop();
    const errors = [...counts.values()].reduce((n, c) => n + c.errors, 0);
    console.log(`mixed load: ${CLIENTS} clients for ${MIX_S} s on 127.0.0.1`);
    for (const [name, c] of counts) console.log(`  ${name.padEnd(28)} ${String(c.done).padStart(5)} done, ${c.errors} errors${c.errors ? ` (statuses ${[...c.statuses].join(', ')})` : ''}`);
    console.log(`  errors: ${errors} (target 0)`);
    console.log(`/healthz, idle:       ${summary(idleSamples)}`);
    console.log(`/healthz, under load: ${summary(busySamples)}`);
    const idleP99 = percentile(idleSamples.map((s) => s.ms), 0.99);
    const busyP99 = percentile(busySamples.map((s) => s.ms), 0.99);
    console.log(`  p99 under load ${busyP99.toFixed(1)} ms (target ≤ 50 ms) = ${(busyP99 / idleP99).toFixed(1)}× the idle p99`);
  }

  // ---- 2. memory for a 60 MB capture upload
  // Our own scenario: a ±2.5 V split-supply clock on a fast CMOS part, both channels sampled every 20 ns.
  const circuit: Circuit = {
    topology: 'split-supply',
    supply: { positiveV: 2.5, negativeV: -2.5 },
    amplifier: resolveAmplifier({ base: 'cmos-rrio-fast', outputResistanceOhm: 0 }, (id) => findBuiltInAmplifier(id)),
    parts: { rTiming: 16000, cTiming: 4.7e-9, rFeedback: 22000, rGround: 10000 },
  };
  const sampleCount = 4_250_000; // about 60 MB of JSON at 4 decimals
  const cap = synthesizeCapture(circuit, { sampleIntervalS: 20e-9, sampleCount, phaseS: 37e-6 });
  const numbers = (xs: Float64Array) => Array.from(xs, (x) => x.toFixed(4)).join(',');
  const wireCircuit = { topology: 'split-supply', supply: { positiveV: 2.5, negativeV: -2.5 }, amplifier: { base: 'cmos-rrio-fast', outputResistanceOhm: 0 }, parts: circuit.parts };
  const body = `{"circuit":${JSON.stringify(wireCircuit)},"capture":{"sampleIntervalS":2e-8,"output":[${numbers(cap.output)}],"capacitor":[${numbers(cap.capacitor)}]}}`;
  const bodyBytes = Buffer.byteLength(body);
  // The baseline is a warm idle service: every worker thread has started and run a small fit (a thread's
  // start-up, tens of MB, is not the upload's cost). Two at once so that both threads are used.
  const smallBody = `{"circuit":${JSON.stringify(wireCircuit)},"capture":{"sampleIntervalS":2e-8,"output":[${numbers(cap.output.subarray(0, 20_000))}],"capacitor":[${numbers(cap.capacitor.subarray(0, 20_000))}]}}`;
  const warm = await Promise.all([0, 1].map(() => rawRequest(port, 'POST /v1/fit HTTP/1.1\r\nhost: 127.0.0.1\r\ncontent-type: application/json', smallBody, 120_000)));
  if (warm.some((w) => w.status !== 200)) console.log(`  warm-up fit answered ${warm.map((w) => w.status).join(', ')}`);
  await new Promise((r) => setTimeout(r, 2000));
  const baselineRss = rssBytes();
  let peakRss = baselineRss;
  const sampler = setInterval(() => {
    peakRss = Math.max(peakRss, rssBytes());
  }, 20);
  const started = performance.now();
  const fit = await rawRequest(port, 'POST /v1/fit HTTP/1.1\r\nhost: 127.0.0.1\r\ncontent-type: application/json', body, 300_000).catch((e: unknown) => ({ status: 0, body: String(e) }));
  const fitMs = performance.now() - started;
  clearInterval(sampler);
  peakRss = Math.max(peakRss, rssBytes());
  await new Promise((r) => setTimeout(r, 10_000));
  const laterRss = rssBytes();
  console.log(`capture upload: ${mb(bodyBytes)} body (${sampleCount.toLocaleString('en')} samples × 2 channels) -> ${fit.status} in ${(fitMs / 1000).toFixed(1)} s`);
  if (fit.status !== 200) console.log(`  answer: ${fit.body.slice(0, 300)}`);
  console.log(`  RSS idle ${mb(baselineRss)}, peak ${mb(peakRss)}: +${mb(peakRss - baselineRss)} = ${((peakRss - baselineRss) / bodyBytes).toFixed(2)}× the body (target ≤ 3×)`);
  console.log(`  RSS 10 s later ${mb(laterRss)}: ${laterRss - baselineRss >= 0 ? '+' : ''}${mb(laterRss - baselineRss)} from idle (target within 50 MB)`);
} finally {
  await killHard(server);
  rmSync(dir, { recursive: true, force: true });
}
