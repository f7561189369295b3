/**
 * The boundary invariant: no non-finite number ever leaves the service. JSON
 * has no NaN or Infinity (a serializer would write null, or fail where the
 * schema says number), so before a 2xx answer is serialised its object tree is
 * walked; the first non-finite number turns the answer into a 422 problem that
 * names where it sits in the answer (`answerPointer`, RFC 6901) instead of a
 * 500 or a silent null. Root causes belong in the core (ranges, derived-
 * quantity checks); this guard makes sure a missed one is still a clear 4xx.
 * "No limit" figures are null by design and are converted before this runs
 * (convert.ts), so they never trip it.
 */
import type { FastifyInstance } from 'fastify';
import { HttpProblem } from './problem.ts';

function escapeSegment(segment: string): string {
  return segment.replace(/~/g, '~0').replace(/\//g, '~1');
}

/** JSON pointer of the first non-finite number in `value`, or undefined when every number is finite. */
export function findNonFinite(value: unknown, depthLimit = 256): string | undefined {
  const path: string[] = [];
  const seen = new Set<object>();
  const walk = (v: unknown, depth: number): boolean => {
    if (typeof v === 'number') return !Number.isFinite(v);
    if (v === null || typeof v !== 'object' || depth > depthLimit || seen.has(v)) return false;
    if (ArrayBuffer.isView(v)) {
      if (v instanceof DataView) return false;
      const arr = v as unknown as ArrayLike<number | bigint>;
      for (let i = 0; i < arr.length; i++) {
        const x = arr[i];
        if (typeof x === 'number' && !Number.isFinite(x)) return (path.push(String(i)), true);
      }
      return false;
    }
    // Buffers, streams and other non-plain payloads are serialised elsewhere (text, SVG, CSV).
    if (!Array.isArray(v) && Object.getPrototypeOf(v) !== Object.prototype && Object.getPrototypeOf(v) !== null) {
      if (typeof (v as { toJSON?: unknown }).toJSON !== 'function') return false;
      return walk((v as { toJSON: () => unknown }).toJSON(), depth + 1);
    }
    seen.add(v);
    if (Array.isArray(v)) {
      for (let i = 0; i < v.length; i++) {
        const x: unknown = v[i];
        if (typeof x === 'number') {
          if (!Number.isFinite(x)) return (path.push(String(i)), true);
        } else if (x !== null && typeof x === 'object' && walk(x, depth + 1)) return (path.unshift(String(i)), true);
      }
      return false;
    }
    for (const key of Object.keys(v)) {
      if (walk((v as Record<string, unknown>)[key], depth + 1)) return (path.unshift(escapeSegment(key)), true);
    }
    return false;
  };
  // The leaf records its segment first, each parent puts its own in front on the way back.
  return walk(value, 0) ? '/' + path.join('/') : undefined;
}

export function nonFiniteProblem(pointer: string): HttpProblem {
  return new HttpProblem(
    422,
    'non-finite-result',
    `The answer's figure at ${pointer} is not a finite number: the request drives the model outside the range where it gives meaningful figures`,
    undefined,
    undefined,
    { answerPointer: pointer },
  );
}

/** Registers the guard for every route: successful answers only (problem bodies are ours and finite). */
export function installFiniteAnswerGuard(app: FastifyInstance): void {
  app.addHook('preSerialization', (_request, reply, payload, done) => {
    if (reply.statusCode >= 300 || payload === null || typeof payload !== 'object') return done(null, payload);
    const pointer = findNonFinite(payload);
    if (pointer === undefined) return done(null, payload);
    reply.log.warn({ answerPointer: pointer }, 'non-finite figure in an answer');
    done(nonFiniteProblem(pointer));
  });
}
