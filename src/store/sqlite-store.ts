import { mkdirSync } from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';
import { MEMORY_DATABASE_PATH } from './db-path.ts';
import { StoreError } from './errors.ts';
import { applyMigrations, MIGRATIONS, type Migration } from './migrations.ts';
import { SqliteDocumentCollection, withSqliteErrors } from './sqlite-collection.ts';
import type { AmplifierBody, CatalogueBody, Store } from './types.ts';

export interface SqliteStoreOptions {
  /** How long a writer waits for another connection's lock before 'conflict'. Default 5000 ms. */
  busyTimeoutMs?: number;
  /** Schema steps to apply at open; default MIGRATIONS (tests pass their own). */
  migrations?: readonly Migration[];
}

/** Store plus SQLite specifics that callers outside src/store/ should not need. */
export interface SqliteStore extends Store {
  readonly path: string;
  /** Migration ids applied by THIS open (empty when the file was already current). */
  readonly migrationsAppliedAtOpen: readonly number[];
}

/**
 * Open (creating if needed) the SQLite store at `filePath`, or ':memory:'.
 * Creates the parent directory, sets the pragmas below and migrates the schema.
 */
export function openSqliteStore(filePath: string, options: SqliteStoreOptions = {}): SqliteStore {
  const inMemory = filePath === MEMORY_DATABASE_PATH;
  if (!inMemory) mkdirSync(path.dirname(path.resolve(filePath)), { recursive: true });

  const db = withSqliteErrors(() => new Database(filePath));
  try {
    configure(db, inMemory, options.busyTimeoutMs ?? 5000);
    const applied = withSqliteErrors(() => applyMigrations(db, options.migrations ?? MIGRATIONS));
    return new SqliteStoreImpl(db, filePath, applied);
  } catch (error) {
    db.close();
    throw error;
  }
}

function configure(db: Database.Database, inMemory: boolean, busyTimeoutMs: number): void {
  // busy_timeout first: switching to WAL itself needs a lock another process may hold.
  db.pragma(`busy_timeout = ${Math.max(0, Math.floor(busyTimeoutMs))}`);
  if (!inMemory) {
    // WAL: readers never block the writer and vice versa, and a commit is one
    // append to the -wal file rather than a rewrite of the main file.
    const mode = db.pragma('journal_mode = WAL', { simple: true });
    if (String(mode).toLowerCase() !== 'wal') {
      throw new StoreError('conflict', `could not switch the database to WAL journal mode (got ${String(mode)})`);
    }
  }
  // Durability. Once a commit returns, its WAL frames have been write()n, so they
  // sit in the OS page cache: a kill -9 of this process cannot lose them under any
  // `synchronous` setting. Power loss or an OS crash is different: with NORMAL the
  // WAL is fsync'ed only at checkpoints, so the last commits may roll back; with
  // FULL SQLite fsyncs the WAL at every commit, so a transaction that returned is
  // on stable storage (provided the disk honours fsync / flush requests).
  // The cost is one fsync per write, acceptable for a store of catalogues and
  // amplifier models that changes rarely.
  db.pragma('synchronous = FULL');
  db.pragma('foreign_keys = ON');
}

class SqliteStoreImpl implements SqliteStore {
  readonly catalogues: SqliteDocumentCollection<CatalogueBody>;
  readonly amplifiers: SqliteDocumentCollection<AmplifierBody>;
  readonly path: string;
  readonly migrationsAppliedAtOpen: readonly number[];
  private readonly db: Database.Database;

  constructor(db: Database.Database, filePath: string, applied: readonly number[]) {
    this.db = db;
    this.path = filePath;
    this.migrationsAppliedAtOpen = Object.freeze([...applied]);
    this.catalogues = new SqliteDocumentCollection(db, 'catalogues');
    this.amplifiers = new SqliteDocumentCollection(db, 'amplifiers');
  }

  readonly backend = 'sqlite' as const;

  async ping(): Promise<boolean> {
    if (!this.db.open) return false;
    try {
      return this.db.prepare('SELECT 1').pluck().get() === 1;
    } catch {
      return false;
    }
  }

  async close(): Promise<void> {
    if (this.db.open) this.db.close();
  }
}
