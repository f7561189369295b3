/** POST /v1/analyze over HTTP: the binding request shape, value strings, and every kind of bad input. */
import fc from 'fast-check';
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectContract } from '../helpers/contract.ts';
import { testApp } from '../helpers/app.ts';

let app: FastifyInstance;
beforeAll(async () => {
  app = await testApp({ config: { bodyLimitBytes: 64 * 1024 } });
});
afterAll(async () => app.close());

// Our own scenario: a 9 V battery-powered beacon blinker on a single supply.
const beacon = {
  topology: 'three-resistor-divider',
  supply: { positiveV: 9, negativeV: 0 },
  amplifier: 'ideal',
  parts: { rTiming: 22000, cTiming: '4n7', rTop: '68k', rBottom: '68k', rFeedback: '68k' },
};

async function analyze(payload: unknown, headers: Record<string, string> = {}) {
  const res = await app.inject({ method: 'POST', url: '/v1/analyze', payload: payload as object, headers });
  await expectContract(res, 'POST', '/v1/analyze');
  return res;
}

describe('POST /v1/analyze', () => {
  it('answers the binding request shape with the textbook figures (T = 2·ln2·RC for equal resistors)', async () => {
    const res = await analyze(beacon);
    expect(res.statusCode).toBe(200);
    const body = res.json();
    expect(body.periodS).toBeCloseTo(2 * Math.LN2 * 22000 * 4.7e-9, 15);
    expect(body.frequencyHz).toBeCloseTo(1 / body.periodS, 9);
    expect(body.thresholds.upperV).toBeCloseTo(6, 12);
    expect(body.thresholds.lowerV).toBeCloseTo(3, 12);
    expect(body.output).toEqual({ highV: 9, lowV: 0, swingV: 9, meanHighV: 9, meanLowV: 0 });
    expect(body.modelEffects).toEqual([]);
    expect(body.transitions).toEqual({ riseTimeS: 0, fallTimeS: 0 });
    expect(body.model).toBe('closed-form');
    expect(body.timeHighS + body.timeLowS).toBeCloseTo(body.periodS, 15);
    expect(body.firstEdgeS).toBeGreaterThan(body.timeHighS); // from 0 V the first charge is longer than from V+/3
    expect(Array.isArray(body.checks)).toBe(true);
    expect(res.headers['x-request-id']).toBeTruthy();
  });

  it('takes an archetype by id and a non-ideal inline amplifier', async () => {
    const byId = await analyze({ ...beacon, supply: { positiveV: 12, negativeV: 0 }, amplifier: 'bipolar-single-supply-general' });
    expect(byId.statusCode).toBe(200);
    expect(byId.json().output.highV).toBeLessThan(12 - 1.4);
    const inline = await analyze({ ...beacon, amplifier: { outputHeadroomHighV: 0.5, outputHeadroomLowV: 0.5, outputResistanceOhm: 100, slewRateVPerS: null } });
    expect(inline.statusCode).toBe(200);
    expect(inline.json().amplifier.figuresBasis).toBe('caller-supplied');
  });

  it('accepts IEC 60062 RKM codes and SI-prefix strings as the same values as numbers', async () => {
    const a = (await analyze({ ...beacon, parts: { rTiming: '22k', cTiming: '4.7 nF', rTop: '68 kΩ', rBottom: '68K', rFeedback: 68000 } })).json();
    const b = (await analyze({ ...beacon, parts: { rTiming: 22000, cTiming: 4.7e-9, rTop: 68000, rBottom: 68000, rFeedback: 68000 } })).json();
    expect(a.periodS).toBe(b.periodS);
  });

  it('rejects a malformed value string with 400 naming the field', async () => {
    const res = await analyze({ ...beacon, parts: { ...beacon.parts, cTiming: '4n7n' } });
    expect(res.statusCode).toBe(400);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(res.json().errors[0].pointer).toBe('/parts/cTiming');
  });

  const badBodies: [string, unknown, number, string][] = [
    ['zero resistance', { ...beacon, parts: { ...beacon.parts, rTiming: 0 } }, 400, '/parts/rTiming'],
    ['negative capacitance', { ...beacon, parts: { ...beacon.parts, cTiming: -1e-9 } }, 400, '/parts/cTiming'],
    ['huge resistance', { ...beacon, parts: { ...beacon.parts, rTop: 1e30 } }, 400, '/parts/rTop'],
    ['missing part', { ...beacon, parts: { rTiming: 1e4, cTiming: 1e-9, rTop: 1e4, rBottom: 1e4 } }, 400, '/parts/rFeedback'],
    ['extra part', { ...beacon, parts: { ...beacon.parts, rGround: 1e4 } }, 400, '/parts/rGround'],
    ['unknown field', { ...beacon, colour: 'blue' }, 400, '/colour'],
    ['unknown topology', { ...beacon, topology: 'crystal' }, 400, '/topology'],
    ['unknown amplifier', { ...beacon, amplifier: 'no-such-amp' }, 422, '/amplifier'],
    ['string where a number belongs', { ...beacon, supply: { positiveV: '9' } }, 400, '/supply/positiveV'],
    ['missing supply', { ...beacon, supply: undefined }, 400, '/supply'],
    ['rails inverted', { ...beacon, supply: { positiveV: -5, negativeV: 0 } }, 400, '/supply/positiveV'],
    ['negative slew rate', { ...beacon, amplifier: { slewRateVPerS: -1 } }, 400, '/amplifier'],
  ];
  for (const [name, body, status, pointer] of badBodies) {
    it(`rejects ${name} with ${status} and pointer ${pointer}`, async () => {
      const res = await analyze(body);
      expect(res.statusCode).toBe(status);
      const problem = res.json();
      expect(problem.status).toBe(status);
      expect(problem.errors.map((e: { pointer: string }) => e.pointer).some((p: string) => p.startsWith(pointer))).toBe(true);
    });
  }

  it('a circuit that cannot oscillate gets 422 with the reason', async () => {
    const res = await analyze({ ...beacon, amplifier: { outputHeadroomHighV: 3 }, parts: { ...beacon.parts, rTop: '1k' } });
    expect(res.statusCode).toBe(422);
    expect(res.json().code).toBe('no-oscillation');
    expect(res.json().detail).toMatch(/latches high/);
  });

  it('unsupported media type -> 415, malformed JSON -> 400, oversized body -> 413', async () => {
    const form = await analyze('x=1', { 'content-type': 'application/x-www-form-urlencoded' });
    expect(form.statusCode).toBe(415);
    const broken = await analyze('{"topology":', { 'content-type': 'application/json' });
    expect(broken.statusCode).toBe(400);
    const big = await analyze(JSON.stringify({ ...beacon, padding: 'x'.repeat(100 * 1024) }), { 'content-type': 'application/json' });
    expect(big.statusCode).toBe(413);
  });

  it('no input yields a 500 (property test over arbitrary JSON bodies, fast-check, fixed seed)', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.oneof(
          fc.jsonValue(),
          fc.record({ topology: fc.constantFrom('two-resistor-feedback', 'three-resistor-divider', 'x'), supply: fc.jsonValue(), amplifier: fc.jsonValue(), parts: fc.jsonValue() }),
          fc.record({
            topology: fc.constant('two-resistor-feedback'),
            supply: fc.record({ positiveV: fc.double(), negativeV: fc.double() }),
            amplifier: fc.constantFrom('ideal', 'jfet-input-general'),
            parts: fc.record({ rTiming: fc.double(), cTiming: fc.double(), rFeedback: fc.oneof(fc.double(), fc.string()), rGround: fc.double() }),
          }),
        ),
        async (body) => {
          const res = await app.inject({ method: 'POST', url: '/v1/analyze', payload: JSON.stringify(body) ?? 'null', headers: { 'content-type': 'application/json' } });
          expect(res.statusCode).toBeLessThan(500);
        },
      ),
      { seed: 20261201, numRuns: 300 },
    );
  });
});
