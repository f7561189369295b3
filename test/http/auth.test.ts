/**
 * API keys over HTTP: the scope matrix (no key / wrong key / read key / write
 * key) on reads and writes, open system routes, and no key ever in the log.
 * Status codes per RFC 9110 §15.5.2 (401 with WWW-Authenticate) and §15.5.4 (403).
 */
import type { FastifyInstance, LightMyRequestResponse } from 'fastify';
import { afterEach, describe, expect, it } from 'vitest';
import { LOG_REDACT_CENSOR, serviceLoggerOptions } from '../../src/http/logger-options.ts';
import { testApp } from '../helpers/app.ts';
import { expectContract } from '../helpers/contract.ts';
import { benchCatalogue } from './fixtures/catalogues.ts';

const READ_KEY = 'r-key-123';
const WRITE_KEY = 'w-key-456';
const WRONG_KEY = 'wrong-key-789';
const KEYS = `read:${READ_KEY},write:${WRITE_KEY}`;

const apps: FastifyInstance[] = [];
afterEach(async () => {
  while (apps.length > 0) await apps.pop()!.close();
});

async function keyedApp(extra: Parameters<typeof testApp>[0] = {}): Promise<FastifyInstance> {
  const app = await testApp({ config: { apiKeys: KEYS }, ...extra });
  apps.push(app);
  return app;
}

type Who = 'none' | 'wrong' | 'read' | 'write';
function keyHeaders(who: Who, form: 'bearer' | 'x-api-key' = 'bearer'): Record<string, string> {
  const key = { none: undefined, wrong: WRONG_KEY, read: READ_KEY, write: WRITE_KEY }[who];
  if (key === undefined) return {};
  return form === 'bearer' ? { authorization: `Bearer ${key}` } : { 'x-api-key': key };
}

async function call(
  app: FastifyInstance,
  method: 'GET' | 'PUT' | 'DELETE',
  url: string,
  route: string,
  headers: Record<string, string>,
  payload?: unknown,
): Promise<LightMyRequestResponse> {
  const res = await app.inject({ method, url, headers, payload: payload as never });
  await expectContract(res, method, route);
  return res;
}

describe('scope matrix', () => {
  // [request, who, expected status]: reads need read scope, writes need write scope (write implies read).
  const matrix: [string, Who, number][] = [
    ['GET catalogues', 'none', 401],
    ['GET catalogues', 'wrong', 401],
    ['GET catalogues', 'read', 200],
    ['GET catalogues', 'write', 200],
    ['GET series', 'none', 401],
    ['GET series', 'read', 200],
    ['PUT catalogue', 'none', 401],
    ['PUT catalogue', 'wrong', 401],
    ['PUT catalogue', 'read', 403],
    ['PUT catalogue', 'write', 201],
    ['PUT amplifier', 'read', 403],
    ['PUT amplifier', 'write', 201],
    ['DELETE catalogue', 'none', 401],
    ['DELETE catalogue', 'read', 403],
    ['DELETE catalogue', 'write', 204],
  ];

  it.each(matrix)('%s with %s key -> %i', async (request, who, expected) => {
    const app = await keyedApp();
    // A catalogue to delete, written with the write key.
    const seeded = await call(app, 'PUT', '/v1/catalogues/seeded', '/v1/catalogues/:id', keyHeaders('write'), benchCatalogue());
    expect(seeded.statusCode).toBe(201);
    const headers = keyHeaders(who);
    let res: LightMyRequestResponse;
    switch (request) {
      case 'GET catalogues':
        res = await call(app, 'GET', '/v1/catalogues', '/v1/catalogues', headers);
        break;
      case 'GET series':
        res = await call(app, 'GET', '/v1/series/E24', '/v1/series/:name', headers);
        break;
      case 'PUT catalogue':
        res = await call(app, 'PUT', '/v1/catalogues/bench', '/v1/catalogues/:id', headers, benchCatalogue());
        break;
      case 'PUT amplifier':
        res = await call(app, 'PUT', '/v1/amplifiers/bench-amp', '/v1/amplifiers/:id', headers, { name: 'Bench amp' });
        break;
      default:
        res = await call(app, 'DELETE', '/v1/catalogues/seeded', '/v1/catalogues/:id', { ...headers, 'if-match': seeded.headers.etag as string });
    }
    expect(res.statusCode).toBe(expected);
    if (expected === 401) {
      expect(res.headers['www-authenticate']).toMatch(/^Bearer /);
      expect(res.json().code).toBe(who === 'none' ? 'api-key-required' : 'api-key-invalid');
    }
    if (expected === 403) expect(res.json().code).toBe('forbidden');
    // A refused write changed nothing.
    if (expected >= 400 && request.startsWith('DELETE')) {
      expect((await call(app, 'GET', '/v1/catalogues/seeded', '/v1/catalogues/:id', keyHeaders('read'))).statusCode).toBe(200);
    }
    if (expected >= 400 && request === 'PUT catalogue') {
      expect((await call(app, 'GET', '/v1/catalogues/bench', '/v1/catalogues/:id', keyHeaders('read'))).statusCode).toBe(404);
    }
  });

  it('accepts the key as X-Api-Key too', async () => {
    const app = await keyedApp();
    expect((await call(app, 'GET', '/v1/catalogues', '/v1/catalogues', keyHeaders('read', 'x-api-key'))).statusCode).toBe(200);
    expect((await call(app, 'PUT', '/v1/catalogues/bench', '/v1/catalogues/:id', keyHeaders('read', 'x-api-key'), benchCatalogue())).statusCode).toBe(403);
    expect((await call(app, 'PUT', '/v1/catalogues/bench', '/v1/catalogues/:id', keyHeaders('write', 'x-api-key'), benchCatalogue())).statusCode).toBe(201);
  });

  it('checks the key before the body: a read key with a malformed body gets 403, not a validation report', async () => {
    const app = await keyedApp();
    const res = await call(app, 'PUT', '/v1/catalogues/bench', '/v1/catalogues/:id', keyHeaders('read'), { parts: 'nope' });
    expect(res.statusCode).toBe(403);
  });

  it('keeps health, readiness and the contract open', async () => {
    const app = await keyedApp();
    expect((await call(app, 'GET', '/healthz', '/healthz', {})).statusCode).toBe(200);
    expect((await call(app, 'GET', '/readyz', '/readyz', {})).statusCode).toBe(200);
    // /openapi.json is the contract itself (hidden from it), so it is checked by content, not against itself.
    const doc = await app.inject({ method: 'GET', url: '/openapi.json' });
    expect(doc.statusCode).toBe(200);
    expect(doc.json().openapi).toBe('3.1.0');
  });

  it('runs open without keys configured', async () => {
    const app = await testApp({ config: { apiKeys: undefined } });
    apps.push(app);
    expect((await call(app, 'PUT', '/v1/catalogues/bench', '/v1/catalogues/:id', {}, benchCatalogue())).statusCode).toBe(201);
  });
});

describe('logging', () => {
  function capturedLogger(options: Record<string, unknown> = {}) {
    const lines: string[] = [];
    const logger = { ...serviceLoggerOptions('info'), ...options, stream: { write: (line: string) => void lines.push(line) } };
    return { logger, text: () => lines.join('') };
  }

  async function exercise(app: FastifyInstance): Promise<void> {
    const ua = { 'user-agent': 'tickwright-auth-test' };
    await app.inject({ method: 'GET', url: '/v1/catalogues', headers: { ...ua, ...keyHeaders('read') } });
    await app.inject({ method: 'PUT', url: '/v1/catalogues/bench', headers: { ...ua, ...keyHeaders('read') }, payload: benchCatalogue() });
    await app.inject({ method: 'PUT', url: '/v1/catalogues/bench', headers: { ...ua, ...keyHeaders('write', 'x-api-key') }, payload: benchCatalogue() });
    await app.inject({ method: 'GET', url: '/v1/catalogues', headers: { ...ua, ...keyHeaders('wrong') } });
    await app.inject({ method: 'GET', url: '/v1/catalogues', headers: { ...ua, cookie: `session=${WRONG_KEY}-cookie` } });
  }

  it('never writes a key with the service logger settings', async () => {
    const captured = capturedLogger();
    const app = await keyedApp({ logger: captured.logger });
    await exercise(app);
    const text = captured.text();
    expect(text).toContain('incoming request'); // fastify's per-request line: the requests were logged
    for (const key of [READ_KEY, WRITE_KEY, WRONG_KEY]) expect(text).not.toContain(key);
  });

  it('redacts key headers even when a serializer logs every request header', async () => {
    // An operator's debugging setup: the request serializer prints all headers.
    const captured = capturedLogger({
      serializers: { req: (req: { method: string; url: string; headers: unknown }) => ({ method: req.method, url: req.url, headers: req.headers }) },
    });
    const app = await keyedApp({ logger: captured.logger });
    await exercise(app);
    const text = captured.text();
    expect(text).toContain('tickwright-auth-test'); // headers do reach the log here...
    expect(text).toContain(LOG_REDACT_CENSOR); // ...with the key headers censored
    for (const key of [READ_KEY, WRITE_KEY, WRONG_KEY]) expect(text).not.toContain(key);
  });

  it('says at start-up when the service runs open, and not when keys are configured', async () => {
    const open = capturedLogger();
    apps.push(await testApp({ config: { apiKeys: undefined }, logger: open.logger }));
    const openLines = open.text().trim().split('\n').map((l) => JSON.parse(l) as { level: number; msg: string });
    // pino levels: 40 = warn.
    expect(openLines.some((l) => l.level === 40 && /open/i.test(l.msg))).toBe(true);

    const keyed = capturedLogger();
    apps.push(await testApp({ config: { apiKeys: KEYS }, logger: keyed.logger }));
    expect(keyed.text()).not.toMatch(/open to every caller/);
  });
});

describe('failed-key limit', () => {
  // Limiting failed authentication per client is common practice (OWASP Authentication Cheat Sheet,
  // "Protect against automated attacks"); 429 with Retry-After per RFC 6585 §4.
  it('answers 429 problem+json with Retry-After once a client exceeds the configured failures, correct key included', async () => {
    const app = await keyedApp({ config: { apiKeys: KEYS, authFailureLimit: 3, authFailureWindowMs: 60_000 } });
    const attempt = (who: Who) => app.inject({ method: 'GET', url: '/v1/catalogues', headers: keyHeaders(who) });
    // A missing key is not a guess: it does not count.
    expect((await attempt('none')).statusCode).toBe(401);
    for (let i = 0; i < 3; i++) expect((await attempt('wrong')).statusCode).toBe(401);
    const limited = await attempt('wrong');
    expect(limited.statusCode).toBe(429);
    await expectContract(limited, 'GET', '/v1/catalogues');
    expect(limited.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(limited.json().code).toBe('too-many-auth-failures');
    const retryAfterS = Number(limited.headers['retry-after']);
    expect(retryAfterS).toBeGreaterThanOrEqual(1);
    expect(retryAfterS).toBeLessThanOrEqual(60);
    // While over the limit even the right key is refused, so guessing cannot tell a hit from a miss.
    expect((await attempt('read')).statusCode).toBe(429);
    // Public routes stay reachable.
    expect((await app.inject({ method: 'GET', url: '/healthz' })).statusCode).toBe(200);
  });

  it('counts per client: another address is not limited', async () => {
    const app = await keyedApp({ config: { apiKeys: KEYS, authFailureLimit: 2, authFailureWindowMs: 60_000 } });
    for (let i = 0; i < 3; i++) await app.inject({ method: 'GET', url: '/v1/catalogues', headers: keyHeaders('wrong'), remoteAddress: '10.0.0.1' });
    expect((await app.inject({ method: 'GET', url: '/v1/catalogues', headers: keyHeaders('read'), remoteAddress: '10.0.0.1' })).statusCode).toBe(429);
    expect((await app.inject({ method: 'GET', url: '/v1/catalogues', headers: keyHeaders('read'), remoteAddress: '10.0.0.2' })).statusCode).toBe(200);
  });

  it('is off with a limit of 0', async () => {
    const app = await keyedApp({ config: { apiKeys: KEYS, authFailureLimit: 0 } });
    for (let i = 0; i < 30; i++) expect((await app.inject({ method: 'GET', url: '/v1/catalogues', headers: keyHeaders('wrong') })).statusCode).toBe(401);
  });
});
