import { createHash } from 'node:crypto';

/**
 * Strong ETag for one version of one document, quoted per RFC 9110 §8.8.3.
 *
 * It is derived from the collection, id, version AND the document's incarnation
 * (a random token chosen when the id is created). Without the incarnation,
 * deleting and re-creating an id would reuse `"1-..."` and a client still holding
 * the old version-1 tag could overwrite the new document.
 * The leading version keeps tags readable in logs; the hash part only needs to be
 * unguessable enough to be unique per incarnation, so 64 bits are kept.
 */
export function documentEtag(collection: string, id: string, incarnation: string, version: number): string {
  const digest = createHash('sha256')
    .update(`${collection}\u0000${id}\u0000${incarnation}\u0000${version}`)
    .digest('hex')
    .slice(0, 16);
  return `"${version}-${digest}"`;
}

/**
 * If-Match comparison for one tag: strong comparison (RFC 9110 §8.8.3.2), so a
 * weak tag (W/"...") never matches. `*` matches any existing representation.
 * Header lists ("a", "b") are split by the HTTP layer; here one value is compared.
 */
export function etagMatches(expected: string, current: string): boolean {
  const trimmed = expected.trim();
  return trimmed === '*' || trimmed === current;
}
