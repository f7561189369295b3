/**
 * Topology ids name the network; the earlier supply-named ids stay accepted as input for one release
 * and every answer carries the current id.
 */
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectContract } from '../helpers/contract.ts';
import { testApp } from '../helpers/app.ts';

let app: FastifyInstance;
beforeAll(async () => {
  app = await testApp();
});
afterAll(async () => app.close());

async function post(url: string, payload: object) {
  const res = await app.inject({ method: 'POST', url, payload });
  await expectContract(res, 'POST', url);
  return res;
}

// Our own scenario: a 12 V relay-exerciser clock on the three-equal-resistor network.
const exerciser = {
  supply: { positiveV: 12 },
  amplifier: 'ideal',
  parts: { rTiming: '33k', cTiming: '10n', rTop: '47k', rBottom: '47k', rFeedback: '47k' },
};

describe('deprecated topology aliases', () => {
  it('analyses a circuit named by the old id with the current id in the answer (T = 2·ln2·RC, three equal resistors)', async () => {
    const res = await post('/v1/analyze', { ...exerciser, topology: 'single-supply-divider' });
    expect(res.statusCode).toBe(200);
    const body = res.json();
    expect(body.topology).toBe('three-resistor-divider');
    // Textbook: thresholds at V+/3 and 2V+/3 give T = 2·ln2·RC (DESIGN.md §5).
    expect(body.periodS).toBeCloseTo(2 * Math.LN2 * 33e3 * 10e-9, 14);
  });

  it('designs with an old id in `topologies` and answers with the current id', async () => {
    const res = await post('/v1/design', {
      targetFrequencyHz: 500,
      frequencyTolerance: 0.03,
      supply: { positiveV: 5, negativeV: -5 },
      amplifier: 'ideal',
      topologies: ['split-supply'],
      count: 2,
    });
    expect(res.statusCode).toBe(200);
    for (const d of res.json().designs) {
      expect(d.topology).toBe('two-resistor-feedback');
      expect(d.circuit.topology).toBe('two-resistor-feedback');
    }
  });

  it('lists the aliases beside the current ids', async () => {
    const res = await app.inject({ method: 'GET', url: '/v1/topologies' });
    await expectContract(res, 'GET', '/v1/topologies');
    const byId = Object.fromEntries(res.json().topologies.map((t: { id: string }) => [t.id, t]));
    expect(byId['three-resistor-divider'].deprecatedAliases).toEqual(['single-supply-divider']);
    expect(byId['two-resistor-feedback'].deprecatedAliases).toEqual(['split-supply']);
    expect(byId['diode-steered'].roles.find((r: { role: string }) => r.role === 'rCharge').purpose).toBe('timing');
  });
});

describe('one value reader on /v1/analyze', () => {
  it('reads the EIA three-digit code "103" as 10 nF, as the BOM reader does (EIA-198 marking, pF base)', async () => {
    const coded = await post('/v1/analyze', { ...exerciser, topology: 'three-resistor-divider', parts: { ...exerciser.parts, cTiming: '103', rTiming: '333' } });
    expect(coded.statusCode).toBe(200);
    // Textbook T = 2·ln2·RC with 33 kΩ (IEC 60062 code 333) and 10 nF.
    expect(coded.json().periodS).toBeCloseTo(2 * Math.LN2 * 33e3 * 10e-9, 14);
  });
});
