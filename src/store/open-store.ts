import { resolveDatabasePath } from './db-path.ts';
import { isPostgresUrl, openPgStore } from './pg-store.ts';
import { openSqliteStore } from './sqlite-store.ts';
import type { Store } from './types.ts';

export interface StoreSettings {
  /** TICKWRIGHT_DATABASE_URL: postgres://... selects PostgreSQL; absent keeps the embedded SQLite file. */
  databaseUrl?: string | undefined;
  /** TICKWRIGHT_DB_PATH: the SQLite file when no URL is set. */
  databasePath: string;
  /** TICKWRIGHT_DATABASE_POOL_SIZE: PostgreSQL connections per process. */
  databasePoolSize?: number;
  onIdleError?: (error: Error) => void;
}

/** The store the settings name: PostgreSQL for a postgres:// URL, otherwise SQLite (the embedded default). */
export async function openStore(settings: StoreSettings): Promise<Store> {
  const url = settings.databaseUrl?.trim();
  if (url !== undefined && url !== '') {
    if (!isPostgresUrl(url)) throw new Error(`TICKWRIGHT_DATABASE_URL must start with postgres:// or postgresql:// (got '${url.split(':')[0]}:...')`);
    return openPgStore(url, { poolSize: settings.databasePoolSize, onIdleError: settings.onIdleError });
  }
  return openSqliteStore(resolveDatabasePath({ TICKWRIGHT_DB_PATH: settings.databasePath }));
}
