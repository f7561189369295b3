/**
 * /metrics from prom-client, read back with a strict parser of the text
 * exposition format 0.0.4 (prometheus.io, "Exposition formats"). Histogram
 * rules checked: buckets cumulative and non-decreasing in `le`, the `+Inf`
 * bucket equal to `_count` (same document).
 */
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Metrics } from '../../src/http/metrics.ts';
import { testApp } from '../helpers/app.ts';
import { benchCatalogue } from '../http/fixtures/catalogues.ts';
import { find, parseExposition, type Exposition } from './prometheus-text.ts';

let app: FastifyInstance;
beforeAll(async () => {
  app = await testApp({ config: { workerThreads: 1 } });
});
afterAll(async () => app.close());

// Our own small scenario: a ±5 V split-rail clock (values chosen for this test).
const clock = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 5, negativeV: -5 },
  amplifier: 'ideal',
  parts: { rTiming: '10k', cTiming: '10n', rFeedback: '20k', rGround: '10k' },
};

async function scrape(): Promise<{ text: string; contentType: string; exposition: Exposition }> {
  const res = await app.inject({ method: 'GET', url: '/metrics' });
  expect(res.statusCode).toBe(200);
  return { text: res.body, contentType: String(res.headers['content-type']), exposition: parseExposition(res.body) };
}

function expectWellFormedHistogram(exposition: Exposition, name: string, labels: Record<string, string>): number {
  const buckets = find(exposition, `${name}_bucket`, labels).sort((a, b) => Number(a.labels.le === '+Inf' ? Infinity : a.labels.le) - Number(b.labels.le === '+Inf' ? Infinity : b.labels.le));
  expect(buckets.length, `${name} ${JSON.stringify(labels)}`).toBeGreaterThan(1);
  for (let i = 1; i < buckets.length; i += 1) expect(buckets[i].value).toBeGreaterThanOrEqual(buckets[i - 1].value);
  const count = find(exposition, `${name}_count`, labels);
  expect(count).toHaveLength(1);
  expect(buckets.at(-1)!.labels.le).toBe('+Inf');
  expect(buckets.at(-1)!.value).toBe(count[0].value);
  expect(find(exposition, `${name}_sum`, labels)[0].value).toBeGreaterThanOrEqual(0);
  return count[0].value;
}

describe('/metrics', () => {
  it('exposes default process and event-loop figures, requests by route and status, store latency and the pool', async () => {
    const put = await app.inject({ method: 'PUT', url: '/v1/catalogues/metered', payload: benchCatalogue() });
    expect(put.statusCode, put.body).toBe(201);
    expect((await app.inject({ method: 'GET', url: '/v1/catalogues/metered' })).statusCode).toBe(200);
    expect((await app.inject({ method: 'GET', url: '/v1/catalogues/absent' })).statusCode).toBe(404);
    const tolerance = await app.inject({ method: 'POST', url: '/v1/tolerance', payload: { circuit: clock, tolerances: { rTiming: 0.01 }, monteCarlo: { samples: 2000, seed: 1 } } });
    expect(tolerance.statusCode, tolerance.body).toBe(200);

    const { contentType, exposition } = await scrape();
    expect(contentType).toMatch(/^text\/plain; version=0\.0\.4/);

    // prom-client's default collectors, with our prefix.
    for (const name of ['tickwright_process_cpu_user_seconds_total', 'tickwright_process_resident_memory_bytes', 'tickwright_nodejs_eventloop_lag_seconds', 'tickwright_nodejs_heap_size_used_bytes']) {
      expect(find(exposition, name).length, name).toBeGreaterThan(0);
    }

    // Requests by route pattern (never the raw URL, which would explode the label set) and status.
    expect(exposition.types.get('tickwright_http_request_duration_seconds')).toBe('histogram');
    expect(expectWellFormedHistogram(exposition, 'tickwright_http_request_duration_seconds', { method: 'PUT', route: '/v1/catalogues/:id', status: '201' })).toBe(1);
    expect(expectWellFormedHistogram(exposition, 'tickwright_http_request_duration_seconds', { method: 'GET', route: '/v1/catalogues/:id', status: '404' })).toBe(1);
    expect(find(exposition, 'tickwright_http_requests_total', { route: '/v1/catalogues/:id', status: '200' })[0].value).toBe(1);
    expect(exposition.samples.some((s) => s.labels.route?.includes('metered'))).toBe(false);

    // Store latency per operation: one put, two gets (one found, one missing) on SQLite.
    expect(expectWellFormedHistogram(exposition, 'tickwright_store_call_duration_seconds', { backend: 'sqlite', operation: 'put', collection: 'catalogues', outcome: 'ok' })).toBe(1);
    expect(expectWellFormedHistogram(exposition, 'tickwright_store_call_duration_seconds', { backend: 'sqlite', operation: 'get', collection: 'catalogues', outcome: 'ok' })).toBeGreaterThanOrEqual(2);

    // The worker pool: the tolerance run as one task, the queue depth gauge present.
    expect(expectWellFormedHistogram(exposition, 'tickwright_worker_task_duration_seconds', { task: 'tolerance', outcome: 'ok' })).toBe(1);
    expect(exposition.types.get('tickwright_worker_pool_queue_depth')).toBe('gauge');
    expect(find(exposition, 'tickwright_worker_pool_queue_depth')[0].value).toBe(0);
    expect(exposition.types.get('tickwright_worker_task_cancellations_total')).toBe('counter');
  });

  it('counts a task whose request was aborted as a cancellation', async () => {
    const metrics = new Metrics({ defaultMetrics: false });
    const controller = new AbortController();
    controller.abort();
    await expect(metrics.taskObserver('tolerance', controller.signal, () => Promise.reject(new Error('aborted')))).rejects.toThrow('aborted');
    await expect(metrics.taskObserver('fit', undefined, () => Promise.reject(new Error('bad capture')))).rejects.toThrow();
    expect(await metrics.taskObserver('design', undefined, () => Promise.resolve(42))).toBe(42);
    const exposition = parseExposition(await metrics.render());
    expect(find(exposition, 'tickwright_worker_task_cancellations_total', { task: 'tolerance' })[0].value).toBe(1);
    expect(find(exposition, 'tickwright_worker_task_cancellations_total', { task: 'fit' })).toHaveLength(0);
    expect(find(exposition, 'tickwright_worker_task_duration_seconds_count', { task: 'fit', outcome: 'error' })[0].value).toBe(1);
    expect(find(exposition, 'tickwright_worker_task_duration_seconds_count', { task: 'design', outcome: 'ok' })[0].value).toBe(1);
  });

  it('the reader rejects malformed exposition lines (so the checks above can fail)', () => {
    expect(() => parseExposition('metric{label=unquoted} 1')).toThrow();
    expect(() => parseExposition('# TYPE x bogus')).toThrow();
    expect(() => parseExposition('9bad 1')).toThrow();
  });
});
