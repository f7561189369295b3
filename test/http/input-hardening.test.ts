/**
 * Issue 10 items 2 and 9, the reproductions as regression tests: media types,
 * field names in 4xx answers (RFC 6901 pointers, RFC 9457 problem details),
 * the shared value ranges, and the boundary guard that keeps non-finite
 * numbers off the wire (JSON, RFC 8259 §6, has no NaN or Infinity).
 */
import Fastify, { type FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { findNonFinite, installFiniteAnswerGuard } from '../../src/http/finite-answer.ts';
import { errorHandler } from '../../src/http/problem.ts';
import { problemType } from '../../src/http/problem-types.ts';
import { testApp } from '../helpers/app.ts';
import { expectContract } from '../helpers/contract.ts';

let app: FastifyInstance;
beforeAll(async () => {
  app = await testApp();
});
afterAll(async () => app.close());

/** The three-equal-resistor single-supply astable (thresholds at V+/3 and 2V+/3, Sedra & Smith). */
const circuit = { topology: 'three-resistor-divider', supply: { positiveV: 5 }, amplifier: 'ideal', parts: { rTiming: '10k', cTiming: '10n', rTop: '47k', rBottom: '47k', rFeedback: '47k' } };

function pointers(body: { errors?: { pointer: string }[] }): string[] {
  return (body.errors ?? []).map((e) => e.pointer);
}

describe('media types and field names', () => {
  it('a JSON body sent as text/plain is 415, not 400 (RFC 9110 §15.5.16)', async () => {
    const res = await app.inject({ method: 'POST', url: '/v1/analyze', headers: { 'content-type': 'text/plain' }, payload: JSON.stringify(circuit) });
    await expectContract(res, 'POST', '/v1/analyze');
    expect(res.statusCode).toBe(415);
  });

  it('a __proto__ key is named by its pointer, not reported as invalid JSON', async () => {
    for (const [payload, pointer] of [
      ['{"__proto__": {"x": 1}, "topology": "three-resistor-divider"}', '/__proto__'],
      [`{"topology": "three-resistor-divider", "supply": {"positiveV": 5, "__proto__": null}}`, '/supply/__proto__'],
      [`{"parts": [{"constructor": {"prototype": {}}}]}`, '/parts/0/constructor/prototype'],
      // A key spelled with a JSON escape is the same key once parsed.
      [`{"\\u005f_proto__": 1}`, '/__proto__'],
    ] as const) {
      const res = await app.inject({ method: 'POST', url: '/v1/analyze', headers: { 'content-type': 'application/json' }, payload });
      await expectContract(res, 'POST', '/v1/analyze');
      expect(res.statusCode, payload).toBe(400);
      expect(pointers(res.json()), payload).toEqual([pointer]);
    }
    // A harmless "constructor" field is only an unknown field.
    const plain = await app.inject({ method: 'POST', url: '/v1/analyze', payload: { ...circuit, constructor: 'x' } });
    expect(plain.statusCode).toBe(400);
    expect(pointers(plain.json())).toEqual(['/constructor']);
  });

  it('malformed and empty JSON bodies are 400 problems pointing at the body', async () => {
    const broken = await app.inject({ method: 'POST', url: '/v1/analyze', headers: { 'content-type': 'application/json' }, payload: '{"topology": ' });
    expect(broken.statusCode).toBe(400);
    expect(broken.json()).toMatchObject({ code: 'malformed-body', errors: [{ pointer: '/' }] });
    const empty = await app.inject({ method: 'POST', url: '/v1/analyze', headers: { 'content-type': 'application/json' }, payload: '' });
    expect(empty.statusCode).toBe(400);
    expect(empty.json()).toMatchObject({ code: 'empty-body' });
  });

  it('query-string errors carry an RFC 6901 pointer and say they point into the query', async () => {
    const res = await app.inject({ method: 'GET', url: '/v1/series/E24?step=2' });
    expect(res.statusCode).toBe(400);
    expect(res.json().errors).toEqual([expect.objectContaining({ pointer: '/step', in: 'query' })]);
  });
});

describe('one set of value ranges (those of /v1/analyze) on /v1/snap', () => {
  it('refuses ideal values outside the component ranges, naming the field', async () => {
    for (const [value, kind] of [
      [1e30, 'resistor'],
      ['1e30', 'resistor'],
      [1e-4, 'resistor'],
      [1e3, 'capacitor'],
      [1e-20, 'capacitor'],
    ] as const) {
      const res = await app.inject({ method: 'POST', url: '/v1/snap', payload: { values: [{ ideal: value, kind, source: { series: 'E24' } }] } });
      await expectContract(res, 'POST', '/v1/snap');
      expect(res.statusCode, `${value} ${kind}`).toBe(400);
      expect(pointers(res.json())).toEqual(['/values/0/ideal']);
    }
    // The same 1e30 Ω is refused by /v1/analyze.
    const analyze = await app.inject({ method: 'POST', url: '/v1/analyze', payload: { ...circuit, parts: { ...circuit.parts, rTiming: 1e30 } } });
    expect(analyze.statusCode).toBe(400);
  });

  it('refuses a target frequency of 5e-324 Hz instead of answering frequencyError null', async () => {
    const res = await app.inject({
      method: 'POST',
      url: '/v1/snap',
      payload: { circuit: { topology: 'three-resistor-divider', supply: { positiveV: 5 }, targetFrequencyHz: 5e-324, values: { resistor: { series: 'E24' }, capacitor: { series: 'E6' } } } },
    });
    await expectContract(res, 'POST', '/v1/snap');
    expect(res.statusCode).toBe(400);
    expect(pointers(res.json())).toEqual(['/circuit/targetFrequencyHz']);
  });
});

describe('no non-finite number leaves the service', () => {
  it('findNonFinite names the JSON pointer of the first non-finite number', () => {
    expect(findNonFinite({ a: 1, b: [1, 2, { c: 'x' }] })).toBeUndefined();
    expect(findNonFinite({ a: 1, b: [1, 2, { 'c/d': Number.NaN }] })).toBe('/b/2/c~1d');
    expect(findNonFinite({ timeS: [0, 1, Infinity] })).toBe('/timeS/2');
    expect(findNonFinite({ v: Float64Array.from([0, -Infinity]) })).toBe('/v/1');
    expect(findNonFinite([[1], [2, Number.NaN]])).toBe('/1/1');
  });

  it('turns a non-finite figure in an answer into a 422 problem, never a 500 or a null', async () => {
    const bare = Fastify();
    bare.setErrorHandler(errorHandler);
    installFiniteAnswerGuard(bare);
    bare.get('/answer', async () => ({ frequencyHz: 1000, edges: { riseS: Number.POSITIVE_INFINITY } }));
    bare.get('/fine', async () => ({ frequencyHz: 1000 }));
    const res = await bare.inject({ method: 'GET', url: '/answer' });
    expect(res.statusCode).toBe(422);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(res.json()).toMatchObject({ code: 'non-finite-result', answerPointer: '/edges/riseS' });
    // Its `type` URI resolves like every other (GET /problems/{code}); this code was once missing from the table.
    expect(res.json().type).toBe('/problems/non-finite-result');
    expect(problemType('non-finite-result')).toMatchObject({ status: 422 });
    expect((await bare.inject({ method: 'GET', url: '/fine' })).json()).toEqual({ frequencyHz: 1000 });
    await bare.close();
  });
});

describe('one set of value ranges on catalogues', () => {
  it('refuses a 1e30 F (or 1 kF) capacitor in a catalogue, naming the part value', async () => {
    for (const value of [1e30, '1e30', 1000]) {
      const res = await app.inject({
        method: 'PUT',
        url: `/v1/catalogues/range-check-${String(value).length}-${typeof value}`,
        payload: { name: 'Range check', parts: [{ kind: 'capacitor', value, tolerance: 0.05, dielectric: 'C0G', partNumber: 'RC-1', status: 'preferred' }] },
      });
      await expectContract(res, 'PUT', '/v1/catalogues/:id');
      expect(res.statusCode, String(value)).toBe(400);
      expect(pointers(res.json())).toEqual(['/parts/0/value']);
    }
  });
});
