/** Process entry of the command line (bin/tickwright.mjs loads it from source or dist/). */
import { runCli } from './program.ts';

export async function main(argv: string[] = process.argv.slice(2)): Promise<number> {
  return runCli(argv, { stdin: process.stdin, stdout: process.stdout, stderr: process.stderr, env: process.env });
}
