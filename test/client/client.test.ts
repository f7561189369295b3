/**
 * The typed client (client/): its generated types are in step with the
 * committed contract, and it talks to a real server listening on loopback —
 * answers, problems, ETag preconditions (RFC 9110 §13.1.1) and API keys.
 */
import { readFileSync } from 'node:fs';
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CONTRACT_PATH, SCHEMA_PATH, generateSchemaSource } from '../../client/generate.ts';
import { createTickwrightClient, type Schemas } from '../../client/src/index.ts';
import { testApp } from '../helpers/app.ts';

const READ_KEY = 'client-read-key';
const WRITE_KEY = 'client-write-key';

/** A scenario of our own (README): 5 V single supply, 15 kΩ / 10 nF, equal 100 kΩ hysteresis divider. */
const PROBE_CLOCK: Schemas['Circuit'] = {
  topology: 'three-resistor-divider',
  supply: { positiveV: 5 },
  amplifier: 'cmos-rrio-fast',
  parts: { rTiming: '15k', cTiming: '10n', rTop: '100k', rBottom: '100k', rFeedback: '100k' },
};

async function listening(app: FastifyInstance): Promise<string> {
  await app.listen({ port: 0, host: '127.0.0.1' });
  const address = app.server.address();
  if (address === null || typeof address === 'string') throw new Error('no TCP address');
  return `http://127.0.0.1:${address.port}`;
}

describe('generated types', () => {
  it('are what openapi-typescript makes of the committed contract (run npm run client:generate)', async () => {
    const contract = JSON.parse(readFileSync(CONTRACT_PATH, 'utf8')) as object;
    const regenerated = await generateSchemaSource(contract);
    const committed = readFileSync(SCHEMA_PATH, 'utf8');
    expect(committed === regenerated, `${SCHEMA_PATH} is stale: run npm run client:generate and commit it`).toBe(true);
  });
});

describe('client against a server on loopback', () => {
  let app: FastifyInstance;
  let baseUrl: string;
  beforeAll(async () => {
    app = await testApp();
    baseUrl = await listening(app);
  });
  afterAll(async () => app.close());

  it('analyses the README circuit: the same answer as the route in-process, near the textbook period', async () => {
    const tw = createTickwrightClient({ baseUrl });
    const { data, error, response } = await tw.POST('/v1/analyze', { body: PROBE_CLOCK });
    expect(error).toBeUndefined();
    expect(response.status).toBe(200);
    const direct = await app.inject({ method: 'POST', url: '/v1/analyze', payload: PROBE_CLOCK });
    expect(data).toEqual(direct.json());
    // Textbook (Horowitz & Hill, The Art of Electronics, Schmitt-trigger relaxation oscillator): thresholds at
    // V/3 and 2V/3 give T = 2·R·C·ln 2 for an ideal rail-to-rail output; the class-typical non-idealities
    // (headroom, output resistance, delay, slew) move it by a few per cent, not more.
    const textbookHz = 1 / (2 * 15e3 * 10e-9 * Math.log(2));
    expect(Math.abs(data!.frequencyHz / textbookHz - 1)).toBeLessThan(0.03);
    expect(data!.thresholds.upperV).toBeGreaterThan(data!.thresholds.lowerV);
  });

  it('returns problems as typed errors with a JSON pointer', async () => {
    const tw = createTickwrightClient({ baseUrl });
    const bad = { ...PROBE_CLOCK, parts: { ...PROBE_CLOCK.parts, cTiming: 'ten nano' } };
    const { data, error, response } = await tw.POST('/v1/analyze', { body: bad });
    expect(data).toBeUndefined();
    expect(response.status).toBe(400);
    expect(response.headers.get('content-type')).toContain('application/problem+json');
    expect(error!.errors?.map((e) => e.pointer)).toContain('/parts/cTiming');
  });

  it('creates, reads and conditionally replaces a catalogue (If-Match, 412 on a stale ETag)', async () => {
    const tw = createTickwrightClient({ baseUrl });
    const body: Schemas['CatalogueWrite'] = {
      name: 'Client test parts',
      parts: [{ kind: 'capacitor', value: '10n', tolerance: 0.05, dielectric: 'C0G', partNumber: 'CT-1', status: 'preferred' }],
    };
    const created = await tw.PUT('/v1/catalogues/{id}', { params: { path: { id: 'client-test' } }, body });
    expect(created.response.status).toBe(201);
    const etag = created.response.headers.get('etag')!;
    expect(created.data!.etag).toBe(etag);
    // IEC 60062: "10n" is 10 nF.
    expect(created.data!.parts[0].valueSi).toBeCloseTo(10e-9, 20);

    const replaced = await tw.PUT('/v1/catalogues/{id}', {
      params: { path: { id: 'client-test' }, header: { 'if-match': etag } },
      body: { ...body, name: 'Client test parts, rev 2' },
    });
    expect(replaced.response.status).toBe(200);
    expect(replaced.data!.version).toBe(2);

    const stale = await tw.PUT('/v1/catalogues/{id}', { params: { path: { id: 'client-test' }, header: { 'if-match': etag } }, body });
    expect(stale.response.status).toBe(412);
    expect(stale.error!.status).toBe(412);

    const read = await tw.GET('/v1/catalogues/{id}', { params: { path: { id: 'client-test' } } });
    expect(read.data!.name).toBe('Client test parts, rev 2');
  });
});

describe('client with API keys', () => {
  let app: FastifyInstance;
  let baseUrl: string;
  beforeAll(async () => {
    app = await testApp({ config: { apiKeys: `read:${READ_KEY},write:${WRITE_KEY}` } });
    baseUrl = await listening(app);
  });
  afterAll(async () => app.close());

  it('sends the key as a bearer token: 401 without, 200 with (RFC 6750 §2.1)', async () => {
    const anonymous = await createTickwrightClient({ baseUrl }).GET('/v1/amplifiers');
    expect(anonymous.response.status).toBe(401);
    const keyed = await createTickwrightClient({ baseUrl, apiKey: READ_KEY }).GET('/v1/amplifiers');
    expect(keyed.response.status).toBe(200);
    expect(keyed.data!.amplifiers.some((a) => a.id === 'cmos-rrio-fast')).toBe(true);
  });

  it('uses a fetch of the caller’s own', async () => {
    const seen: string[] = [];
    const tw = createTickwrightClient({
      baseUrl: baseUrl + '/',
      apiKey: READ_KEY,
      fetch: (request) => {
        seen.push(`${request.method} ${new URL(request.url).pathname} ${request.headers.get('authorization')}`);
        return fetch(request);
      },
    });
    const { data } = await tw.GET('/v1/series/{name}', { params: { path: { name: 'E6' } } });
    // IEC 60063: the E6 series is 1.0, 1.5, 2.2, 3.3, 4.7, 6.8.
    expect(data!.values.slice(0, 6)).toEqual([1, 1.5, 2.2, 3.3, 4.7, 6.8]);
    expect(seen).toEqual([`GET /v1/series/E6 Bearer ${READ_KEY}`]);
  });
});
