import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { FastifyInstance } from 'fastify';
import { testApp } from '../helpers/app.ts';
import { expectContract } from '../helpers/contract.ts';

let app: FastifyInstance;
beforeAll(async () => {
  // Load shedding has its own tests; one long first request (JIT on a busy machine) must not shed the next ones here.
  app = await testApp({ config: { maxEventLoopDelayMs: 0 } });
});
afterAll(async () => {
  await app.close();
});

async function post(url: string, payload: unknown) {
  const res = await app.inject({ method: 'POST', url, payload: payload as never });
  await expectContract(res, 'POST', url);
  return res;
}

interface DesignJson {
  frequencyError: number;
  dutyCycleError: number;
  circuit: unknown;
  parts: { role: string; value: number; series?: string; partNumber?: string }[];
}

describe('POST /v1/design', () => {
  const requests = [
    { targetFrequencyHz: 2500, supply: { positiveV: 5 }, amplifier: 'cmos-rrio-fast' },
    { targetFrequencyHz: 640, targetDutyCycle: 0.3, frequencyTolerance: 0.02, supply: { positiveV: 3.3 }, amplifier: 'comparator-push-pull-cmos' },
    { targetFrequencyHz: 250, supply: { positiveV: 12, negativeV: -12 }, amplifier: 'bipolar-split-supply-general', values: { resistor: { series: 'E96' }, capacitor: { series: 'E6' } } },
    { targetFrequencyHz: 12e3, supply: { positiveV: 5 }, amplifier: { base: 'cmos-rrio-fast', slewRateVPerS: 3e6 }, constraints: { rMinOhm: 4.7e3, rMaxOhm: 470e3 } },
  ];

  for (const body of requests) {
    it(`round trip: every design analysed by /v1/analyze lands within its reported error (${body.targetFrequencyHz} Hz)`, async () => {
      const res = await post('/v1/design', body);
      expect(res.statusCode).toBe(200);
      const designs = res.json().designs as DesignJson[];
      expect(designs.length).toBeGreaterThan(0);
      for (const d of designs) {
        const a = await post('/v1/analyze', d.circuit);
        expect(a.statusCode).toBe(200);
        const error = a.json().frequencyHz / body.targetFrequencyHz - 1;
        expect(Math.abs(error)).toBeLessThanOrEqual(Math.abs(d.frequencyError) * (1 + 1e-9) + 1e-12);
        expect(Math.abs(d.frequencyError)).toBeLessThanOrEqual(body.frequencyTolerance ?? 0.01);
        for (const p of d.parts) expect(p.series ?? p.partNumber).toBeDefined();
      }
    });
  }

  it('answers 422 with the reason for a target above the frequency ceiling', async () => {
    const res = await post('/v1/design', { targetFrequencyHz: 2e5, supply: { positiveV: 12, negativeV: -12 }, amplifier: 'bipolar-split-supply-general' });
    expect(res.statusCode).toBe(422);
    expect(res.json().code).toBe('infeasible');
    expect(res.json().detail).toMatch(/frequency ceiling/);
    expect(res.json().errors[0].pointer).toBe('/targetFrequencyHz');
  });

  it('answers 422 for a supply outside the amplifier rating and for an empty catalogue', async () => {
    const supply = await post('/v1/design', { targetFrequencyHz: 1000, supply: { positiveV: 24 }, amplifier: 'cmos-rrio-fast' });
    expect(supply.statusCode).toBe(422);
    expect(supply.json().errors[0].pointer).toBe('/supply');
    const put = await app.inject({
      method: 'PUT',
      url: '/v1/catalogues/resistors-only',
      payload: { parts: [{ kind: 'resistor', value: '10k', tolerance: 0.01, partNumber: 'RO-1', status: 'active' }] },
    });
    expect(put.statusCode).toBeLessThan(300);
    const empty = await post('/v1/design', {
      targetFrequencyHz: 1000,
      supply: { positiveV: 5 },
      amplifier: 'cmos-rrio-fast',
      values: { resistor: { series: 'E24' }, capacitor: { catalogue: 'resistors-only' } },
    });
    expect(empty.statusCode).toBe(422);
    expect(empty.json().errors[0].pointer).toBe('/values/capacitor');
  });

  it('answers 422 with the closest design when none meets the tolerance', async () => {
    const res = await post('/v1/design', {
      targetFrequencyHz: 1234,
      frequencyTolerance: 1e-4,
      supply: { positiveV: 5 },
      amplifier: 'cmos-rrio-fast',
      values: { resistor: { series: 'E3' }, capacitor: { series: 'E3' } },
      constraints: { rMinOhm: 10e3, rMaxOhm: 47e3, cMinF: 10e-9, cMaxF: 22e-9 },
    });
    expect(res.statusCode).toBe(422);
    expect(typeof res.json().figures.bestFrequencyError).toBe('number');
  });

  it('rejects an unknown field with a pointer', async () => {
    const res = await post('/v1/design', { targetFrequencyHz: 1000, supply: { positiveV: 5 }, amplifier: 'ideal', colour: 'red' });
    expect(res.statusCode).toBe(400);
    expect(res.json().errors[0].pointer).toBe('/colour');
  });
});

describe('POST /v1/design beyond threshold placement (diode steering)', () => {
  const steered = [
    { targetFrequencyHz: 2000, targetDutyCycle: 0.05, supply: { positiveV: 5 }, amplifier: 'cmos-rrio-fast' },
    { targetFrequencyHz: 800, targetDutyCycle: 0.96, dutyTolerance: 0.01, supply: { positiveV: 3.3 }, amplifier: 'comparator-push-pull-cmos' },
    { targetFrequencyHz: 300, targetDutyCycle: 0.04, frequencyTolerance: 0.02, supply: { positiveV: 12, negativeV: -12 }, amplifier: 'bipolar-split-supply-general' },
    { targetFrequencyHz: 1500, targetDutyCycle: 0.92, supply: { positiveV: 5 }, amplifier: 'cmos-rrio-fast', diode: { forwardDropV: 0.3 } },
  ];

  for (const body of steered) {
    it(`round trip: ${body.targetDutyCycle * 100} % duty designs analysed by /v1/analyze land within their reported errors`, async () => {
      const res = await post('/v1/design', body);
      expect(res.statusCode).toBe(200);
      const designs = res.json().designs as (DesignJson & { topology: string; circuit: { diode?: { forwardDropV: number; resistanceOhm: number } } })[];
      expect(designs.length).toBeGreaterThan(0);
      for (const d of designs) {
        expect(d.topology).toBe('diode-steered');
        // The design's own diode travels in its circuit (the request's, completed with the 10 Ω default).
        expect(d.circuit.diode).toEqual({ forwardDropV: body.diode?.forwardDropV ?? 0.6, resistanceOhm: 10 });
        const a = await post('/v1/analyze', d.circuit);
        expect(a.statusCode).toBe(200);
        const error = a.json().frequencyHz / body.targetFrequencyHz - 1;
        expect(Math.abs(error)).toBeLessThanOrEqual(Math.abs(d.frequencyError) * (1 + 1e-9) + 1e-12);
        expect(Math.abs(d.frequencyError)).toBeLessThanOrEqual(body.frequencyTolerance ?? 0.01);
        expect(Math.abs(a.json().dutyCycle - body.targetDutyCycle)).toBeLessThanOrEqual(body.dutyTolerance ?? 0.02);
        expect(a.json().dutyCycle - body.targetDutyCycle).toBeCloseTo(d.dutyCycleError, 9);
        for (const p of d.parts) expect(p.series ?? p.partNumber).toBeDefined();
      }
    });
  }

  it('offers diode-steered designs at 50 % duty when topologies names it', async () => {
    const res = await post('/v1/design', { targetFrequencyHz: 1000, supply: { positiveV: 5 }, amplifier: 'cmos-rrio-fast', topologies: ['diode-steered'] });
    expect(res.statusCode).toBe(200);
    expect(res.json().designs.every((d: { topology: string }) => d.topology === 'diode-steered')).toBe(true);
  });

  it('answers 422 at /targetDutyCycle when the duty needs a resistor ratio the bounds do not allow', async () => {
    const res = await post('/v1/design', {
      targetFrequencyHz: 1000,
      targetDutyCycle: 0.01,
      dutyTolerance: 0.001,
      supply: { positiveV: 5 },
      amplifier: 'cmos-rrio-fast',
      constraints: { rMinOhm: 1e3, rMaxOhm: 47e3 },
    });
    expect(res.statusCode).toBe(422);
    expect(res.json().code).toBe('infeasible');
    expect(res.json().errors[0].pointer).toBe('/targetDutyCycle');
    expect(res.json().detail).toMatch(/ratio/);
    // Centred thresholds: the paths must stand in the ratio d/(1 − d) (hand derivation in steered-design.test.ts).
    expect(res.json().figures.requiredResistanceRatio).toBeCloseTo(0.01 / 0.99, 9);
  });

  it('answers 422 for a duty cycle outside placement when the topologies named exclude steering', async () => {
    const res = await post('/v1/design', {
      targetFrequencyHz: 1000,
      targetDutyCycle: 0.95,
      supply: { positiveV: 5 },
      amplifier: 'cmos-rrio-fast',
      topologies: ['three-resistor-divider'],
    });
    expect(res.statusCode).toBe(422);
    expect(res.json().errors[0].pointer).toBe('/targetDutyCycle');
  });
});

describe('POST /v1/design runs off the event loop', () => {
  it('answers /healthz while a long design search is in flight (the search runs in a worker thread)', async () => {
    const busyApp = await testApp({ config: { workerThreads: 1 } });
    try {
      const order: string[] = [];
      const design = busyApp
        .inject({
          method: 'POST',
          url: '/v1/design',
          payload: {
            targetFrequencyHz: 3300,
            targetDutyCycle: 0.97,
            frequencyTolerance: 0.01,
            supply: { positiveV: 5 },
            amplifier: 'cmos-rrio-fast',
            values: { resistor: { series: 'E192' } },
            count: 5,
          },
        })
        .then((r) => {
          order.push('design');
          return r;
        });
      await new Promise((r) => setTimeout(r, 20)); // let the search reach the worker
      const health = await busyApp.inject({ method: 'GET', url: '/healthz' });
      order.push('healthz');
      const res = await design;
      expect(health.statusCode).toBe(200);
      expect(res.statusCode, res.body.slice(0, 300)).toBe(200);
      expect(order).toEqual(['healthz', 'design']);
    } finally {
      await busyApp.close();
    }
  });
});
