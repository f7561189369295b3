/**
 * Runs the `tickwright` bin (bin/tickwright.mjs) as a child process, the way a
 * script would, and collects its exit code and output. Asynchronous on purpose:
 * tests serve the --server path from this same process.
 */
import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';

export const PROJECT_ROOT = fileURLToPath(new URL('../../', import.meta.url));
export const BIN = fileURLToPath(new URL('../../bin/tickwright.mjs', import.meta.url));

export interface CliRun {
  code: number | null;
  stdout: string;
  stderr: string;
}

export function tickwright(args: string[], options: { cwd: string; env?: Record<string, string | undefined>; stdin?: string }): Promise<CliRun> {
  const env: NodeJS.ProcessEnv = { ...process.env };
  // Nothing from the developer's shell may steer the command under test.
  for (const name of ['TICKWRIGHT_SERVER', 'TICKWRIGHT_API_KEY', 'TICKWRIGHT_API_KEYS', 'TICKWRIGHT_DB_PATH', 'TICKWRIGHT_DATABASE_URL']) delete env[name];
  for (const [k, v] of Object.entries(options.env ?? {})) if (v !== undefined) env[k] = v;
  const child = spawn(process.execPath, [BIN, ...args], { cwd: options.cwd, env, stdio: ['pipe', 'pipe', 'pipe'] });
  let stdout = '';
  let stderr = '';
  child.stdout.on('data', (c: Buffer) => (stdout += c.toString('utf8')));
  child.stderr.on('data', (c: Buffer) => (stderr += c.toString('utf8')));
  child.stdin.end(options.stdin ?? '');
  return new Promise((resolve, reject) => {
    child.once('error', reject);
    child.once('close', (code) => resolve({ code, stdout, stderr }));
  });
}
