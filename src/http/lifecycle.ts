/**
 * Graceful shutdown that answers every request it accepted.
 *
 * On SIGTERM the service first DRAINS: requests already running may finish
 * within the grace period; a request arriving meanwhile (on a keep-alive
 * connection, or a new one before the listener closes) is answered 503 +
 * Retry-After with `Connection: close` rather than reset, and /readyz says
 * not-ready so a balancer stops sending. When the grace period runs out, tasks
 * still running in the worker pool are cancelled and their requests answered
 * 503 + Retry-After; then the app closes (listener, idle sockets, pool, store).
 */
import type { FastifyInstance } from 'fastify';
import { problem, sendProblem } from './problem.ts';

export interface Lifecycle {
  /** Requests received and not yet answered (or abandoned). */
  readonly inFlight: number;
  readonly draining: boolean;
  /**
   * Drains and closes the app: new requests get 503, running ones get up to
   * `graceMs`, then pool tasks are cancelled (503 to their callers) and the app closes.
   */
  shutdown(graceMs: number): Promise<void>;
}

declare module 'fastify' {
  interface FastifyInstance {
    lifecycle: Lifecycle;
  }
}

/** How long cancelled requests get to write their 503 before the app closes, ms. */
const ANSWER_AFTER_CANCEL_MS = 2000;
/** Retry-After on answers refused during shutdown, s (a replacement replica is usually up by then). */
const RETRY_AFTER_S = '5';

export function installLifecycle(app: FastifyInstance, cancelRunningTasks: () => void): void {
  let inFlight = 0;
  let draining = false;
  let idleWaiters: (() => void)[] = [];

  const settle = () => {
    if (inFlight > 0) return;
    const waiters = idleWaiters;
    idleWaiters = [];
    for (const w of waiters) w();
  };
  const whenIdle = (timeoutMs: number) =>
    new Promise<void>((resolve) => {
      if (inFlight === 0) return resolve();
      const timer = setTimeout(resolve, timeoutMs);
      idleWaiters.push(() => {
        clearTimeout(timer);
        resolve();
      });
    });

  app.addHook('onRequest', (request, reply, done) => {
    if (draining) {
      reply.header('connection', 'close');
      sendProblem(reply, problem(503, 'shutting-down', 'The service is shutting down; retry on another replica or shortly', request.url), {
        'retry-after': RETRY_AFTER_S,
      });
      return;
    }
    inFlight++;
    // 'close' fires once per response whether it finished or the client went away.
    reply.raw.once('close', () => {
      inFlight--;
      settle();
    });
    done();
  });

  const lifecycle: Lifecycle = {
    get inFlight() {
      return inFlight;
    },
    get draining() {
      return draining;
    },
    async shutdown(graceMs: number) {
      draining = true;
      await whenIdle(graceMs);
      if (inFlight > 0) {
        app.log.warn({ inFlight }, 'grace period over: cancelling running tasks');
        cancelRunningTasks();
        await whenIdle(ANSWER_AFTER_CANCEL_MS);
      }
      await app.close();
    },
  };
  app.decorate('lifecycle', lifecycle);
}
