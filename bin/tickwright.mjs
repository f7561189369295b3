#!/usr/bin/env node
// The `tickwright` command: runs the compiled command line from dist/ when it is built and at least as
// new as every source file, else the TypeScript source through tsx (a fresh clone after `npm ci`).
import { existsSync, readdirSync, statSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { dirname, join } from 'node:path';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const built = join(root, 'dist', 'cli', 'main.js');

function newestMtime(dir) {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(p) : statSync(p).mtimeMs);
  }
  return newest;
}

let entry;
if (existsSync(built) && statSync(built).mtimeMs >= newestMtime(join(root, 'src'))) {
  entry = pathToFileURL(built).href;
} else {
  const { register } = await import('tsx/esm/api');
  register();
  entry = pathToFileURL(join(root, 'src', 'cli', 'main.ts')).href;
}
const { main } = await import(entry);
process.exitCode = await main(process.argv.slice(2));
