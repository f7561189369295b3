/** Builds an app on an in-memory store for inject() tests. */
import type { FastifyInstance } from 'fastify';
import { buildApp, type BuildOptions } from '../../src/http/app.ts';
import { openSqliteStore } from '../../src/store/index.ts';

export async function testApp(options: BuildOptions = {}): Promise<FastifyInstance> {
  // Load shedding is tested on purpose in system.test.ts; elsewhere a busy CI machine must not turn
  // answers into 503s (a shedder with no event-loop sample yet would read the delay as unbounded),
  // so it is off (0) unless a test asks for it.
  const config = { maxEventLoopDelayMs: 0, ...options.config };
  const app = await buildApp({ ...options, store: options.store ?? openSqliteStore(':memory:'), config });
  await app.ready();
  return app;
}
