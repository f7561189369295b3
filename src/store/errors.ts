/**
 * The one error type the persistence layer throws. `code` is stable so the HTTP
 * layer can map it without string matching:
 *   not-found             -> 404
 *   precondition-required -> 428 (update/delete of an existing document without If-Match)
 *   precondition-failed   -> 412 (stale or non-matching ETag)
 *   conflict              -> 409 (the store could not take the write right now: a lock held
 *                                 past busy_timeout, a schema newer than this build)
 *   invalid-id            -> 400 (an id that fails DOCUMENT_ID_PATTERN)
 *   corrupt               -> 500 (stored data that cannot be read back; should never happen)
 *   unavailable           -> 503 (the database server cannot be reached right now; retry later)
 */
export type StoreErrorCode =
  | 'not-found'
  | 'precondition-required'
  | 'precondition-failed'
  | 'conflict'
  | 'invalid-id'
  | 'corrupt'
  | 'unavailable';

export class StoreError extends Error {
  readonly code: StoreErrorCode;
  readonly details: Record<string, unknown> | undefined;

  constructor(code: StoreErrorCode, message: string, details?: Record<string, unknown>, options?: { cause?: unknown }) {
    super(message, options);
    this.name = 'StoreError';
    this.code = code;
    this.details = details;
  }
}

export function isStoreError(value: unknown): value is StoreError {
  return value instanceof StoreError;
}
