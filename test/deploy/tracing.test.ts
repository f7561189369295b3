/**
 * OpenTelemetry spans with an in-memory exporter: a server span per request
 * named by its route, and store calls and worker-pool tasks as its children
 * (same trace id, parent span id = the request span's id), per the W3C Trace
 * Context / OpenTelemetry parent-child model.
 */
import { context, trace } from '@opentelemetry/api';
import { InMemorySpanExporter, NodeTracerProvider, SimpleSpanProcessor } from '@opentelemetry/sdk-trace-node';
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { testApp } from '../helpers/app.ts';
import { benchCatalogue } from '../http/fixtures/catalogues.ts';

const exporter = new InMemorySpanExporter();
const provider = new NodeTracerProvider({ spanProcessors: [new SimpleSpanProcessor(exporter)] });
let app: FastifyInstance;
let untraced: FastifyInstance;

beforeAll(async () => {
  provider.register();
  app = await testApp({ config: { workerThreads: 1, tracing: 'console' } });
  untraced = await testApp({ config: { workerThreads: 1 } });
});
afterAll(async () => {
  await app.close();
  await untraced.close();
  await provider.shutdown();
  trace.disable();
  context.disable();
});
beforeEach(() => exporter.reset());

// Our own small scenario: a ±5 V split-rail clock (values chosen for this test).
const clock = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 5, negativeV: -5 },
  amplifier: 'ideal',
  parts: { rTiming: '10k', cTiming: '10n', rFeedback: '20k', rGround: '10k' },
};

function spans() {
  return exporter.getFinishedSpans();
}

describe('tracing', () => {
  it('makes store calls children of the request span', async () => {
    const res = await app.inject({ method: 'PUT', url: '/v1/catalogues/traced', payload: benchCatalogue() });
    expect(res.statusCode).toBe(201);
    const server = spans().find((s) => s.name === 'PUT /v1/catalogues/:id');
    expect(server, spans().map((s) => s.name).join(', ')).toBeDefined();
    expect(server!.attributes['http.response.status_code']).toBe(201);
    expect(server!.parentSpanContext).toBeUndefined();
    const storeSpans = spans().filter((s) => s.name.startsWith('store.'));
    expect(storeSpans.map((s) => s.name)).toContain('store.put');
    for (const span of storeSpans) {
      expect(span.spanContext().traceId).toBe(server!.spanContext().traceId);
      expect(span.parentSpanContext?.spanId).toBe(server!.spanContext().spanId);
      expect(span.attributes['db.system']).toBe('sqlite');
    }
  });

  it('makes a worker-pool task a child of the request span', async () => {
    const res = await app.inject({ method: 'POST', url: '/v1/tolerance', payload: { circuit: clock, tolerances: { rTiming: 0.01 }, monteCarlo: { samples: 2000, seed: 1 } } });
    expect(res.statusCode, res.body).toBe(200);
    const server = spans().find((s) => s.name === 'POST /v1/tolerance');
    const task = spans().find((s) => s.name === 'pool.task tolerance');
    expect(server).toBeDefined();
    expect(task).toBeDefined();
    expect(task!.parentSpanContext?.spanId).toBe(server!.spanContext().spanId);
    expect(task!.spanContext().traceId).toBe(server!.spanContext().traceId);
    // The child ends inside its parent's interval.
    const ns = (t: [number, number]) => t[0] * 1e9 + t[1];
    expect(ns(task!.startTime)).toBeGreaterThanOrEqual(ns(server!.startTime));
    expect(ns(task!.endTime)).toBeLessThanOrEqual(ns(server!.endTime));
  });

  it('keeps separate requests in separate traces', async () => {
    await Promise.all([app.inject({ method: 'GET', url: '/v1/catalogues/traced' }), app.inject({ method: 'GET', url: '/v1/catalogues/absent' })]);
    const servers = spans().filter((s) => s.name === 'GET /v1/catalogues/:id');
    expect(servers).toHaveLength(2);
    expect(servers[0].spanContext().traceId).not.toBe(servers[1].spanContext().traceId);
    for (const get of spans().filter((s) => s.name === 'store.get')) {
      expect(servers.map((s) => s.spanContext().spanId)).toContain(get.parentSpanContext?.spanId);
    }
  });

  it('emits nothing when tracing is off (the default)', async () => {
    const res = await untraced.inject({ method: 'PUT', url: '/v1/catalogues/quiet', payload: benchCatalogue() });
    expect(res.statusCode).toBe(201);
    expect(spans()).toEqual([]);
  });
});
