/**
 * Stored catalogues over HTTP: create/replace/read/list/delete, ETag
 * preconditions (RFC 9110 §13.1), validation with JSON pointers, restart
 * persistence and two writers racing on the same ETag.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { FastifyInstance, LightMyRequestResponse } from 'fastify';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { CoreError } from '../../src/core/errors.ts';
import { getCatalogue } from '../../src/http/catalogue-source.ts';
import { openSqliteStore } from '../../src/store/index.ts';
import { testApp } from '../helpers/app.ts';
import { expectContract } from '../helpers/contract.ts';
import { benchCatalogue, resistorLines } from './fixtures/catalogues.ts';

const ONE = '/v1/catalogues/:id';
const LIST = '/v1/catalogues';

let app: FastifyInstance;
const cleanups: Array<() => Promise<void> | void> = [];
beforeEach(async () => {
  app = await testApp();
  cleanups.push(() => app.close());
});
afterEach(async () => {
  while (cleanups.length > 0) await cleanups.pop()!();
});

async function send(
  target: FastifyInstance,
  method: 'GET' | 'PUT' | 'DELETE',
  url: string,
  options: { payload?: unknown; headers?: Record<string, string> } = {},
): Promise<LightMyRequestResponse> {
  const res = await target.inject({ method, url, payload: options.payload as never, headers: options.headers });
  await expectContract(res, method, url === LIST ? LIST : ONE);
  return res;
}

const put = (url: string, payload: unknown, headers?: Record<string, string>) => send(app, 'PUT', url, { payload, headers });
const get = (url: string, headers?: Record<string, string>) => send(app, 'GET', url, { headers });
const del = (url: string, headers?: Record<string, string>) => send(app, 'DELETE', url, { headers });

function pointers(res: LightMyRequestResponse): string[] {
  return (res.json().errors ?? []).map((e: { pointer: string }) => e.pointer);
}

describe('PUT /v1/catalogues/{id}: create', () => {
  it('creates with 201, Location and ETag, and reads values per IEC 60062', async () => {
    const res = await put('/v1/catalogues/bench', benchCatalogue());
    expect(res.statusCode).toBe(201);
    expect(res.headers.location).toBe('/v1/catalogues/bench');
    const body = res.json();
    expect(res.headers.etag).toBe(body.etag);
    expect(body.etag).toMatch(/^"[^"]+"$/); // a strong, quoted entity tag (RFC 9110 §8.8.3)
    expect(body.version).toBe(1);
    // IEC 60062 RKM code: the letter stands for the decimal point and the multiplier.
    expect(body.parts[0].valueSi).toBe(4700); // "4K7" = 4.7 kΩ
    expect(body.parts[1].valueSi).toBe(0.47); // "R47" = 0.47 Ω
    expect(body.parts[3].valueSi).toBe(4.7e-9); // "4n7" = 4.7 nF
    expect(body.parts[4].valueSi).toBe(1e-7); // "100 nF" in SI-prefix form
    // The body is kept as sent.
    expect(body.parts.map((p: { value: unknown }) => p.value)).toEqual(benchCatalogue().parts.map((p) => p.value));
  });

  it('answers GET with the same representation and ETag, and 304 for If-None-Match', async () => {
    const created = (await put('/v1/catalogues/bench', benchCatalogue())).json();
    const res = await get('/v1/catalogues/bench');
    expect(res.statusCode).toBe(200);
    expect(res.json()).toEqual(created);
    expect(res.headers.etag).toBe(created.etag);
    const notModified = await get('/v1/catalogues/bench', { 'if-none-match': created.etag });
    expect(notModified.statusCode).toBe(304);
    expect(notModified.headers.etag).toBe(created.etag);
    // RFC 9110 §13.1.2: If-None-Match uses the weak comparison, so W/"x" matches "x".
    expect((await get('/v1/catalogues/bench', { 'if-none-match': `W/${created.etag}` })).statusCode).toBe(304);
    expect((await get('/v1/catalogues/bench', { 'if-none-match': '"0-other"' })).statusCode).toBe(200);
  });

  it('is create-only with If-None-Match: *', async () => {
    expect((await put('/v1/catalogues/bench', benchCatalogue(), { 'if-none-match': '*' })).statusCode).toBe(201);
    const again = await put('/v1/catalogues/bench', benchCatalogue(), { 'if-none-match': '*' });
    expect(again.statusCode).toBe(412);
  });

  it('refuses If-Match on an id that does not exist (RFC 9110 §13.1.1)', async () => {
    const res = await put('/v1/catalogues/nothing-here', benchCatalogue(), { 'if-match': '*' });
    expect(res.statusCode).toBe(412);
    expect((await get('/v1/catalogues/nothing-here')).statusCode).toBe(404);
  });

  it('takes the largest allowed catalogue (20000 parts) and refuses one more', async () => {
    const ok = await put('/v1/catalogues/big', { parts: resistorLines(20_000) });
    expect(ok.statusCode).toBe(201);
    expect(ok.json().parts).toHaveLength(20_000);
    const tooMany = await put('/v1/catalogues/bigger', { parts: resistorLines(20_001) });
    expect(tooMany.statusCode).toBe(400);
    expect(pointers(tooMany)).toContain('/parts');
  });
});

describe('PUT /v1/catalogues/{id}: update preconditions', () => {
  async function created() {
    return (await put('/v1/catalogues/bench', benchCatalogue())).json() as { etag: string };
  }

  it('428 without If-Match, 412 with a stale one, 200 with the current one', async () => {
    const first = await created();
    const missing = await put('/v1/catalogues/bench', benchCatalogue('renamed'));
    expect(missing.statusCode).toBe(428);
    expect(missing.json().code).toBe('precondition-required');

    const updated = await put('/v1/catalogues/bench', benchCatalogue('renamed'), { 'if-match': first.etag });
    expect(updated.statusCode).toBe(200);
    expect(updated.json().version).toBe(2);
    expect(updated.json().name).toBe('renamed');
    expect(updated.headers.etag).not.toBe(first.etag);
    expect(updated.headers.location).toBeUndefined();

    const stale = await put('/v1/catalogues/bench', benchCatalogue('lost update'), { 'if-match': first.etag });
    expect(stale.statusCode).toBe(412);
    expect((await get('/v1/catalogues/bench')).json().name).toBe('renamed');
  });

  it('accepts a list of tags when one is current, and * (RFC 9110 §13.1.1)', async () => {
    const first = await created();
    const listed = await put('/v1/catalogues/bench', benchCatalogue('v2'), { 'if-match': `"9-0000000000000000", ${first.etag}` });
    expect(listed.statusCode).toBe(200);
    const star = await put('/v1/catalogues/bench', benchCatalogue('v3'), { 'if-match': '*' });
    expect(star.statusCode).toBe(200);
    expect(star.json().version).toBe(3);
  });

  it('never matches a weak tag or an unquoted one in If-Match (strong comparison, RFC 9110 §8.8.3.2)', async () => {
    const first = await created();
    expect((await put('/v1/catalogues/bench', benchCatalogue('x'), { 'if-match': `W/${first.etag}` })).statusCode).toBe(412);
    expect((await put('/v1/catalogues/bench', benchCatalogue('x'), { 'if-match': first.etag.slice(1, -1) })).statusCode).toBe(412);
  });

  it('a rejected update leaves the stored version untouched', async () => {
    const first = await created();
    const bad = benchCatalogue('should not land');
    bad.parts[2].value = '4k7k';
    const res = await put('/v1/catalogues/bench', bad, { 'if-match': first.etag });
    expect(res.statusCode).toBe(400);
    const after = await get('/v1/catalogues/bench');
    expect(after.headers.etag).toBe(first.etag);
    expect(after.json().name).toBe('Bench clock parts');
  });
});

describe('PUT /v1/catalogues/{id}: validation', () => {
  it('points at the one bad value in a long list (/parts/17/value)', async () => {
    const parts = resistorLines(20);
    parts[17].value = '4k7k';
    const res = await put('/v1/catalogues/bench', { parts });
    expect(res.statusCode).toBe(400);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(pointers(res)).toEqual(['/parts/17/value']);
  });

  type Mutation = (parts: ReturnType<typeof benchCatalogue>['parts']) => void;
  it.each<[string, Mutation, string]>([
    ['a capacitance on a resistor line', (p) => (p[0].value = '10nF'), '/parts/0/value'],
    ['a zero value', (p) => (p[0].value = 0), '/parts/0/value'],
    ['an unknown dielectric code', (p) => (p[3].dielectric = 'Q9Z'), '/parts/3/dielectric'],
    ['a dielectric on a resistor', (p) => (p[0].dielectric = 'C0G'), '/parts/0/dielectric'],
    ['a tolerance of 100 %', (p) => (p[1].tolerance = 1), '/parts/1/tolerance'],
    ['a zero tolerance', (p) => (p[1].tolerance = 0), '/parts/1/tolerance'],
    ['an unknown status', (p) => ((p[2] as { status: string }).status = 'obsolete'), '/parts/2/status'],
    ['an unknown kind', (p) => ((p[2] as { kind: string }).kind = 'inductor'), '/parts/2/kind'],
    ['a repeated part number', (p) => (p[4].partNumber = p[1].partNumber), '/parts/4/partNumber'],
    ['a missing part number', (p) => delete (p[4] as { partNumber?: string }).partNumber, '/parts/4/partNumber'],
    ['a negative rated voltage', (p) => (p[3].ratedVoltageV = -5), '/parts/3/ratedVoltageV'],
    ['an unknown field', (p) => ((p[0] as unknown as Record<string, unknown>).colour = 'blue'), '/parts/0/colour'],
  ])('rejects %s with 400 at the field', async (_what, mutate, pointer) => {
    const body = benchCatalogue();
    mutate(body.parts);
    const res = await put('/v1/catalogues/bench', body);
    expect(res.statusCode).toBe(400);
    expect(pointers(res)).toContain(pointer);
    expect((await get('/v1/catalogues/bench')).statusCode).toBe(404);
  });

  it('rejects an empty parts list, a bad id and a non-JSON body', async () => {
    const empty = await put('/v1/catalogues/bench', { parts: [] });
    expect(empty.statusCode).toBe(400);
    expect(pointers(empty)).toContain('/parts');
    const badId = await put('/v1/catalogues/Bad%20Id', benchCatalogue());
    expect(badId.statusCode).toBe(400);
    const notJson = await send(app, 'PUT', '/v1/catalogues/bench', { payload: '{"parts": [', headers: { 'content-type': 'application/json' } });
    expect(notJson.statusCode).toBe(400);
  });
});

describe('GET /v1/catalogues', () => {
  it('lists summaries with part counts, ordered by id, and follows updates and deletes', async () => {
    expect((await get(LIST)).json()).toEqual({ catalogues: [] });
    const b = (await put('/v1/catalogues/b-second', benchCatalogue('Second'))).json();
    await put('/v1/catalogues/a-first', { parts: resistorLines(3) });
    let list = (await get(LIST)).json().catalogues;
    expect(list.map((c: { id: string }) => c.id)).toEqual(['a-first', 'b-second']);
    expect(list[0].name).toBeUndefined();
    // benchCatalogue(): 3 resistors (one not for new designs) and 2 capacitors.
    expect(list[1]).toMatchObject({ name: 'Second', version: 1, etag: b.etag, partCounts: { total: 5, resistors: 3, capacitors: 2, notForNewDesigns: 1 } });
    expect(list[1].parts).toBeUndefined();

    await put('/v1/catalogues/b-second', { name: 'Second, trimmed', parts: resistorLines(2) }, { 'if-match': b.etag });
    await del('/v1/catalogues/a-first', { 'if-match': list[0].etag });
    list = (await get(LIST)).json().catalogues;
    expect(list).toHaveLength(1);
    expect(list[0]).toMatchObject({ id: 'b-second', name: 'Second, trimmed', version: 2, partCounts: { total: 2, resistors: 2, capacitors: 0 } });
  });
});

describe('DELETE /v1/catalogues/{id}', () => {
  it('428 without If-Match, 412 stale, 204 current, then 404', async () => {
    const first = (await put('/v1/catalogues/bench', benchCatalogue())).json();
    expect((await del('/v1/catalogues/bench')).statusCode).toBe(428);
    expect((await del('/v1/catalogues/bench', { 'if-match': '"1-0000000000000000"' })).statusCode).toBe(412);
    expect((await del('/v1/catalogues/bench', { 'if-match': first.etag })).statusCode).toBe(204);
    expect((await get('/v1/catalogues/bench')).statusCode).toBe(404);
    expect((await del('/v1/catalogues/bench', { 'if-match': first.etag })).statusCode).toBe(404);
  });

  it('an ETag of a deleted catalogue does not match its re-creation', async () => {
    const first = (await put('/v1/catalogues/bench', benchCatalogue())).json();
    await del('/v1/catalogues/bench', { 'if-match': first.etag });
    const again = (await put('/v1/catalogues/bench', benchCatalogue())).json();
    expect(again.version).toBe(1);
    expect((await put('/v1/catalogues/bench', benchCatalogue('stale'), { 'if-match': first.etag })).statusCode).toBe(412);
  });
});

describe('getCatalogue (for design and snap)', () => {
  it('returns parts in SI units with canonical dielectric codes', async () => {
    await put('/v1/catalogues/bench', benchCatalogue());
    const catalogue = await getCatalogue(app.services, 'bench', '/catalogue');
    expect(catalogue.id).toBe('bench');
    expect(catalogue.name).toBe('Bench clock parts');
    expect(catalogue.parts.map((p) => p.value)).toEqual([4700, 0.47, 100000, 4.7e-9, 1e-7]);
    // EIA-198: NP0 is the older name of the class I code C0G.
    expect(catalogue.parts[3].dielectric).toBe('C0G');
    expect(catalogue.parts[4].dielectric).toBe('X7R');
    expect(catalogue.parts[0]).toMatchObject({ tempcoPpmPerK: 100, package: '0603', status: 'preferred', partNumber: 'TW-R-0001' });
  });

  it('throws unknown-reference at the caller pointer for a missing id', async () => {
    let caught: unknown;
    try {
      await getCatalogue(app.services, 'not-stored', '/catalogue');
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(CoreError);
    expect((caught as CoreError).code).toBe('unknown-reference');
    expect((caught as CoreError).pointer).toBe('/catalogue');
  });
});

describe('persistence and concurrent writers (file store)', () => {
  function tempDbFile(): string {
    const dir = mkdtempSync(path.join(tmpdir(), 'tickwright-http-'));
    cleanups.unshift(() => rmSync(dir, { recursive: true, force: true })); // removed after the apps close
    return path.join(dir, 'store.db');
  }

  it('keeps catalogues across an application restart', async () => {
    const file = tempDbFile();
    const first = await testApp({ store: openSqliteStore(file) });
    const created = (await send(first, 'PUT', '/v1/catalogues/bench', { payload: benchCatalogue() })).json();
    await first.close();
    await first.services.store.close();

    const second = await testApp({ store: openSqliteStore(file) });
    cleanups.push(async () => {
      await second.close();
      await second.services.store.close();
    });
    const res = await send(second, 'GET', '/v1/catalogues/bench');
    expect(res.statusCode).toBe(200);
    expect(res.json()).toEqual(created);
  });

  it('of two updates holding the same ETag exactly one wins, the other gets 412', async () => {
    const file = tempDbFile();
    // Two app instances on one database file: two replicas sharing a store.
    const replicas = await Promise.all([testApp({ store: openSqliteStore(file) }), testApp({ store: openSqliteStore(file) })]);
    for (const r of replicas) {
      cleanups.push(async () => {
        await r.close();
        await r.services.store.close();
      });
    }
    const created = (await send(replicas[0], 'PUT', '/v1/catalogues/bench', { payload: benchCatalogue() })).json();
    const results = await Promise.all(
      replicas.map((r, i) => send(r, 'PUT', '/v1/catalogues/bench', { payload: benchCatalogue(`editor ${i}`), headers: { 'if-match': created.etag } })),
    );
    const statuses = results.map((r) => r.statusCode).sort();
    expect(statuses).toEqual([200, 412]);
    const winner = results.find((r) => r.statusCode === 200)!.json();
    const stored = (await send(replicas[1], 'GET', '/v1/catalogues/bench')).json();
    expect(stored.version).toBe(2);
    expect(stored.name).toBe(winner.name);
  });
});
