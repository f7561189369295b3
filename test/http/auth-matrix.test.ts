/**
 * Access is decided from the route the router matched, whatever form the
 * request target takes (RFC 9112 §3.2: origin form, absolute form; the router
 * also normalises `//`, `/./`, `%2F` and trailing slashes in its own way). Every
 * route the app registers × every credential kind × every target form, sent
 * over a real socket because inject and fetch normalise targets before sending.
 *
 * Expected statuses: RFC 9110 §15.5.2 (401 without valid credentials) and
 * §15.5.4 (403 when the credentials lack the permission).
 */
import type { AddressInfo } from 'node:net';
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RouteTableEntry } from '../../src/http/auth/route-access.ts';
import { testApp } from '../helpers/app.ts';
import { benchCatalogue } from './fixtures/catalogues.ts';
import { inBatches, rawRequest, type RawResponse } from './fixtures/raw-http.ts';

const READ_KEY = 'matrix-read-key';
const WRITE_KEY = 'matrix-write-key';
const WRONG_KEY = 'matrix-wrong-key';

type Credential = 'none' | 'wrong' | 'read' | 'write';
const CREDENTIALS: Credential[] = ['none', 'wrong', 'read', 'write'];
type TargetForm = 'origin' | 'absolute' | 'double-slash' | 'encoded-slash' | 'dot-segment' | 'trailing-slash' | 'HEAD' | 'OPTIONS';
const FORMS: TargetForm[] = ['origin', 'absolute', 'double-slash', 'encoded-slash', 'dot-segment', 'trailing-slash', 'HEAD', 'OPTIONS'];

let app: FastifyInstance;
let port: number;

beforeAll(async () => {
  // The failure limit is off here (0): the matrix sends hundreds of wrong keys on purpose.
  app = await testApp({ config: { apiKeys: `read:${READ_KEY},write:${WRITE_KEY}`, authFailureLimit: 0 } });
  await app.listen({ port: 0, host: '127.0.0.1' });
  port = (app.server.address() as AddressInfo).port;
});
afterAll(async () => {
  await app.close();
});

/** A concrete path for a route pattern: parameters and wildcards filled with a harmless value. */
function concretePath(pattern: string): string {
  return pattern
    .split('/')
    .map((segment) => (segment.startsWith(':') ? 'm1' : segment === '*' ? 'x' : segment))
    .join('/');
}

function target(path: string, form: TargetForm): string {
  switch (form) {
    case 'absolute':
      return `http://x${path}`;
    case 'double-slash':
      return `/${path}`;
    case 'encoded-slash': {
      const second = path.indexOf('/', 1);
      return second > 0 ? `${path.slice(0, second)}%2F${path.slice(second + 1)}` : `${path}%2F`;
    }
    case 'dot-segment':
      return `/.${path}`;
    case 'trailing-slash':
      return path.endsWith('/') ? path : `${path}/`;
    default:
      return path;
  }
}

function credentialHeader(credential: Credential): string {
  const key = { none: undefined, wrong: WRONG_KEY, read: READ_KEY, write: WRITE_KEY }[credential];
  return key === undefined ? '' : `\r\nauthorization: Bearer ${key}`;
}

function send(route: RouteTableEntry, credential: Credential, form: TargetForm): Promise<RawResponse> {
  const method = form === 'HEAD' || form === 'OPTIONS' ? form : route.method;
  const hasBody = method === 'POST' || method === 'PUT' || method === 'PATCH';
  const head = `${method} ${target(concretePath(route.url), form)} HTTP/1.1\r\nhost: 127.0.0.1${credentialHeader(credential)}${hasBody ? '\r\ncontent-type: application/json' : ''}`;
  return rawRequest(port, head, hasBody ? '{}' : '');
}

describe('auth matrix over a real socket', () => {
  it('enumerates the routes from the app, each with a declared or derived access', () => {
    const routes = app.routeTable;
    // Every /v1 write method needs write; health, readiness, metrics and the contract are public.
    expect(routes.length).toBeGreaterThan(20);
    for (const r of routes) {
      if (r.url.startsWith('/v1/') && ['PUT', 'PATCH', 'DELETE'].includes(r.method)) expect(r.access, `${r.method} ${r.url}`).toBe('write');
      if (r.url.startsWith('/v1/')) expect(r.access, `${r.method} ${r.url}`).not.toBe('public');
    }
    for (const open of ['/healthz', '/readyz', '/metrics', '/openapi.json']) {
      expect(routes.find((r) => r.url === open && r.method === 'GET')?.access, open).toBe('public');
    }
  });

  it('every route × credential × target form: no way past the keys', async () => {
    const cases = app.routeTable.flatMap((route) => CREDENTIALS.flatMap((credential) => FORMS.map((form) => ({ route, credential, form }))));
    const outcomes = await inBatches(cases, 12, async (c) => ({ ...c, res: await send(c.route, c.credential, c.form) }));
    const failures: string[] = [];
    for (const { route, credential, form, res } of outcomes) {
      const label = `${route.method} ${route.url} [${route.access}] ${credential} ${form} -> ${res.status}`;
      const status = res.status;
      if (status >= 500) failures.push(`${label}: server error`);
      if (route.access === 'public') {
        if (['origin', 'absolute', 'HEAD'].includes(form) && [401, 403, 429].includes(status)) failures.push(`${label}: public route refused`);
        continue;
      }
      if (credential === 'none' || credential === 'wrong') {
        // Whatever the router makes of the target, a caller without a valid key gets 401 and nothing else.
        if (status !== 401) failures.push(`${label}: expected 401`);
        else if (form !== 'HEAD' && route.method !== 'HEAD' && !/"code":"api-key-(required|invalid)"/.test(res.body)) failures.push(`${label}: 401 without its problem body`);
      } else if (credential === 'read' && route.access === 'write') {
        // Matched: 403. A form the router does not match: 404/405 (nothing runs).
        if (![403, 404, 405].includes(status)) failures.push(`${label}: a read key must not write`);
      } else if (status === 401 || status === 403) {
        failures.push(`${label}: a sufficient key was refused`);
      }
    }
    expect(failures, failures.slice(0, 30).join('\n')).toEqual([]);
    expect(outcomes.length).toBeGreaterThan(20 * 4 * 8);
  }, 60_000);

  it('absolute-form PUT and DELETE without a key are refused and change nothing (regression)', async () => {
    const body = JSON.stringify(benchCatalogue());
    const json = '\r\ncontent-type: application/json';
    const created = await rawRequest(port, `PUT /v1/catalogues/abs-seeded HTTP/1.1\r\nhost: 127.0.0.1${credentialHeader('write')}${json}`, body);
    expect(created.status).toBe(201);

    const put = await rawRequest(port, `PUT http://x/v1/catalogues/abs-new HTTP/1.1\r\nhost: 127.0.0.1${json}`, body);
    expect(put.status).toBe(401);
    const del = await rawRequest(port, `DELETE http://x/v1/catalogues/abs-seeded HTTP/1.1\r\nhost: 127.0.0.1\r\nif-match: ${created.headers.etag}`);
    expect(del.status).toBe(401);
    // A read key on the same absolute-form write: 403.
    const readDel = await rawRequest(port, `DELETE http://x/v1/catalogues/abs-seeded HTTP/1.1\r\nhost: 127.0.0.1${credentialHeader('read')}\r\nif-match: ${created.headers.etag}`);
    expect(readDel.status).toBe(403);

    const get = (id: string) => rawRequest(port, `GET /v1/catalogues/${id} HTTP/1.1\r\nhost: 127.0.0.1${credentialHeader('read')}`);
    expect((await get('abs-new')).status).toBe(404);
    expect((await get('abs-seeded')).status).toBe(200);
    // The write key in absolute form works like the origin form (the router's match decides both).
    const ok = await rawRequest(port, `DELETE http://x/v1/catalogues/abs-seeded HTTP/1.1\r\nhost: 127.0.0.1${credentialHeader('write')}\r\nif-match: ${created.headers.etag}`);
    expect(ok.status).toBe(204);
  });
});
