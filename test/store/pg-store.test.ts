/** PostgreSQL specifics: the SQL ETag twin, migrations under concurrent start-up, outages and readiness. */
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { buildApp } from '../../src/http/app.ts';
import { documentEtag } from '../../src/store/etag.ts';
import { openPgStore, type PgStore } from '../../src/store/pg-store.ts';
import { PG_MIGRATIONS } from '../../src/store/pg-migrations.ts';
import { StoreError } from '../../src/store/errors.ts';
import { createThrowawayDatabase, requirePostgres, urlForDatabase, type ThrowawayDatabase } from './pg-database.ts';
import { startTcpGate, type TcpGate } from './tcp-gate.ts';

const skip = await requirePostgres();
const cleanups: Array<() => Promise<void>> = [];
afterEach(async () => {
  while (cleanups.length > 0) await cleanups.pop()!();
});

describe.skipIf(skip !== undefined)(`PostgreSQL store${skip ? ` (skipped: ${skip})` : ''}`, () => {
  let db: ThrowawayDatabase;
  beforeAll(async () => {
    db = await createThrowawayDatabase();
  }, 60_000);
  afterAll(async () => db?.drop(), 60_000);

  async function open(url = db.url, options: Parameters<typeof openPgStore>[1] = {}): Promise<PgStore> {
    const store = await openPgStore(url, { poolSize: 4, ...options });
    cleanups.push(() => store.close());
    return store;
  }

  it('computes in SQL exactly the ETag node:crypto computes (the compare-and-set relies on it)', async () => {
    await open(); // migrates
    const cases: Array<[string, string, string, number]> = [
      ['catalogues', 'a', '00112233aabbccdd', 1],
      ['amplifiers', 'lab-bench_2.v1', 'ffeeddccbbaa9988', 7],
      ['catalogues', 'z'.repeat(64), '0123456789abcdef', 2_000_000_000],
    ];
    for (const [collection, id, incarnation, version] of cases) {
      const rows = await db.sql<{ etag: string }>('SELECT tickwright_document_etag($1, $2, $3, $4) AS etag', [collection, id, incarnation, version]);
      expect(rows[0].etag).toBe(documentEtag(collection, id, incarnation, version));
    }
  });

  it('applies each migration once when several replicas start together, and none on reopen', async () => {
    const fresh = await createThrowawayDatabase();
    cleanups.push(() => fresh.drop());
    const stores = await Promise.all(Array.from({ length: 4 }, () => open(fresh.url)));
    const appliedBy = stores.map((s) => s.migrationsAppliedAtOpen);
    expect(appliedBy.filter((ids) => ids.length > 0)).toEqual([PG_MIGRATIONS.map((m) => m.id)]);
    const ledger = await fresh.sql<{ id: number }>('SELECT id FROM schema_migrations ORDER BY id');
    expect(ledger.map((r) => r.id)).toEqual(PG_MIGRATIONS.map((m) => m.id));
    expect((await open(fresh.url)).migrationsAppliedAtOpen).toEqual([]);
  });

  it('refuses a database migrated by a newer build', async () => {
    const fresh = await createThrowawayDatabase();
    cleanups.push(() => fresh.drop());
    await open(fresh.url);
    await fresh.sql("INSERT INTO schema_migrations (id, name) VALUES (999, 'from-the-future')");
    const error = await openPgStore(fresh.url).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(StoreError);
    expect((error as StoreError).code).toBe('conflict');
  });

  it('keeps a JSON body byte for byte (text, not jsonb: key order and spacing of what was stored)', async () => {
    const store = await open();
    const body = { zeta: 1, alpha: { b: 2, a: 1 }, unicode: 'µF ±5 %' };
    await store.catalogues.put('ordered', body, undefined);
    const raw = await db.sql<{ body: string }>("SELECT body FROM documents WHERE collection = 'catalogues' AND id = 'ordered'");
    expect(raw[0].body).toBe(JSON.stringify(body));
    expect(Object.keys((await store.catalogues.get('ordered'))!.body)).toEqual(['zeta', 'alpha', 'unicode']);
  });

  describe('an outage of the database', () => {
    let gate: TcpGate;
    beforeAll(async () => {
      const admin = new URL(db.url);
      gate = await startTcpGate(admin.hostname, Number(admin.port || 5432));
    });
    afterAll(async () => gate?.close());

    function gatedUrl(): string {
      const url = new URL(db.url);
      url.hostname = '127.0.0.1';
      url.port = String(gate.port);
      return url.toString();
    }

    it('turns calls into unavailable and ping false, then recovers by itself', async () => {
      gate.open();
      const store = await open(gatedUrl(), { connectTimeoutMs: 1000, pingTimeoutMs: 500, pingCacheMs: 0 });
      await store.catalogues.put('outage', { v: 1 }, undefined);
      expect(await store.ping()).toBe(true);

      gate.shut();
      expect(await store.ping()).toBe(false);
      const error = await store.catalogues.get('outage').catch((e: unknown) => e);
      expect(error).toBeInstanceOf(StoreError);
      expect((error as StoreError).code).toBe('unavailable');

      gate.open();
      // No restart and no new store: the pool reconnects on the next call.
      expect(await store.ping()).toBe(true);
      expect((await store.catalogues.get('outage'))?.body).toEqual({ v: 1 });
    });

    it('/readyz answers 503 during the outage and 200 after it, with no restart', async () => {
      gate.open();
      const store = await open(gatedUrl(), { connectTimeoutMs: 1000, pingTimeoutMs: 500, pingCacheMs: 0 });
      const app = await buildApp({ store, config: { maxEventLoopDelayMs: 0, apiKeys: undefined } });
      cleanups.push(() => app.close());
      const ready = async () => (await app.inject({ method: 'GET', url: '/readyz' })).statusCode;
      expect(await ready()).toBe(200);
      gate.shut();
      expect(await ready()).toBe(503);
      const write = await app.inject({ method: 'PUT', url: '/v1/amplifiers/during-outage', payload: { name: 'x' } });
      expect(write.statusCode).toBe(503);
      expect(write.headers['retry-after']).toBe('5');
      gate.open();
      expect(await ready()).toBe(200);
    });

    it('caches the readiness answer briefly so probes cost at most one query per interval', async () => {
      gate.open();
      const store = await open(gatedUrl(), { pingTimeoutMs: 500, pingCacheMs: 60_000 });
      expect(await store.ping()).toBe(true);
      gate.shut();
      // Within the cache interval the last answer stands (documented trade-off: readiness lags by ≤ pingCacheMs).
      expect(await store.ping()).toBe(true);
      gate.open();
    });
  });

  it('names the database in the URL it is given (TICKWRIGHT_TEST_DATABASE_URL keeps user, host and port)', () => {
    expect(urlForDatabase('tw_x', 'postgres://u:p@db.example:6543/test?sslmode=disable')).toBe('postgres://u:p@db.example:6543/tw_x?sslmode=disable');
  });
});
