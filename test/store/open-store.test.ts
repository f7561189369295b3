/** Which store the settings select: PostgreSQL for a postgres:// URL, else the embedded SQLite file. */
import { describe, expect, it } from 'vitest';
import { configFromEnv } from '../../src/config.ts';
import { openStore } from '../../src/store/open-store.ts';
import { isPostgresUrl } from '../../src/store/pg-store.ts';
import { createThrowawayDatabase, requirePostgres } from './pg-database.ts';

const skip = await requirePostgres();

describe('store selection', () => {
  it('reads the database settings from the environment with embedded defaults', () => {
    const defaults = configFromEnv({});
    expect(defaults.databaseUrl).toBeUndefined();
    expect(defaults.databasePoolSize).toBe(10);
    expect(defaults.tracing).toBe('off');
    const set = configFromEnv({ TICKWRIGHT_DATABASE_URL: ' postgres://u@db:5432/tw ', TICKWRIGHT_DATABASE_POOL_SIZE: '25', TICKWRIGHT_TRACING: 'OTLP' });
    expect(set).toMatchObject({ databaseUrl: 'postgres://u@db:5432/tw', databasePoolSize: 25, tracing: 'otlp' });
    expect(() => configFromEnv({ TICKWRIGHT_DATABASE_POOL_SIZE: '0' })).toThrow(/TICKWRIGHT_DATABASE_POOL_SIZE/);
    expect(() => configFromEnv({ TICKWRIGHT_TRACING: 'jaeger' })).toThrow(/TICKWRIGHT_TRACING/);
  });

  it('recognises postgres:// and postgresql:// URLs only', () => {
    expect(isPostgresUrl('postgres://h/db')).toBe(true);
    expect(isPostgresUrl('postgresql://h/db')).toBe(true);
    expect(isPostgresUrl('mysql://h/db')).toBe(false);
    expect(isPostgresUrl('./data/x.db')).toBe(false);
  });

  it('opens SQLite without a URL and refuses a URL of another scheme', async () => {
    const sqlite = await openStore({ databasePath: ':memory:' });
    expect(sqlite.backend).toBe('sqlite');
    await sqlite.close();
    await expect(openStore({ databaseUrl: 'mysql://h/db', databasePath: ':memory:' })).rejects.toThrow(/postgres:\/\//);
  });

  it.skipIf(skip !== undefined)('opens PostgreSQL for a postgres:// URL', async () => {
    const db = await createThrowawayDatabase();
    try {
      const store = await openStore({ databaseUrl: db.url, databasePath: ':memory:', databasePoolSize: 2 });
      expect(store.backend).toBe('postgres');
      expect(await store.ping()).toBe(true);
      await store.close();
    } finally {
      await db.drop();
    }
  });
});
