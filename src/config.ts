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
  /** Event-loop delay above which requests are shed with 503. */
  maxEventLoopDelayMs: number;
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
  };
}
