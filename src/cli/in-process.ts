/**
 * The service inside the command's own process: the same builder and the same
 * environment configuration as the server (so the same store: what a command
 * writes, the server reads, and nothing is kept twice), without what only a
 * network listener needs — logging to stdout, API keys (the caller already has
 * the store), load shedding (one caller, one request at a time).
 */
import { injectTransport, type Transport } from './transport.ts';

export async function inProcessTransport(env: NodeJS.ProcessEnv): Promise<Transport> {
  // Loaded on demand: the --server path never pays for building the app.
  const [{ buildApp }, { configFromEnv }] = await Promise.all([import('../http/app.ts'), import('../config.ts')]);
  const config = configFromEnv(env);
  const app = await buildApp({ config: { ...config, apiKeys: undefined, maxEventLoopDelayMs: 0 }, logger: false });
  await app.ready();
  return injectTransport(app);
}
