import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterEach, describe, expect, it } from 'vitest';
import { openSqliteStore } from '../../src/store/sqlite-store.ts';
import { readLines, spawnFixture, waitForExit } from './fixtures/child-process.ts';

const cleanups: Array<() => void> = [];
// LIFO: resources registered later (stores, children) close before the temp dir is removed.
afterEach(() => {
  while (cleanups.length > 0) cleanups.pop()!();
});

// What this proves: every write the process acknowledged after commit survives the
// process being killed with SIGKILL mid-stream, and the file stays consistent.
// It does not simulate power loss (that needs the synchronous = FULL fsync, which a
// test on a running kernel cannot observe).
describe('durability under kill -9', () => {
  it('keeps every acknowledged write and passes integrity_check', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'tickwright-kill-'));
    cleanups.push(() => rmSync(dir, { recursive: true, force: true }));
    const file = path.join(dir, 'killed.db');

    const child = spawnFixture('durable-writer.ts', [file]);
    cleanups.push(() => {
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
    });
    const acknowledgedIds: string[] = [];
    let acknowledgedCounterVersion = 0;
    let acknowledgedCounterIndex = -1;
    const killAfter = 60 + Math.floor(Math.random() * 60); // vary where in the stream the kill lands
    const io = readLines(child, (line) => {
      const [kind, a, b] = line.split(' ');
      if (kind === 'created') acknowledgedIds.push(a);
      if (kind === 'counter') {
        acknowledgedCounterVersion = Number(a);
        acknowledgedCounterIndex = Number(b);
      }
      if (acknowledgedIds.length >= killAfter && child.signalCode === null) child.kill('SIGKILL');
    });
    const exit = await waitForExit(child);
    expect(exit.signal, `writer should have been killed, stderr: ${io.stderr()}`).toBe('SIGKILL');
    expect(acknowledgedIds.length).toBeGreaterThanOrEqual(killAfter);

    // The raw file first, before our own code touches it: SQLite's own consistency check.
    const raw = new Database(file);
    expect(raw.pragma('integrity_check', { simple: true })).toBe('ok'); // SQLite docs: returns the single row 'ok'
    raw.close();

    const store = openSqliteStore(file);
    cleanups.push(() => void store.close());
    const stored = new Set((await store.catalogues.list()).map((d) => d.id));
    const missing = acknowledgedIds.filter((id) => !stored.has(id));
    expect(missing).toEqual([]);
    for (const id of acknowledgedIds) {
      const index = Number(id.slice('doc-'.length));
      expect((await store.catalogues.get(id))?.body).toMatchObject({ index });
    }
    // At most one commit can have happened after the last acknowledgement we read.
    const counter = (await store.amplifiers.get('counter'))!;
    expect(counter.version).toBeGreaterThanOrEqual(acknowledgedCounterVersion);
    expect(counter.version).toBeLessThanOrEqual(acknowledgedCounterVersion + 1);
    expect(Number(counter.body.lastIndex)).toBeGreaterThanOrEqual(acknowledgedCounterIndex);
  });
});
