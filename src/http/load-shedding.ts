/**
 * Load shedding on event-loop delay, with two promises the general-purpose
 * plugin could not keep:
 *
 *  - `/healthz` is never shed (routes with `config: { shed: false }`): it says
 *    whether the process lives, and an orchestrator that reads a busy moment as
 *    death restarts a healthy replica. Pressure shows on `/readyz` instead.
 *  - Sampling never throws. The delay comes from perf_hooks' histogram and the
 *    timer's own lateness, the heap from V8's statistics: nothing opens a file,
 *    so running out of file descriptors (a connection flood) cannot turn a
 *    sample into an uncaught EMFILE that takes the process down.
 */
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { getHeapStatistics } from 'node:v8';
import type { FastifyInstance } from 'fastify';
import { problem, sendProblem } from './problem.ts';

export interface LoadSheddingOptions {
  /** Mean event-loop delay above which requests are shed, ms; 0 switches shedding off. */
  maxEventLoopDelayMs: number;
  /** How often the delay is sampled, ms. */
  sampleIntervalMs?: number;
  /** Retry-After on a shed request, s. */
  retryAfterS?: number;
}

export interface PressureReport {
  underPressure: boolean;
  /** Event-loop delay over the last sampling interval, ms. */
  eventLoopDelayMs: number;
  heapUsedBytes: number;
}

declare module 'fastify' {
  interface FastifyContextConfig {
    /** false: never answered 503 for load (liveness). */
    shed?: boolean;
  }
  interface FastifyInstance {
    /** The load shedder's latest sample. */
    pressure(): PressureReport;
  }
}

/** Resolution of the delay histogram, ms (its own sampling adds about this much to the mean). */
const RESOLUTION_MS = 10;

export function installLoadShedding(app: FastifyInstance, options: LoadSheddingOptions): void {
  const limitMs = options.maxEventLoopDelayMs;
  const intervalMs = options.sampleIntervalMs ?? 250;
  const retryAfter = String(options.retryAfterS ?? 5);
  const histogram = monitorEventLoopDelay({ resolution: RESOLUTION_MS });
  histogram.enable();
  let delayMs = 0;
  let heapUsedBytes = 0;
  let lastSampleAt = performance.now();

  const sample = () => {
    const now = performance.now();
    // A loop blocked for the whole interval leaves the histogram empty (NaN mean); the timer's own
    // lateness is then the delay. Either way take the larger of the two readings.
    const lateMs = Math.max(0, now - lastSampleAt - intervalMs);
    const meanMs = histogram.count > 0 ? Math.max(0, histogram.mean / 1e6 - RESOLUTION_MS) : lateMs;
    delayMs = Math.max(meanMs, lateMs);
    histogram.reset();
    lastSampleAt = now;
    try {
      heapUsedBytes = getHeapStatistics().used_heap_size;
    } catch {
      // Keep the previous figure: a failed sample must never become a fatal error.
    }
  };
  const timer = setInterval(sample, intervalMs);
  timer.unref();
  app.addHook('onClose', (_instance, done) => {
    clearInterval(timer);
    histogram.disable();
    done();
  });

  const underPressure = () => limitMs > 0 && delayMs > limitMs;
  app.decorate('pressure', (): PressureReport => ({ underPressure: underPressure(), eventLoopDelayMs: delayMs, heapUsedBytes }));

  if (limitMs <= 0) return;
  app.addHook('onRequest', (request, reply, done) => {
    if (!underPressure() || request.routeOptions.config?.shed === false) return done();
    sendProblem(
      reply,
      problem(503, 'overloaded', `The service is under load (event-loop delay ${Math.round(delayMs)} ms); retry later`, request.url),
      { 'retry-after': retryAfter },
    );
  });
}
