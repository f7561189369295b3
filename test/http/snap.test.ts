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

const snap = async (payload: unknown) => {
  const res = await app.inject({ method: 'POST', url: '/v1/snap', payload: payload as never });
  await expectContract(res, 'POST', '/v1/snap');
  return res;
};

describe('POST /v1/snap, values', () => {
  it('snaps value strings to E24 neighbours with their errors', async () => {
    const res = await snap({ values: [{ ideal: '4k6', kind: 'resistor', source: { series: 'E24' }, label: 'R7' }, { ideal: '3.1n', kind: 'capacitor', source: { series: 'E12' } }] });
    expect(res.statusCode).toBe(200);
    const [r, c] = res.json().values;
    // IEC 60063: E24 ... 4.3, 4.7 ...; E12 ... 2.7, 3.3 ...
    expect([r.lower.value, r.nearest.value, r.higher.value]).toEqual([4300, 4700, 4700]);
    expect(r.label).toBe('R7');
    expect(r.nearest.series).toBe('E24');
    expect(r.nearest.error).toBeCloseTo(100 / 4600, 12);
    expect(c.lower.value).toBeCloseTo(2.7e-9, 21);
    expect(c.higher.value).toBeCloseTo(3.3e-9, 21);
  });

  it('offers a two-part combination that beats the nearest single part', async () => {
    const res = await snap({ values: [{ ideal: 5000, kind: 'resistor', source: { series: 'E12' }, combinations: true }] });
    const v = res.json().values[0];
    expect(v.combination.parts).toHaveLength(2);
    expect(['series', 'parallel']).toContain(v.combination.arrangement);
    const [a, b] = v.combination.parts.map((p: { value: number }) => p.value);
    const expected = v.combination.arrangement === 'series' ? a + b : (a * b) / (a + b);
    expect(v.combination.value).toBeCloseTo(expected, 9);
    expect(Math.abs(v.combination.error)).toBeLessThan(Math.abs(v.nearest.error));
  });

  it('snaps to a stored catalogue and names the part', async () => {
    const put = await app.inject({
      method: 'PUT',
      url: '/v1/catalogues/snap-lab',
      payload: {
        name: 'Invented lab list',
        parts: [
          { kind: 'resistor', value: '10k', tolerance: 0.01, partNumber: 'SL-R1', status: 'preferred' },
          { kind: 'resistor', value: '12k', tolerance: 0.01, partNumber: 'SL-R2', status: 'not-for-new-designs' },
          { kind: 'resistor', value: '15k', tolerance: 0.01, partNumber: 'SL-R3', status: 'active' },
        ],
      },
    });
    expect(put.statusCode).toBeLessThan(300);
    const res = await snap({ values: [{ ideal: '12k', kind: 'resistor', source: { catalogue: 'snap-lab' } }] });
    const v = res.json().values[0];
    // The not-for-new-designs 12k part is never offered.
    expect(v.lower.partNumber).toBe('SL-R1');
    expect(v.higher.partNumber).toBe('SL-R3');
    expect(v.nearest.catalogue).toBe('snap-lab');
  });

  it('answers 422 for an unknown catalogue and 400 for an unparseable value, with pointers', async () => {
    const missing = await snap({ values: [{ ideal: 1000, kind: 'resistor', source: { catalogue: 'nope' } }] });
    expect(missing.statusCode).toBe(422);
    expect(missing.json().errors[0].pointer).toBe('/values/0/source/catalogue');
    const bad = await snap({ values: [{ ideal: '4x7', kind: 'resistor', source: { series: 'E24' } }] });
    expect(bad.statusCode).toBe(400);
    expect(bad.json().errors[0].pointer).toBe('/values/0/ideal');
    const empty = await snap({});
    expect(empty.statusCode).toBe(400);
  });
});

describe('POST /v1/snap, circuit', () => {
  it('returns joint choices ranked by frequency error, each analysed', async () => {
    const res = await snap({
      circuit: {
        topology: 'two-resistor-feedback',
        supply: { positiveV: 9, negativeV: -9 },
        amplifier: 'ideal',
        targetFrequencyHz: 4321,
        values: { resistor: { series: 'E24' }, capacitor: { series: 'E6' } },
        hysteresis: { feedbackFractionMin: 0.3, feedbackFractionMax: 0.6 },
        count: 4,
      },
    });
    expect(res.statusCode).toBe(200);
    const { candidates, search } = res.json().circuit;
    expect(candidates).toHaveLength(4);
    const errors = candidates.map((c: { frequencyError: number }) => Math.abs(c.frequencyError));
    expect([...errors].sort((a, b) => a - b)).toEqual(errors);
    for (const c of candidates) {
      const p = Object.fromEntries(c.parts.map((x: { role: string; value: number }) => [x.role, x.value]));
      const beta = p.rGround / (p.rGround + p.rFeedback);
      expect(beta).toBeGreaterThanOrEqual(0.3);
      expect(beta).toBeLessThanOrEqual(0.6);
      // Sedra & Smith astable: f = 1 / (2·R·C·ln((1+β)/(1−β))) for an ideal amplifier.
      const f = 1 / (2 * p.rTiming * p.cTiming * Math.log((1 + beta) / (1 - beta)));
      expect(c.predicted.frequencyHz).toBeCloseTo(f, 6);
      expect(c.frequencyError).toBeCloseTo(f / 4321 - 1, 9);
    }
    expect(search.pairsExamined).toBeLessThan(search.exhaustiveTuples);
  });

  it('snaps near ideal divider values for a duty target, with a two-part timing resistor allowed', async () => {
    const res = await snap({
      circuit: {
        topology: 'three-resistor-divider',
        supply: { positiveV: 5 },
        amplifier: 'cmos-rrio-fast',
        targetFrequencyHz: 1000,
        targetDutyCycle: 0.5,
        dutyTolerance: 0.03,
        values: { resistor: { series: 'E24' }, capacitor: { series: 'E6' } },
        hysteresis: { ideal: { rTop: '100k', rBottom: '100k', rFeedback: '100k' } },
        combine: 'rTiming',
        count: 3,
      },
    });
    expect(res.statusCode).toBe(200);
    for (const c of res.json().circuit.candidates) {
      expect(Math.abs(c.dutyCycleError)).toBeLessThanOrEqual(0.03);
      const rTiming = c.parts.find((p: { role: string }) => p.role === 'rTiming');
      if (rTiming.arrangement !== 'single') expect(rTiming.parts).toHaveLength(2);
    }
  });

  it('puts circuit errors under /circuit', async () => {
    const res = await snap({
      circuit: {
        topology: 'two-resistor-feedback',
        supply: { positiveV: 9, negativeV: -9 },
        targetFrequencyHz: 1000,
        values: { resistor: { series: 'E24' }, capacitor: { catalogue: 'absent' } },
      },
    });
    expect(res.statusCode).toBe(422);
    expect(res.json().errors[0].pointer).toBe('/circuit/values/capacitor/catalogue');
  });
});
