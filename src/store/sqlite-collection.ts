import { randomBytes } from 'node:crypto';
import type Database from 'better-sqlite3';
import { DocumentCodec, encodeBody, presentOrUndefined, type RowMeta } from './codec.ts';
import { StoreError } from './errors.ts';
import { etagMatches } from './etag.ts';
import { isValidDocumentId } from './ids.ts';
import type { DocumentBody, DocumentCollection, DocumentSummary, PutOptions, PutResult, StoredDocument } from './types.ts';

interface DocumentRow {
  id: string;
  incarnation: string;
  version: number;
  body: string;
  created_at: string;
  updated_at: string;
}

type SummaryRow = Omit<DocumentRow, 'body'> & { body_bytes: number };

/** One collection (catalogues, amplifiers...) as rows of the shared `documents` table. */
export class SqliteDocumentCollection<T extends DocumentBody> implements DocumentCollection<T> {
  private readonly collection: string;
  private readonly codec: DocumentCodec;
  private readonly selectOne: Database.Statement<[string, string], DocumentRow>;
  private readonly selectSummaries: Database.Statement<[string], SummaryRow>;
  private readonly selectAll: Database.Statement<[string], DocumentRow>;
  private readonly insertRow: Database.Statement<[string, string, string, string, string, string]>;
  private readonly updateRow: Database.Statement<[string, string, string, string, number]>;
  private readonly deleteRow: Database.Statement<[string, string]>;
  private readonly putTransaction: (id: string, bodyText: string, expectedEtag: string | undefined, createOnly: boolean) => PutResult<T>;
  private readonly deleteTransaction: (id: string, expectedEtag: string | undefined) => void;

  constructor(db: Database.Database, collection: string) {
    this.collection = collection;
    this.codec = new DocumentCodec(collection);
    const columns = 'id, incarnation, version, created_at, updated_at';
    this.selectOne = db.prepare(`SELECT ${columns}, body FROM documents WHERE collection = ? AND id = ?`);
    this.selectSummaries = db.prepare(
      `SELECT ${columns}, octet_length(body) AS body_bytes FROM documents WHERE collection = ? ORDER BY id`,
    );
    this.selectAll = db.prepare(`SELECT ${columns}, body FROM documents WHERE collection = ? ORDER BY id`);
    this.insertRow = db.prepare(
      `INSERT INTO documents (collection, id, incarnation, version, body, created_at, updated_at)
       VALUES (?, ?, ?, 1, ?, ?, ?)`,
    );
    this.updateRow = db.prepare(
      `UPDATE documents SET body = ?, updated_at = ?, version = version + 1
       WHERE collection = ? AND id = ? AND version = ?`,
    );
    this.deleteRow = db.prepare('DELETE FROM documents WHERE collection = ? AND id = ?');

    // IMMEDIATE takes the write lock before the read, so the ETag we check is
    // still current when we write: a second writer waits (busy_timeout) and then
    // sees the new version, failing its precondition. DEFERRED would let both
    // read the same version and one fail late with SQLITE_BUSY instead.
    const put = db.transaction((id: string, bodyText: string, expectedEtag: string | undefined, createOnly: boolean) =>
      this.putLocked(id, bodyText, expectedEtag, createOnly),
    );
    this.putTransaction = (...args) => put.immediate(...args);
    const remove = db.transaction((id: string, expectedEtag: string | undefined) => this.deleteLocked(id, expectedEtag));
    this.deleteTransaction = (...args) => remove.immediate(...args);
  }

  // The SQLite driver is synchronous; the async methods keep the shared contract
  // (a failure becomes a rejection, never a synchronous throw).
  async get(id: string): Promise<StoredDocument<T> | undefined> {
    if (!isValidDocumentId(id)) return undefined;
    const row = withSqliteErrors(() => this.selectOne.get(this.collection, id));
    return row === undefined ? undefined : this.decode(row);
  }

  async list(): Promise<DocumentSummary[]> {
    const rows = withSqliteErrors(() => this.selectSummaries.all(this.collection));
    return rows.map((row) => ({ ...this.meta(row), bodyBytes: row.body_bytes }));
  }

  async listWithBodies(): Promise<StoredDocument<T>[]> {
    const rows = withSqliteErrors(() => this.selectAll.all(this.collection));
    return rows.map((row) => this.decode(row));
  }

  async put(id: string, body: T, expectedEtag: string | undefined, options: PutOptions = {}): Promise<PutResult<T>> {
    this.assertId(id);
    const bodyText = encodeBody(body);
    return withSqliteErrors(() => this.putTransaction(id, bodyText, presentOrUndefined(expectedEtag), options.createOnly === true));
  }

  async delete(id: string, expectedEtag: string | undefined): Promise<void> {
    if (!isValidDocumentId(id)) throw this.notFound(id);
    withSqliteErrors(() => this.deleteTransaction(id, presentOrUndefined(expectedEtag)));
  }

  private putLocked(id: string, bodyText: string, expectedEtag: string | undefined, createOnly: boolean): PutResult<T> {
    const existing = this.selectOne.get(this.collection, id);
    const now = new Date().toISOString();
    if (existing === undefined) {
      if (expectedEtag !== undefined) throw this.codec.missingForIfMatch(id);
      const incarnation = randomBytes(8).toString('hex');
      this.insertRow.run(this.collection, id, incarnation, bodyText, now, now);
      return { outcome: 'created', doc: this.mustReadBack(id) };
    }
    const current = this.meta(existing);
    if (createOnly) throw this.codec.alreadyExists(id, current.etag);
    this.checkPrecondition(id, expectedEtag, current.etag);
    this.updateRow.run(bodyText, now, this.collection, id, existing.version);
    return { outcome: 'updated', doc: this.mustReadBack(id) };
  }

  private deleteLocked(id: string, expectedEtag: string | undefined): void {
    const existing = this.selectOne.get(this.collection, id);
    if (existing === undefined) throw this.notFound(id);
    this.checkPrecondition(id, expectedEtag, this.meta(existing).etag);
    this.deleteRow.run(this.collection, id);
  }

  private checkPrecondition(id: string, expectedEtag: string | undefined, currentEtag: string): void {
    if (expectedEtag === undefined) throw this.codec.preconditionRequired(id);
    if (!etagMatches(expectedEtag, currentEtag)) throw this.codec.stale(id, expectedEtag, currentEtag);
  }

  private mustReadBack(id: string): StoredDocument<T> {
    const row = this.selectOne.get(this.collection, id);
    if (row === undefined) {
      throw new StoreError('corrupt', `${this.label(id)} vanished inside its own write transaction`);
    }
    return this.decode(row);
  }

  private meta(row: Omit<DocumentRow, 'body'>): Omit<StoredDocument<T>, 'body'> {
    return this.codec.meta<T>(rowMeta(row));
  }

  private decode(row: DocumentRow): StoredDocument<T> {
    return this.codec.decode<T>(rowMeta(row), row.body);
  }

  private assertId(id: string): void {
    this.codec.assertId(id);
  }

  private notFound(id: string): StoreError {
    return this.codec.notFound(id);
  }

  private label(id: string): string {
    return this.codec.label(id);
  }
}

function rowMeta(row: Omit<DocumentRow, 'body'>): RowMeta {
  return { id: row.id, incarnation: row.incarnation, version: row.version, createdAt: row.created_at, updatedAt: row.updated_at };
}

/**
 * Turn SQLite lock and corruption failures into StoreError; pass StoreError and
 * everything else through unchanged.
 */
export function withSqliteErrors<R>(work: () => R): R {
  try {
    return work();
  } catch (error) {
    if (error instanceof StoreError) throw error;
    const code = (error as { code?: unknown }).code;
    if (typeof code === 'string') {
      if (code.startsWith('SQLITE_BUSY') || code.startsWith('SQLITE_LOCKED')) {
        throw new StoreError('conflict', 'the database stayed locked by another writer past busy_timeout; retry', {
          sqliteCode: code,
        }, { cause: error });
      }
      if (code.startsWith('SQLITE_CORRUPT') || code === 'SQLITE_NOTADB') {
        throw new StoreError('corrupt', `the database file is damaged (${code})`, { sqliteCode: code }, { cause: error });
      }
    }
    throw error;
  }
}
