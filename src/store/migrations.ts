import type Database from 'better-sqlite3';
import { StoreError } from './errors.ts';

export interface Migration {
  /** Strictly increasing, never reused or renumbered once released. */
  id: number;
  name: string;
  sql: string;
}

/**
 * The schema, as an append-only list. Never edit a released step: add a new one.
 *
 * One table serves every collection: the collections share the same shape
 * (versioned JSON documents), and a new collection then needs no migration.
 * STRICT makes SQLite enforce column types; json_valid keeps non-JSON out.
 */
export const MIGRATIONS: readonly Migration[] = [
  {
    id: 1,
    name: 'create-documents',
    sql: `
      CREATE TABLE documents (
        collection  TEXT    NOT NULL,
        id          TEXT    NOT NULL,
        incarnation TEXT    NOT NULL,
        version     INTEGER NOT NULL CHECK (version >= 1),
        body        TEXT    NOT NULL CHECK (json_valid(body)),
        created_at  TEXT    NOT NULL,
        updated_at  TEXT    NOT NULL,
        PRIMARY KEY (collection, id)
      ) STRICT, WITHOUT ROWID;
    `,
  },
];

const CREATE_LEDGER = `
  CREATE TABLE IF NOT EXISTS schema_migrations (
    id         INTEGER PRIMARY KEY,
    name       TEXT    NOT NULL,
    applied_at TEXT    NOT NULL
  ) STRICT;
`;

/**
 * Bring the database up to `migrations`, returning the ids applied now (empty
 * when already current). Everything runs in one IMMEDIATE transaction: two
 * processes opening a fresh file at once cannot both apply a step, and a failing
 * step leaves the database exactly as it was.
 */
export function applyMigrations(db: Database.Database, migrations: readonly Migration[] = MIGRATIONS): number[] {
  assertOrdered(migrations);
  const run = db.transaction((): number[] => {
    db.exec(CREATE_LEDGER);
    const appliedIds = new Set(
      db.prepare('SELECT id FROM schema_migrations').pluck().all() as number[],
    );
    const known = new Set(migrations.map((m) => m.id));
    const unknown = [...appliedIds].filter((id) => !known.has(id));
    if (unknown.length > 0) {
      // A newer build wrote this file; running old code on it could corrupt it.
      throw new StoreError(
        'conflict',
        `database has schema migrations this build does not know (${unknown.join(', ')}); it was written by a newer version`,
        { unknownMigrationIds: unknown },
      );
    }
    const record = db.prepare('INSERT INTO schema_migrations (id, name, applied_at) VALUES (?, ?, ?)');
    const appliedNow: number[] = [];
    for (const migration of migrations) {
      if (appliedIds.has(migration.id)) continue;
      db.exec(migration.sql);
      record.run(migration.id, migration.name, new Date().toISOString());
      appliedNow.push(migration.id);
    }
    return appliedNow;
  });
  return run.immediate();
}

function assertOrdered(migrations: readonly Migration[]): void {
  for (let i = 1; i < migrations.length; i += 1) {
    if (migrations[i].id <= migrations[i - 1].id) {
      throw new Error(`migration ids must be strictly increasing: ${migrations[i - 1].id} then ${migrations[i].id}`);
    }
  }
}
