/**
 * Request body parsing for the whole service.
 * - JSON (application/json) is parsed with JSON.parse, then any `__proto__`
 *   key, or `constructor` key holding a `prototype`, is refused as a 400 that
 *   names the field by its JSON pointer — fastify's default parser refuses them
 *   too but reports "not valid JSON" with no field. (JSON.parse itself makes
 *   such keys plain own properties; refusing them keeps Object.assign-style
 *   copies anywhere downstream from touching a prototype.)
 * - fastify's default text/plain parser is removed: a JSON body sent as
 *   text/plain is then a 415 (unsupported media type), not a 400 about a
 *   string body. Routes that take text (CSV captures) register their own types.
 */
import type { FastifyInstance, FastifyRequest } from 'fastify';
import { HttpProblem } from './problem.ts';

const FORBIDDEN_HINT = /__proto__|constructor|\\u/;

function escapeSegment(segment: string): string {
  return segment.replace(/~/g, '~0').replace(/\//g, '~1');
}

/** Pointer to the first prototype-poisoning key in a parsed JSON value, if any. */
export function findForbiddenKey(value: unknown): string | undefined {
  const stack: { v: unknown; path: string }[] = [{ v: value, path: '' }];
  while (stack.length > 0) {
    const { v, path } = stack.pop()!;
    if (v === null || typeof v !== 'object') continue;
    if (Array.isArray(v)) {
      for (let i = v.length - 1; i >= 0; i--) stack.push({ v: v[i], path: `${path}/${i}` });
      continue;
    }
    const record = v as Record<string, unknown>;
    if (Object.prototype.hasOwnProperty.call(record, '__proto__')) return `${path}/__proto__`;
    const ctor = Object.prototype.hasOwnProperty.call(record, 'constructor') ? record.constructor : undefined;
    if (ctor !== null && typeof ctor === 'object' && Object.prototype.hasOwnProperty.call(ctor, 'prototype')) return `${path}/constructor/prototype`;
    const keys = Object.keys(record);
    for (let i = keys.length - 1; i >= 0; i--) stack.push({ v: record[keys[i]], path: `${path}/${escapeSegment(keys[i])}` });
  }
  return undefined;
}

export function parseJsonBody(_request: FastifyRequest, body: string): unknown {
  if (body.length === 0) throw new HttpProblem(400, 'empty-body', 'The JSON body is empty', [{ pointer: '/', detail: 'body is empty' }]);
  let value: unknown;
  try {
    value = JSON.parse(body);
  } catch (err) {
    const message = `The body is not valid JSON: ${(err as Error).message}`;
    throw new HttpProblem(400, 'malformed-body', message, [{ pointer: '/', detail: message }]);
  }
  if (FORBIDDEN_HINT.test(body)) {
    const pointer = findForbiddenKey(value);
    if (pointer !== undefined) {
      throw new HttpProblem(400, 'validation', `Invalid request: ${pointer} is not an accepted field name`, [{ pointer, detail: 'is not an accepted field name' }]);
    }
  }
  return value;
}

export function installBodyParsers(app: FastifyInstance): void {
  app.removeContentTypeParser(['application/json', 'text/plain']);
  app.addContentTypeParser('application/json', { parseAs: 'string' }, (request, body, done) => {
    try {
      done(null, parseJsonBody(request, body as string));
    } catch (err) {
      done(err as Error, undefined);
    }
  });
}
