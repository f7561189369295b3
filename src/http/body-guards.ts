/**
 * Cheap refusals before a body costs memory or CPU:
 *
 *  - JSON nested deeper than a limit is refused by a linear pre-scan of the
 *    text before JSON.parse (2 MB of `[[[[…` would otherwise build a deep tree
 *    and then a deep validation); the scan stops at the first bracket too deep.
 *  - Large uploads (Content-Length at or above a threshold, or chunked with no
 *    length) are admitted a few at a time: each one costs several times its
 *    size while it is parsed and processed, so without a bound four 60 MB
 *    captures at once cost over a gigabyte. Beyond the bound: 503 + Retry-After,
 *    before a byte of the body is read.
 */
import type { FastifyInstance } from 'fastify';
import { parseJsonBody } from './json-body.ts';
import { HttpProblem, problem, sendProblem } from './problem.ts';

/** Index of the first opening bracket deeper than maxDepth, or -1. Brackets inside strings are skipped. */
export function firstTooDeep(text: string, maxDepth: number): number {
  let depth = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 0x5c) i++; // backslash: skip the escaped character
      else if (c === 0x22) inString = false;
      continue;
    }
    if (c === 0x22) inString = true;
    else if (c === 0x5b || c === 0x7b) {
      if (++depth > maxDepth) return i;
    } else if (c === 0x5d || c === 0x7d) depth--;
  }
  return -1;
}

export function installJsonDepthGuard(app: FastifyInstance, maxDepth: number): void {
  // The service's JSON parser (json-body.ts: empty and malformed bodies, prototype keys named by pointer) after the scan.
  app.removeContentTypeParser('application/json');
  app.addContentTypeParser('application/json', { parseAs: 'string' }, (request, body, done) => {
    const text = body as string;
    const at = firstTooDeep(text, maxDepth);
    if (at >= 0) {
      done(
        new HttpProblem(400, 'too-deeply-nested', `The JSON body nests arrays/objects deeper than ${maxDepth} levels (at character ${at}); refused before parsing`, [
          { pointer: '/', detail: `nesting deeper than ${maxDepth}` },
        ]),
        undefined,
      );
      return;
    }
    try {
      done(null, parseJsonBody(request, text));
    } catch (err) {
      done(err as Error, undefined);
    }
  });
}

export interface LargeUploadOptions {
  thresholdBytes: number;
  concurrency: number;
  retryAfterS?: number;
}

export function installLargeUploadGate(app: FastifyInstance, options: LargeUploadOptions): { readonly active: number } {
  let active = 0;
  // preParsing: after the access check (onRequest), before any of the body is read.
  app.addHook('preParsing', (request, reply, payload, done) => {
    const length = Number(request.headers['content-length']);
    const chunkedWithoutLength = request.headers['content-length'] === undefined && request.headers['transfer-encoding'] !== undefined;
    const large = chunkedWithoutLength || (Number.isFinite(length) && length >= options.thresholdBytes);
    if (!large) return done(null, payload);
    if (active >= options.concurrency) {
      // Close the connection rather than read and discard the body.
      reply.header('connection', 'close');
      sendProblem(
        reply,
        problem(503, 'too-many-large-uploads', `${active} large uploads are being processed (limit ${options.concurrency}); retry shortly`, request.url),
        { 'retry-after': String(options.retryAfterS ?? 2) },
      );
      return;
    }
    active++;
    reply.raw.once('close', () => active--);
    done(null, payload);
  });
  return {
    get active() {
      return active;
    },
  };
}
