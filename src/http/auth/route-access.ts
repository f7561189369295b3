/**
 * Who may call a route, decided once per ROUTE (its registered method and
 * pattern), never per request from the raw target: a request reaches a handler
 * only through the router, so the router's match is the one thing the access
 * check can trust. A request target in absolute form (`http://x/v1/...`), with
 * `//`, `/./` or a trailing slash is normalised by the router and must meet the
 * same rule as the origin form.
 *
 * Routes declare `config: { access: 'public' | 'read' | 'write' }`. A route that
 * declares nothing gets the safe default from its method (PUT, PATCH, DELETE
 * write; everything else read); only health, metrics, the contract, the docs
 * and the problem descriptions are public. A request no route matches (404/405)
 * needs read access, so a caller without a key learns nothing about which paths
 * exist.
 */
import type { FastifyInstance, FastifyRequest, RouteOptions } from 'fastify';

export type RouteAccess = 'public' | 'read' | 'write';

declare module 'fastify' {
  interface FastifyContextConfig {
    /** Who may call the route when API keys are configured (see auth/route-access.ts). */
    access?: RouteAccess;
  }
  interface FastifyInstance {
    /** Every route the app registered, with the access it was given (for the auth matrix test and docs). */
    routeTable: RouteTableEntry[];
  }
}

export interface RouteTableEntry {
  method: string;
  url: string;
  access: RouteAccess;
}

/** Prefix of the swagger UI routes (registered by a plugin that knows nothing of our config). */
export const DOCS_PREFIX = '/docs';

const WRITE_METHODS = new Set(['PUT', 'PATCH', 'DELETE']);

/** The access a route gets when it declares none. */
export function defaultAccess(method: string, url: string): RouteAccess {
  if (url === DOCS_PREFIX || url.startsWith(DOCS_PREFIX + '/')) return 'public';
  return WRITE_METHODS.has(method.toUpperCase()) ? 'write' : 'read';
}

/**
 * Fills in `config.access` on every route as it is registered and records the
 * route table. Must be installed before any route (or route-adding plugin).
 */
export function installRouteAccess(app: FastifyInstance): void {
  const table: RouteTableEntry[] = [];
  app.decorate('routeTable', table);
  app.addHook('onRoute', (route: RouteOptions) => {
    const methods = Array.isArray(route.method) ? route.method : [route.method];
    const declared = route.config?.access;
    for (const method of methods) {
      const access = declared ?? defaultAccess(method, route.url);
      table.push({ method: method.toUpperCase(), url: route.url, access });
    }
    // One route object may carry several methods; a declared access applies to all of them, and the
    // default is the strictest over them.
    const access = declared ?? (methods.some((m) => defaultAccess(m, route.url) === 'write') ? 'write' : defaultAccess(methods[0], route.url));
    route.config = { ...route.config, access };
  });
}

/** The access a request needs: from the matched route's config; unmatched requests need read. */
export function requiredAccess(request: FastifyRequest): RouteAccess {
  // routeOptions.url is undefined when no route matched (the not-found handler answers).
  if (request.routeOptions.url === undefined) return 'read';
  return request.routeOptions.config?.access ?? 'read';
}
