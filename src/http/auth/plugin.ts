/**
 * Enforces API keys when they are configured. The access a request needs comes
 * from the route the router matched (route-access.ts), never from the raw URL.
 *
 * Failed authentication (a key that matches no configured key) is limited per
 * client with @fastify/rate-limit: after `limit` failures in `windowMs`, every
 * request from that client that needs a key gets 429 problem+json with
 * Retry-After until the window ends. A correct key is refused too while the
 * client is over the limit, so guessing cannot tell a hit from a miss.
 */
import rateLimit from '@fastify/rate-limit';
import type { FastifyInstance, FastifyRequest } from 'fastify';
import { HttpProblem } from '../problem.ts';
import { extractPresentedKey, type ApiKeyRing } from './api-keys.ts';
import { requiredAccess } from './route-access.ts';

export interface AuthOptions {
  /** Failed key attempts allowed per client and window; 0 switches the limit off. */
  failureLimit: number;
  /** Length of the failure-counting window, ms. */
  failureWindowMs: number;
}

type Limiter = (request: FastifyRequest, options?: { increment?: boolean }) => Promise<{ isAllowed: boolean; remaining?: number; ttlInSeconds?: number; isExceeded?: boolean }>;

export async function registerAuth(app: FastifyInstance, keys: ApiKeyRing, options: AuthOptions): Promise<void> {
  if (keys.isOpen) return;
  let failures: Limiter | undefined;
  if (options.failureLimit > 0) {
    // global: false — nothing is limited by the plugin itself; only failed keys are counted, below.
    // The key is the client address (per IPv6 /56 by the plugin's default), never used to authorize.
    await app.register(rateLimit, { global: false, max: options.failureLimit, timeWindow: options.failureWindowMs });
    failures = app.createRateLimit() as Limiter;
  }

  const tooMany = (ttlInSeconds: number | undefined) => {
    const retryAfterS = Math.max(1, ttlInSeconds ?? 1);
    return new HttpProblem(
      429,
      'too-many-auth-failures',
      `Too many requests with an invalid API key from this client; retry after ${retryAfterS} s`,
      undefined,
      { 'retry-after': String(retryAfterS) },
    );
  };

  app.addHook('onRequest', async (request) => {
    const needed = requiredAccess(request);
    if (needed === 'public') return;
    if (failures) {
      const status = await failures(request, { increment: false });
      if (!status.isAllowed && (status.remaining ?? 1) <= 0) throw tooMany(status.ttlInSeconds);
    }
    const outcome = keys.authorize(extractPresentedKey(request.headers), needed);
    if (outcome === 'ok') return;
    if (outcome === 'forbidden') {
      throw new HttpProblem(403, 'forbidden', `This API key does not have the '${needed}' scope`);
    }
    if (outcome === 'invalid' && failures) await failures(request);
    throw new HttpProblem(
      401,
      outcome === 'missing' ? 'api-key-required' : 'api-key-invalid',
      outcome === 'missing' ? 'An API key is required: send Authorization: Bearer <key> or X-Api-Key' : 'The API key is not valid',
      undefined,
      { 'www-authenticate': 'Bearer realm="tickwright"' },
    );
  });
}
