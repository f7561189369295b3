import pg from 'pg';
import { PgDocumentCollection } from './pg-collection.ts';
import { withPgErrors } from './pg-errors.ts';
import { applyPgMigrations, PG_MIGRATIONS } from './pg-migrations.ts';
import type { Migration } from './migrations.ts';
import type { AmplifierBody, CatalogueBody, Store } from './types.ts';

export interface PgStoreOptions {
  /** Connections this process keeps at most (TICKWRIGHT_DATABASE_POOL_SIZE). Default 10. */
  poolSize?: number;
  /** How long a query waits for a free or new connection before 'unavailable'. Default 5000 ms. */
  connectTimeoutMs?: number;
  /** Server-side limit for one statement. Default 15000 ms. */
  statementTimeoutMs?: number;
  /** /readyz probe: how long `SELECT 1` may take, and how long its answer is reused. Defaults 1000 ms, 1000 ms. */
  pingTimeoutMs?: number;
  pingCacheMs?: number;
  /** Schema steps to apply at open; default PG_MIGRATIONS (tests pass their own). */
  migrations?: readonly Migration[];
  /** Told about errors of idle pooled connections (a restarted server); they are otherwise harmless. */
  onIdleError?: (error: Error) => void;
}

export interface PgStore extends Store {
  /** Migration ids applied by THIS open (empty when the database was already current). */
  readonly migrationsAppliedAtOpen: readonly number[];
  readonly poolSize: number;
}

export function isPostgresUrl(url: string | undefined): boolean {
  return typeof url === 'string' && /^postgres(ql)?:\/\//i.test(url.trim());
}

/**
 * Connect a pool to `connectionString` (postgres://...), migrate, and return
 * the store. Several processes may open the same database at once: migrations
 * run under an advisory lock. Fails (rejects) if the server cannot be reached
 * now; once open, an outage turns calls into 'unavailable' and /readyz false
 * until the server is back, with no restart needed.
 */
export async function openPgStore(connectionString: string, options: PgStoreOptions = {}): Promise<PgStore> {
  const poolSize = options.poolSize ?? 10;
  const pool = new pg.Pool({
    connectionString,
    max: poolSize,
    connectionTimeoutMillis: options.connectTimeoutMs ?? 5000,
    idleTimeoutMillis: 30_000,
    statement_timeout: options.statementTimeoutMs ?? 15_000,
    keepAlive: true,
    application_name: 'tickwright',
  });
  // Without a listener, an idle connection dropped by the server (restart,
  // failover) would be an unhandled 'error' event and end the process.
  pool.on('error', (error) => options.onIdleError?.(error));
  try {
    const applied = await withPgErrors(async () => {
      const client = await pool.connect();
      try {
        return await applyPgMigrations(client, options.migrations ?? PG_MIGRATIONS);
      } finally {
        client.release();
      }
    });
    return new PgStoreImpl(pool, poolSize, applied, options.pingTimeoutMs ?? 1000, options.pingCacheMs ?? 1000);
  } catch (error) {
    await pool.end().catch(() => undefined);
    throw error;
  }
}

class PgStoreImpl implements PgStore {
  readonly backend = 'postgres' as const;
  readonly catalogues: PgDocumentCollection<CatalogueBody>;
  readonly amplifiers: PgDocumentCollection<AmplifierBody>;
  readonly migrationsAppliedAtOpen: readonly number[];
  private closed = false;
  private lastPing: { atMs: number; ok: boolean } | undefined;
  private pingInFlight: Promise<boolean> | undefined;

  constructor(
    private readonly pool: pg.Pool,
    readonly poolSize: number,
    applied: readonly number[],
    private readonly pingTimeoutMs: number,
    private readonly pingCacheMs: number,
  ) {
    this.migrationsAppliedAtOpen = Object.freeze([...applied]);
    this.catalogues = new PgDocumentCollection(pool, 'catalogues');
    this.amplifiers = new PgDocumentCollection(pool, 'amplifiers');
  }

  /**
   * `SELECT 1` within pingTimeoutMs, its answer reused for pingCacheMs: probes
   * from several kubelets and load balancers cost one query a second at most,
   * and concurrent probes share one query. Never rejects.
   */
  ping(): Promise<boolean> {
    if (this.closed) return Promise.resolve(false);
    const now = performance.now();
    if (this.lastPing && now - this.lastPing.atMs < this.pingCacheMs) return Promise.resolve(this.lastPing.ok);
    this.pingInFlight ??= this.probe().then((ok) => {
      this.lastPing = { atMs: performance.now(), ok };
      this.pingInFlight = undefined;
      return ok;
    });
    return this.pingInFlight;
  }

  private async probe(): Promise<boolean> {
    let timer: NodeJS.Timeout | undefined;
    const query = this.pool.query<{ one: number }>('SELECT 1 AS one').then(
      (result) => result.rows[0]?.one === 1,
      () => false,
    );
    const timeout = new Promise<boolean>((resolve) => {
      timer = setTimeout(() => resolve(false), this.pingTimeoutMs);
    });
    try {
      return await Promise.race([query, timeout]);
    } finally {
      clearTimeout(timer);
    }
  }

  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    await this.pool.end();
  }
}
