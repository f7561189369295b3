/**
 * The two store backends behind one shape, so the same contract tests run on
 * both: `fresh()` gives an empty database and a way to open handles on it
 * (two handles = two replicas or processes sharing it) and to damage a row.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { openPgStore } from '../../src/store/pg-store.ts';
import { openSqliteStore } from '../../src/store/sqlite-store.ts';
import type { Store } from '../../src/store/types.ts';
import { createThrowawayDatabase, requirePostgres, type ThrowawayDatabase } from './pg-database.ts';

export interface FreshDatabase {
  open(): Promise<Store>;
  /** Overwrite a stored body with `bodyText` behind the store's back (bypassing its checks). */
  damage(collection: string, id: string, bodyText: string): Promise<void>;
}

export interface BackendUnderTest {
  name: 'sqlite' | 'postgres';
  /** Reason to skip (no server and not CI); undefined = runs. Throws under CI when a server is missing. */
  skip: string | undefined;
  setUp(): Promise<void>;
  tearDown(): Promise<void>;
  /** An empty database; every handle opened on it is closed by `cleanUp`. */
  fresh(): Promise<FreshDatabase>;
  cleanUp(): Promise<void>;
}

function sqliteBackend(): BackendUnderTest {
  const handles: Store[] = [];
  const dirs: string[] = [];
  return {
    name: 'sqlite',
    skip: undefined,
    setUp: async () => undefined,
    tearDown: async () => undefined,
    async fresh() {
      const dir = mkdtempSync(path.join(tmpdir(), 'tickwright-contract-'));
      dirs.push(dir);
      const file = path.join(dir, 'store.db');
      return {
        open: async () => {
          const store = openSqliteStore(file);
          handles.push(store);
          return store;
        },
        damage: async (collection, id, bodyText) => {
          const db = new Database(file);
          try {
            // Bypass the json_valid CHECK to simulate damage that the schema would normally stop.
            db.pragma('ignore_check_constraints = ON');
            db.prepare('UPDATE documents SET body = ? WHERE collection = ? AND id = ?').run(bodyText, collection, id);
          } finally {
            db.close();
          }
        },
      };
    },
    async cleanUp() {
      while (handles.length > 0) await handles.pop()!.close();
      while (dirs.length > 0) rmSync(dirs.pop()!, { recursive: true, force: true });
    },
  };
}

async function postgresBackend(): Promise<BackendUnderTest> {
  const skip = await requirePostgres();
  const handles: Store[] = [];
  let database: ThrowawayDatabase | undefined;
  return {
    name: 'postgres',
    skip,
    async setUp() {
      database = await createThrowawayDatabase();
    },
    async tearDown() {
      await database?.drop();
      database = undefined;
    },
    async fresh() {
      const db = database!;
      // The schema stays (migrated by the first open); each test starts from empty rows.
      await db.sql("SELECT 1 FROM pg_tables WHERE tablename = 'documents'").then(async (rows) => {
        if (rows.length > 0) await db.sql('TRUNCATE documents');
      });
      return {
        open: async () => {
          const store = await openPgStore(db.url, { poolSize: 4 });
          handles.push(store);
          return store;
        },
        damage: async (collection, id, bodyText) => {
          // The CHECK keeps non-JSON out; drop it for the tamper and put it back unvalidated.
          await db.sql('ALTER TABLE documents DROP CONSTRAINT IF EXISTS documents_body_check');
          await db.sql('UPDATE documents SET body = $1 WHERE collection = $2 AND id = $3', [bodyText, collection, id]);
          await db.sql('ALTER TABLE documents ADD CONSTRAINT documents_body_check CHECK ((body::json) IS NOT NULL) NOT VALID');
        },
      };
    },
    async cleanUp() {
      while (handles.length > 0) await handles.pop()!.close();
    },
  };
}

export async function backendsUnderTest(): Promise<BackendUnderTest[]> {
  return [sqliteBackend(), await postgresBackend()];
}
