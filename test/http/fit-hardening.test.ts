/**
 * Regression tests for caller input that used to reach a 500 or be read
 * silently wrong (issue reproductions): every answer is a 4xx problem naming
 * the field, per RFC 9457 (problem+json) and the service's contract.
 */
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectContract } from '../helpers/contract.ts';
import { testApp } from '../helpers/app.ts';

let app: FastifyInstance;
beforeAll(async () => {
  app = await testApp();
});
afterAll(async () => {
  await app.close();
});

const circuit = {
  topology: 'single-supply-divider',
  supply: { positiveV: 5, negativeV: 0 },
  amplifier: 'cmos-rrio-fast',
  parts: { rTiming: 10000, cTiming: 10e-9, rTop: 100000, rBottom: 100000, rFeedback: 100000 },
};

async function post(payload: unknown, headers: Record<string, string> = {}) {
  const res = await app.inject({ method: 'POST', url: '/v1/fit', payload: payload as string, headers });
  await expectContract(res, 'POST', '/v1/fit');
  return res;
}

const pointers = (res: { json(): { errors?: { pointer: string }[] } }) => (res.json().errors ?? []).map((e) => e.pointer);

describe('POST /v1/fit refuses what it cannot use, never with a 5xx', () => {
  it('no body and no content type: 400 naming the body', async () => {
    const res = await app.inject({ method: 'POST', url: '/v1/fit' });
    expect(res.statusCode).toBe(400);
    expect(res.headers['content-type']).toContain('application/problem+json');
  });

  it('an uncertainty of 1e-300: 400 naming it', async () => {
    const res = await post({ circuit, measurements: { frequencyHz: { value: 7000, uncertainty: 1e-300 } } });
    expect(res.statusCode).toBe(400);
    expect(res.json().detail).toContain('uncertainty');
  });

  it('a sample interval of 1e-300 s: 4xx naming sampleIntervalS', async () => {
    const res = await post({ circuit, capture: { sampleIntervalS: 1e-300, output: [0, 5, 0, 5, 0, 5, 0, 5, 0, 5] } });
    expect(res.statusCode).toBeGreaterThanOrEqual(400);
    expect(res.statusCode).toBeLessThan(500);
    expect(JSON.stringify(res.json())).toContain('sampleIntervalS');
  });

  it('a tolerance of 1e-300: 400 naming the tolerance', async () => {
    const res = await post({ circuit, tolerances: { rTiming: 1e-300 }, measurements: { frequencyHz: 7000 } });
    expect(res.statusCode).toBe(400);
    expect(JSON.stringify(res.json())).toContain('tolerances');
  });

  it('a 1.5 Ω timing resistor: an answer or a 4xx, never a 5xx, and only finite numbers', async () => {
    const res = await post({ circuit: { ...circuit, parts: { ...circuit.parts, rTiming: 1.5 } }, measurements: { frequencyHz: 7000 } });
    expect(res.statusCode).toBeLessThan(500);
    expect(res.body).not.toMatch(/NaN|Infinity/);
  });

  it('text/plain is not read as CSV: 415', async () => {
    const res = await app.inject({ method: 'POST', url: `/v1/fit?circuit=${encodeURIComponent(JSON.stringify(circuit))}`, payload: 'Time (s),CH1\n0,1\n', headers: { 'content-type': 'text/plain' } });
    expect(res.statusCode).toBe(415);
  });

  it('a CSV time column in furlongs or in Ts: 422 naming the column', async () => {
    for (const unit of ['furlongs', 'Ts']) {
      const rows = Array.from({ length: 40 }, (_, i) => `${i},${i % 10 < 5 ? 0 : 5}`).join('\n');
      const res = await post({ circuit, capture: { csv: `Time (${unit}),CH1 (V)\n${rows}\n` } });
      expect(res.statusCode).toBe(422);
      // Names the column by its header and the field the CSV came in.
      expect(res.json().detail).toContain(`"Time (${unit})"`);
      expect(res.json().figures).toMatchObject({ reason: 'bad-time-unit', column: 1, unit });
      expect(pointers(res)).toEqual(['/capture/csv']);
    }
  });

  it('the same refusals for a text/csv body (the only media type read as CSV)', async () => {
    const url = `/v1/fit?circuit=${encodeURIComponent(JSON.stringify(circuit))}`;
    const send = (csv: string) => app.inject({ method: 'POST', url, payload: csv, headers: { 'content-type': 'text/csv' } });
    const timeRows = Array.from({ length: 40 }, (_, i) => `${i},${i % 10 < 5 ? 0 : 5}`).join('\n');
    const badUnit = await send(`Time (Ts),CH1 (V)\n${timeRows}\n`);
    await expectContract(badUnit, 'POST', '/v1/fit');
    expect(badUnit.statusCode).toBe(422);
    expect(badUnit.json().detail).toContain('"Time (Ts)"');
    const twoRows = Array.from({ length: 40 }, (_, i) => `${i * 1e-6},${i % 10 < 5 ? 0 : 5},${i % 10}`).join('\n');
    const duplicate = await send(`Time (s),CH2 (V),CH2 (V)\n${twoRows}\n`);
    await expectContract(duplicate, 'POST', '/v1/fit');
    expect(duplicate.statusCode).toBe(422);
    expect(duplicate.json().figures).toMatchObject({ reason: 'duplicate-channel', channel: 'CH2' });
  });

  it('two channels with the same name: 422 naming it', async () => {
    const rows = Array.from({ length: 40 }, (_, i) => `${i * 1e-6},${i % 10 < 5 ? 0 : 5},${i % 10}`).join('\n');
    const res = await post({ circuit, capture: { csv: `Time (s),CH1 (V),CH1 (V)\n${rows}\n` } });
    expect(res.statusCode).toBe(422);
    expect(res.json().detail).toContain('"CH1"');
  });
});
