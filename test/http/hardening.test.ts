/**
 * Process-level hardening seen over real sockets on loopback: nothing here can
 * be observed through inject (timeouts, parser errors, connection handling).
 * Statuses per RFC 9110 (§15.5.9 408, §15.6.4 503 with Retry-After §10.2.3) and
 * RFC 6585 §5 (431); problem bodies per RFC 9457.
 */
import type { AddressInfo, Socket } from 'node:net';
import net from 'node:net';
import type { FastifyInstance } from 'fastify';
import { afterEach, describe, expect, it } from 'vitest';
import { buildApp, type BuildOptions } from '../../src/http/app.ts';
import { firstTooDeep } from '../../src/http/body-guards.ts';
import { PROBLEM_TYPES } from '../../src/http/problem-types.ts';
import { HttpProblem } from '../../src/http/problem.ts';
import { runForRequest } from '../../src/http/workers/run-for-request.ts';
import { openSqliteStore } from '../../src/store/index.ts';
import { rawRequest } from './fixtures/raw-http.ts';

const apps: FastifyInstance[] = [];
const sockets: Socket[] = [];
afterEach(async () => {
  while (sockets.length > 0) sockets.pop()!.destroy();
  while (apps.length > 0) await apps.pop()!.close();
});

/** A listening app; `extend` may add test-only routes before it starts. */
async function listening(config: BuildOptions['config'] = {}, extend?: (app: FastifyInstance) => void): Promise<{ app: FastifyInstance; port: number }> {
  const app = await buildApp({ store: openSqliteStore(':memory:'), config: { maxEventLoopDelayMs: 0, ...config } });
  extend?.(app);
  apps.push(app);
  await app.listen({ port: 0, host: '127.0.0.1' });
  return { app, port: (app.server.address() as AddressInfo).port };
}

function connect(port: number): Promise<Socket> {
  return new Promise((resolve, reject) => {
    const socket = net.connect({ port, host: '127.0.0.1' }, () => resolve(socket));
    socket.once('error', reject);
    sockets.push(socket);
  });
}

/** Everything a socket receives until the server closes it, and how long that took. */
function untilClosed(socket: Socket): Promise<{ text: string; elapsedMs: number }> {
  const started = performance.now();
  const chunks: Buffer[] = [];
  socket.on('data', (c) => chunks.push(c));
  return new Promise((resolve) => {
    socket.once('close', () => resolve({ text: Buffer.concat(chunks).toString('utf8'), elapsedMs: performance.now() - started }));
    socket.on('error', () => undefined);
  });
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('requests Node refuses before routing', () => {
  it('answers a 20 KB query with 431 problem+json, not a plain-text 431', async () => {
    const { port } = await listening();
    const res = await rawRequest(port, `GET /v1/series?q=${'a'.repeat(20 * 1024)} HTTP/1.1\r\nhost: 127.0.0.1`);
    expect(res.status).toBe(431);
    expect(res.headers['content-type']).toBe('application/problem+json');
    expect(JSON.parse(res.body)).toMatchObject({ status: 431, code: 'headers-too-large', type: '/problems/headers-too-large' });
  });

  it('cuts a client that dribbles its body at the request timeout, with 408 problem+json', async () => {
    // Before: the timeout was only checked every 30 s (Node's connectionsCheckingInterval), so a 10 s
    // setting cut a dribbling client after 66–83 s. A 1.5 s timeout here must cut well within 10 s.
    const { port } = await listening({ requestTimeoutMs: 1500 });
    const socket = await connect(port);
    const closed = untilClosed(socket);
    const body = JSON.stringify({ topology: 'split-supply', padding: 'x'.repeat(500) });
    socket.write(`POST /v1/analyze HTTP/1.1\r\nhost: 127.0.0.1\r\ncontent-type: application/json\r\ncontent-length: ${body.length}\r\n\r\n`);
    let sent = 0;
    const dribble = setInterval(() => {
      if (socket.destroyed || sent >= body.length) return clearInterval(dribble);
      socket.write(body[sent++]);
    }, 100);
    const { text, elapsedMs } = await closed;
    clearInterval(dribble);
    expect(elapsedMs).toBeLessThan(10_000);
    expect(sent).toBeLessThan(body.length); // cut before the body was complete
    expect(text).toMatch(/^HTTP\/1\.1 408 /);
    expect(text).toContain('"code":"request-timeout"');
  }, 20_000);
});

describe('JSON nesting', () => {
  it('finds the first bracket deeper than the limit and ignores brackets inside strings', () => {
    expect(firstTooDeep('[[[1]]]', 3)).toBe(-1);
    expect(firstTooDeep('[[[[1]]]]', 3)).toBe(3);
    expect(firstTooDeep('{"a":"[[[[[[\\"[[["}', 2)).toBe(-1);
  });

  it('refuses 2 MB of nested brackets with 400 problem+json before parsing', async () => {
    const { port } = await listening({ maxJsonDepth: 64 });
    const res = await rawRequest(port, 'POST /v1/analyze HTTP/1.1\r\nhost: 127.0.0.1\r\ncontent-type: application/json', '['.repeat(2 * 1024 * 1024));
    expect(res.status).toBe(400);
    expect(JSON.parse(res.body)).toMatchObject({ code: 'too-deeply-nested', errors: [{ pointer: '/' }] });
    // Nesting within the limit still reaches validation (400 validation), and __proto__ is still refused.
    const shallow = await rawRequest(port, 'POST /v1/analyze HTTP/1.1\r\nhost: 127.0.0.1\r\ncontent-type: application/json', '{"topology":[[[1]]]}');
    expect(JSON.parse(shallow.body).code).toBe('validation');
    const poisoned = await rawRequest(port, 'POST /v1/analyze HTTP/1.1\r\nhost: 127.0.0.1\r\ncontent-type: application/json', '{"__proto__":{"x":1}}');
    expect(poisoned.status).toBe(400);
  });
});

describe('worker-pool deadline', () => {
  it('stops a task past the deadline with 503 problem + Retry-After and frees the thread', async () => {
    // The deadline runs from submission, so it must cover a thread's start-up under tsx (about a second here).
    const { app, port } = await listening({ workerThreads: 1, taskDeadlineMs: 4000 }, (a) => {
      a.post('/test/spin', async (request, reply) => runForRequest(a.services.workers, reply, 'spin', request.body as { ms: number }, 'spin'));
    });
    const started = performance.now();
    const res = await rawRequest(port, 'POST /test/spin HTTP/1.1\r\nhost: 127.0.0.1\r\ncontent-type: application/json', '{"ms":20000}', 30_000);
    expect(res.status).toBe(503);
    expect(res.headers['retry-after']).toBeDefined();
    expect(JSON.parse(res.body)).toMatchObject({ code: 'deadline-exceeded', type: '/problems/deadline-exceeded' });
    expect(performance.now() - started).toBeLessThan(15_000); // not the 20 s the task asked for
    expect(JSON.parse(res.body).detail).toMatch(/4000 ms/);
    // The thread was terminated and replaced: the next task runs (a few tries: on a loaded machine a fresh
    // thread's start-up under tsx can itself take longer than this short deadline).
    let echoed: unknown;
    for (let attempt = 0; attempt < 4 && echoed === undefined; attempt++) {
      echoed = await app.services.workers.run('echo', { after: 'deadline' }).catch(() => undefined);
    }
    expect(echoed).toEqual({ after: 'deadline' });
  }, 40_000);
});

describe('large uploads', () => {
  it('admits the configured number at once; the next gets 503 + Retry-After before its body is read', async () => {
    const { port } = await listening({ largeBodyBytes: 4096, largeBodyConcurrency: 1 });
    // A large upload in progress: headers and part of the body, then it waits.
    const first = await connect(port);
    const firstDone = untilClosed(first);
    first.write('POST /v1/analyze HTTP/1.1\r\nhost: 127.0.0.1\r\ncontent-type: application/json\r\ncontent-length: 10000\r\nconnection: close\r\n\r\n{"a":"');
    await sleep(300);
    const refused = await rawRequest(port, 'POST /v1/analyze HTTP/1.1\r\nhost: 127.0.0.1\r\ncontent-type: application/json', `{"a":"${'x'.repeat(5000)}"}`);
    expect(refused.status).toBe(503);
    expect(refused.headers['retry-after']).toBeDefined();
    expect(JSON.parse(refused.body).code).toBe('too-many-large-uploads');
    // Small bodies are not held back.
    const small = await rawRequest(port, 'POST /v1/analyze HTTP/1.1\r\nhost: 127.0.0.1\r\ncontent-type: application/json', '{}');
    expect(small.status).toBe(400);
    // Once the first finishes, the slot is free again.
    first.end(`${'x'.repeat(10000 - 6 - 2)}"}`);
    expect((await firstDone).text).toMatch(/^HTTP\/1\.1 400 /);
    const again = await rawRequest(port, 'POST /v1/analyze HTTP/1.1\r\nhost: 127.0.0.1\r\ncontent-type: application/json', `{"a":"${'x'.repeat(5000)}"}`);
    expect(again.status).toBe(400);
  });
});

describe('shutdown', () => {
  it('answers keep-alive requests during the drain with 503, cancels running tasks at the end of the grace, and answers them 503', async () => {
    const { app, port } = await listening({ workerThreads: 1, taskDeadlineMs: 60_000 }, (a) => {
      a.post('/test/spin', async (request, reply) => runForRequest(a.services.workers, reply, 'spin', request.body as { ms: number }, 'spin'));
    });
    // A keep-alive connection that has already been answered once.
    const keepAlive = await connect(port);
    const received: Buffer[] = [];
    keepAlive.on('data', (c) => received.push(c));
    keepAlive.write('GET /healthz HTTP/1.1\r\nhost: 127.0.0.1\r\n\r\n');
    await sleep(200);
    expect(Buffer.concat(received).toString()).toMatch(/^HTTP\/1\.1 200 /);
    received.length = 0;

    const long = rawRequest(port, 'POST /test/spin HTTP/1.1\r\nhost: 127.0.0.1\r\ncontent-type: application/json', '{"ms":30000}', 30_000);
    await sleep(500);
    const started = performance.now();
    const shutdown = app.lifecycle.shutdown(800);
    apps.pop(); // shutdown closes it
    // During the drain: the keep-alive connection gets a 503 answer, not a reset.
    keepAlive.write('GET /v1/series HTTP/1.1\r\nhost: 127.0.0.1\r\n\r\n');
    await sleep(200);
    const during = Buffer.concat(received).toString();
    expect(during).toMatch(/^HTTP\/1\.1 503 /);
    expect(during.toLowerCase()).toContain('retry-after: 5');
    expect(during).toContain('"code":"shutting-down"');

    const res = await long;
    expect(res.status).toBe(503);
    expect(res.headers['retry-after']).toBeDefined();
    expect(JSON.parse(res.body).code).toBe('shutting-down');
    await shutdown;
    expect(performance.now() - started).toBeLessThan(10_000); // grace 0.8 s + answering, not the 30 s task
  }, 40_000);
});

describe('problem types', () => {
  it('every problem type URI resolves at /problems/{code}', async () => {
    const { port } = await listening();
    const notFound = await rawRequest(port, 'GET /v1/nothing-here HTTP/1.1\r\nhost: 127.0.0.1');
    const type = JSON.parse(notFound.body).type as string;
    expect(type).toBe('/problems/not-found');
    const described = await rawRequest(port, `GET ${type} HTTP/1.1\r\nhost: 127.0.0.1`);
    expect(described.status).toBe(200);
    expect(JSON.parse(described.body)).toMatchObject({ code: 'not-found', status: 404 });
    for (const code of Object.keys(PROBLEM_TYPES)) {
      const res = await rawRequest(port, `GET /problems/${code} HTTP/1.1\r\nhost: 127.0.0.1`);
      expect(res.status, code).toBe(200);
    }
    expect((await rawRequest(port, 'GET /problems/no-such-code HTTP/1.1\r\nhost: 127.0.0.1')).status).toBe(404);
    void HttpProblem;
  });
});
