/**
 * Gives a large request's memory back to the system promptly.
 *
 * After a 60 MB capture, the worker thread that analysed it holds its input and
 * intermediate arrays as garbage, and the main thread the blocks it read the
 * body into; an idle thread allocates nothing, so V8 has no reason to collect,
 * and the memory stays resident until the next request. After such a request
 * (only then: a full collection costs a few milliseconds per live megabyte)
 * each thread asks for one full collection once its work is done.
 *
 * Node exposes the collector only behind --expose-gc, which worker threads
 * cannot be given in execArgv; the flag is set at run time and the function
 * taken from a fresh context, which is the documented effect of that flag on
 * contexts created after it is set (Node's `v8.setFlagsFromString` docs).
 * If that ever fails, memory is released at the next natural collection.
 */
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';

let collect: (() => void) | null | undefined;

function collector(): (() => void) | null {
  if (collect !== undefined) return collect;
  try {
    setFlagsFromString('--expose-gc');
    const gc = runInNewContext('gc') as unknown;
    collect = typeof gc === 'function' ? (gc as () => void) : null;
  } catch {
    collect = null;
  }
  return collect;
}

/** One full collection after the current task has returned (its input then unreachable). */
export function releaseMemorySoon(): void {
  const gc = collector();
  if (gc) setTimeout(gc, 50).unref();
}
