// Auth helpers live in src/http/auth/; their tests sit here because test/store/ is
// this work package's test folder.
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { extractPresentedKey, hashApiKey, parseApiKeyConfig } from '../../src/http/auth/api-keys.ts';

// Independent reference: Node's own SHA-256, not the module under test.
const sha256Hex = (text: string) => createHash('sha256').update(text, 'utf8').digest('hex');

describe('hashApiKey', () => {
  it('is SHA-256 in hex', () => {
    // FIPS 180-2 Appendix B.1 test vector: SHA-256("abc").
    expect(hashApiKey('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });
});

describe('parseApiKeyConfig', () => {
  it('is open with no configuration', () => {
    for (const text of [undefined, '', '   ', ',']) {
      const ring = parseApiKeyConfig(text);
      expect(ring.isOpen).toBe(true);
      expect(ring.size).toBe(0);
      expect(ring.authorize(undefined, 'write')).toBe('ok');
    }
  });

  it('accepts plaintext and sha256 entries, with spaces and a trailing comma', () => {
    const ring = parseApiKeyConfig(` read:bench-reader-01 , write:sha256:${sha256Hex('line-writer-02').toUpperCase()},`);
    expect(ring.isOpen).toBe(false);
    expect(ring.size).toBe(2);
    expect(ring.authorize('bench-reader-01', 'read')).toBe('ok');
    expect(ring.authorize('line-writer-02', 'write')).toBe('ok');
  });

  it('keeps the colon-containing rest of an entry as the key', () => {
    expect(parseApiKeyConfig('read:a:b:c').authorize('a:b:c', 'read')).toBe('ok');
  });

  it.each([
    ['no scope separator', 'justakey'],
    ['unknown scope', 'admin:k1'],
    ['upper-case scope', 'READ:k1'],
    ['empty key', 'read:'],
    ['key with a space', 'read:two words'],
    ['short digest', 'write:sha256:abcd'],
    ['non-hex digest', `write:sha256:${'z'.repeat(64)}`],
    ['duplicate key', 'read:dup-key,write:dup-key'],
    ['duplicate via digest', `read:dup-key,write:sha256:${sha256Hex('dup-key')}`],
  ])('rejects %s with an error naming the entry position', (_label, text) => {
    expect(() => parseApiKeyConfig(text)).toThrow(/TICKWRIGHT_API_KEYS entry \d+/);
  });

  it('never echoes a plaintext key in an error message', () => {
    let message = '';
    try {
      parseApiKeyConfig('read:secret-value-7,read:secret-value-7');
    } catch (error) {
      message = (error as Error).message;
    }
    expect(message).toMatch(/entry 2/);
    expect(message).not.toContain('secret-value-7');
  });
});

describe('authorization matrix', () => {
  const ring = parseApiKeyConfig(`read:reader-key-1,write:writer-key-1,read:sha256:${sha256Hex('reader-key-2')}`);
  const cases: Array<[string, string | undefined, 'read' | 'write', string]> = [
    ['no key, read', undefined, 'read', 'missing'],
    ['no key, write', undefined, 'write', 'missing'],
    ['empty key, read', '', 'read', 'missing'],
    ['read key, read', 'reader-key-1', 'read', 'ok'],
    ['read key, write', 'reader-key-1', 'write', 'forbidden'],
    ['hashed read key, read', 'reader-key-2', 'read', 'ok'],
    ['hashed read key, write', 'reader-key-2', 'write', 'forbidden'],
    ['write key, read (write implies read)', 'writer-key-1', 'read', 'ok'],
    ['write key, write', 'writer-key-1', 'write', 'ok'],
    ['wrong key, read', 'reader-key-3', 'read', 'invalid'],
    ['wrong key, write', 'nobody', 'write', 'invalid'],
    ['prefix of a key', 'writer-key-', 'write', 'invalid'],
    ['case-changed key', 'WRITER-KEY-1', 'write', 'invalid'],
    ['the stored digest itself', sha256Hex('reader-key-2'), 'read', 'invalid'],
  ];
  it.each(cases)('%s', (_label, presented, needed, expected) => {
    expect(ring.authorize(presented, needed)).toBe(expected);
  });
});

describe('extractPresentedKey', () => {
  it('reads Bearer tokens (scheme case-insensitive, RFC 9110 §11.1) and X-Api-Key', () => {
    expect(extractPresentedKey({ authorization: 'Bearer tok-1' })).toBe('tok-1');
    expect(extractPresentedKey({ authorization: 'bearer   tok-2 ' })).toBe('tok-2');
    expect(extractPresentedKey({ 'x-api-key': ' tok-3 ' })).toBe('tok-3');
    expect(extractPresentedKey({ 'x-api-key': ['tok-4', 'tok-5'] })).toBe('tok-4');
  });

  it('prefers Bearer over X-Api-Key and ignores other schemes', () => {
    expect(extractPresentedKey({ authorization: 'Bearer tok-a', 'x-api-key': 'tok-b' })).toBe('tok-a');
    expect(extractPresentedKey({ authorization: 'Basic dXNlcjpwYXNz', 'x-api-key': 'tok-b' })).toBe('tok-b');
    expect(extractPresentedKey({ authorization: 'Basic dXNlcjpwYXNz' })).toBeUndefined();
    expect(extractPresentedKey({ authorization: 'Bearertok' })).toBeUndefined();
  });

  it('returns undefined when nothing is presented', () => {
    expect(extractPresentedKey({})).toBeUndefined();
    expect(extractPresentedKey({ authorization: 'Bearer ' })).toBeUndefined();
    expect(extractPresentedKey({ 'x-api-key': '  ' })).toBeUndefined();
  });

  it('feeds authorize end to end', () => {
    const ring = parseApiKeyConfig('write:writer-key-1');
    expect(ring.authorize(extractPresentedKey({ authorization: 'Bearer writer-key-1' }), 'write')).toBe('ok');
    expect(ring.authorize(extractPresentedKey({}), 'read')).toBe('missing');
  });
});
