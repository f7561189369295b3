// Runs before `npm start`: builds dist/ when it is missing or older than any source file,
// so `npm install && npm start` works on a fresh clone.
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { execFileSync } from 'node:child_process';

function newestMtime(dir) {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(p) : statSync(p).mtimeMs);
  }
  return newest;
}

const entry = 'dist/server.js';
if (!existsSync(entry) || statSync(entry).mtimeMs < newestMtime('src')) {
  console.log('building dist/ ...');
  execFileSync(process.execPath, ['node_modules/typescript/bin/tsc', '-p', 'tsconfig.build.json'], { stdio: 'inherit' });
}
