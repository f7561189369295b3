import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterEach, describe, expect, it } from 'vitest';
import { StoreError } from '../../src/store/errors.ts';
import { applyMigrations, MIGRATIONS, type Migration } from '../../src/store/migrations.ts';
import { openSqliteStore } from '../../src/store/sqlite-store.ts';

const cleanups: Array<() => void> = [];
// LIFO: resources registered later (stores, children) close before the temp dir is removed.
afterEach(() => {
  while (cleanups.length > 0) cleanups.pop()!();
});

function tempFile(name: string): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'tickwright-migrate-'));
  cleanups.push(() => rmSync(dir, { recursive: true, force: true }));
  return path.join(dir, name);
}

function ledger(file: string): Array<{ id: number; name: string; applied_at: string }> {
  const db = new Database(file, { readonly: true });
  try {
    return db.prepare('SELECT id, name, applied_at FROM schema_migrations ORDER BY id').all() as Array<{
      id: number;
      name: string;
      applied_at: string;
    }>;
  } finally {
    db.close();
  }
}

describe('schema migrations', () => {
  it('applies every step on a new file and none on reopen', async () => {
    const file = tempFile('m.db');
    const first = openSqliteStore(file);
    expect(first.migrationsAppliedAtOpen).toEqual(MIGRATIONS.map((m) => m.id));
    await first.catalogues.put('survives', { v: 1 }, undefined);
    await first.close();
    const before = ledger(file);
    expect(before.map((r) => r.id)).toEqual(MIGRATIONS.map((m) => m.id));

    const second = openSqliteStore(file);
    cleanups.push(() => void second.close());
    expect(second.migrationsAppliedAtOpen).toEqual([]);
    expect(ledger(file)).toEqual(before); // same rows, same applied_at: nothing re-ran
    expect((await second.catalogues.get('survives'))?.body).toEqual({ v: 1 });
  });

  it('runs each step exactly once, in order, and only the new ones later', async () => {
    const db = new Database(':memory:');
    cleanups.push(() => db.close());
    const steps: Migration[] = [
      { id: 1, name: 'log', sql: 'CREATE TABLE log (step INTEGER NOT NULL)' },
      { id: 2, name: 'first-entry', sql: 'INSERT INTO log (step) VALUES (2)' },
    ];
    expect(applyMigrations(db, steps)).toEqual([1, 2]);
    expect(applyMigrations(db, steps)).toEqual([]);
    const extended = [...steps, { id: 5, name: 'second-entry', sql: 'INSERT INTO log (step) VALUES (5)' }];
    expect(applyMigrations(db, extended)).toEqual([5]);
    expect(applyMigrations(db, extended)).toEqual([]);
    expect(db.prepare('SELECT step FROM log ORDER BY rowid').pluck().all()).toEqual([2, 5]);
  });

  it('rolls back every step of a failing run', async () => {
    const db = new Database(':memory:');
    cleanups.push(() => db.close());
    const steps: Migration[] = [
      { id: 1, name: 'ok', sql: 'CREATE TABLE kept_only_if_all_pass (x INTEGER)' },
      { id: 2, name: 'broken', sql: 'CREATE TABLE oops (' },
    ];
    expect(() => applyMigrations(db, steps)).toThrow();
    const tables = db.prepare(`SELECT name FROM sqlite_master WHERE type = 'table'`).pluck().all();
    expect(tables).not.toContain('kept_only_if_all_pass');
    expect(tables).not.toContain('schema_migrations');
  });

  it('refuses a database written by a newer schema', async () => {
    const db = new Database(':memory:');
    cleanups.push(() => db.close());
    applyMigrations(db, [...MIGRATIONS, { id: 999, name: 'future', sql: 'CREATE TABLE future (x INTEGER)' }]);
    let caught: unknown;
    try {
      applyMigrations(db, MIGRATIONS);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(StoreError);
    expect((caught as StoreError).code).toBe('conflict');
    expect((caught as StoreError).message).toContain('999');
  });

  it('rejects a migration list that is not strictly increasing', async () => {
    const db = new Database(':memory:');
    cleanups.push(() => db.close());
    expect(() =>
      applyMigrations(db, [
        { id: 2, name: 'b', sql: 'SELECT 1' },
        { id: 1, name: 'a', sql: 'SELECT 1' },
      ]),
    ).toThrow(/strictly increasing/);
  });
});
