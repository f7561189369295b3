/** POST /v1/waveform over HTTP: JSON samples, the SVG plot, content negotiation and the sample cap. */
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { negotiateWaveformType } from '../../src/http/routes/waveform.ts';
import { testApp } from '../helpers/app.ts';
import { expectContract } from '../helpers/contract.ts';

let app: FastifyInstance;
beforeAll(async () => {
  // 0 disables load shedding: a long first contract compile leaves the load shedder with no
  // event-loop sample for an interval, which it reads as infinite delay (and answers 503).
  app = await testApp({ config: { maxEventLoopDelayMs: 0 } });
});
afterAll(async () => app.close());

// Our own scenario: a ±12 V test-fixture clock on a slow general-purpose part.
const fixtureClock = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 12, negativeV: -12 },
  amplifier: 'bipolar-split-supply-general',
  parts: { rTiming: '10k', cTiming: '10n', rFeedback: '10k', rGround: '10k' },
};

async function waveform(payload: unknown, headers: Record<string, string> = {}) {
  const res = await app.inject({ method: 'POST', url: '/v1/waveform', payload: payload as object, headers });
  await expectContract(res, 'POST', '/v1/waveform');
  return res;
}

describe('POST /v1/waveform', () => {
  it('samples N periods on a uniform grid; the figures match POST /v1/analyze', async () => {
    const res = await waveform({ circuit: fixtureClock, periods: 2, samples: 801 });
    expect(res.statusCode).toBe(200);
    const body = res.json();
    expect(body.timeS).toHaveLength(801);
    for (const key of ['capacitorV', 'outputV', 'decisionV']) expect(body[key]).toHaveLength(801);
    const step = body.timeS[1] - body.timeS[0];
    expect(body.timeS[800]).toBeCloseTo(2 * body.periodS, 15);
    expect(body.timeS[400] - body.timeS[399]).toBeCloseTo(step, 18);
    const analysis = (await app.inject({ method: 'POST', url: '/v1/analyze', payload: fixtureClock })).json();
    expect(body.periodS).toBe(analysis.periodS);
    expect(body.dutyCycle).toBe(analysis.dutyCycle);
    // The capacitor stays between the swing limits; it overshoots the thresholds only by what
    // the recovery delay and slew add (it keeps charging until the output has turned).
    const vMax = Math.max(...body.capacitorV);
    const vMin = Math.min(...body.capacitorV);
    expect(vMax).toBeGreaterThan(body.thresholds.upperV);
    expect(vMax).toBeLessThanOrEqual(analysis.capacitor.maxV + 1e-12);
    expect(vMin).toBeGreaterThanOrEqual(analysis.capacitor.minV - 1e-12);
    // Window starts at a rising decision: the output is still low (recovery delay) and the capacitor at the lower threshold.
    expect(body.capacitorV[0]).toBeCloseTo(body.thresholds.lowerV, 9);
    expect(body.outputV[0]).toBeLessThan(0);
    // Periodic: one period later the same values.
    expect(body.capacitorV[400]).toBeCloseTo(body.capacitorV[0], 9);
  });

  it('starts at power-up with the capacitor empty when asked', async () => {
    const res = await waveform({ circuit: fixtureClock, periods: 1, samples: 100, includePowerUp: true });
    expect(res.statusCode).toBe(200);
    const body = res.json();
    expect(body.includePowerUp).toBe(true);
    expect(body.capacitorV[0]).toBe(0);
    expect(body.outputV[0]).toBeGreaterThan(10); // powered up high: output near V+ minus its headroom
  });

  it('returns an SVG plot for Accept: image/svg+xml', async () => {
    const res = await waveform({ circuit: fixtureClock, samples: 500 }, { accept: 'image/svg+xml' });
    expect(res.statusCode).toBe(200);
    expect(res.headers['content-type']).toMatch(/^image\/svg\+xml/);
    expect(res.headers.vary).toMatch(/Accept/i);
    expect(res.body.startsWith('<svg') || res.body.startsWith('<?xml')).toBe(true);
    expect(res.body).toContain('</svg>');
  });

  it('answers 406 with a problem for a media type it cannot produce', async () => {
    const res = await waveform({ circuit: fixtureClock }, { accept: 'text/csv' });
    expect(res.statusCode).toBe(406);
    expect(res.json().code).toBe('not-acceptable');
  });

  it('refuses more samples than the cap with 422 (limit-exceeded) and a pointer', async () => {
    const res = await waveform({ circuit: fixtureClock, samples: 200_001 });
    expect(res.statusCode).toBe(422);
    const body = res.json();
    expect(body.code).toBe('limit-exceeded');
    expect(JSON.stringify(body)).toContain('/samples');
  });

  it('rejects out-of-range periods with 400 and points into the circuit for bad parts', async () => {
    const periods = await waveform({ circuit: fixtureClock, periods: 1001 });
    expect(periods.statusCode).toBe(400);
    const part = await waveform({ circuit: { ...fixtureClock, parts: { ...fixtureClock.parts, rTiming: '-3' } } });
    expect(part.statusCode).toBe(400);
    expect(JSON.stringify(part.json())).toContain('/circuit/parts/rTiming');
  });

  it('answers 422 with the reason for a circuit that latches', async () => {
    // A weak output (1 kΩ) into a 100 Ω load only reaches 5·100/1100 ≈ 0.45 V when high, while the
    // divider puts the upper threshold near (5 + 0.45)/3 ≈ 1.8 V: the capacitor never gets there.
    const weak = {
      topology: 'three-resistor-divider',
      supply: { positiveV: 5 },
      amplifier: { outputResistanceOhm: 1000, slewRateVPerS: 1e6 },
      load: { resistanceOhm: 100 },
      parts: { rTiming: '10k', cTiming: '10n', rTop: '100k', rBottom: '100k', rFeedback: '100k' },
    };
    const res = await waveform({ circuit: weak });
    expect(res.statusCode).toBe(422);
    const body = res.json();
    expect(body.code).toBe('no-oscillation');
    expect(body.detail).toMatch(/latches high/);
    expect(body.detail).toMatch(/does not reach the upper threshold/);
  });
});

describe('waveform content negotiation (RFC 9110 §12.5.1)', () => {
  it('ranks by q and falls back to JSON', () => {
    expect(negotiateWaveformType(undefined)).toBe('application/json');
    expect(negotiateWaveformType('*/*')).toBe('application/json');
    expect(negotiateWaveformType('image/svg+xml')).toBe('image/svg+xml');
    expect(negotiateWaveformType('application/json;q=0.5, image/svg+xml')).toBe('image/svg+xml');
    expect(negotiateWaveformType('image/*;q=0.9, application/json;q=0.2')).toBe('image/svg+xml');
    expect(negotiateWaveformType('image/svg+xml;q=0, */*;q=0.1')).toBe('application/json');
    expect(negotiateWaveformType('text/html')).toBeUndefined();
  });
});
