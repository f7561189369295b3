/**
 * Typed client for the tickwright service: openapi-fetch over types generated
 * from the committed contract, so every path, body and answer is checked by the
 * compiler. Thin on purpose — problems come back as `error` (RFC 9457 body),
 * answers as `data`, and `response` keeps the headers (ETag for If-Match).
 *
 *     const tw = createTickwrightClient({ baseUrl: 'http://localhost:8080', apiKey });
 *     const { data, error } = await tw.POST('/v1/analyze', { body: circuit });
 */
import createClient, { type Client } from 'openapi-fetch';
import type { components, paths } from './schema.ts';

export type { components, operations, paths } from './schema.ts';
/** Every named schema of the contract, e.g. `Schemas['Analysis']`. */
export type Schemas = components['schemas'];
export type TickwrightClient = Client<paths>;

export interface TickwrightClientOptions {
  /** Where the service answers, e.g. http://localhost:8080 (a path prefix is kept). */
  baseUrl: string;
  /** Sent as `Authorization: Bearer <key>` when the service has keys configured. */
  apiKey?: string;
  /** A fetch of your own (tests, proxies, retries); defaults to the global fetch. */
  fetch?: (input: Request) => Promise<Response>;
  /** Extra headers on every request. */
  headers?: Record<string, string>;
}

export function createTickwrightClient(options: TickwrightClientOptions): TickwrightClient {
  const headers: Record<string, string> = { ...options.headers };
  if (options.apiKey) headers.authorization = `Bearer ${options.apiKey}`;
  return createClient<paths>({
    baseUrl: options.baseUrl.replace(/\/+$/, ''),
    headers,
    ...(options.fetch ? { fetch: options.fetch } : {}),
  });
}
