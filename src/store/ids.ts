/**
 * Document ids are part of URLs (/v1/catalogues/{id}) and of file-like names in
 * logs, so they are kept to a small, case-free, URL-safe alphabet: a lowercase
 * letter or digit first (no leading dot or dash), then up to 63 of [a-z0-9._-].
 */
export const DOCUMENT_ID_PATTERN = /^[a-z0-9][a-z0-9._-]{0,63}$/;

/** The same pattern as a string, for JSON Schema `pattern` in route schemas. */
export const DOCUMENT_ID_PATTERN_SOURCE = DOCUMENT_ID_PATTERN.source;

export function isValidDocumentId(id: unknown): id is string {
  return typeof id === 'string' && DOCUMENT_ID_PATTERN.test(id);
}
