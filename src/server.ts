/**
 * Process entry: configuration from the environment (embedded defaults),
 * listen, and shut down gracefully on SIGTERM/SIGINT: new requests get 503 +
 * Retry-After, running ones get TICKWRIGHT_SHUTDOWN_GRACE_MS to finish, worker
 * tasks still running then are cancelled (their callers get 503), and the
 * store closes cleanly (src/http/lifecycle.ts).
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

/** Beyond the grace period: answering the cancelled requests and closing the store. */
const CLOSE_MARGIN_MS = 5000;

closeWithGrace({ delay: config.shutdownGraceMs + CLOSE_MARGIN_MS }, async ({ signal, err }) => {
  if (err) app.log.error({ err }, 'shutting down after an error');
  else app.log.info({ signal, graceMs: config.shutdownGraceMs }, 'shutting down');
  await app.lifecycle.shutdown(err ? 0 : config.shutdownGraceMs);
  await stopTracing();
});

try {
  await app.listen({ port: config.port, host: config.host });
  app.log.info({ store: config.databaseUrl ? 'postgres' : config.databasePath, apiKeys: config.apiKeys ? 'configured' : 'none (open service)' }, 'tickwright ready');
} catch (err) {
  app.log.error({ err }, 'failed to start');
  process.exit(1);
}
