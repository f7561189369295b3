import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { openSqliteStore } from '../../src/store/sqlite-store.ts';
import { readLines, spawnFixture, waitForExit } from './fixtures/child-process.ts';

const cleanups: Array<() => void> = [];
// LIFO: resources registered later (stores, children) close before the temp dir is removed.
afterEach(() => {
  while (cleanups.length > 0) cleanups.pop()!();
});

/** A writer in its own process (own SQLite connection) answering "put" commands over stdin/stdout. */
function startContender(file: string, name: string) {
  const child = spawnFixture('contender.ts', [file, name]);
  cleanups.push(() => {
    if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
  });
  const waiting = new Map<string, (answer: string) => void>();
  let ready: () => void = () => {};
  const readyPromise = new Promise<void>((resolve) => {
    ready = resolve;
  });
  const io = readLines(child, (line) => {
    if (line === 'ready') return ready();
    const [round, answer] = line.split(' ');
    waiting.get(round)?.(answer);
    waiting.delete(round);
  });
  return {
    child,
    ready: Promise.race([
      readyPromise,
      waitForExit(child).then(() => {
        throw new Error(`contender ${name} exited early: ${io.stderr()}`);
      }),
    ]),
    put(round: number, etag: string): Promise<string> {
      const answer = new Promise<string>((resolve) => waiting.set(String(round), resolve));
      child.stdin.write(`put ${round} ${etag}\n`);
      return answer;
    },
  };
}

describe('optimistic concurrency across processes', () => {
  it('gives exactly one winner when two processes update with the same ETag at once', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'tickwright-race-'));
    cleanups.push(() => rmSync(dir, { recursive: true, force: true }));
    const file = path.join(dir, 'race.db');
    const observer = openSqliteStore(file);
    cleanups.push(() => void observer.close());
    await observer.catalogues.put('shared', { writer: 'none', round: -1 }, undefined);

    const left = startContender(file, 'left');
    const right = startContender(file, 'right');
    await Promise.all([left.ready, right.ready]);

    const rounds = 40;
    for (let round = 0; round < rounds; round += 1) {
      const before = (await observer.catalogues.get('shared'))!;
      // Both commands leave in the same tick; the two processes then race for the write lock.
      const answers = await Promise.all([left.put(round, before.etag), right.put(round, before.etag)]);
      expect([...answers].sort()).toEqual(['ok', 'precondition-failed']);
      const after = (await observer.catalogues.get('shared'))!;
      expect(after.version).toBe(before.version + 1); // no lost update, no double update
      expect(after.body).toEqual({ writer: answers[0] === 'ok' ? 'left' : 'right', round });
    }
    left.child.stdin.write('exit\n');
    right.child.stdin.write('exit\n');
    const exits = await Promise.all([waitForExit(left.child), waitForExit(right.child)]);
    expect(exits.map((e) => e.code)).toEqual([0, 0]);
  });
});
