/**
 * Process entry: configuration from the environment (embedded defaults),
 * listen, and shut down gracefully on SIGTERM/SIGINT (in-flight requests
 * finish, the store closes cleanly).
 */
import closeWithGrace from 'close-with-grace';
import { configFromEnv } from './config.ts';
import { buildApp } from './http/app.ts';
import { serviceLoggerOptions } from './http/logger-options.ts';

const config = configFromEnv();
const app = await buildApp({
  config,
  logger: serviceLoggerOptions(config.logLevel),
});

closeWithGrace({ delay: 10_000 }, async ({ signal, err }) => {
  if (err) app.log.error({ err }, 'shutting down after an error');
  else app.log.info({ signal }, 'shutting down');
  await app.close();
});

try {
  await app.listen({ port: config.port, host: config.host });
  app.log.info({ store: config.databaseUrl ? 'postgres' : config.databasePath, apiKeys: config.apiKeys ? 'configured' : 'none (open service)' }, 'tickwright ready');
} catch (err) {
  app.log.error({ err }, 'failed to start');
  process.exit(1);
}
