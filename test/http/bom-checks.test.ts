/**
 * POST /v1/bom-checks over HTTP: the binding request shape, JSON and NDJSON
 * answers validated against the OpenAPI document, bad assemblies failing alone,
 * request-level errors, a stored catalogue, and a 5000-assembly stream.
 */
import Ajv2020Module from 'ajv/dist/2020.js';
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectContract, openApiDocument } from '../helpers/contract.ts';
import { testApp } from '../helpers/app.ts';

const Ajv2020 = (Ajv2020Module as unknown as { default: typeof Ajv2020Module.default }).default ?? Ajv2020Module;

let app: FastifyInstance;
// Other suites share this machine: keep load shedding out of the way of these heavy batches.
const CONFIG = { config: { maxEventLoopDelayMs: 0 } };
beforeAll(async () => {
  app = await testApp(CONFIG);
});
afterAll(async () => app.close());

// Our own scenario: a 5 V clock for a greenhouse fan-speed sensor, ~7 kHz from 22 kΩ and 4.7 nF;
// three equal threshold resistors give T = 2·ln2·R·C (Sedra & Smith, op-amp astable section).
const NOMINAL_HZ = 1 / (2 * Math.LN2 * 22e3 * 4.7e-9);
const clean = {
  id: 'fan-sense-rev-c',
  lines: [
    { refdes: 'R1', value: '22K 1% 0603', partNumber: 'RES-22K-1' },
    { refdes: 'C1', value: '4n7 50V C0G 2%', partNumber: 'CAP-4N7-C0G' },
    { refdes: 'R2, R3, R4', value: '68K 1% 0603' },
    { refdes: 'U1', value: 'op-amp' },
  ],
  roles: { rTiming: 'R1', cTiming: 'C1', rTop: 'R2', rBottom: 'R3', rFeedback: 'R4' },
  topology: 'three-resistor-divider',
  amplifier: 'ideal',
  supply: { positiveV: 5, tolerance: 0.02 },
  temperature: { minC: 0, maxC: 50 },
  spec: { frequencyHz: NOMINAL_HZ, frequencyTolerance: 0.1, dutyMin: 0.4, dutyMax: 0.6 },
  series: 'E24',
};

async function post(payload: unknown, headers: Record<string, string> = {}) {
  return app.inject({ method: 'POST', url: '/v1/bom-checks', payload: payload as object, headers });
}

/** Validates every NDJSON line against the document's BomCheckResult schema (the helper reads JSON bodies only). */
async function ndjsonValidator() {
  const doc = await openApiDocument();
  const ajv = new Ajv2020({ strict: false, allErrors: true });
  ajv.addSchema(doc as object, 'openapi');
  const pointer = 'openapi#/paths/~1v1~1bom-checks/post/responses/200/content/application~1x-ndjson/schema';
  const validate = ajv.getSchema(pointer);
  expect(validate, pointer).toBeDefined();
  return validate!;
}

describe('POST /v1/bom-checks (JSON)', () => {
  it('passes a clean assembly and fails a bad one in the same batch', async () => {
    const bad = { ...clean, id: 'bad-rev', amplifier: 'no-such-amp', lines: [{ refdes: 'R1', value: '4700' }] };
    const res = await post({ assemblies: [clean, bad] });
    await expectContract(res, 'POST', '/v1/bom-checks');
    expect(res.statusCode).toBe(200);
    const body = res.json();
    expect(body.summary).toEqual({ assemblies: 2, passed: 1, failed: 1 });
    const [ok, ko] = body.results;
    expect(ok).toMatchObject({ id: 'fan-sense-rev-c', index: 0, pass: true });
    const f = ok.rules.find((r: { code: string }) => r.code === 'frequency-within-spec');
    expect(f.figures.nominalFrequencyHz).toBeCloseTo(NOMINAL_HZ, 6);
    expect(ko.pass).toBe(false);
    const codes = ko.rules.map((r: { code: string }) => r.code);
    expect(codes).toContain('amplifier-unresolved');
    expect(codes).toContain('refdes-missing');
    // IEC 60062: "4700" could be 4700 Ω or the 4-digit code 470 Ω; it is refused, not guessed.
    expect(codes).toContain('value-unreadable');
  });

  it('checks part numbers against a stored catalogue', async () => {
    const put = await app.inject({
      method: 'PUT',
      url: '/v1/catalogues/greenhouse-approved',
      payload: {
        parts: [
          { kind: 'resistor', value: '22k', tolerance: 0.01, partNumber: 'RES-22K-1', status: 'preferred' },
          { kind: 'capacitor', value: '4.7n', tolerance: 0.02, dielectric: 'C0G', ratedVoltageV: 50, partNumber: 'CAP-4N7-C0G', status: 'not-for-new-designs' },
        ],
      },
    });
    expect([200, 201]).toContain(put.statusCode);
    const res = await post({ assemblies: [{ ...clean, catalogue: 'greenhouse-approved' }, { ...clean, id: 'no-cat', catalogue: 'nope' }] });
    await expectContract(res, 'POST', '/v1/bom-checks');
    const [withCat, missing] = res.json().results;
    const nfnd = withCat.rules.find((r: { code: string }) => r.code === 'part-not-for-new-designs');
    expect(nfnd.refdes).toBe('C1');
    expect(withCat.rules.filter((r: { code: string }) => r.code === 'value-not-in-catalogue').map((r: { refdes: string }) => r.refdes)).toEqual(['R2', 'R3', 'R4']);
    expect(missing.rules.map((r: { code: string }) => r.code)).toContain('catalogue-unavailable');
  });

  it('rejects request-level mistakes with problem+json: not an array, too many assemblies, unknown fields', async () => {
    for (const payload of [
      { assemblies: { id: 'x' } },
      { assemblies: Array.from({ length: 5001 }, () => clean) },
      { assemblies: [{ ...clean, colour: 'green' }] },
      { assemblies: [] },
    ]) {
      const res = await post(payload);
      await expectContract(res, 'POST', '/v1/bom-checks');
      expect(res.statusCode).toBe(400);
      expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
      expect(res.json().errors[0].pointer).toMatch(/^\/assemblies/);
    }
  });
});

describe('POST /v1/bom-checks (NDJSON)', () => {
  it('streams one valid result per line, in request order', async () => {
    const validate = await ndjsonValidator();
    const res = await post({ assemblies: [clean, { ...clean, id: 'y5v', lines: [...clean.lines.slice(0, 1), { refdes: 'C1', value: '4n7 50V Y5V' }, clean.lines[2]] }] }, { accept: 'application/x-ndjson' });
    expect(res.statusCode).toBe(200);
    expect(res.headers['content-type']).toMatch(/^application\/x-ndjson/);
    const doc = await openApiDocument();
    expect(Object.keys(doc.paths['/v1/bom-checks'].post.responses['200'].content ?? {})).toContain('application/x-ndjson');
    const lines = res.body.split('\n').filter(Boolean).map((l) => JSON.parse(l));
    expect(lines.map((l) => l.id)).toEqual(['fan-sense-rev-c', 'y5v']);
    for (const l of lines) expect(validate(l), JSON.stringify(validate.errors)).toBe(true);
    expect(lines[1].pass).toBe(false);
    expect(lines[1].rules.map((r: { code: string }) => r.code)).toContain('dielectric-unfit-for-timing');
  });

  it('streams and completes a 5000-assembly batch with bounded memory, one bad assembly among them', async () => {
    const validate = await ndjsonValidator();
    const assemblies = Array.from({ length: 5000 }, (_, i) => {
      // Every 97th assembly has an unreadable timing resistor; the rest vary R1 over E24 values.
      const e24 = [10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30][i % 12];
      const value = i % 97 === 0 ? '??' : `${e24}K 1%`;
      return { ...clean, id: `asm-${i}`, lines: [{ refdes: 'R1', value }, ...clean.lines.slice(1)], spec: { ...clean.spec, frequencyHz: NOMINAL_HZ * (22 / e24) } };
    });
    const heapBefore = process.memoryUsage().heapUsed;
    const res = await post({ assemblies, options: { mode: 'worst-case' } }, { accept: 'application/x-ndjson' });
    expect(res.statusCode).toBe(200);
    const lines = res.body.split('\n').filter(Boolean);
    expect(lines).toHaveLength(5000);
    let failed = 0;
    lines.forEach((text, i) => {
      const r = JSON.parse(text);
      expect(r.index).toBe(i);
      if (i % 250 === 0) expect(validate(r), JSON.stringify(validate.errors)).toBe(true);
      if (!r.pass) failed++;
    });
    expect(failed).toBe(Math.ceil(5000 / 97));
    // inject() buffers the whole response body; the server side holds one slice of results at a time.
    // The heap stays within a generous bound of the request plus response text (our own margin).
    const heapAfter = process.memoryUsage().heapUsed;
    expect(heapAfter - heapBefore).toBeLessThan(400 * 1024 * 1024);
  }, 120_000);

  it('over a real socket the results arrive in many writes while the batch runs (streamed, not buffered)', async () => {
    const server = await testApp(CONFIG);
    try {
      const address = await server.listen({ port: 0, host: '127.0.0.1' });
      const assemblies = Array.from({ length: 3000 }, (_, i) => ({ ...clean, id: `s-${i}` }));
      const res = await fetch(`${address}/v1/bom-checks`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', accept: 'application/x-ndjson' },
        body: JSON.stringify({ assemblies, options: { mode: 'worst-case' } }),
      });
      expect(res.status).toBe(200);
      const reader = res.body!.getReader();
      const decoder = new TextDecoder();
      let linesBeforeLastChunk = 0;
      let chunks = 0;
      let text = '';
      for (;;) {
        const { done, value } = await reader.read();
        if (done) break;
        chunks++;
        linesBeforeLastChunk = text.split('\n').length - 1;
        text += decoder.decode(value, { stream: true });
      }
      expect(text.split('\n').filter(Boolean)).toHaveLength(3000);
      // A buffered answer would arrive as one body; the stream hands over slices of at most 64 results.
      expect(chunks).toBeGreaterThan(10);
      expect(linesBeforeLastChunk).toBeGreaterThan(0);
    } finally {
      await server.close();
    }
  }, 120_000);
});
