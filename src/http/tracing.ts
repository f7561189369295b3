/**
 * OpenTelemetry tracing, off unless configured (TICKWRIGHT_TRACING=otlp|console).
 * When on, each request gets a server span named by its route, and store calls
 * and worker-pool tasks inside it become its children (the request's context is
 * entered before the handler runs, and AsyncLocalStorage carries it through
 * awaits). When off, the API's no-op tracer makes every call here free.
 *
 * `otlp` exports over OTLP/HTTP to OTEL_EXPORTER_OTLP_ENDPOINT (or
 * OTEL_EXPORTER_OTLP_TRACES_ENDPOINT), read by the exporter itself; `console`
 * prints finished spans (local debugging).
 */
import { context, SpanKind, SpanStatusCode, trace, type Context, type Span } from '@opentelemetry/api';
import { OTLPTraceExporter } from '@opentelemetry/exporter-trace-otlp-http';
import { resourceFromAttributes } from '@opentelemetry/resources';
import { BatchSpanProcessor, ConsoleSpanExporter, NodeTracerProvider, SimpleSpanProcessor } from '@opentelemetry/sdk-trace-node';
import { ATTR_SERVICE_NAME, ATTR_SERVICE_VERSION } from '@opentelemetry/semantic-conventions';
import type { FastifyInstance, FastifyRequest } from 'fastify';
import { instrumentStore, type StoreCallObserver } from '../store/instrumented.ts';
import type { Store, StoreBackend } from '../store/types.ts';
import type { Metrics } from './metrics.ts';
import type { TaskObserver } from './workers/pool.ts';

const TRACER_NAME = 'tickwright';

export type TracingMode = 'off' | 'otlp' | 'console';

/**
 * Install the process-wide tracer provider for `mode` (once, at process start).
 * Returns a shutdown function that flushes pending spans; 'off' installs nothing.
 */
export function startTracing(mode: TracingMode, serviceVersion: string): () => Promise<void> {
  if (mode === 'off') return async () => undefined;
  const exporter = mode === 'otlp' ? new OTLPTraceExporter() : new ConsoleSpanExporter();
  const provider = new NodeTracerProvider({
    resource: resourceFromAttributes({ [ATTR_SERVICE_NAME]: 'tickwright', [ATTR_SERVICE_VERSION]: serviceVersion }),
    spanProcessors: [mode === 'otlp' ? new BatchSpanProcessor(exporter) : new SimpleSpanProcessor(exporter)],
  });
  // Also installs the AsyncLocalStorage context manager that carries the active span across awaits.
  provider.register();
  return () => provider.shutdown();
}

function tracer() {
  return trace.getTracer(TRACER_NAME);
}

const REQUEST_CONTEXT = Symbol('tickwright.traceContext');
type TracedRequest = FastifyRequest & { [REQUEST_CONTEXT]?: { span: Span; ctx: Context } };

/** Server spans per request: started on arrival, entered before the handler, ended with the status. */
export function registerRequestTracing(app: FastifyInstance): void {
  app.addHook('onRequest', (request, _reply, done) => {
    const route = request.routeOptions.url ?? 'unmatched';
    const span = tracer().startSpan(`${request.method} ${route}`, {
      kind: SpanKind.SERVER,
      attributes: { 'http.request.method': request.method, 'http.route': route, 'url.path': request.url.split('?')[0] },
    });
    (request as TracedRequest)[REQUEST_CONTEXT] = { span, ctx: trace.setSpan(context.active(), span) };
    done();
  });
  // The handler is called synchronously after the last preHandler hook, so entering the
  // context here makes the request span the parent of everything the handler awaits.
  app.addHook('preHandler', (request, _reply, done) => {
    const traced = (request as TracedRequest)[REQUEST_CONTEXT];
    if (traced) context.with(traced.ctx, done);
    else done();
  });
  app.addHook('onResponse', (request, reply, done) => {
    const traced = (request as TracedRequest)[REQUEST_CONTEXT];
    if (traced) {
      traced.span.setAttribute('http.response.status_code', reply.statusCode);
      if (reply.statusCode >= 500) traced.span.setStatus({ code: SpanStatusCode.ERROR });
      traced.span.end();
    }
    done();
  });
}

async function inSpan<R>(name: string, attributes: Record<string, string>, work: () => Promise<R>): Promise<R> {
  return tracer().startActiveSpan(name, { kind: SpanKind.INTERNAL, attributes }, async (span) => {
    try {
      return await work();
    } catch (error) {
      span.setStatus({ code: SpanStatusCode.ERROR, message: error instanceof Error ? error.message : String(error) });
      throw error;
    } finally {
      span.end();
    }
  });
}

/** A span per store call, child of the active request span. */
export function storeCallTracer(backend: StoreBackend): StoreCallObserver {
  return (operation, collection, call) =>
    inSpan(`store.${operation}`, { 'db.system': backend === 'postgres' ? 'postgresql' : 'sqlite', 'db.operation.name': operation, 'tickwright.collection': collection ?? 'none' }, call);
}

/** A span per worker-pool task, child of the active request span. */
export const poolTaskTracer: TaskObserver = (task, _signal, run) => inSpan(`pool.task ${task}`, { 'tickwright.task': task }, run);

/** The store the routes use: every call timed into the metrics and, with tracing on, inside a span. */
export function observedStore(store: Store, metrics: Metrics, tracing: boolean): Store {
  const timed = metrics.storeObserver(store.backend);
  if (!tracing) return instrumentStore(store, timed);
  const traced = storeCallTracer(store.backend);
  return instrumentStore(store, (operation, collection, call) => timed(operation, collection, () => traced(operation, collection, call)));
}

/** What wraps every worker-pool task: its metrics and, with tracing on, a span. */
export function observedTasks(metrics: Metrics, tracing: boolean): TaskObserver {
  if (!tracing) return metrics.taskObserver;
  return (task, signal, run) => metrics.taskObserver(task, signal, () => poolTaskTracer(task, signal, run));
}
