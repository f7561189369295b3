/**
 * Issue 10 item 8, validation parity: every GET body round-trips through PUT,
 * and an inline amplifier and a registration are refused by the same rule,
 * naming the same figure. Responses are checked against the generated contract.
 */
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AMPLIFIER_FIGURE_NAMES, BUILT_IN_AMPLIFIERS } from '../../src/core/index.ts';
import { testApp } from '../helpers/app.ts';
import { expectContract } from '../helpers/contract.ts';

let app: FastifyInstance;
beforeAll(async () => {
  app = await testApp();
});
afterAll(async () => app.close());

const ONE = '/v1/amplifiers/:id';

/** The textbook three-equal-resistor single-supply astable (thresholds at V+/3 and 2V+/3; Sedra & Smith). */
function circuit(amplifier: unknown) {
  return { topology: 'three-resistor-divider', supply: { positiveV: 5 }, amplifier, parts: { rTiming: '10k', cTiming: '2n2', rTop: '47k', rBottom: '47k', rFeedback: '47k' } };
}

describe('GET body -> PUT round trip', () => {
  for (const amp of BUILT_IN_AMPLIFIERS) {
    it(`${amp.id}: the GET body registers unchanged and reads back with the same figures`, async () => {
      const got = await app.inject({ method: 'GET', url: `/v1/amplifiers/${amp.id}` });
      await expectContract(got, 'GET', ONE);
      expect(got.statusCode).toBe(200);
      const body = got.json();
      const id = `copy-of-${amp.id}`;
      const put = await app.inject({ method: 'PUT', url: `/v1/amplifiers/${id}`, payload: body });
      await expectContract(put, 'PUT', ONE);
      expect(put.statusCode, put.body).toBe(201);
      const again = await app.inject({ method: 'GET', url: `/v1/amplifiers/${id}` });
      await expectContract(again, 'GET', ONE);
      const copy = again.json();
      for (const name of AMPLIFIER_FIGURE_NAMES) expect(copy[name], name).toEqual(body[name]);
      expect(copy).toMatchObject({ id, name: body.name, technologyClass: body.technologyClass, description: body.description, source: 'registered', figuresBasis: 'caller-supplied' });
      // And the copy's own GET body round-trips too (replacing it needs its ETag).
      const replace = await app.inject({ method: 'PUT', url: `/v1/amplifiers/${id}`, payload: copy, headers: { 'if-match': String(again.headers.etag) } });
      expect(replace.statusCode, replace.body).toBe(200);
      const reread = await app.inject({ method: 'GET', url: `/v1/amplifiers/${id}` });
      expect(reread.json()).toEqual(copy);
    });
  }
});

describe('one validation for inline and registered figures', () => {
  const CASES: [string, number][] = [
    ['slewRateVPerS', 1e-300],
    ['recoveryDelayS', 1e300],
    ['outputResistanceOhm', 5e-324],
    ['outputCurrentLimitA', 1e-300],
    ['differentialClampV', 5e-324],
    ['inputBiasCurrentA', 1e300],
    ['outputHeadroomHighV', 4.99],
  ];
  for (const [name, value] of CASES) {
    it(`${name} = ${value}: refused inline (analyze, waveform) and at registration, naming the figure`, async () => {
      // outputHeadroomHighV 4.99 V is in range alone; with a 5 V rating and the base's 0.02 V low headroom it
      // leaves the output no swing: the derived-quantity check.
      const amp = name === 'outputHeadroomHighV' ? { base: 'cmos-rrio-fast', supplyMaxV: 5, [name]: value } : { base: 'cmos-rrio-fast', [name]: value };
      const analyze = await app.inject({ method: 'POST', url: '/v1/analyze', payload: circuit(amp) });
      await expectContract(analyze, 'POST', '/v1/analyze');
      const waveform = await app.inject({ method: 'POST', url: '/v1/waveform', payload: { circuit: circuit(amp), periods: 2, samples: 100 } });
      await expectContract(waveform, 'POST', '/v1/waveform');
      const put = await app.inject({ method: 'PUT', url: `/v1/amplifiers/bad-${name.toLowerCase()}`, payload: { name: 'Bad', ...amp } });
      await expectContract(put, 'PUT', ONE);
      for (const [res, prefix] of [
        [analyze, '/amplifier'],
        [waveform, '/circuit/amplifier'],
        [put, ''],
      ] as const) {
        expect(res.statusCode, res.body).toBeGreaterThanOrEqual(400);
        expect(res.statusCode, res.body).toBeLessThan(500);
        expect(res.json().errors.map((e: { pointer: string }) => e.pointer)).toContain(`${prefix}/${name}`);
      }
      const stored = await app.inject({ method: 'GET', url: `/v1/amplifiers/bad-${name.toLowerCase()}` });
      expect(stored.statusCode).toBe(404);
    });
  }
});
