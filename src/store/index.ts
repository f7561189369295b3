export { StoreError, isStoreError, type StoreErrorCode } from './errors.ts';
export { DOCUMENT_ID_PATTERN, DOCUMENT_ID_PATTERN_SOURCE, isValidDocumentId } from './ids.ts';
export { documentEtag, etagMatches } from './etag.ts';
export { DEFAULT_DATABASE_PATH, MEMORY_DATABASE_PATH, resolveDatabasePath } from './db-path.ts';
export { MIGRATIONS, applyMigrations, type Migration } from './migrations.ts';
export { openSqliteStore, type SqliteStore, type SqliteStoreOptions } from './sqlite-store.ts';
export type {
  AmplifierBody,
  CatalogueBody,
  DocumentBody,
  DocumentCollection,
  DocumentSummary,
  PutOptions,
  PutResult,
  Store,
  StoreBackend,
  StoredDocument,
} from './types.ts';
export { openPgStore, isPostgresUrl, type PgStore, type PgStoreOptions } from './pg-store.ts';
export { PG_MIGRATIONS, applyPgMigrations } from './pg-migrations.ts';
export { openStore, type StoreSettings } from './open-store.ts';
