import { randomBytes } from 'node:crypto';
import type pg from 'pg';
import { DocumentCodec, encodeBody, presentOrUndefined, type RowMeta } from './codec.ts';
import { isValidDocumentId } from './ids.ts';
import { withPgErrors } from './pg-errors.ts';
import type { DocumentBody, DocumentCollection, DocumentSummary, PutOptions, PutResult, StoredDocument } from './types.ts';

interface PgRow {
  id: string;
  incarnation: string;
  version: number;
  created_at: Date;
  updated_at: Date;
  body: string;
  body_bytes: number;
}

const COLUMNS = 'id, incarnation, version, created_at, updated_at';
/** The SQL twin of documentEtag() (migration 1): the compare-and-set statements match If-Match against it. */
const ETAG_SQL = 'tickwright_document_etag(collection, id, incarnation, version)';

// Named statements are prepared once per pooled connection and reused.
const SQL = {
  get: { name: 'tw-doc-get', text: `SELECT ${COLUMNS}, body FROM documents WHERE collection = $1 AND id = $2` },
  meta: { name: 'tw-doc-meta', text: `SELECT ${COLUMNS} FROM documents WHERE collection = $1 AND id = $2` },
  list: {
    name: 'tw-doc-list',
    text: `SELECT ${COLUMNS}, octet_length(body) AS body_bytes FROM documents WHERE collection = $1 ORDER BY id`,
  },
  listBodies: { name: 'tw-doc-list-bodies', text: `SELECT ${COLUMNS}, body FROM documents WHERE collection = $1 ORDER BY id` },
  // If-None-Match / no If-Match: create or do nothing, in one statement.
  insert: {
    name: 'tw-doc-insert',
    text: `INSERT INTO documents (collection, id, incarnation, version, body, created_at, updated_at)
           VALUES ($1, $2, $3, 1, $4, now(), now())
           ON CONFLICT (collection, id) DO NOTHING
           RETURNING ${COLUMNS}, body`,
  },
  // If-Match: compare-and-set in one statement; no row back = the precondition failed.
  updateIfMatch: {
    name: 'tw-doc-update-if-match',
    text: `UPDATE documents SET body = $4, version = version + 1, updated_at = now()
           WHERE collection = $1 AND id = $2 AND ($3 = '*' OR ${ETAG_SQL} = $3)
           RETURNING ${COLUMNS}, body`,
  },
  deleteIfMatch: {
    name: 'tw-doc-delete-if-match',
    text: `DELETE FROM documents WHERE collection = $1 AND id = $2 AND ($3 = '*' OR ${ETAG_SQL} = $3) RETURNING id`,
  },
} as const;

/**
 * One collection as rows of the shared `documents` table on a PostgreSQL
 * server. Every write decides in ONE statement (a conditional INSERT, UPDATE or
 * DELETE), so two replicas racing with the same ETag cannot both win: the
 * server serialises the two row updates and the loser's WHERE no longer
 * matches. A follow-up read only explains a refusal; it never decides one.
 */
export class PgDocumentCollection<T extends DocumentBody> implements DocumentCollection<T> {
  private readonly codec: DocumentCodec;

  constructor(
    private readonly pool: pg.Pool,
    private readonly collection: string,
  ) {
    this.codec = new DocumentCodec(collection);
  }

  async get(id: string): Promise<StoredDocument<T> | undefined> {
    if (!isValidDocumentId(id)) return undefined;
    const rows = await this.query(SQL.get, [this.collection, id]);
    return rows[0] === undefined ? undefined : this.decode(rows[0]);
  }

  async list(): Promise<DocumentSummary[]> {
    const rows = await this.query(SQL.list, [this.collection]);
    return rows.map((row) => ({ ...this.codec.meta<never>(rowMeta(row)), bodyBytes: Number(row.body_bytes) }));
  }

  async listWithBodies(): Promise<StoredDocument<T>[]> {
    const rows = await this.query(SQL.listBodies, [this.collection]);
    return rows.map((row) => this.decode(row));
  }

  async put(id: string, body: T, expectedEtag: string | undefined, options: PutOptions = {}): Promise<PutResult<T>> {
    this.codec.assertId(id);
    const bodyText = encodeBody(body);
    const expected = presentOrUndefined(expectedEtag)?.trim();

    if (expected === undefined) {
      // A concurrent delete can make the conflicting row vanish before we explain
      // the refusal; then the insert is simply tried again.
      for (let attempt = 0; attempt < 3; attempt += 1) {
        const inserted = await this.query(SQL.insert, [this.collection, id, randomBytes(8).toString('hex'), bodyText]);
        if (inserted[0] !== undefined) return { outcome: 'created', doc: this.decode(inserted[0]) };
        const current = await this.currentEtag(id);
        if (current === undefined) continue;
        throw options.createOnly === true ? this.codec.alreadyExists(id, current) : this.codec.preconditionRequired(id);
      }
      throw this.codec.preconditionRequired(id);
    }

    if (options.createOnly === true) {
      // If-None-Match: * together with If-Match can never both hold: refuse without writing.
      const current = await this.currentEtag(id);
      throw current === undefined ? this.codec.missingForIfMatch(id) : this.codec.alreadyExists(id, current);
    }

    const updated = await this.query(SQL.updateIfMatch, [this.collection, id, expected, bodyText]);
    if (updated[0] !== undefined) return { outcome: 'updated', doc: this.decode(updated[0]) };
    const current = await this.currentEtag(id);
    throw current === undefined ? this.codec.missingForIfMatch(id) : this.codec.stale(id, expected, current);
  }

  async delete(id: string, expectedEtag: string | undefined): Promise<void> {
    if (!isValidDocumentId(id)) throw this.codec.notFound(id);
    const expected = presentOrUndefined(expectedEtag)?.trim();
    if (expected !== undefined) {
      const deleted = await this.query(SQL.deleteIfMatch, [this.collection, id, expected]);
      if (deleted[0] !== undefined) return;
    }
    const current = await this.currentEtag(id);
    if (current === undefined) throw this.codec.notFound(id);
    throw expected === undefined ? this.codec.preconditionRequired(id) : this.codec.stale(id, expected, current);
  }

  private async currentEtag(id: string): Promise<string | undefined> {
    const rows = await this.query(SQL.meta, [this.collection, id]);
    return rows[0] === undefined ? undefined : this.codec.meta(rowMeta(rows[0])).etag;
  }

  private decode(row: PgRow): StoredDocument<T> {
    return this.codec.decode<T>(rowMeta(row), row.body);
  }

  private async query(statement: { name: string; text: string }, values: unknown[]): Promise<PgRow[]> {
    return withPgErrors(async () => (await this.pool.query<PgRow>({ ...statement, values })).rows);
  }
}

function rowMeta(row: Omit<PgRow, 'body' | 'body_bytes'>): RowMeta {
  return {
    id: row.id,
    incarnation: row.incarnation,
    version: Number(row.version),
    createdAt: isoUtc(row.created_at),
    updatedAt: isoUtc(row.updated_at),
  };
}

/** timestamptz -> the same ISO 8601 UTC form the SQLite store writes (millisecond precision). */
function isoUtc(value: Date | string): string {
  return (value instanceof Date ? value : new Date(value)).toISOString();
}
