/**
 * Two replicas of the real server (child processes, each listening on its own
 * loopback port) sharing one PostgreSQL database, as behind a load balancer:
 * racing If-Match writes have exactly one winner (RFC 9110 §13.1.1: the losers
 * get 412), a write on one replica is read on the other, and a kill -9 of one
 * replica loses nothing it acknowledged.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { benchCatalogue, resistorLines } from '../http/fixtures/catalogues.ts';
import { killHard, startServer, type ServerProcess } from '../http/fixtures/server-process.ts';
import { createThrowawayDatabase, requirePostgres, type ThrowawayDatabase } from './pg-database.ts';

const skip = await requirePostgres();

async function send(server: ServerProcess, method: string, url: string, body?: unknown, headers: Record<string, string> = {}) {
  const res = await fetch(`${server.baseUrl}${url}`, {
    method,
    headers: body === undefined ? headers : { 'content-type': 'application/json', ...headers },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const text = await res.text();
  return { status: res.status, etag: res.headers.get('etag'), body: text === '' ? undefined : (JSON.parse(text) as Record<string, unknown>) };
}

/**
 * A 503 from load shedding (the shedder answers before any handler runs, so
 * nothing was written) is retried the way a client honouring Retry-After would;
 * on a loaded 2-core test machine a burst of 30 requests can trip it.
 */
let shedRetries = 0;
async function sendRetryingShed(server: ServerProcess, method: string, url: string, body?: unknown, headers: Record<string, string> = {}) {
  for (let attempt = 0; ; attempt += 1) {
    const res = await send(server, method, url, body, headers);
    if (res.status !== 503 || attempt >= 20) return res;
    shedRetries += 1;
    await new Promise((resolve) => setTimeout(resolve, 100 + Math.random() * 200));
  }
}

describe.skipIf(skip !== undefined)(`replicas on one PostgreSQL database${skip ? ` (skipped: ${skip})` : ''}`, () => {
  let db: ThrowawayDatabase;
  const replicas: ServerProcess[] = [];

  beforeAll(async () => {
    db = await createThrowawayDatabase();
    // The SQLite path must not be used: point it somewhere that cannot be created to prove it.
    const env = { TICKWRIGHT_DATABASE_URL: db.url, TICKWRIGHT_DATABASE_POOL_SIZE: '4' };
    replicas.push(...(await Promise.all([startServer('/proc/no-sqlite-here.db', env, 120_000), startServer('/proc/no-sqlite-here.db', env, 120_000)])));
  }, 180_000);

  afterAll(async () => {
    while (replicas.length > 0) await killHard(replicas.pop()!);
    await db?.drop();
  }, 60_000);

  it('reads on one replica what the other wrote, catalogues and registered amplifiers alike', async () => {
    const [a, b] = replicas;
    const created = await send(a, 'PUT', '/v1/catalogues/shared-read', benchCatalogue('written on A'));
    expect(created.status).toBe(201);
    const read = await send(b, 'GET', '/v1/catalogues/shared-read');
    expect(read.status).toBe(200);
    expect(read.etag).toBe(created.etag);
    expect(read.body).toEqual(created.body);

    const amp = await send(b, 'PUT', '/v1/amplifiers/lab-amp', { name: 'Lab amplifier', base: 'ideal', slewRateVPerS: 2e6 });
    expect(amp.status, JSON.stringify(amp.body)).toBe(201);
    const ampOnA = await send(a, 'GET', '/v1/amplifiers/lab-amp');
    expect(ampOnA.status).toBe(200);
    expect(ampOnA.etag).toBe(amp.etag);
    expect(ampOnA.body).toMatchObject({ id: 'lab-amp', slewRateVPerS: 2e6, source: 'registered' });
    const list = await send(a, 'GET', '/v1/amplifiers');
    expect((list.body!.amplifiers as Array<{ id: string }>).map((x) => x.id)).toContain('lab-amp');
  }, 60_000);

  it('gives exactly one winner among 30 racing If-Match PUTs split across the replicas; the rest get 412', async () => {
    const [a, b] = replicas;
    const base = await sendRetryingShed(a, 'PUT', '/v1/catalogues/raced', benchCatalogue('base'));
    expect(base.status, JSON.stringify(base.body)).toBe(201);
    const racers = Array.from({ length: 30 }, (_, i) => ({ i, via: i % 2 === 0 ? a : b }));
    const answers = await Promise.all(
      racers.map(({ i, via }) => sendRetryingShed(via, 'PUT', '/v1/catalogues/raced', benchCatalogue(`racer ${i}`), { 'if-match': base.etag! })),
    );
    const statuses = answers.map((r) => r.status);
    const winners = answers.flatMap((r, i) => (r.status === 200 ? [i] : []));
    expect(winners, `statuses: ${statuses.join(',')}`).toHaveLength(1);
    expect(statuses.filter((s) => s === 412), JSON.stringify(answers.filter((r) => r.status !== 412 && r.status !== 200).slice(0, 2))).toHaveLength(29);
    // Both replicas now serve the winner's version 2.
    for (const via of [a, b]) {
      const now = await send(via, 'GET', '/v1/catalogues/raced');
      expect(now.body).toMatchObject({ version: 2, name: `racer ${winners[0]}` });
      expect(now.etag).toBe(answers[winners[0]].etag);
    }
    console.info(`replica race: 30 If-Match PUTs (15 per replica) -> ${winners.length} x 200, ${statuses.filter((s) => s === 412).length} x 412; winner racer ${winners[0]} via replica ${winners[0] % 2 === 0 ? 'A' : 'B'}; ${shedRetries} load-shed 503s retried`);
  }, 60_000);

  it('loses nothing acknowledged when one replica is killed with SIGKILL mid-stream', async () => {
    const victim = replicas[0];
    const survivor = replicas[1];
    const acknowledged = new Map<string, string>();
    let stop = false;
    // A steady stream of writes to the victim; each one counts once its 201 has arrived.
    const writer = (async () => {
      for (let i = 0; !stop; i += 1) {
        const id = `kill-${String(i).padStart(4, '0')}`;
        const res = await send(victim, 'PUT', `/v1/catalogues/${id}`, { name: id, parts: resistorLines(1 + (i % 5)) }).catch(() => undefined);
        if (res === undefined) return; // the victim is gone
        if (res.status === 201) acknowledged.set(id, res.etag!);
      }
    })();
    while (acknowledged.size < 20) await new Promise((resolve) => setTimeout(resolve, 20));
    victim.child.kill('SIGKILL');
    const exit = await victim.exited;
    expect(exit.signal).toBe('SIGKILL');
    stop = true;
    await writer;

    const listed = await send(survivor, 'GET', '/v1/catalogues');
    const stored = new Map((listed.body!.catalogues as Array<{ id: string; etag: string }>).map((c) => [c.id, c.etag]));
    const lost = [...acknowledged].filter(([id, etag]) => stored.get(id) !== etag);
    expect(lost).toEqual([]);
    console.info(`replica kill -9: ${acknowledged.size} acknowledged writes, ${lost.length} lost, ${stored.size} catalogues on the survivor`);
  }, 90_000);
});
