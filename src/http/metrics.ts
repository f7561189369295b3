/**
 * Prometheus metrics (prom-client): the library's default process and
 * event-loop figures, plus what this service adds — HTTP request duration by
 * route and status, the worker pool (queue depth, task durations, cancellations)
 * and store call latency. One registry per app, so several apps in one process
 * (tests) keep their own series.
 */
import { collectDefaultMetrics, Counter, Gauge, Histogram, Registry } from 'prom-client';
import type { StoreCallObserver } from '../store/instrumented.ts';
import type { StoreBackend } from '../store/types.ts';
import type { TaskObserver, WorkerPoolStats } from './workers/pool.ts';

/** Request latency buckets, seconds: sub-millisecond analyses up to long Monte Carlo runs. */
const HTTP_BUCKETS_S = [0.001, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30];
/** Store call buckets, seconds: an in-process SQLite read (~10 µs) up to a slow network round trip. */
const STORE_BUCKETS_S = [0.00005, 0.0001, 0.00025, 0.0005, 0.001, 0.0025, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 1];
const TASK_BUCKETS_S = [0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30, 60];

export type TaskOutcome = 'ok' | 'error' | 'cancelled';

export class Metrics {
  readonly registry = new Registry();
  private readonly requests: Counter<'method' | 'route' | 'status'>;
  private readonly requestDuration: Histogram<'method' | 'route' | 'status'>;
  private readonly taskDuration: Histogram<'task' | 'outcome'>;
  private readonly taskCancellations: Counter<'task'>;
  private readonly storeDuration: Histogram<'backend' | 'operation' | 'collection' | 'outcome'>;

  private poolStats: (() => WorkerPoolStats) | undefined;

  constructor(options: { defaultMetrics?: boolean } = {}) {
    if (options.defaultMetrics !== false) collectDefaultMetrics({ register: this.registry, prefix: 'tickwright_' });
    const registers = [this.registry];
    this.requests = new Counter({
      name: 'tickwright_http_requests_total',
      help: 'HTTP requests by method, route (the matched pattern) and status.',
      labelNames: ['method', 'route', 'status'],
      registers,
    });
    this.requestDuration = new Histogram({
      name: 'tickwright_http_request_duration_seconds',
      help: 'HTTP request duration by method, route and status, seconds.',
      labelNames: ['method', 'route', 'status'],
      buckets: HTTP_BUCKETS_S,
      registers,
    });
    const poolStats = () => this.poolStats?.();
    new Gauge({
      name: 'tickwright_worker_pool_queue_depth',
      help: 'Tasks waiting for a worker thread.',
      registers,
      collect() {
        this.set(poolStats()?.queued ?? 0);
      },
    });
    new Gauge({
      name: 'tickwright_worker_pool_threads',
      help: 'Worker threads alive.',
      registers,
      collect() {
        this.set(poolStats()?.threads ?? 0);
      },
    });
    this.taskDuration = new Histogram({
      name: 'tickwright_worker_task_duration_seconds',
      help: 'Worker pool task duration (queue wait included) by task and outcome (ok, error, cancelled), seconds.',
      labelNames: ['task', 'outcome'],
      buckets: TASK_BUCKETS_S,
      registers,
    });
    this.taskCancellations = new Counter({
      name: 'tickwright_worker_task_cancellations_total',
      help: 'Worker pool tasks cancelled because the client went away or the request was aborted.',
      labelNames: ['task'],
      registers,
    });
    this.storeDuration = new Histogram({
      name: 'tickwright_store_call_duration_seconds',
      help: 'Store call latency by backend, operation, collection and outcome (ok, error), seconds.',
      labelNames: ['backend', 'operation', 'collection', 'outcome'],
      buckets: STORE_BUCKETS_S,
      registers,
    });
  }

  /** Read the worker pool's figures at every scrape. */
  watchPool(stats: () => WorkerPoolStats): void {
    this.poolStats = stats;
  }

  observe(method: string, route: string, status: number, durationS: number): void {
    const labels = { method, route, status: String(status) };
    this.requests.inc(labels);
    this.requestDuration.observe(labels, durationS);
  }

  observeTask(task: string, outcome: TaskOutcome, durationS: number): void {
    this.taskDuration.observe({ task, outcome }, durationS);
    if (outcome === 'cancelled') this.taskCancellations.inc({ task });
  }

  /** A task observer that times each pool task; an aborted signal at failure counts as a cancellation. */
  readonly taskObserver: TaskObserver = async (task, signal, run) => {
    const startedNs = process.hrtime.bigint();
    let outcome: TaskOutcome = 'error';
    try {
      const result = await run();
      outcome = 'ok';
      return result;
    } catch (error) {
      if (signal?.aborted) outcome = 'cancelled';
      throw error;
    } finally {
      this.observeTask(task, outcome, Number(process.hrtime.bigint() - startedNs) / 1e9);
    }
  };

  /** A store observer that times each call into the store latency histogram. */
  storeObserver(backend: StoreBackend): StoreCallObserver {
    return async (operation, collection, call) => {
      const startedNs = process.hrtime.bigint();
      let outcome = 'error';
      try {
        const result = await call();
        outcome = 'ok';
        return result;
      } finally {
        const durationS = Number(process.hrtime.bigint() - startedNs) / 1e9;
        this.storeDuration.observe({ backend, operation, collection: collection ?? 'none', outcome }, durationS);
      }
    };
  }

  get contentType(): string {
    return this.registry.contentType;
  }

  render(): Promise<string> {
    return this.registry.metrics();
  }
}
