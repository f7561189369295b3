/**
 * Command-line wall times, each a spawned `tickwright analyze` on the README's
 * probe clock, median of a few runs:
 *  - baseline: a bare `node -e 0` process start, measured in the same run;
 *  - --server: the command calling a server on 127.0.0.1 (started here);
 *  - in-process: the command building the app itself (source through tsx, or
 *    dist/ when `npm run build` made it).
 * Prints each median and its ratio to the baseline. Loopback only; bounded.
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { buildApp } from '../src/http/app.ts';
import { openSqliteStore } from '../src/store/index.ts';

const RUNS = Number(process.env.CLI_BENCH_RUNS ?? 5);
const BIN = path.resolve('bin/tickwright.mjs');
const PROBE_CLOCK = {
  topology: 'three-resistor-divider',
  supply: { positiveV: 5 },
  amplifier: 'cmos-rrio-fast',
  parts: { rTiming: '15k', cTiming: '10n', rTop: '100k', rBottom: '100k', rFeedback: '100k' },
};

function timed(args: string[], env: NodeJS.ProcessEnv): Promise<number> {
  const started = performance.now();
  const child = spawn(process.execPath, args, { env, stdio: ['ignore', 'ignore', 'inherit'] });
  return new Promise((resolve, reject) => {
    child.once('error', reject);
    child.once('close', (code) => (code === 0 ? resolve(performance.now() - started) : reject(new Error(`${args.join(' ')} exited ${code}`))));
  });
}

async function median(args: string[], env: NodeJS.ProcessEnv): Promise<number> {
  const times: number[] = [];
  for (let i = 0; i < RUNS; i++) times.push(await timed(args, env));
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)];
}

const dir = mkdtempSync(path.join(tmpdir(), 'tickwright-cli-bench-'));
const input = path.join(dir, 'probe.json');
writeFileSync(input, JSON.stringify(PROBE_CLOCK));
const env: NodeJS.ProcessEnv = { ...process.env, TICKWRIGHT_DB_PATH: path.join(dir, 'tw.db') };
delete env.TICKWRIGHT_SERVER;

const app = await buildApp({ store: openSqliteStore(':memory:'), config: { maxEventLoopDelayMs: 0 } });
await app.listen({ port: 0, host: '127.0.0.1' });
const url = `http://127.0.0.1:${(app.server.address() as AddressInfo).port}`;
try {
  await timed([BIN, 'analyze', input], env); // warm the transform cache once
  const baseline = await median(['-e', '0'], env);
  const remote = await median([BIN, '--server', url, 'analyze', input], env);
  const local = await median([BIN, 'analyze', input], env);
  const row = (name: string, ms: number) => console.log(`${name.padEnd(40)} ${ms.toFixed(0).padStart(6)} ms   ${(ms / baseline).toFixed(1).padStart(5)}× node start`);
  console.log(`median of ${RUNS} runs each; command loaded from ${existsSync('dist/cli/main.js') ? 'dist/ if current, else ' : ''}source through tsx`);
  row('baseline: node -e 0', baseline);
  row('tickwright --server URL analyze', remote);
  row('tickwright analyze (in-process)', local);
  console.log(`in-process / --server: ${(local / remote).toFixed(2)}`);
} finally {
  await app.close();
  rmSync(dir, { recursive: true, force: true });
}
