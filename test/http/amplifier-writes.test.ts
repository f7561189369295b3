/**
 * Registered amplifiers: PUT/DELETE /v1/amplifiers/{id} in the store, read back
 * through GET and the list, used by analyses, built-ins read-only (409).
 */
import type { FastifyInstance, LightMyRequestResponse } from 'fastify';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../src/core/index.ts';
import { testApp } from '../helpers/app.ts';
import { expectContract } from '../helpers/contract.ts';

const ONE = '/v1/amplifiers/:id';

let app: FastifyInstance;
beforeEach(async () => {
  app = await testApp();
});
afterEach(async () => {
  await app.close();
});

async function call(method: 'GET' | 'PUT' | 'DELETE', url: string, payload?: unknown, headers?: Record<string, string>): Promise<LightMyRequestResponse> {
  const res = await app.inject({ method, url, payload: payload as never, headers });
  await expectContract(res, method, url === '/v1/amplifiers' ? '/v1/amplifiers' : ONE);
  return res;
}

/** An invented part of our own: a comparator we pretend to have characterised on the bench. */
const benchComparator = {
  name: 'Bench comparator A',
  technologyClass: 'CMOS comparator, push-pull',
  description: 'Figures measured on our own test jig (invented for the tests)',
  outputStage: 'push-pull',
  supplyMinV: 1.8,
  supplyMaxV: 5.5,
  outputHeadroomHighV: 0.05,
  outputHeadroomLowV: 0.05,
  outputResistanceOhm: 40,
  outputCurrentLimitA: 0.03,
  slewRateVPerS: null,
  recoveryDelayS: 80e-9,
  inputBiasCurrentA: 1e-12,
  inputOffsetV: 1e-3,
  quiescentCurrentA: 60e-6,
};

function pointers(res: LightMyRequestResponse): string[] {
  return (res.json().errors ?? []).map((e: { pointer: string }) => e.pointer);
}

describe('PUT /v1/amplifiers/{id}', () => {
  it('registers with 201, Location and ETag; GET and the list read it from the store', async () => {
    const res = await call('PUT', '/v1/amplifiers/bench-comp-a', benchComparator);
    expect(res.statusCode).toBe(201);
    expect(res.headers.location).toBe('/v1/amplifiers/bench-comp-a');
    expect(res.headers.etag).toMatch(/^"[^"]+"$/);
    const record = res.json();
    expect(record).toMatchObject({ id: 'bench-comp-a', name: 'Bench comparator A', source: 'registered', slewRateVPerS: null, recoveryDelayS: 80e-9 });

    const read = await call('GET', '/v1/amplifiers/bench-comp-a');
    expect(read.statusCode).toBe(200);
    expect(read.headers.etag).toBe(res.headers.etag); // GET hands out the tag a later If-Match needs
    expect(read.json()).toEqual(record);
    const list = await call('GET', '/v1/amplifiers');
    expect(list.json().amplifiers.filter((a: { id: string }) => a.id === 'bench-comp-a')).toEqual([record]);
  });

  it('takes omitted figures from a built-in base and keeps the caller overrides', async () => {
    const base = findBuiltInAmplifier('bipolar-single-supply-general')!;
    const res = await call('PUT', '/v1/amplifiers/faster-bipolar', { name: 'Faster bipolar', base: base.id, slewRateVPerS: 2e6 });
    expect(res.statusCode).toBe(201);
    const record = res.json();
    expect(record.slewRateVPerS).toBe(2e6);
    expect(record.supplyMaxV).toBe(base.supplyMaxV);
    expect(record.outputHeadroomHighV).toBe(base.outputHeadroomHighV);
  });

  it('is used by analyses: the textbook astable with an ideal registered amplifier', async () => {
    await call('PUT', '/v1/amplifiers/my-ideal', { name: 'Ideal, registered' });
    const res = await app.inject({
      method: 'POST',
      url: '/v1/analyze',
      payload: {
        topology: 'two-resistor-feedback',
        supply: { positiveV: 5, negativeV: -5 },
        amplifier: 'my-ideal',
        parts: { rTiming: 10_000, cTiming: 1e-8, rFeedback: 10_000, rGround: 10_000 },
      },
    });
    await expectContract(res, 'POST', '/v1/analyze');
    expect(res.statusCode).toBe(200);
    // Sedra & Smith, op-amp astable multivibrator: T = 2RC·ln((1+β)/(1−β)); β = 1/2 gives 2RC·ln 3.
    expect(res.json().periodS).toBeCloseTo(2 * 10_000 * 1e-8 * Math.log(3), 12);
    expect(res.json().amplifier.id).toBe('my-ideal');
  });

  it('needs If-Match to replace: 428 without, 412 stale, 200 current', async () => {
    const first = await call('PUT', '/v1/amplifiers/bench-comp-a', benchComparator);
    const etag = first.headers.etag as string;
    expect((await call('PUT', '/v1/amplifiers/bench-comp-a', { ...benchComparator, inputOffsetV: 2e-3 })).statusCode).toBe(428);
    const updated = await call('PUT', '/v1/amplifiers/bench-comp-a', { ...benchComparator, inputOffsetV: 2e-3 }, { 'if-match': etag });
    expect(updated.statusCode).toBe(200);
    expect(updated.json().inputOffsetV).toBe(2e-3);
    expect((await call('PUT', '/v1/amplifiers/bench-comp-a', benchComparator, { 'if-match': etag })).statusCode).toBe(412);
    expect((await call('GET', '/v1/amplifiers/bench-comp-a')).json().inputOffsetV).toBe(2e-3);
  });

  it('refuses built-in ids with 409, whatever the body', async () => {
    for (const body of [benchComparator, { nonsense: true }]) {
      const res = await call('PUT', '/v1/amplifiers/ideal', body);
      expect(res.statusCode).toBe(409);
      expect(res.json().code).toBe('read-only');
    }
    expect((await call('GET', '/v1/amplifiers/ideal')).json().source).toBe('built-in');
  });

  it.each<[string, Record<string, unknown>, number, string]>([
    ['a negative headroom', { outputHeadroomHighV: -0.1 }, 400, '/outputHeadroomHighV'],
    ['a supply maximum below the minimum', { supplyMinV: 5, supplyMaxV: 3 }, 400, '/supplyMaxV'],
    ['a zero slew rate', { slewRateVPerS: 0 }, 400, '/slewRateVPerS'],
    ['a string figure', { recoveryDelayS: '80n' }, 400, '/recoveryDelayS'],
    ['an unknown output stage', { outputStage: 'totem-pole' }, 400, '/outputStage'],
    ['an unknown field', { gainBandwidthHz: 1e6 }, 400, '/gainBandwidthHz'],
    ['an unknown base', { base: 'no-such-archetype' }, 422, '/base'],
  ])('rejects %s (%i at the field) and stores nothing', async (_what, change, status, pointer) => {
    const res = await call('PUT', '/v1/amplifiers/bench-comp-a', { ...benchComparator, ...change });
    expect(res.statusCode).toBe(status);
    expect(pointers(res)).toContain(pointer);
    expect((await call('GET', '/v1/amplifiers/bench-comp-a')).statusCode).toBe(404);
  });

  it('needs a name', async () => {
    const { name: _omitted, ...nameless } = benchComparator;
    const res = await call('PUT', '/v1/amplifiers/bench-comp-a', nameless);
    expect(res.statusCode).toBe(400);
    expect(pointers(res)).toContain('/name');
  });
});

describe('DELETE /v1/amplifiers/{id}', () => {
  it('428 without If-Match, 412 stale, 204 current, then 404', async () => {
    const etag = (await call('PUT', '/v1/amplifiers/bench-comp-a', benchComparator)).headers.etag as string;
    expect((await call('DELETE', '/v1/amplifiers/bench-comp-a')).statusCode).toBe(428);
    expect((await call('DELETE', '/v1/amplifiers/bench-comp-a', undefined, { 'if-match': '"1-0000000000000000"' })).statusCode).toBe(412);
    expect((await call('DELETE', '/v1/amplifiers/bench-comp-a', undefined, { 'if-match': etag })).statusCode).toBe(204);
    expect((await call('GET', '/v1/amplifiers/bench-comp-a')).statusCode).toBe(404);
    expect((await call('DELETE', '/v1/amplifiers/bench-comp-a', undefined, { 'if-match': etag })).statusCode).toBe(404);
  });

  it('refuses built-in ids with 409', async () => {
    const res = await call('DELETE', '/v1/amplifiers/comparator-push-pull-cmos', undefined, { 'if-match': '*' });
    expect(res.statusCode).toBe(409);
  });
});

describe('inline amplifiers over a base archetype', () => {
  it('keep their own identity: an inline model is caller-supplied, not the base', async () => {
    const res = await app.inject({
      method: 'POST',
      url: '/v1/analyze',
      payload: {
        topology: 'two-resistor-feedback',
        supply: { positiveV: 12, negativeV: -12 },
        amplifier: { base: 'bipolar-split-supply-general', outputHeadroomHighV: 2 },
        parts: { rTiming: '10k', cTiming: '10n', rFeedback: '10k', rGround: '10k' },
      },
    });
    expect(res.statusCode).toBe(200);
    expect(res.json().amplifier.id).toBe('inline');
    expect(res.json().amplifier.figuresBasis).toBe('caller-supplied');
    expect(res.json().output.highV).toBeLessThan(10.01);
  });
});
