/**
 * The fastify application: plugins, shared schemas, error mapping and routes.
 * Thin by design — routes convert, call the core and shape the answer.
 */
import Fastify, { type FastifyInstance, type FastifyServerOptions } from 'fastify';
import swagger from '@fastify/swagger';
import swaggerUi from '@fastify/swagger-ui';
import type { TypeBoxTypeProvider } from '@fastify/type-provider-typebox';
import { randomUUID } from 'node:crypto';
import type { ServiceConfig } from '../config.ts';
import { DEFAULT_CONFIG } from '../config.ts';
import { openStore, type Store } from '../store/index.ts';
import { AmplifierDirectory } from './amplifier-directory.ts';
import { parseApiKeyConfig } from './auth/api-keys.ts';
import { registerAuth } from './auth/plugin.ts';
import { DOCS_PREFIX, installRouteAccess } from './auth/route-access.ts';
import { installJsonParser, installLargeUploadGate } from './body-guards.ts';
import { clientErrorHandler } from './client-errors.ts';
import { installLifecycle } from './lifecycle.ts';
import { installLoadShedding } from './load-shedding.ts';
import { Metrics } from './metrics.ts';
import { observedStore, observedTasks, registerRequestTracing } from './tracing.ts';
import { errorHandler, problem, sendProblem } from './problem.ts';
import { installFiniteAnswerGuard } from './finite-answer.ts';
import { installBodyParsers } from './json-body.ts';
import { ROUTES } from './routes/index.ts';
import { REGISTERED_SCHEMAS } from './schemas/index.ts';
import { withExamples } from './schemas/examples.ts';
import type { Services } from './services.ts';
import { storedAmplifierSource } from './stored-amplifiers.ts';
import { WorkerPool } from './workers/pool.ts';

export const API_VERSION = '1.0.0';

export interface BuildOptions {
  config?: Partial<ServiceConfig>;
  /** An already-open store (tests); otherwise the configured one (databaseUrl, else the SQLite databasePath). */
  store?: Store;
  logger?: FastifyServerOptions['logger'];
}

export async function buildApp(options: BuildOptions = {}): Promise<FastifyInstance> {
  const config: ServiceConfig = { ...DEFAULT_CONFIG, ...options.config };
  const app = Fastify({
    logger: options.logger ?? false,
    bodyLimit: config.bodyLimitBytes,
    requestTimeout: config.requestTimeoutMs,
    // Node checks request and header timeouts on this interval (default 30 s, which let a dribbling body run
    // far past the documented timeout); headers must arrive within the same timeout.
    http: { connectionsCheckingInterval: Math.min(1000, config.requestTimeoutMs), headersTimeout: config.requestTimeoutMs },
    clientErrorHandler,
    trustProxy: config.trustProxy === false ? false : config.trustProxy,
    requestIdHeader: 'x-request-id',
    genReqId: () => randomUUID(),
    return503OnClosing: true,
    ajv: { customOptions: { removeAdditional: false, coerceTypes: false, useDefaults: true } },
  }).withTypeProvider<TypeBoxTypeProvider>();

  const metrics = new Metrics();
  const tracing = config.tracing !== 'off';
  const rawStore =
    options.store ??
    (await openStore({
      databaseUrl: config.databaseUrl,
      databasePath: config.databasePath,
      databasePoolSize: config.databasePoolSize,
      onIdleError: (err) => app.log.warn({ err }, 'an idle database connection failed; the pool replaces it'),
    }));
  const store = observedStore(rawStore, metrics, tracing);
  const services: Services = {
    store,
    amplifiers: new AmplifierDirectory(storedAmplifierSource(store)),
    keys: parseApiKeyConfig(config.apiKeys),
    metrics,
    workers: new WorkerPool({ threads: config.workerThreads, deadlineMs: config.taskDeadlineMs, observe: observedTasks(metrics, tracing) }),
  };
  metrics.watchPool(() => services.workers.stats);
  // Beyond the cap Node closes new connections at once, long before the open-file limit (an fd flood
  // would otherwise starve the store, the worker threads and the log of descriptors).
  app.server.maxConnections = config.maxConnections;
  app.decorate('services', services);
  if (!options.store) app.addHook('onClose', async () => await rawStore.close());
  if (tracing) registerRequestTracing(app);
  app.addHook('onClose', async () => services.workers.close());

  app.setErrorHandler(errorHandler);
  // Before any plugin adds routes: every route gets its access decided at registration.
  installRouteAccess(app);
  installBodyParsers(app);
  installFiniteAnswerGuard(app);
  installMethodAwareNotFound(app);

  // Callback-style hooks: they run on every request, and fastify's promise path for hooks costs more.
  app.addHook('onRequest', (request, reply, done) => {
    reply.header('x-request-id', request.id);
    done();
  });
  app.addHook('onResponse', (request, reply, done) => {
    const route = request.routeOptions.url ?? 'unmatched';
    services.metrics.observe(request.method, route, reply.statusCode, reply.elapsedTime / 1000);
    done();
  });

  // Shutdown first (a draining replica answers 503 before anything else), then load shedding.
  installLifecycle(app, () => services.workers.cancelAll());
  installLoadShedding(app, { maxEventLoopDelayMs: config.maxEventLoopDelayMs, sampleIntervalMs: 250, retryAfterS: 5 });
  installJsonParser(app, { maxDepth: config.maxJsonDepth, largeBodyBytes: config.largeBodyBytes });

  await app.register(swagger, {
    openapi: {
      openapi: '3.1.0',
      info: {
        title: 'tickwright',
        version: API_VERSION,
        description:
          'Sizes, checks and diagnoses RC relaxation oscillators built from an op-amp or comparator with hysteresis. All values are SI base units; errors are RFC 9457 problem details.',
      },
      servers: [{ url: '/' }],
      components: {
        securitySchemes: {
          bearerKey: { type: 'http', scheme: 'bearer', description: 'API key (only when the service has keys configured)' },
          headerKey: { type: 'apiKey', in: 'header', name: 'X-Api-Key' },
        },
      },
      security: [{}, { bearerKey: [] }, { headerKey: [] }],
    },
    refResolver: { buildLocalReference: (json, _baseUri, _fragment, i) => (json.$id as string) ?? `schema-${i}` },
    // Request and response examples (README scenarios; answers produced by the service) live in one module.
    transformObject: (document) => ('openapiObject' in document ? withExamples(document.openapiObject) : document.swaggerObject),
  });
  await app.register(swaggerUi, { routePrefix: DOCS_PREFIX });

  for (const schema of REGISTERED_SCHEMAS) app.addSchema(schema);
  await registerAuth(app, services.keys, { failureLimit: config.authFailureLimit, failureWindowMs: config.authFailureWindowMs });
  installLargeUploadGate(app, { thresholdBytes: config.largeBodyBytes, concurrency: config.largeBodyConcurrency });
  if (services.keys.isOpen) app.log.warn('No API keys configured (TICKWRIGHT_API_KEYS): the service is open to every caller');

  for (const route of ROUTES) await app.register(route);
  return app;
}

/**
 * 404 for unknown paths, 405 with Allow for a known path with the wrong method.
 * Route patterns are collected as they are added so parametric paths match too.
 */
function installMethodAwareNotFound(app: FastifyInstance): void {
  const patterns: { method: string; regex: RegExp }[] = [];
  app.addHook('onRoute', (route) => {
    const methods = Array.isArray(route.method) ? route.method : [route.method];
    const regex = new RegExp(
      '^' +
        route.url
          .split('/')
          .map((seg) => (seg.startsWith(':') ? '[^/]+' : seg === '*' ? '.*' : seg.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')))
          .join('/') +
        '/?$',
    );
    for (const m of methods) patterns.push({ method: m, regex });
  });
  app.setNotFoundHandler((request, reply) => {
    const path = request.url.split('?')[0];
    const allowed = [...new Set(patterns.filter((p) => p.regex.test(path)).map((p) => p.method))];
    if (allowed.length > 0) {
      return sendProblem(
        reply,
        problem(405, 'method-not-allowed', `${request.method} is not allowed on ${path}; allowed: ${allowed.join(', ')}`, request.url),
        { allow: allowed.join(', ') },
      );
    }
    return sendProblem(reply, problem(404, 'not-found', `No resource at ${path}`, request.url));
  });
}
