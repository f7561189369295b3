/**
 * A Store that reports every call to an observer (latency metrics, trace
 * spans) and otherwise forwards untouched. The observer lives in the HTTP
 * layer; the store itself knows nothing about telemetry.
 */
import type { DocumentBody, DocumentCollection, Store } from './types.ts';

export type StoreOperation = 'get' | 'list' | 'listWithBodies' | 'put' | 'delete' | 'ping';

/** Wraps one store call: must call `call` exactly once and return (or rethrow) its outcome. */
export type StoreCallObserver = <R>(operation: StoreOperation, collection: string | undefined, call: () => Promise<R>) => Promise<R>;

export function instrumentStore(store: Store, observe: StoreCallObserver): Store {
  return {
    backend: store.backend,
    catalogues: instrumentCollection(store.catalogues, 'catalogues', observe),
    amplifiers: instrumentCollection(store.amplifiers, 'amplifiers', observe),
    ping: () => observe('ping', undefined, () => store.ping()),
    close: () => store.close(),
  };
}

function instrumentCollection<T extends DocumentBody>(
  inner: DocumentCollection<T>,
  name: string,
  observe: StoreCallObserver,
): DocumentCollection<T> {
  return {
    get: (id) => observe('get', name, () => inner.get(id)),
    list: () => observe('list', name, () => inner.list()),
    listWithBodies: () => observe('listWithBodies', name, () => inner.listWithBodies()),
    put: (id, body, expectedEtag, options) => observe('put', name, () => inner.put(id, body, expectedEtag, options)),
    delete: (id, expectedEtag) => observe('delete', name, () => inner.delete(id, expectedEtag)),
  };
}
