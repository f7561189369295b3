/** Builds an app on an in-memory store for inject() tests. */
import type { FastifyInstance } from 'fastify';
import { buildApp, type BuildOptions } from '../../src/http/app.ts';
import { openSqliteStore } from '../../src/store/index.ts';

export async function testApp(options: BuildOptions = {}): Promise<FastifyInstance> {
  const app = await buildApp({ store: options.store ?? openSqliteStore(':memory:'), ...options });
  await app.ready();
  return app;
}
