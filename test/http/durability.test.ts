/**
 * Persistence of the real server process: a graceful restart and a kill -9
 * lose no acknowledged write and leave every stored catalogue readable.
 * (The store's own tests cover power loss settings and raw-file integrity; this
 * is the same promise seen from an HTTP client.)
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { benchCatalogue, resistorLines } from './fixtures/catalogues.ts';
import { killHard, startServer, type ServerProcess } from './fixtures/server-process.ts';

const servers: ServerProcess[] = [];
const dirs: string[] = [];
afterEach(async () => {
  while (servers.length > 0) await killHard(servers.pop()!);
  while (dirs.length > 0) rmSync(dirs.pop()!, { recursive: true, force: true });
});

function tempDatabase(): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'tickwright-server-'));
  dirs.push(dir);
  return path.join(dir, 'tickwright.db');
}

async function start(databasePath: string): Promise<ServerProcess> {
  const server = await startServer(databasePath);
  servers.push(server);
  return server;
}

async function putCatalogue(server: ServerProcess, id: string, body: unknown, ifMatch?: string) {
  const res = await fetch(`${server.baseUrl}/v1/catalogues/${id}`, {
    method: 'PUT',
    headers: { 'content-type': 'application/json', ...(ifMatch ? { 'if-match': ifMatch } : {}) },
    body: JSON.stringify(body),
  });
  return { status: res.status, body: (await res.json()) as { etag: string; version: number; name?: string } };
}

async function getCatalogue(server: ServerProcess, id: string) {
  const res = await fetch(`${server.baseUrl}/v1/catalogues/${id}`);
  return { status: res.status, etag: res.headers.get('etag'), body: (await res.json()) as Record<string, unknown> };
}

describe('the server process', () => {
  it('keeps catalogues across a graceful restart (SIGTERM)', async () => {
    const db = tempDatabase();
    const first = await start(db);
    const created = await putCatalogue(first, 'bench', benchCatalogue());
    expect(created.status).toBe(201);
    const updated = await putCatalogue(first, 'bench', benchCatalogue('after restart'), created.body.etag);
    expect(updated.status).toBe(200);
    first.child.kill('SIGTERM');
    const exit = await first.exited;
    expect(exit.code, first.output()).toBe(0); // close-with-grace closes the app and the store, then exits 0

    const second = await start(db);
    const read = await getCatalogue(second, 'bench');
    expect(read.status).toBe(200);
    expect(read.etag).toBe(updated.body.etag);
    expect(read.body).toEqual(updated.body);
  }, 90_000);

  it('keeps every acknowledged write after kill -9, and the store still reads', async () => {
    const db = tempDatabase();
    const first = await start(db);
    const acknowledged = new Map<string, { etag: string; body: unknown }>();
    for (let i = 0; i < 25; i++) {
      const id = `cat-${String(i).padStart(2, '0')}`;
      const res = await putCatalogue(first, id, { name: `catalogue ${i}`, parts: resistorLines(1 + (i % 7)) });
      expect(res.status).toBe(201);
      acknowledged.set(id, { etag: res.body.etag, body: res.body });
    }
    // One document that has moved on from version 1.
    const bumped = await putCatalogue(first, 'cat-00', { name: 'catalogue 0, v2', parts: resistorLines(3) }, acknowledged.get('cat-00')!.etag);
    expect(bumped.status).toBe(200);
    acknowledged.set('cat-00', { etag: bumped.body.etag, body: bumped.body });

    // Writes in flight when the process dies: each may or may not have committed, but none may be half there.
    const inFlight = Array.from({ length: 5 }, (_, i) => `late-${i}`);
    const pending = inFlight.map((id) => putCatalogue(first, id, { name: id, parts: resistorLines(500) }).catch(() => undefined));
    first.child.kill('SIGKILL');
    const exit = await first.exited;
    expect(exit.signal).toBe('SIGKILL');
    await Promise.all(pending);

    const second = await start(db);
    for (const [id, expected] of acknowledged) {
      const read = await getCatalogue(second, id);
      expect(read.status, id).toBe(200);
      expect(read.etag, id).toBe(expected.etag);
      expect(read.body, id).toEqual(expected.body);
    }
    for (const id of inFlight) {
      const read = await getCatalogue(second, id);
      expect([200, 404], `${id}: ${JSON.stringify(read.body).slice(0, 200)}`).toContain(read.status);
      if (read.status === 200) expect((read.body.parts as unknown[]).length).toBe(500);
    }
    const list = await fetch(`${second.baseUrl}/v1/catalogues`);
    expect(list.status).toBe(200);
    const ids = ((await list.json()) as { catalogues: { id: string }[] }).catalogues.map((c) => c.id);
    for (const id of acknowledged.keys()) expect(ids).toContain(id);
  }, 90_000);
});
