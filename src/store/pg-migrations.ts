import type pg from 'pg';
import { StoreError } from './errors.ts';
import type { Migration } from './migrations.ts';

/**
 * The PostgreSQL schema, as an append-only list like the SQLite one (same ids
 * for the same logical step, so both backends read alike). Never edit a
 * released step: add a new one.
 *
 * Shape as in SQLite: one `documents` table for every collection. The body is
 * kept as the JSON text the service wrote (not jsonb) so a listing's byte size
 * and a read-back are exactly what was stored; the CHECK casts it to json to
 * keep non-JSON out. Ids use the "C" collation so ORDER BY id is byte order on
 * every server whatever its locale, as in SQLite.
 *
 * `tickwright_document_etag` is the SQL twin of src/store/etag.ts: the
 * compare-and-set statements compare the caller's If-Match against it inside
 * the UPDATE/DELETE itself. A NUL cannot sit in PostgreSQL text, so the hash
 * input is built as bytea with zero-byte separators, the same bytes node:crypto
 * hashes.
 */
export const PG_MIGRATIONS: readonly Migration[] = [
  {
    id: 1,
    name: 'create-documents',
    sql: `
      CREATE TABLE documents (
        collection  text        NOT NULL,
        id          text        COLLATE "C" NOT NULL,
        incarnation text        NOT NULL,
        version     integer     NOT NULL CHECK (version >= 1),
        body        text        NOT NULL CHECK ((body::json) IS NOT NULL),
        created_at  timestamptz NOT NULL,
        updated_at  timestamptz NOT NULL,
        PRIMARY KEY (collection, id)
      );
      CREATE FUNCTION tickwright_document_etag(collection text, id text, incarnation text, version integer)
        RETURNS text LANGUAGE sql IMMUTABLE STRICT PARALLEL SAFE AS $fn$
          SELECT '"' || version::text || '-' || left(encode(sha256(
            convert_to(collection, 'UTF8') || '\\x00'::bytea ||
            convert_to(id, 'UTF8') || '\\x00'::bytea ||
            convert_to(incarnation, 'UTF8') || '\\x00'::bytea ||
            convert_to(version::text, 'UTF8')), 'hex'), 16) || '"'
        $fn$;
    `,
  },
];

const CREATE_LEDGER = `
  CREATE TABLE IF NOT EXISTS schema_migrations (
    id         integer     PRIMARY KEY,
    name       text        NOT NULL,
    applied_at timestamptz NOT NULL DEFAULT now()
  )
`;

/**
 * Any 64-bit number of our own: the advisory lock every replica takes while it
 * migrates, so replicas starting together apply each step exactly once.
 */
const MIGRATION_LOCK_KEY = 7_147_201_511n;

/**
 * Bring the database up to `migrations` in ONE transaction under an advisory
 * lock; returns the ids applied now (empty when already current). PostgreSQL
 * DDL is transactional, so a failing step leaves the database as it was.
 */
export async function applyPgMigrations(client: pg.ClientBase, migrations: readonly Migration[] = PG_MIGRATIONS): Promise<number[]> {
  for (let i = 1; i < migrations.length; i += 1) {
    if (migrations[i].id <= migrations[i - 1].id) {
      throw new Error(`migration ids must be strictly increasing: ${migrations[i - 1].id} then ${migrations[i].id}`);
    }
  }
  await client.query('BEGIN');
  try {
    await client.query('SELECT pg_advisory_xact_lock($1)', [MIGRATION_LOCK_KEY.toString()]);
    await client.query(CREATE_LEDGER);
    const { rows } = await client.query<{ id: number }>('SELECT id FROM schema_migrations');
    const appliedIds = new Set(rows.map((r) => Number(r.id)));
    const known = new Set(migrations.map((m) => m.id));
    const unknown = [...appliedIds].filter((id) => !known.has(id));
    if (unknown.length > 0) {
      // A newer build migrated this database; running old code on it could damage it.
      throw new StoreError(
        'conflict',
        `database has schema migrations this build does not know (${unknown.join(', ')}); it was written by a newer version`,
        { unknownMigrationIds: unknown },
      );
    }
    const appliedNow: number[] = [];
    for (const migration of migrations) {
      if (appliedIds.has(migration.id)) continue;
      await client.query(migration.sql);
      await client.query('INSERT INTO schema_migrations (id, name) VALUES ($1, $2)', [migration.id, migration.name]);
      appliedNow.push(migration.id);
    }
    await client.query('COMMIT');
    return appliedNow;
  } catch (error) {
    await client.query('ROLLBACK').catch(() => undefined);
    throw error;
  }
}
