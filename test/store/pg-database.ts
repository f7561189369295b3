/**
 * A throwaway PostgreSQL database per test run: CREATE DATABASE tw_test_<random>
 * on the server named by TICKWRIGHT_TEST_DATABASE_URL (default: the machine's
 * server at 127.0.0.1:5432, trust auth, user postgres, database test), dropped
 * again when the run ends.
 *
 * Reachability decides skip or fail: on a developer machine without a server the
 * PostgreSQL suites skip with a note; under CI=true they FAIL, since CI promises
 * a server and a silent skip would hide a broken set-up.
 */
import { randomBytes } from 'node:crypto';
import pg from 'pg';

export const ADMIN_URL = process.env.TICKWRIGHT_TEST_DATABASE_URL?.trim() || 'postgres://postgres@127.0.0.1:5432/test';
export const IN_CI = process.env.CI === 'true';

/** The admin URL with another database name (keeps user, host, port, parameters). */
export function urlForDatabase(name: string, base: string = ADMIN_URL): string {
  const url = new URL(base);
  url.pathname = `/${name}`;
  return url.toString();
}

/** Error text when the server does not answer; undefined when it does. */
export async function postgresUnreachable(url: string = ADMIN_URL): Promise<string | undefined> {
  const client = new pg.Client({ connectionString: url, connectionTimeoutMillis: 3000 });
  client.on('error', () => undefined);
  try {
    await client.connect();
    await client.query('SELECT 1');
    return undefined;
  } catch (error) {
    return error instanceof Error ? error.message : String(error);
  } finally {
    await client.end().catch(() => undefined);
  }
}

export interface ThrowawayDatabase {
  name: string;
  url: string;
  /** Run SQL on the throwaway database directly (tests that tamper with rows). */
  sql<R extends pg.QueryResultRow = pg.QueryResultRow>(text: string, values?: unknown[]): Promise<R[]>;
  drop(): Promise<void>;
}

export async function createThrowawayDatabase(): Promise<ThrowawayDatabase> {
  const name = `tw_test_${randomBytes(6).toString('hex')}`;
  await adminQuery(`CREATE DATABASE ${name}`);
  const url = urlForDatabase(name);
  const pool = new pg.Pool({ connectionString: url, max: 2 });
  pool.on('error', () => undefined);
  return {
    name,
    url,
    sql: async <R extends pg.QueryResultRow>(text: string, values?: unknown[]) => (await pool.query<R>(text, values)).rows,
    drop: async () => {
      await pool.end().catch(() => undefined);
      // FORCE (PostgreSQL 13+) ends connections a crashed test may have left behind.
      await adminQuery(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
    },
  };
}

async function adminQuery(text: string): Promise<void> {
  const client = new pg.Client({ connectionString: ADMIN_URL, connectionTimeoutMillis: 5000 });
  client.on('error', () => undefined);
  await client.connect();
  try {
    await client.query(text);
  } finally {
    await client.end();
  }
}

/**
 * For a suite's beforeAll: undefined when PostgreSQL answers; a reason to skip
 * when it does not and this is not CI; throws (failing the suite) under CI.
 */
export async function requirePostgres(): Promise<string | undefined> {
  const reason = await postgresUnreachable();
  if (reason === undefined) return undefined;
  const message = `PostgreSQL is unreachable at ${new URL(ADMIN_URL).host} (${reason}); set TICKWRIGHT_TEST_DATABASE_URL or start the server`;
  if (IN_CI) throw new Error(`${message}. CI requires it.`);
  return message;
}
