/** Operational endpoints and generic HTTP behaviour. */
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectContract } from '../helpers/contract.ts';
import { testApp } from '../helpers/app.ts';

let app: FastifyInstance;
beforeAll(async () => {
  app = await testApp();
});
afterAll(async () => app.close());

describe('system endpoints', () => {
  it('GET /healthz and /readyz', async () => {
    const h = await app.inject({ method: 'GET', url: '/healthz' });
    expect(h.json()).toEqual({ status: 'ok' });
    await expectContract(h, 'GET', '/healthz');
    const r = await app.inject({ method: 'GET', url: '/readyz' });
    expect(r.statusCode).toBe(200);
    expect(r.json().checks.store).toBe(true);
    await expectContract(r, 'GET', '/readyz');
  });

  it('GET /metrics is Prometheus text exposition format with request counters', async () => {
    await app.inject({ method: 'GET', url: '/healthz' });
    const m = await app.inject({ method: 'GET', url: '/metrics' });
    expect(m.headers['content-type']).toMatch(/^text\/plain/);
    expect(m.body).toMatch(/# TYPE tickwright_http_requests_total counter/);
    expect(m.body).toMatch(/tickwright_http_requests_total\{method="GET",route="\/healthz",status="200"\} \d+/);
    // Every non-comment line is "name{labels} value" or "name value"; empty lines are allowed (exposition format 0.0.4).
    for (const line of m.body.trim().split('\n').filter((l) => !l.startsWith('#') && l.trim() !== '')) {
      // Metric names per the format: [a-zA-Z_:][a-zA-Z0-9_:]* (digits allowed after the first character).
      expect(line).toMatch(/^[a-zA-Z_:][a-zA-Z0-9_:]*(\{[^}]*\})? (-?[0-9.e+-]+|[+-]Inf|NaN)$/);
    }
    await expectContract(m, 'GET', '/metrics');
  });

  it('serves the contract at /openapi.json and the docs at /docs', async () => {
    const doc = await app.inject({ method: 'GET', url: '/openapi.json' });
    expect(doc.json().openapi).toBe('3.1.0');
    const docs = await app.inject({ method: 'GET', url: '/docs' });
    expect([200, 302]).toContain(docs.statusCode);
  });

  it('unknown path -> 404 problem; wrong method -> 405 with Allow', async () => {
    const nf = await app.inject({ method: 'GET', url: '/v1/nothing-here' });
    expect(nf.statusCode).toBe(404);
    expect(nf.headers['content-type']).toMatch(/^application\/problem\+json/);
    const na = await app.inject({ method: 'DELETE', url: '/v1/analyze' });
    expect(na.statusCode).toBe(405);
    expect(na.headers.allow).toBe('POST');
    expect(na.json().status).toBe(405);
  });

  it('echoes a caller-supplied request id', async () => {
    const res = await app.inject({ method: 'GET', url: '/healthz', headers: { 'x-request-id': 'trace-abc-123' } });
    expect(res.headers['x-request-id']).toBe('trace-abc-123');
  });
});

describe('amplifier table', () => {
  it('lists ideal plus at least seven technology-class archetypes, every figure documented as class-typical', async () => {
    const res = await app.inject({ method: 'GET', url: '/v1/amplifiers' });
    await expectContract(res, 'GET', '/v1/amplifiers');
    const { amplifiers } = res.json();
    expect(amplifiers.find((a: { id: string }) => a.id === 'ideal')).toBeDefined();
    const archetypes = amplifiers.filter((a: { figuresBasis: string }) => a.figuresBasis === 'class-typical');
    expect(archetypes.length).toBeGreaterThanOrEqual(7);
    expect(new Set(archetypes.map((a: { technologyClass: string }) => a.technologyClass)).size).toBe(archetypes.length);
    expect(archetypes.some((a: { outputStage: string }) => a.outputStage === 'open-drain')).toBe(true);
    expect(archetypes.some((a: { differentialClampV: number | null }) => a.differentialClampV !== null)).toBe(true);
  });

  it('GET /v1/amplifiers/{id}: limits that do not exist are null; unknown id -> 404', async () => {
    const ideal = await app.inject({ method: 'GET', url: '/v1/amplifiers/ideal' });
    await expectContract(ideal, 'GET', '/v1/amplifiers/:id');
    expect(ideal.json().slewRateVPerS).toBeNull();
    const missing = await app.inject({ method: 'GET', url: '/v1/amplifiers/not-a-part' });
    expect(missing.statusCode).toBe(404);
    await expectContract(missing, 'GET', '/v1/amplifiers/:id');
  });
});

describe('load shedding', () => {
  it('answers 503 problem+json with Retry-After while the event loop is blocked beyond the limit', async () => {
    const busy = await testApp({ config: { maxEventLoopDelayMs: 20 } });
    // Keep the loop busy in 80 ms chunks (a CPU-bound neighbour), so every sampling interval sees a mean
    // delay far above the 20 ms limit whatever the machine's own timing; requests still get turns between chunks.
    const hog = setInterval(() => {
      const until = Date.now() + 80;
      while (Date.now() < until) {
        /* busy */
      }
    }, 1);
    try {
      await new Promise((r) => setTimeout(r, 1200));
      const res = await busy.inject({ method: 'GET', url: '/v1/amplifiers' });
      clearInterval(hog);
      expect(res.statusCode).toBe(503);
      expect(res.headers['retry-after']).toBeDefined();
      expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
      await expectContract(res, 'GET', '/v1/amplifiers');
    } finally {
      clearInterval(hog);
      await busy.close();
    }
  });
});
