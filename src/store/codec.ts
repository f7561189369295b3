/**
 * What both backends share about a stored document: body encoding, the checks
 * on what comes back, and the errors for a failed precondition. The backends
 * differ only in how they read and write rows.
 */
import { StoreError } from './errors.ts';
import { documentEtag } from './etag.ts';
import { isValidDocumentId } from './ids.ts';
import type { StoredDocument } from './types.ts';

export interface RowMeta {
  id: string;
  incarnation: string;
  version: number;
  createdAt: string;
  updatedAt: string;
}

export function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** JSON text for a body. The HTTP layer validates bodies; this only stops programming errors. */
export function encodeBody(body: unknown): string {
  if (!isPlainObject(body)) throw new TypeError('document body must be a JSON object');
  return JSON.stringify(body);
}

/** An empty If-Match header is treated as absent rather than as a tag that never matches. */
export function presentOrUndefined(etag: string | undefined): string | undefined {
  return etag === undefined || etag.trim() === '' ? undefined : etag;
}

export class DocumentCodec {
  constructor(readonly collection: string) {}

  label(id: string): string {
    return `${this.collection}/${id}`;
  }

  meta<T>(row: RowMeta): Omit<StoredDocument<T>, 'body'> {
    if (!Number.isSafeInteger(row.version) || row.version < 1 || typeof row.incarnation !== 'string') {
      throw new StoreError('corrupt', `${this.label(row.id)} has an unreadable version record`, { collection: this.collection, id: row.id });
    }
    return {
      id: row.id,
      version: row.version,
      etag: documentEtag(this.collection, row.id, row.incarnation, row.version),
      createdAt: row.createdAt,
      updatedAt: row.updatedAt,
    };
  }

  decode<T>(row: RowMeta, bodyText: string): StoredDocument<T> {
    let body: unknown;
    try {
      body = JSON.parse(bodyText);
    } catch (cause) {
      throw new StoreError('corrupt', `${this.label(row.id)} holds a body that is not valid JSON`, { collection: this.collection, id: row.id }, { cause });
    }
    if (!isPlainObject(body)) {
      throw new StoreError('corrupt', `${this.label(row.id)} holds a body that is not a JSON object`, { collection: this.collection, id: row.id });
    }
    return { ...this.meta<T>(row), body: body as T };
  }

  assertId(id: string): void {
    if (!isValidDocumentId(id)) {
      throw new StoreError('invalid-id', `document id must match ^[a-z0-9][a-z0-9._-]{0,63}$`, { collection: this.collection });
    }
  }

  notFound(id: string): StoreError {
    return new StoreError('not-found', `${this.label(id)} does not exist`, { collection: this.collection, id });
  }

  /** RFC 9110 §13.1.1: If-Match (even `*`) fails when there is no current representation. */
  missingForIfMatch(id: string): StoreError {
    return new StoreError('precondition-failed', `${this.label(id)} does not exist, so If-Match cannot match`, { collection: this.collection, id });
  }

  alreadyExists(id: string, currentEtag: string): StoreError {
    return new StoreError('precondition-failed', `${this.label(id)} already exists`, { collection: this.collection, id, currentEtag });
  }

  preconditionRequired(id: string): StoreError {
    return new StoreError('precondition-required', `${this.label(id)} exists; send its current ETag in If-Match to change or delete it`, {
      collection: this.collection,
      id,
    });
  }

  stale(id: string, expectedEtag: string, currentEtag: string): StoreError {
    return new StoreError('precondition-failed', `${this.label(id)} has changed since ETag ${expectedEtag}`, {
      collection: this.collection,
      id,
      currentEtag,
    });
  }
}
