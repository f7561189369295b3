import path from 'node:path';

export const DEFAULT_DATABASE_PATH = './data/tickwright.db';
export const MEMORY_DATABASE_PATH = ':memory:';

/**
 * Where the server keeps its database: TICKWRIGHT_DB_PATH, else
 * ./data/tickwright.db, resolved against the working directory so log lines
 * show an absolute path. ':memory:' passes through (tests, throwaway runs).
 */
export function resolveDatabasePath(env: NodeJS.ProcessEnv = process.env, cwd: string = process.cwd()): string {
  const configured = env.TICKWRIGHT_DB_PATH?.trim();
  const chosen = configured === undefined || configured === '' ? DEFAULT_DATABASE_PATH : configured;
  return chosen === MEMORY_DATABASE_PATH ? chosen : path.resolve(cwd, chosen);
}
