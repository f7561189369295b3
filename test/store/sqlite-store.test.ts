/** SQLite specifics; the Store contract itself runs on both backends in store-contract.test.ts. */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterEach, describe, expect, it } from 'vitest';
import { DOCUMENT_ID_PATTERN, isValidDocumentId } from '../../src/store/ids.ts';
import { resolveDatabasePath } from '../../src/store/db-path.ts';
import { openSqliteStore, type SqliteStore } from '../../src/store/sqlite-store.ts';

const cleanups: Array<() => void> = [];
// LIFO: resources registered later (stores, children) close before the temp dir is removed.
afterEach(() => {
  while (cleanups.length > 0) cleanups.pop()!();
});

function tempDir(): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'tickwright-store-'));
  cleanups.push(() => rmSync(dir, { recursive: true, force: true }));
  return dir;
}

function open(file: string): SqliteStore {
  const store = openSqliteStore(file);
  cleanups.push(() => void store.close());
  return store;
}

describe('ids', () => {
  it('accepts and rejects ids per the documented pattern', () => {
    for (const id of ['a', '0', 'lab-bench_2.v1', 'a'.repeat(64)]) expect(isValidDocumentId(id)).toBe(true);
    for (const id of ['', 'A', '-a', '.a', '_a', 'a b', 'a/b', 'é', 'a'.repeat(65), 'a\n']) {
      expect(isValidDocumentId(id)).toBe(false);
      expect(DOCUMENT_ID_PATTERN.test(id)).toBe(false);
    }
  });
});

describe('SQLite file settings', () => {
  it('opens a file database with WAL, synchronous FULL, foreign keys and a busy timeout', async () => {
    const file = path.join(tempDir(), 'pragmas.db');
    const store = open(file);
    expect(await store.ping()).toBe(true);
    const probe = new Database(file);
    cleanups.push(() => probe.close());
    // journal_mode is persistent in the file for WAL (SQLite docs, "Persistence of WAL mode").
    expect(probe.pragma('journal_mode', { simple: true })).toBe('wal');
    // The other pragmas are per connection, so read them through the store's own connection.
    const internal = (store as unknown as { db: Database.Database }).db;
    expect(internal.pragma('synchronous', { simple: true })).toBe(2); // 2 = FULL (SQLite pragma docs)
    expect(internal.pragma('foreign_keys', { simple: true })).toBe(1);
    expect(internal.pragma('busy_timeout', { simple: true })).toBe(5000);
  });

  it('resolves the database path from TICKWRIGHT_DB_PATH or the default under the working directory', () => {
    const cwd = path.resolve('/srv/tickwright');
    expect(resolveDatabasePath({}, cwd)).toBe(path.join(cwd, 'data', 'tickwright.db'));
    expect(resolveDatabasePath({ TICKWRIGHT_DB_PATH: '' }, cwd)).toBe(path.join(cwd, 'data', 'tickwright.db'));
    expect(resolveDatabasePath({ TICKWRIGHT_DB_PATH: 'state/x.db' }, cwd)).toBe(path.join(cwd, 'state', 'x.db'));
    expect(resolveDatabasePath({ TICKWRIGHT_DB_PATH: '/var/lib/t.db' }, cwd)).toBe(path.resolve('/var/lib/t.db'));
    expect(resolveDatabasePath({ TICKWRIGHT_DB_PATH: ':memory:' }, cwd)).toBe(':memory:');
  });
});
