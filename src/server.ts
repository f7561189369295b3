/**
 * Process entry: configuration from the environment (embedded defaults),
 * listen, and shut down gracefully on SIGTERM/SIGINT (in-flight requests
 * finish, the store closes cleanly).
 */
import closeWithGrace from 'close-with-grace';
import { configFromEnv } from './config.ts';
import { API_VERSION, buildApp } from './http/app.ts';
import { serviceLoggerOptions } from './http/logger-options.ts';
import { startTracing } from './http/tracing.ts';

const config = configFromEnv();
// Before the app exists, so its spans go to the configured exporter (no-op when off).
const stopTracing = startTracing(config.tracing, API_VERSION);
const app = await buildApp({
  config,
  logger: serviceLoggerOptions(config.logLevel),
});

closeWithGrace({ delay: 10_000 }, async ({ signal, err }) => {
  if (err) app.log.error({ err }, 'shutting down after an error');
  else app.log.info({ signal }, 'shutting down');
  await app.close();
  await stopTracing();
});

try {
  await app.listen({ port: config.port, host: config.host });
  app.log.info({ store: config.databaseUrl ? 'postgres' : config.databasePath, apiKeys: config.apiKeys ? 'configured' : 'none (open service)' }, 'tickwright ready');
} catch (err) {
  app.log.error({ err }, 'failed to start');
  process.exit(1);
}
