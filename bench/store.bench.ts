/**
 * Store call latency, both backends, measured in the same run: get, If-Match put
 * and list on the embedded SQLite file (synchronous=FULL: one fsync per write)
 * and on PostgreSQL over loopback (a throwaway database, dropped after), plus
 * the replica race figure (concurrent If-Match writers on one document, through
 * two pools: exactly one winner per round). Baseline: a trivial `SELECT 1`
 * round trip on the same pool, so the PostgreSQL figures read as "round trips".
 *
 * Needs PostgreSQL at TICKWRIGHT_TEST_DATABASE_URL or 127.0.0.1:5432; without
 * it only the SQLite figures are printed.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { StoreError } from '../src/store/errors.ts';
import { openPgStore } from '../src/store/pg-store.ts';
import { openSqliteStore } from '../src/store/sqlite-store.ts';
import type { Store } from '../src/store/types.ts';
import { createThrowawayDatabase, postgresUnreachable } from '../test/store/pg-database.ts';

const ROUNDS = 400;
const body = { name: 'bench catalogue', parts: Array.from({ length: 20 }, (_, i) => ({ kind: 'resistor', value: `${i + 1}k`, tolerance: 0.01, partNumber: `B-${i}` })) };

function percentile(sortedMs: number[], p: number): number {
  return sortedMs[Math.min(sortedMs.length - 1, Math.floor(p * sortedMs.length))];
}

async function timeEach(n: number, work: (i: number) => Promise<unknown>): Promise<{ p50Ms: number; p99Ms: number }> {
  const samples: number[] = [];
  for (let i = 0; i < n; i += 1) {
    const t0 = performance.now();
    await work(i);
    samples.push(performance.now() - t0);
  }
  samples.sort((a, b) => a - b);
  return { p50Ms: percentile(samples, 0.5), p99Ms: percentile(samples, 0.99) };
}

async function measure(label: string, store: Store, baselineMs?: number): Promise<void> {
  let etag = (await store.catalogues.put('bench', body, undefined)).doc.etag;
  for (let i = 0; i < 20; i += 1) await store.catalogues.put(`other-${i}`, body, undefined);
  const get = await timeEach(ROUNDS, () => store.catalogues.get('bench'));
  const put = await timeEach(ROUNDS / 4, async () => {
    etag = (await store.catalogues.put('bench', body, etag)).doc.etag;
  });
  const list = await timeEach(ROUNDS / 4, () => store.catalogues.list());
  const ratio = (ms: number) => (baselineMs ? `  (${(ms / baselineMs).toFixed(1)}x SELECT 1)` : '');
  console.log(`${label.padEnd(10)} get p50 ${get.p50Ms.toFixed(3)} ms p99 ${get.p99Ms.toFixed(3)} ms${ratio(get.p50Ms)}`);
  console.log(`${''.padEnd(10)} put p50 ${put.p50Ms.toFixed(3)} ms p99 ${put.p99Ms.toFixed(3)} ms${ratio(put.p50Ms)}`);
  console.log(`${''.padEnd(10)} list(21) p50 ${list.p50Ms.toFixed(3)} ms p99 ${list.p99Ms.toFixed(3)} ms${ratio(list.p50Ms)}`);
}

const dir = mkdtempSync(path.join(tmpdir(), 'tickwright-bench-'));
try {
  const sqlite = openSqliteStore(path.join(dir, 'bench.db'));
  await measure('sqlite', sqlite);
  await sqlite.close();

  const unreachable = await postgresUnreachable();
  if (unreachable) {
    console.log(`postgres: skipped (${unreachable})`);
  } else {
    const db = await createThrowawayDatabase();
    try {
      const raw = new pg.Pool({ connectionString: db.url, max: 1 });
      const baseline = await timeEach(ROUNDS, () => raw.query('SELECT 1'));
      await raw.end();
      console.log(`baseline   SELECT 1 round trip p50 ${baseline.p50Ms.toFixed(3)} ms`);
      const a = await openPgStore(db.url, { poolSize: 4 });
      const b = await openPgStore(db.url, { poolSize: 4 });
      await measure('postgres', a, baseline.p50Ms);

      // Racing If-Match writers through two pools (two replicas' worth of connections).
      let wins = 0;
      let refusals = 0;
      const RACE_ROUNDS = 30;
      const t0 = performance.now();
      for (let round = 0; round < RACE_ROUNDS; round += 1) {
        const current = (await a.catalogues.get('bench'))!.etag;
        const outcomes = await Promise.all(
          Array.from({ length: 30 }, (_, i) =>
            (i % 2 === 0 ? a : b).catalogues.put('bench', { ...body, name: `racer ${i}` }, current).then(
              () => 'won',
              (e: unknown) => (e instanceof StoreError && e.code === 'precondition-failed' ? 'refused' : `error ${String(e)}`),
            ),
          ),
        );
        wins += outcomes.filter((o) => o === 'won').length;
        refusals += outcomes.filter((o) => o === 'refused').length;
      }
      const raceMs = performance.now() - t0;
      console.log(`race       ${RACE_ROUNDS} rounds x 30 If-Match writers on 2 pools: ${wins} wins (expect ${RACE_ROUNDS}), ${refusals} x 412, ${(raceMs / RACE_ROUNDS).toFixed(1)} ms per round`);
      await a.close();
      await b.close();
    } finally {
      await db.drop();
    }
  }
} finally {
  rmSync(dir, { recursive: true, force: true });
}
