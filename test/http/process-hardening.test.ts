/**
 * The real server process (src/server.ts) under the conditions an orchestrator
 * and a hostile but fair caller create: SIGTERM with a long computation in
 * flight, a flood of idle connections, and /healthz polled over a real socket
 * while each kind of heavy request runs. Liveness (/healthz) must answer
 * whatever the load (common practice for liveness probes: Kubernetes docs,
 * "Configure Liveness, Readiness and Startup Probes"); timings are asserted
 * generously (the machine is shared), the figures live in bench/load.bench.ts.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import net, { type Socket } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { bomRequest, designRequest, nestedBracketsRequest, toleranceRequest, waveformRequest, type HeavyRequest } from './fixtures/heavy-requests.ts';
import { percentile, pollHealth } from './fixtures/health-poll.ts';
import { rawRequest } from './fixtures/raw-http.ts';
import { killHard, startServer, type ServerProcess } from './fixtures/server-process.ts';

const servers: ServerProcess[] = [];
const dirs: string[] = [];
const sockets: Socket[] = [];
afterEach(async () => {
  while (sockets.length > 0) sockets.pop()!.destroy();
  while (servers.length > 0) await killHard(servers.pop()!);
  while (dirs.length > 0) rmSync(dirs.pop()!, { recursive: true, force: true });
});

async function start(env: Record<string, string>): Promise<{ server: ServerProcess; port: number }> {
  const dir = mkdtempSync(path.join(tmpdir(), 'tickwright-hardening-'));
  dirs.push(dir);
  const server = await startServer(path.join(dir, 'tickwright.db'), env);
  servers.push(server);
  return { server, port: Number(new URL(server.baseUrl).port) };
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function send(port: number, req: HeavyRequest, timeoutMs = 60_000) {
  return rawRequest(port, `${req.method} ${req.path} HTTP/1.1\r\nhost: 127.0.0.1\r\ncontent-type: ${req.contentType}${req.accept ? `\r\naccept: ${req.accept}` : ''}`, req.body, timeoutMs);
}

describe('the server process under load', () => {
  it('keeps /healthz answering 200 while each kind of heavy request runs', async () => {
    const { port } = await start({ TICKWRIGHT_MAX_EVENT_LOOP_DELAY_MS: '1000', TICKWRIGHT_WORKER_THREADS: '1' });
    // Warm up: the first request of each kind compiles its schemas and starts the worker thread.
    await send(port, toleranceRequest(1000));
    const kinds = [waveformRequest(200_000), nestedBracketsRequest(), bomRequest(1000), toleranceRequest(100_000), designRequest()];
    for (const kind of kinds) {
      const poll = pollHealth(port);
      const res = await send(port, kind);
      await sleep(100);
      const samples = await poll.stop();
      // The heavy request itself may be shed (503 overloaded) on a starved machine; it must never fail (500).
      expect(res.status === 503 ? JSON.parse(res.body).code : res.status < 500, `${kind.name}: ${res.body.slice(0, 200)}`).toBe(res.status === 503 ? 'overloaded' : true);
      expect(samples.length, kind.name).toBeGreaterThan(0);
      expect(samples.filter((s) => s.status !== 200), kind.name).toEqual([]);
      expect(percentile(samples.map((s) => s.ms), 0.99), kind.name).toBeLessThan(1000);
    }
  }, 120_000);

  it('survives a flood of idle connections beyond the cap and answers again afterwards', async () => {
    const { server, port } = await start({ TICKWRIGHT_MAX_CONNECTIONS: '50' });
    // 2,000 connections that never send a byte: beyond the cap the server closes them at once.
    const opened = await Promise.all(
      Array.from({ length: 2000 }, () =>
        new Promise<Socket | undefined>((resolve) => {
          const s = net.connect({ port, host: '127.0.0.1' }, () => resolve(s));
          s.on('error', () => resolve(undefined));
          sockets.push(s);
        }),
      ),
    );
    expect(opened.filter(Boolean).length).toBeGreaterThan(0);
    await sleep(500);
    expect(server.child.exitCode).toBeNull(); // still running
    const open = sockets.filter((s) => !s.destroyed && !s.readableEnded).length;
    expect(open).toBeLessThanOrEqual(2000);
    // The flood ends: the service answers again.
    while (sockets.length > 0) sockets.pop()!.destroy();
    let status = 0;
    for (let attempt = 0; attempt < 20 && status !== 200; attempt++) {
      status = await rawRequest(port, 'GET /healthz HTTP/1.1\r\nhost: 127.0.0.1').then((r) => r.status, () => 0);
      if (status !== 200) await sleep(250);
    }
    expect(status).toBe(200);
    expect(server.child.exitCode).toBeNull();
    expect(server.output()).not.toMatch(/EMFILE/);
  }, 60_000);

  it('on SIGTERM answers the request in flight (503 + Retry-After once the grace is over) and exits 0', async () => {
    const { server, port } = await start({ TICKWRIGHT_SHUTDOWN_GRACE_MS: '300', TICKWRIGHT_WORKER_THREADS: '1' });
    await send(port, toleranceRequest(1000)); // the worker thread is up
    // The longest computation the API allows: a million Monte Carlo samples with worst case and sensitivities.
    const inFlight = send(port, toleranceRequest(1_000_000));
    await sleep(150);
    server.child.kill('SIGTERM');
    const res = await inFlight;
    // Either it finished within the grace (200) or it was cancelled and told so: never a reset.
    expect([200, 503]).toContain(res.status);
    if (res.status === 503) {
      expect(res.headers['retry-after']).toBeDefined();
      expect(JSON.parse(res.body).code).toBe('shutting-down');
    }
    const exit = await server.exited;
    expect(exit.code, server.output()).toBe(0);
  }, 60_000);
});
