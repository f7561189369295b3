/**
 * Regression (found by the contract-driven fuzz test): a timing capacitor with an absurd rated voltage
 * (1e-29 V) reached the C(V) law and ended in a 500. Ratings below 1 V are a slip of the caller; the
 * answer must be a 400 naming the field. Valid ratings keep working (common practice: ceramic ratings
 * start at a few volts).
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import type { FastifyInstance } from 'fastify';
import { testApp } from '../helpers/app.ts';
import { expectContract } from '../helpers/contract.ts';

let app: FastifyInstance;
beforeAll(async () => {
  app = await testApp();
});
afterAll(async () => {
  await app.close();
});

const body = (ratedVoltageV: number) => ({
  topology: 'three-resistor-divider',
  supply: { positiveV: 5 },
  amplifier: 'cmos-rrio-fast',
  parts: {
    rTiming: '22k', rTop: '68k', rBottom: '68k', rFeedback: '68k',
    cTiming: { value: '4n7', dielectric: 'X7R', ratedVoltageV, caseSize: '0402', ageHours: 24 },
  },
});

test('a rated voltage of 1e-29 V is refused with 400 naming the field', async () => {
  const res = await app.inject({ method: 'POST', url: '/v1/analyze', payload: body(1.0606856722359923e-29) });
  expect(res.statusCode).toBe(400);
  expect(res.body).toContain('/parts/cTiming/ratedVoltageV');
  await expectContract(res, 'POST', '/v1/analyze');
});

test.each([1, 6.3, 10000])('a %s V rating (range edges included) is analysed', async (ratingV) => {
  const res = await app.inject({ method: 'POST', url: '/v1/analyze', payload: body(ratingV) });
  expect(res.statusCode).toBe(200);
  await expectContract(res, 'POST', '/v1/analyze');
});

// Regression (fuzz test): a 1 fF class II capacitor behind a slewing output made one slewing piece need more
// solution segments than the engine allows and ended in a 500; it is now a 422 naming the capacitor.
test('a 1 fF X7R timing capacitor behind a slewing output: 4xx naming the capacitor, never a 5xx', async () => {
  const payload = body(6.3);
  payload.parts.cTiming.value = 1e-15 as unknown as string;
  const res = await app.inject({ method: 'POST', url: '/v1/analyze', payload });
  expect(res.statusCode).toBeGreaterThanOrEqual(400);
  expect(res.statusCode).toBeLessThan(500);
  expect(res.body).toContain('/parts/cTiming');
  await expectContract(res, 'POST', '/v1/analyze');
});
