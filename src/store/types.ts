/**
 * The storage contract, implemented by the embedded SQLite store and by the
 * PostgreSQL store (several replicas on one database). Every call is async: a
 * server database answers over a connection pool. Nothing outside src/store/
 * imports a database driver.
 *
 * Bodies are opaque JSON objects here: the HTTP layer validates them against
 * its schemas BEFORE storing and narrows the type after reading.
 */
export type DocumentBody = Record<string, unknown>;

/** A parts catalogue (approved values list) as validated by the HTTP layer. */
export type CatalogueBody = DocumentBody;
/** A caller-registered amplifier model as validated by the HTTP layer. */
export type AmplifierBody = DocumentBody;

export interface StoredDocument<T> {
  id: string;
  /** 1 on creation, +1 on every successful put. */
  version: number;
  /** Strong entity tag, already quoted per RFC 9110 (e.g. `"3-9f2c41d07a1be655"`); send as ETag as is. */
  etag: string;
  /** ISO 8601 UTC timestamps. */
  createdAt: string;
  updatedAt: string;
  body: T;
}

/** What list() returns per document: everything but the body, plus its stored size. */
export type DocumentSummary = Omit<StoredDocument<never>, 'body'> & {
  /** Length in bytes of the stored JSON body (UTF-8), so a listing can show size without loading bodies. */
  bodyBytes: number;
};

export interface PutOptions {
  /**
   * Create-only (the `If-None-Match: *` case): fail with precondition-failed if
   * the id already exists. Optional.
   */
  createOnly?: boolean;
}

export interface PutResult<T> {
  outcome: 'created' | 'updated';
  doc: StoredDocument<T>;
}

export interface DocumentCollection<T> {
  /** undefined when the id does not exist (or is not a valid id). Throws StoreError 'corrupt' on unreadable data. */
  get(id: string): Promise<StoredDocument<T> | undefined>;
  /** Metadata of every document, ordered by id (byte order; ids are ASCII). Bodies are not loaded. */
  list(): Promise<DocumentSummary[]>;
  /** Every document with its body, ordered by id. For small collections (amplifiers); catalogues can be large. */
  listWithBodies(): Promise<StoredDocument<T>[]>;
  /**
   * Create or replace. `expectedEtag` is the caller's If-Match value (one quoted
   * strong tag, or `*` meaning "must exist"):
   *   - id exists, expectedEtag absent          -> StoreError 'precondition-required'
   *   - id exists, expectedEtag stale           -> StoreError 'precondition-failed'
   *   - id missing, expectedEtag present        -> StoreError 'precondition-failed'
   *   - id exists and options.createOnly        -> StoreError 'precondition-failed'
   * The ETag check and the write are atomic (SQLite: one IMMEDIATE transaction;
   * PostgreSQL: one compare-and-set statement), so of two writers holding the
   * same ETag exactly one succeeds, whichever replica each talks to.
   */
  put(id: string, body: T, expectedEtag: string | undefined, options?: PutOptions): Promise<PutResult<T>>;
  /**
   * Delete an existing document. Missing id -> 'not-found'; absent ETag ->
   * 'precondition-required'; stale -> 'precondition-failed'. Atomic like put.
   */
  delete(id: string, expectedEtag: string | undefined): Promise<void>;
}

export type StoreBackend = 'sqlite' | 'postgres';

export interface Store {
  catalogues: DocumentCollection<CatalogueBody>;
  amplifiers: DocumentCollection<AmplifierBody>;
  /** Which database answers: 'sqlite' or 'postgres' (logs, metrics labels). */
  readonly backend: StoreBackend;
  /** true when the database answers a trivial query; never rejects (for /readyz). */
  ping(): Promise<boolean>;
  /** Release the database; idempotent. Calls after close reject. */
  close(): Promise<void>;
}
