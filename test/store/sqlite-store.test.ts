import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterEach, describe, expect, it } from 'vitest';
import { StoreError, type StoreErrorCode } from '../../src/store/errors.ts';
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

async function storeErrorCode(work: () => Promise<unknown>): Promise<StoreErrorCode | 'no error' | 'other error'> {
  try {
    await work();
    return 'no error';
  } catch (error) {
    return error instanceof StoreError ? error.code : 'other error';
  }
}

// RFC 9110 §8.8.3: entity-tag = [ weak ] opaque-tag; opaque-tag = DQUOTE *etagc DQUOTE,
// etagc = %x21 / %x23-7E / obs-text. A strong tag has no W/ prefix.
const STRONG_ETAG = /^"[\x21\x23-\x7e]*"$/;

describe('document CRUD', () => {
  it('creates, reads, updates and deletes with increasing versions and changing ETags', async () => {
    const store = open(':memory:');
    const created = (await store.catalogues.put('bench-a', { parts: ['4k7'] }, undefined));
    expect(created.outcome).toBe('created');
    expect(created.doc.version).toBe(1);
    expect(created.doc.etag).toMatch(STRONG_ETAG);
    expect(created.doc.body).toEqual({ parts: ['4k7'] });
    expect((await store.catalogues.get('bench-a'))).toEqual(created.doc);

    const updated = (await store.catalogues.put('bench-a', { parts: ['4k7', '10n'] }, created.doc.etag));
    expect(updated.outcome).toBe('updated');
    expect(updated.doc.version).toBe(2);
    expect(updated.doc.etag).toMatch(STRONG_ETAG);
    expect(updated.doc.etag).not.toBe(created.doc.etag);
    expect(updated.doc.createdAt).toBe(created.doc.createdAt);
    expect(Date.parse(updated.doc.updatedAt)).toBeGreaterThanOrEqual(Date.parse(created.doc.updatedAt));
    expect((await store.catalogues.get('bench-a'))?.body).toEqual({ parts: ['4k7', '10n'] });

    const third = (await store.catalogues.put('bench-a', { parts: [] }, updated.doc.etag));
    expect(third.doc.version).toBe(3);
    expect(new Set([created.doc.etag, updated.doc.etag, third.doc.etag]).size).toBe(3);

    await store.catalogues.delete('bench-a', third.doc.etag);
    expect((await store.catalogues.get('bench-a'))).toBeUndefined();
    expect((await store.catalogues.list())).toEqual([]);
  });

  it('keeps collections apart', async () => {
    const store = open(':memory:');
    await store.catalogues.put('same-id', { kind: 'catalogue' }, undefined);
    await store.amplifiers.put('same-id', { kind: 'amplifier' }, undefined);
    expect((await store.catalogues.get('same-id'))?.body).toEqual({ kind: 'catalogue' });
    expect((await store.amplifiers.get('same-id'))?.body).toEqual({ kind: 'amplifier' });
    expect((await store.catalogues.get('same-id'))?.etag).not.toBe((await store.amplifiers.get('same-id'))?.etag);
  });

  it('lists summaries and full documents ordered by id', async () => {
    const store = open(':memory:');
    const ids = ['zeta', 'alpha.2', 'alpha-1', '9lives', 'alpha_3', 'm'];
    for (const id of ids) await store.amplifiers.put(id, { name: id, note: 'é' }, undefined);
    // Expected order from JavaScript's code-unit sort, independent of SQLite (ids are ASCII).
    const expectedOrder = [...ids].sort();
    const summaries = (await store.amplifiers.list());
    expect(summaries.map((s) => s.id)).toEqual(expectedOrder);
    for (const summary of summaries) {
      expect(summary).not.toHaveProperty('body');
      expect(summary.version).toBe(1);
      expect(summary.etag).toBe((await store.amplifiers.get(summary.id))?.etag);
      // Byte length per the UTF-8 encoding of the stored JSON (Node's Buffer as the reference).
      expect(summary.bodyBytes).toBe(Buffer.byteLength(JSON.stringify({ name: summary.id, note: 'é' }), 'utf8'));
    }
    expect((await store.amplifiers.listWithBodies()).map((d) => [d.id, d.body.name])).toEqual(expectedOrder.map((id) => [id, id]));
  });

  it('does not reuse an ETag when an id is deleted and created again', async () => {
    const store = open(':memory:');
    const first = (await store.catalogues.put('reborn', { n: 1 }, undefined));
    await store.catalogues.delete('reborn', first.doc.etag);
    const second = (await store.catalogues.put('reborn', { n: 2 }, undefined));
    expect(second.doc.version).toBe(1);
    expect(second.doc.etag).not.toBe(first.doc.etag);
    expect(await storeErrorCode(async () => (await store.catalogues.put('reborn', { n: 3 }, first.doc.etag)))).toBe('precondition-failed');
  });
});

describe('preconditions (RFC 9110 §13.1.1 If-Match, RFC 6585 §3 428)', () => {
  it('requires an ETag to change or delete an existing document', async () => {
    const store = open(':memory:');
    await store.catalogues.put('guarded', { v: 1 }, undefined);
    expect(await storeErrorCode(async () => (await store.catalogues.put('guarded', { v: 2 }, undefined)))).toBe('precondition-required');
    expect(await storeErrorCode(async () => (await store.catalogues.put('guarded', { v: 2 }, '  ')))).toBe('precondition-required');
    expect(await storeErrorCode(async () => (await store.catalogues.delete('guarded', undefined)))).toBe('precondition-required');
    expect((await store.catalogues.get('guarded'))?.version).toBe(1);
  });

  it('rejects a stale or weak ETag with precondition-failed and leaves the document unchanged', async () => {
    const store = open(':memory:');
    const v1 = (await store.catalogues.put('guarded', { v: 1 }, undefined)).doc;
    const v2 = (await store.catalogues.put('guarded', { v: 2 }, v1.etag)).doc;
    expect(await storeErrorCode(async () => (await store.catalogues.put('guarded', { v: 3 }, v1.etag)))).toBe('precondition-failed');
    expect(await storeErrorCode(async () => (await store.catalogues.delete('guarded', v1.etag)))).toBe('precondition-failed');
    // Strong comparison: W/"x" never matches "x" (RFC 9110 §8.8.3.2).
    expect(await storeErrorCode(async () => (await store.catalogues.put('guarded', { v: 3 }, `W/${v2.etag}`)))).toBe('precondition-failed');
    expect((await store.catalogues.get('guarded'))).toEqual(v2);
  });

  it('accepts If-Match: * for an existing document and rejects it for a missing one', async () => {
    const store = open(':memory:');
    expect(await storeErrorCode(async () => (await store.catalogues.put('absent', { v: 1 }, '*')))).toBe('precondition-failed');
    expect((await store.catalogues.get('absent'))).toBeUndefined();
    await store.catalogues.put('present', { v: 1 }, undefined);
    expect((await store.catalogues.put('present', { v: 2 }, '*')).doc.version).toBe(2);
  });

  it('rejects creating a new id when an If-Match is given', async () => {
    const store = open(':memory:');
    const other = (await store.catalogues.put('other', { v: 1 }, undefined)).doc;
    expect(await storeErrorCode(async () => (await store.catalogues.put('fresh', { v: 1 }, other.etag)))).toBe('precondition-failed');
    expect((await store.catalogues.get('fresh'))).toBeUndefined();
  });

  it('supports create-only puts (If-None-Match: *)', async () => {
    const store = open(':memory:');
    expect((await store.catalogues.put('once', { v: 1 }, undefined, { createOnly: true })).outcome).toBe('created');
    expect(await storeErrorCode(async () => (await store.catalogues.put('once', { v: 2 }, undefined, { createOnly: true })))).toBe('precondition-failed');
  });

  it('reports not-found for deleting a missing id', async () => {
    const store = open(':memory:');
    expect(await storeErrorCode(async () => (await store.catalogues.delete('nothing-here', '"1-0000"')))).toBe('not-found');
    expect(await storeErrorCode(async () => (await store.catalogues.delete('nothing-here', undefined)))).toBe('not-found');
  });

  it('lets exactly one of two stores on the same file win with the same ETag', async () => {
    const file = path.join(tempDir(), 'shared.db');
    const first = open(file);
    const second = open(file);
    const base = (await first.catalogues.put('contested', { by: 'none' }, undefined)).doc;
    expect((await second.catalogues.get('contested'))?.etag).toBe(base.etag);
    const outcomes = [
      await storeErrorCode(async () => (await first.catalogues.put('contested', { by: 'first' }, base.etag))),
      await storeErrorCode(async () => (await second.catalogues.put('contested', { by: 'second' }, base.etag))),
    ];
    expect(outcomes).toEqual(['no error', 'precondition-failed']);
    expect((await second.catalogues.get('contested'))).toMatchObject({ version: 2, body: { by: 'first' } });
  });
});

describe('ids', () => {
  it('accepts and rejects ids per the documented pattern', async () => {
    for (const id of ['a', '0', 'lab-bench_2.v1', 'a'.repeat(64)]) expect(isValidDocumentId(id)).toBe(true);
    for (const id of ['', 'A', '-a', '.a', '_a', 'a b', 'a/b', 'é', 'a'.repeat(65), 'a\n']) {
      expect(isValidDocumentId(id)).toBe(false);
      expect(DOCUMENT_ID_PATTERN.test(id)).toBe(false);
    }
  });

  it('refuses to store under an invalid id and treats reads of one as missing', async () => {
    const store = open(':memory:');
    expect(await storeErrorCode(async () => (await store.catalogues.put('Bad Id', { v: 1 }, undefined)))).toBe('invalid-id');
    expect((await store.catalogues.get('Bad Id'))).toBeUndefined();
    expect(await storeErrorCode(async () => (await store.catalogues.delete('Bad Id', '"x"')))).toBe('not-found');
  });
});

describe('persistence and health', () => {
  it('reads back after close and reopen', async () => {
    const file = path.join(tempDir(), 'nested', 'dir', 'persist.db');
    const writer = openSqliteStore(file);
    const written = (await writer.amplifiers.put('kept', { slewRateVPerS: 0.5e6, label: 'kept' }, undefined)).doc;
    const again = (await writer.amplifiers.put('kept', { slewRateVPerS: 1.5e6, label: 'kept' }, written.etag)).doc;
    await writer.close();
    await writer.close(); // idempotent

    const reader = open(file);
    expect((await reader.amplifiers.get('kept'))).toEqual(again);
    expect((await reader.amplifiers.list()).map((d) => d.id)).toEqual(['kept']);
  });

  it('opens a file database with WAL, synchronous FULL, foreign keys and a busy timeout', async () => {
    const file = path.join(tempDir(), 'pragmas.db');
    const store = open(file);
    expect((await store.ping())).toBe(true);
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

  it('ping reports false after close', async () => {
    const store = openSqliteStore(':memory:');
    expect((await store.ping())).toBe(true);
    await store.close();
    expect((await store.ping())).toBe(false);
  });

  it('reports an unreadable stored body as corrupt instead of crashing', async () => {
    const file = path.join(tempDir(), 'corrupt.db');
    const store = open(file);
    await store.catalogues.put('fine', { ok: true }, undefined);
    await store.catalogues.put('broken', { ok: true }, undefined);
    await store.catalogues.put('array', { ok: true }, undefined);
    const tamper = new Database(file);
    // Bypass the json_valid CHECK to simulate damage that the schema would normally stop.
    tamper.pragma('ignore_check_constraints = ON');
    tamper.prepare(`UPDATE documents SET body = '{"ok": tru' WHERE id = 'broken'`).run();
    tamper.prepare(`UPDATE documents SET body = '[1,2]' WHERE id = 'array'`).run();
    tamper.close();

    expect((await store.catalogues.get('fine'))?.body).toEqual({ ok: true });
    let caught: unknown;
    try {
      await store.catalogues.get('broken');
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(StoreError);
    expect((caught as StoreError).code).toBe('corrupt');
    expect((caught as StoreError).message).toContain('catalogues/broken');
    expect(await storeErrorCode(async () => (await store.catalogues.get('array')))).toBe('corrupt');
    expect(await storeErrorCode(async () => (await store.catalogues.listWithBodies()))).toBe('corrupt');
    // Summaries do not parse bodies, so a listing still works and shows the damaged ids.
    expect((await store.catalogues.list()).map((d) => d.id)).toEqual(['array', 'broken', 'fine']);
  });

  it('resolves the database path from TICKWRIGHT_DB_PATH or the default under the working directory', async () => {
    const cwd = path.resolve('/srv/tickwright');
    expect(resolveDatabasePath({}, cwd)).toBe(path.join(cwd, 'data', 'tickwright.db'));
    expect(resolveDatabasePath({ TICKWRIGHT_DB_PATH: '' }, cwd)).toBe(path.join(cwd, 'data', 'tickwright.db'));
    expect(resolveDatabasePath({ TICKWRIGHT_DB_PATH: 'state/x.db' }, cwd)).toBe(path.join(cwd, 'state', 'x.db'));
    expect(resolveDatabasePath({ TICKWRIGHT_DB_PATH: '/var/lib/t.db' }, cwd)).toBe(path.resolve('/var/lib/t.db'));
    expect(resolveDatabasePath({ TICKWRIGHT_DB_PATH: ':memory:' }, cwd)).toBe(':memory:');
  });
});
