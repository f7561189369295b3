/**
 * Enforces API-key scopes when keys are configured: PUT/DELETE need write,
 * everything else under /v1 needs read; health, metrics and the contract stay
 * open so orchestrators and contract tooling can reach them.
 */
import type { FastifyInstance, FastifyRequest } from 'fastify';
import { HttpProblem } from '../problem.ts';
import { extractPresentedKey, type ApiKeyRing } from './api-keys.ts';

export function neededScope(request: FastifyRequest): 'none' | 'read' | 'write' {
  const configured = request.routeOptions.config?.scope;
  if (configured) return configured;
  if (!request.url.startsWith('/v1/')) return 'none';
  return request.method === 'PUT' || request.method === 'DELETE' || request.method === 'PATCH' ? 'write' : 'read';
}

export function registerAuth(app: FastifyInstance, keys: ApiKeyRing): void {
  if (keys.isOpen) return;
  app.addHook('onRequest', async (request) => {
    const scope = neededScope(request);
    if (scope === 'none') return;
    const outcome = keys.authorize(extractPresentedKey(request.headers), scope);
    if (outcome === 'ok') return;
    if (outcome === 'forbidden') {
      throw new HttpProblem(403, 'forbidden', `This API key does not have the '${scope}' scope`);
    }
    throw new HttpProblem(
      401,
      outcome === 'missing' ? 'api-key-required' : 'api-key-invalid',
      outcome === 'missing' ? 'An API key is required: send Authorization: Bearer <key> or X-Api-Key' : 'The API key is not valid',
      undefined,
      { 'www-authenticate': 'Bearer realm="tickwright"' },
    );
  });
}
