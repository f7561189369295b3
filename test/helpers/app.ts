/** Builds an app on an in-memory store for inject() tests. */
import type { FastifyInstance } from 'fastify';
import { buildApp, type BuildOptions } from '../../src/http/app.ts';
import { openSqliteStore } from '../../src/store/index.ts';

export async function testApp(options: BuildOptions = {}): Promise<FastifyInstance> {
  // Load shedding is tested on purpose elsewhere; here a busy CI machine must not turn answers into 503s.
  const config = { maxEventLoopDelayMs: 60_000, ...options.config };
  const app = await buildApp({ ...options, store: options.store ?? openSqliteStore(':memory:'), config });
  await app.ready();
  return app;
}
