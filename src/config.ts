/**
 * Service configuration from the environment, with embedded defaults so the
 * service starts on a fresh clone with no settings at all. Every variable is in
 * the README's configuration table.
 */
export interface ServiceConfig {
  port: number;
  host: string;
  logLevel: string;
  /** SQLite file; ':memory:' keeps nothing across restarts. */
  databasePath: string;
  /** Raw TICKWRIGHT_API_KEYS value (parsed by the auth module); undefined = open service. */
  apiKeys: string | undefined;
  bodyLimitBytes: number;
  requestTimeoutMs: number;
  /** Trusted proxy addresses/CIDRs (never a hop count). */
  trustProxy: string[] | false;
  /** Worker threads for heavy work (Monte Carlo, batches, long captures). */
  workerThreads: number;
  /** Event-loop delay above which requests are shed with 503 (never /healthz; 0 = off). */
  maxEventLoopDelayMs: number;
  /** Failed API-key attempts allowed per client per window before 429 (0 = no limit). */
  authFailureLimit: number;
  /** Window over which failed API-key attempts are counted, ms. */
  authFailureWindowMs: number;
  /** Longest a worker-pool task may run (queue wait excluded) before it is stopped and answered 503, ms. */
  taskDeadlineMs: number;
  /** Open client connections the server accepts at once; beyond it new connections are closed at once. */
  maxConnections: number;
  /** On SIGTERM/SIGINT: how long in-flight requests may take before running tasks are cancelled, ms. */
  shutdownGraceMs: number;
  /** Bodies at least this large (by Content-Length) count as large uploads, bytes. */
  largeBodyBytes: number;
  /** Large uploads read and processed at once; more get 503 + Retry-After. */
  largeBodyConcurrency: number;
  /** Deepest nesting of arrays/objects a JSON body may have (checked before parsing). */
  maxJsonDepth: number;
  /** postgres://... = the shared PostgreSQL store (several replicas); undefined = the SQLite file at databasePath. */
  databaseUrl: string | undefined;
  /** PostgreSQL connections per process. */
  databasePoolSize: number;
  /** Trace export: 'off' (default), 'otlp' (OTEL_EXPORTER_OTLP_ENDPOINT) or 'console'. */
  tracing: 'off' | 'otlp' | 'console';
}

export const DEFAULT_CONFIG: ServiceConfig = {
  port: 8080,
  host: '0.0.0.0',
  logLevel: 'info',
  databasePath: './data/tickwright.db',
  apiKeys: undefined,
  bodyLimitBytes: 64 * 1024 * 1024,
  requestTimeoutMs: 120_000,
  trustProxy: false,
  workerThreads: 2,
  maxEventLoopDelayMs: 1000,
  authFailureLimit: 20,
  authFailureWindowMs: 60_000,
  taskDeadlineMs: 30_000,
  maxConnections: 1000,
  shutdownGraceMs: 10_000,
  largeBodyBytes: 8 * 1024 * 1024,
  largeBodyConcurrency: 2,
  maxJsonDepth: 64,
  databaseUrl: undefined,
  databasePoolSize: 10,
  tracing: 'off',
};

function int(env: NodeJS.ProcessEnv, name: string, fallback: number, min: number, max: number): number {
  const raw = env[name];
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < min || n > max) throw new Error(`${name} must be an integer in ${min}..${max}, got '${raw}'`);
  return n;
}

export function configFromEnv(env: NodeJS.ProcessEnv = process.env): ServiceConfig {
  const trust = env.TICKWRIGHT_TRUST_PROXY?.trim();
  return {
    port: int(env, 'PORT', DEFAULT_CONFIG.port, 0, 65535),
    host: env.HOST || DEFAULT_CONFIG.host,
    logLevel: env.LOG_LEVEL || DEFAULT_CONFIG.logLevel,
    databasePath: env.TICKWRIGHT_DB_PATH || DEFAULT_CONFIG.databasePath,
    apiKeys: env.TICKWRIGHT_API_KEYS || undefined,
    bodyLimitBytes: int(env, 'TICKWRIGHT_BODY_LIMIT_BYTES', DEFAULT_CONFIG.bodyLimitBytes, 1024, 1024 * 1024 * 1024),
    requestTimeoutMs: int(env, 'TICKWRIGHT_REQUEST_TIMEOUT_MS', DEFAULT_CONFIG.requestTimeoutMs, 1000, 3_600_000),
    trustProxy: trust ? trust.split(',').map((s) => s.trim()).filter(Boolean) : false,
    workerThreads: int(env, 'TICKWRIGHT_WORKER_THREADS', DEFAULT_CONFIG.workerThreads, 1, 64),
    maxEventLoopDelayMs: int(env, 'TICKWRIGHT_MAX_EVENT_LOOP_DELAY_MS', DEFAULT_CONFIG.maxEventLoopDelayMs, 10, 60_000),
    authFailureLimit: int(env, 'TICKWRIGHT_AUTH_FAILURE_LIMIT', DEFAULT_CONFIG.authFailureLimit, 0, 1_000_000),
    authFailureWindowMs: int(env, 'TICKWRIGHT_AUTH_FAILURE_WINDOW_MS', DEFAULT_CONFIG.authFailureWindowMs, 1000, 86_400_000),
    taskDeadlineMs: int(env, 'TICKWRIGHT_TASK_DEADLINE_MS', DEFAULT_CONFIG.taskDeadlineMs, 100, 3_600_000),
    maxConnections: int(env, 'TICKWRIGHT_MAX_CONNECTIONS', DEFAULT_CONFIG.maxConnections, 1, 1_000_000),
    shutdownGraceMs: int(env, 'TICKWRIGHT_SHUTDOWN_GRACE_MS', DEFAULT_CONFIG.shutdownGraceMs, 0, 600_000),
    largeBodyBytes: int(env, 'TICKWRIGHT_LARGE_BODY_BYTES', DEFAULT_CONFIG.largeBodyBytes, 1024, 1024 * 1024 * 1024),
    largeBodyConcurrency: int(env, 'TICKWRIGHT_LARGE_BODY_CONCURRENCY', DEFAULT_CONFIG.largeBodyConcurrency, 1, 1024),
    maxJsonDepth: int(env, 'TICKWRIGHT_MAX_JSON_DEPTH', DEFAULT_CONFIG.maxJsonDepth, 8, 10_000),
    databaseUrl: env.TICKWRIGHT_DATABASE_URL?.trim() || undefined,
    databasePoolSize: int(env, 'TICKWRIGHT_DATABASE_POOL_SIZE', DEFAULT_CONFIG.databasePoolSize, 1, 1000),
    tracing: tracingMode(env.TICKWRIGHT_TRACING),
  };
}

function tracingMode(raw: string | undefined): ServiceConfig['tracing'] {
  const mode = raw?.trim().toLowerCase() || 'off';
  if (mode !== 'off' && mode !== 'otlp' && mode !== 'console') throw new Error(`TICKWRIGHT_TRACING must be off, otlp or console, got '${raw}'`);
  return mode;
}
