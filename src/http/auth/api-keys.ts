import { createHash, timingSafeEqual } from 'node:crypto';

/**
 * API keys from TICKWRIGHT_API_KEYS: a comma-separated list of `scope:key` or
 * `scope:sha256:<64 hex>` entries, scope `read` or `write` (write implies read).
 * Empty segments (a trailing comma) are ignored; no entries at all = open service.
 *
 * Only SHA-256 digests are kept. The plaintext form exists just long enough to be
 * hashed; JavaScript cannot wipe a string, but nothing here keeps a reference to
 * it, and error messages name entries by position, never by content.
 */
export type ApiScope = 'read' | 'write';
export type AuthorizationOutcome = 'ok' | 'missing' | 'invalid' | 'forbidden';

export interface ApiKeyRing {
  /** true when no keys are configured: every request is authorized. */
  readonly isOpen: boolean;
  /** Number of configured keys. */
  readonly size: number;
  /**
   * 'missing'   no key presented (-> 401)
   * 'invalid'   a key that matches no configured key (-> 401)
   * 'forbidden' a valid read key where write is needed (-> 403)
   * 'ok'        authorized (also every call on an open ring)
   */
  authorize(presentedKey: string | undefined, needed: ApiScope): AuthorizationOutcome;
}

interface KeyEntry {
  digest: Buffer; // 32 bytes
  scope: ApiScope;
}

const HASHED_PREFIX = 'sha256:';
const HEX_DIGEST = /^[0-9a-f]{64}$/i;
// Visible ASCII without spaces: what fits in `Authorization: Bearer <key>` and X-Api-Key unaltered.
const PLAINTEXT_KEY = /^[\x21-\x7e]+$/;

/** Hex SHA-256 of a key: what operators put after `sha256:` to avoid plaintext keys in config. */
export function hashApiKey(key: string): string {
  return createHash('sha256').update(key, 'utf8').digest('hex');
}

export function parseApiKeyConfig(text: string | undefined): ApiKeyRing {
  const entries: KeyEntry[] = [];
  const segments = (text ?? '').split(',');
  segments.forEach((segment, index) => {
    const entry = segment.trim();
    if (entry === '') return;
    const position = `TICKWRIGHT_API_KEYS entry ${index + 1}`;
    const colon = entry.indexOf(':');
    if (colon < 0) throw new Error(`${position}: expected "read:<key>", "write:<key>" or "<scope>:sha256:<hex>"`);
    const scope = entry.slice(0, colon);
    if (scope !== 'read' && scope !== 'write') {
      throw new Error(`${position}: scope must be "read" or "write"`);
    }
    const secret = entry.slice(colon + 1);
    const digest = secret.startsWith(HASHED_PREFIX) ? parseHexDigest(secret.slice(HASHED_PREFIX.length), position) : hashPlaintext(secret, position);
    if (entries.some((existing) => existing.digest.equals(digest))) {
      throw new Error(`${position}: the same key is configured more than once`);
    }
    entries.push({ digest, scope });
  });
  return new HashedKeyRing(entries);
}

function parseHexDigest(hex: string, position: string): Buffer {
  if (!HEX_DIGEST.test(hex)) throw new Error(`${position}: sha256 form needs exactly 64 hexadecimal digits`);
  return Buffer.from(hex, 'hex');
}

function hashPlaintext(key: string, position: string): Buffer {
  if (!PLAINTEXT_KEY.test(key)) {
    throw new Error(`${position}: key must be non-empty visible ASCII without spaces`);
  }
  return createHash('sha256').update(key, 'utf8').digest();
}

class HashedKeyRing implements ApiKeyRing {
  private readonly entries: readonly KeyEntry[];

  constructor(entries: KeyEntry[]) {
    this.entries = Object.freeze(entries);
  }

  get isOpen(): boolean {
    return this.entries.length === 0;
  }

  get size(): number {
    return this.entries.length;
  }

  authorize(presentedKey: string | undefined, needed: ApiScope): AuthorizationOutcome {
    if (this.isOpen) return 'ok';
    if (presentedKey === undefined || presentedKey === '') return 'missing';
    // Hashing first gives fixed-length (32-byte) inputs to timingSafeEqual, so
    // neither the key length nor a matching prefix shows in the timing. Every
    // configured digest is compared, with no early exit, so the position of the
    // matching entry does not show either.
    const presented = createHash('sha256').update(presentedKey, 'utf8').digest();
    let matched: KeyEntry | undefined;
    for (const entry of this.entries) {
      const equal = timingSafeEqual(presented, entry.digest);
      if (equal && matched === undefined) matched = entry;
    }
    if (matched === undefined) return 'invalid';
    if (needed === 'write' && matched.scope !== 'write') return 'forbidden';
    return 'ok';
  }
}

export type HeaderBag = Record<string, string | string[] | undefined>;

/**
 * The key a request presents: `Authorization: Bearer <key>` (scheme name
 * case-insensitive, RFC 9110 §11.1) or else `X-Api-Key: <key>`. Header names are
 * looked up lowercase, as Node delivers them. An Authorization header with another
 * scheme (e.g. Basic from a proxy) is ignored. Bearer wins when both are present.
 * Returns undefined when no key is presented.
 */
export function extractPresentedKey(headers: HeaderBag): string | undefined {
  const authorization = firstValue(headers.authorization);
  if (authorization !== undefined) {
    const match = /^bearer[ \t]+(.*)$/i.exec(authorization.trim());
    if (match !== null) {
      const token = match[1].trim();
      if (token !== '') return token;
    }
  }
  const apiKey = firstValue(headers['x-api-key'])?.trim();
  return apiKey === undefined || apiKey === '' ? undefined : apiKey;
}

function firstValue(value: string | string[] | undefined): string | undefined {
  return Array.isArray(value) ? value[0] : value;
}
