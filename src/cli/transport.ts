/**
 * How the command line reaches the service: one `fetch`-shaped function either
 * way, so every command is the same HTTP request whether it goes over the wire
 * (--server) or into the app's own routes in this process (fastify inject).
 */
import { Readable } from 'node:stream';
import type { FastifyInstance } from 'fastify';
import { CliError, EXIT } from './exit-codes.ts';

export interface Transport {
  /** Where requests go, for messages ("in-process" or the server URL). */
  readonly target: string;
  fetch(path: string, init: RequestInit): Promise<Response>;
  close(): Promise<void>;
}

/** A deployment: the global fetch against its base URL, with the API key as a bearer token. */
export function remoteTransport(server: string, apiKey: string | undefined): Transport {
  let base: URL;
  try {
    base = new URL(server.endsWith('/') ? server : server + '/');
  } catch {
    throw new CliError(EXIT.usage, `--server ${server} is not a URL`);
  }
  if (base.protocol !== 'http:' && base.protocol !== 'https:') throw new CliError(EXIT.usage, `--server ${server} must be http:// or https://`);
  return {
    target: base.href,
    async fetch(path, init) {
      const headers = new Headers(init.headers);
      if (apiKey) headers.set('authorization', `Bearer ${apiKey}`);
      try {
        return await fetch(new URL(path.replace(/^\//, ''), base), { ...init, headers });
      } catch (err) {
        const cause = (err as { cause?: { code?: string; message?: string } }).cause;
        throw new CliError(EXIT.service, `cannot reach ${base.href}: ${cause?.code ?? cause?.message ?? (err as Error).message}`);
      }
    },
    async close() {},
  };
}

/**
 * The app's routes through inject, answered as a streamed Response (NDJSON
 * lines arrive as the route writes them, so progress is live in-process too).
 */
export function injectTransport(app: FastifyInstance): Transport {
  return {
    target: 'in-process',
    async fetch(path, init) {
      const headers: Record<string, string> = {};
      new Headers(init.headers).forEach((value, name) => {
        headers[name] = value;
      });
      const res = await app.inject({
        method: (init.method ?? 'GET') as 'GET',
        url: path,
        headers,
        ...(init.body !== undefined && init.body !== null ? { payload: init.body as string } : {}),
        payloadAsStream: true,
      });
      const responseHeaders = new Headers();
      for (const [name, value] of Object.entries(res.headers)) {
        if (value === undefined) continue;
        for (const v of Array.isArray(value) ? value : [value]) responseHeaders.append(name, String(v));
      }
      const noBody = res.statusCode === 204 || res.statusCode === 304 || init.method === 'HEAD';
      const body = noBody ? null : (Readable.toWeb(res.stream()) as ReadableStream<Uint8Array>);
      return new Response(body, { status: res.statusCode, headers: responseHeaders });
    },
    async close() {
      await app.close();
    },
  };
}
