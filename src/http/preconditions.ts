/**
 * HTTP conditional requests for stored resources (RFC 9110 §13): parsing
 * If-Match / If-None-Match, picking the one tag the store compares inside its
 * write transaction, and the header/response declarations routes share.
 */
import { Type } from 'typebox';

type HeaderValue = string | string[] | undefined;

const ENTITY_TAG = /\*|(?:W\/)?"[^"]*"/g;

/** Entity tags of an If-Match / If-None-Match field (RFC 9110 §8.8.3: `*` or a list of tags). */
export function entityTags(header: HeaderValue): string[] {
  const text = (Array.isArray(header) ? header.join(',') : header ?? '').trim();
  if (text === '') return [];
  const tags = text.match(ENTITY_TAG) ?? [];
  // A bare token (a client that forgot the quotes) is kept as is: it matches nothing, so the store answers 412.
  return tags.length > 0 ? tags : [text];
}

/**
 * The store compares ONE tag inside its write transaction. From a list, pick `*`
 * or the tag equal to the current one (strong comparison: weak tags never match);
 * otherwise any listed tag, which the store then rejects as stale.
 * `currentEtag` is only consulted for lists, so a single tag costs no extra read.
 */
export async function ifMatchForStore(
  header: HeaderValue,
  currentEtag: () => Promise<string | undefined>,
): Promise<string | undefined> {
  const tags = entityTags(header);
  if (tags.length === 0) return undefined;
  if (tags.includes('*')) return '*';
  if (tags.length === 1) return tags[0];
  const current = await currentEtag();
  return tags.find((t) => t === current) ?? tags[0];
}

/** If-None-Match on a read uses the weak comparison (RFC 9110 §13.1.2): W/"x" matches "x". */
export function ifNoneMatchHits(header: HeaderValue, currentEtag: string): boolean {
  const strip = (tag: string) => tag.replace(/^W\//, '');
  return entityTags(header).some((t) => t === '*' || strip(t) === strip(currentEtag));
}

export const PRECONDITION_HEADERS = Type.Object({
  'if-match': Type.Optional(
    Type.String({ description: 'ETag of the version being replaced or deleted; required when the resource exists (428 without, 412 when stale)' }),
  ),
});

export const ETAG_HEADER = { etag: { type: 'string', description: 'Strong entity tag of this version; send it in If-Match to change it' } };

export function jsonResponse(description: string, schema: unknown, headers: Record<string, unknown> = ETAG_HEADER) {
  return { description, headers, content: { 'application/json': { schema } } };
}
