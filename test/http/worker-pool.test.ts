/**
 * The generic worker pool: named tasks run in threads, core errors come back
 * as CoreError, the queue bound gives 503, and the same pool works from the
 * TypeScript source (tsx hooks in the thread) and from compiled JavaScript
 * (what `npm run build` emits into dist/).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { CoreError } from '../../src/core/errors.ts';
import { HttpProblem } from '../../src/http/problem.ts';
import { WorkerPool, workerEntry } from '../../src/http/workers/pool.ts';

const circuit = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 5, negativeV: -5 },
  amplifier: {
    id: 'ideal-copy', name: 'ideal', technologyClass: 'ideal', description: 'ideal', figuresBasis: 'ideal' as const, outputStage: 'push-pull' as const,
    supplyMinV: 0, supplyMaxV: Infinity, outputHeadroomHighV: 0, outputHeadroomLowV: 0, outputResistanceOhm: 0, outputCurrentLimitA: Infinity,
    slewRateVPerS: Infinity, recoveryDelayS: 0, inputCommonModeLowMarginV: -Infinity, inputCommonModeHighMarginV: -Infinity,
    inputBiasCurrentA: 0, inputOffsetV: 0, differentialClampV: Infinity, quiescentCurrentA: 0,
    overdriveDelayChargeVS: 0, internalHysteresisV: 0, inputOffsetDriftVPerK: 0, inputBiasDoublingK: Infinity, outputHeadroomDriftVPerK: 0, recoveryDelayDriftPerK: 0, inputCapacitanceF: 0,
  },
  parts: { rTiming: 10e3, cTiming: 10e-9, rFeedback: 20e3, rGround: 10e3 },
};

describe('WorkerPool from the TypeScript source', () => {
  const pool = new WorkerPool({ threads: 1, maxQueue: 1 });
  afterAll(() => pool.close());

  it('loads worker.ts through a plain-JS entry that registers tsx first', () => {
    expect(workerEntry().filename.endsWith('/source-entry.mjs')).toBe(true);
    expect(workerEntry().execArgv).toEqual([]);
  });

  it('starts reliably: several fresh pools in a row each run a task in a thread', async () => {
    for (let i = 0; i < 4; i++) {
      const fresh = new WorkerPool({ threads: 1 });
      try {
        expect(await fresh.run('echo', { round: i })).toEqual({ round: i });
      } finally {
        await fresh.close();
      }
    }
  });

  it('runs a named task in a thread and returns its value', async () => {
    expect(await pool.run('echo', { a: 1, limit: Infinity })).toEqual({ a: 1, limit: Infinity });
    const r = await pool.run('tolerance', { request: { circuit, tolerances: { rTiming: 0.01 }, monteCarlo: { samples: 1000, seed: 1 } } });
    // Sedra & Smith astable: f = 1/(2RC·ln((1+β)/(1−β))), β = 1/3 -> ln 2.
    expect(r.nominal.frequencyHz * 2 * 10e3 * 10e-9 * Math.log(2)).toBeCloseTo(1, 12);
    expect(pool.stats.completed).toBeGreaterThanOrEqual(2);
  });

  it('rethrows a core error as CoreError with its code and pointer', async () => {
    const err = await pool.run('tolerance', { request: { circuit, tolerances: { rTop: 0.01 } } }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(CoreError);
    expect(err).toMatchObject({ code: 'invalid-value', pointer: '/tolerances/rTop' });
  });

  it('rejects with 503 when the queue is full', async () => {
    const running = pool.run('spin', { ms: 300 });
    const queued = pool.run('spin', { ms: 1 });
    const refused = await pool.run('spin', { ms: 1 }).catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(HttpProblem);
    expect((refused as HttpProblem).status).toBe(503);
    await Promise.all([running, queued]);
  });

  it('runs inline with zero threads', async () => {
    const inline = new WorkerPool({ threads: 0 });
    expect(await inline.run('echo', 'x')).toBe('x');
    await inline.close();
  });
});

describe('WorkerPool from compiled JavaScript', () => {
  const outDir = join(process.cwd(), 'node_modules', '.cache', 'tickwright-worker-build');
  afterAll(() => rmSync(outDir, { recursive: true, force: true }));

  it('works with worker.js after a tsc build, without tsx', () => {
    rmSync(outDir, { recursive: true, force: true });
    mkdirSync(outDir, { recursive: true });
    // The same compiler settings as tsconfig.build.json (rootDir src, .ts imports rewritten to .js), limited to the
    // pool's import graph to keep the test quick. Type errors elsewhere in the tree must not stop the emit.
    spawnSync(
      process.execPath,
      [
        'node_modules/typescript/bin/tsc',
        'src/http/workers/pool.ts',
        'src/http/workers/worker.ts',
        '--outDir', outDir,
        '--rootDir', 'src',
        '--module', 'NodeNext',
        '--moduleResolution', 'NodeNext',
        '--target', 'ES2023',
        '--rewriteRelativeImportExtensions',
        '--verbatimModuleSyntax',
        '--skipLibCheck',
        '--types', 'node',
      ],
      { stdio: 'pipe', encoding: 'utf8' },
    );
    const poolJs = join(outDir, 'http', 'workers', 'pool.js');
    expect(existsSync(poolJs)).toBe(true);
    expect(existsSync(join(outDir, 'http', 'workers', 'worker.js'))).toBe(true);
    const script = `
      import { WorkerPool, workerEntry } from ${JSON.stringify(pathToFileURL(poolJs).href)};
      const pool = new WorkerPool({ threads: 1 });
      const circuit = ${JSON.stringify(circuit).replace(/null/g, 'Infinity')};
      circuit.amplifier.inputCommonModeLowMarginV = -Infinity;
      circuit.amplifier.inputCommonModeHighMarginV = -Infinity;
      const r = await pool.run('tolerance', { request: { circuit, tolerances: { rTiming: 0.01 }, monteCarlo: { samples: 1000, seed: 1 } } });
      const err = await pool.run('tolerance', { request: { circuit, tolerances: { rTop: 0.01 } } }).catch((e) => e);
      console.log(JSON.stringify({ entry: workerEntry(), f: r.nominal.frequencyHz, errName: err.name, code: err.code }));
      await pool.close();
    `;
    // Plain node: no tsx loader anywhere in this process or its threads.
    const child = spawnSync(process.execPath, ['--input-type=module', '-e', script], { encoding: 'utf8', env: { ...process.env, NODE_OPTIONS: '' }, timeout: 60_000 });
    expect(child.stderr).toBe('');
    const out = JSON.parse(child.stdout.trim().split('\n').pop()!);
    expect(out.entry.filename.endsWith('/worker.js')).toBe(true);
    expect(out.entry.execArgv).toEqual([]);
    expect(out.f * 2 * 10e3 * 10e-9 * Math.log(2)).toBeCloseTo(1, 12);
    expect(out).toMatchObject({ errName: 'CoreError', code: 'invalid-value' });
  }, 120_000);
});
