/**
 * Runs every bench/*.bench.ts in turn, each in its own process so one bench's
 * JIT state and heap do not colour the next. Each bench prints its own figures
 * and ratios against a baseline it measures in the same run.
 */
import { readdirSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';

const only = process.argv[2];
const files = readdirSync('bench')
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => !only || f.includes(only))
  .sort();
let failed = 0;
for (const f of files) {
  console.log(`\n=== ${f} ===`);
  const r = spawnSync(process.execPath, ['--import', 'tsx', join('bench', f)], { stdio: 'inherit' });
  if (r.status !== 0) failed++;
}
process.exit(failed ? 1 : 0);
