/**
 * Cheap refusals before a body costs memory or CPU:
 *
 *  - JSON nested deeper than a limit is refused by a linear pre-scan of the
 *    text before JSON.parse (2 MB of `[[[[…` would otherwise build a deep tree
 *    and then a deep validation); the scan stops at the first bracket too deep.
 *    Large bodies are parsed as they stream in (streaming-json.ts), which
 *    counts depth as it goes.
 *  - Large uploads (Content-Length at or above a threshold, or chunked with no
 *    length) are admitted a few at a time: each one costs several times its
 *    size while it is parsed and processed, so without a bound four 60 MB
 *    captures at once cost over a gigabyte. Beyond the bound: 503 + Retry-After,
 *    before a byte of the body is read.
 */
import type { IncomingHttpHeaders } from 'node:http';
import { errorCodes, type FastifyInstance, type FastifyRequest } from 'fastify';
import { parseJsonBody } from './json-body.ts';
import { HttpProblem, problem, sendProblem } from './problem.ts';
import { releaseMemorySoon } from './release-memory.ts';
import { StreamingJsonParser } from './streaming-json.ts';

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

declare module 'fastify' {
  interface FastifyContextConfig {
    /**
     * JSON pointers of arrays in this route's body that hold scope samples: a large body reads them
     * straight into Float64Arrays (streaming-json.ts), found in the handler with sampleArraysOf(body).
     */
    sampleArrays?: readonly string[];
  }
}

/** A body that is large by its declared length, or of unknown length (chunked). */
export function isLargeUpload(headers: IncomingHttpHeaders, thresholdBytes: number): boolean {
  const length = Number(headers['content-length']);
  const chunkedWithoutLength = headers['content-length'] === undefined && headers['transfer-encoding'] !== undefined;
  return chunkedWithoutLength || (Number.isFinite(length) && length >= thresholdBytes);
}

export interface JsonParsingOptions {
  maxDepth: number;
  /** At or above this size (or chunked) a body is parsed as it streams in, never held whole. */
  largeBodyBytes: number;
}

/** What the body reader feeds: either whole (small bodies) or chunk by chunk (large ones). */
interface BodySink {
  write(chunk: Buffer): void;
  end(): unknown;
}

class WholeTextSink implements BodySink {
  private readonly chunks: Buffer[] = [];
  private length = 0;
  constructor(
    private readonly request: FastifyRequest,
    private readonly maxDepth: number,
  ) {}
  write(chunk: Buffer): void {
    this.chunks.push(chunk);
    this.length += chunk.length;
  }
  end(): unknown {
    const text = (this.chunks.length === 1 ? this.chunks[0] : Buffer.concat(this.chunks, this.length)).toString('utf8');
    const at = firstTooDeep(text, this.maxDepth);
    if (at >= 0) {
      throw new HttpProblem(400, 'too-deeply-nested', `The JSON body nests arrays/objects deeper than ${this.maxDepth} levels (at character ${at}); refused before parsing`, [
        { pointer: '/', detail: `nesting deeper than ${this.maxDepth}` },
      ]);
    }
    return parseJsonBody(this.request, text);
  }
}

/**
 * Reads a body into a sink with fastify's own rules for raw bodies (the route's body limit, the declared
 * length must match what arrived, a stream error is a 4xx), so both kinds of JSON body behave alike.
 */
function readBody(request: FastifyRequest, payload: NodeJS.ReadableStream, sink: BodySink, done: (err: Error | null, body?: unknown) => void): void {
  const limit = request.routeOptions.bodyLimit ?? Number.POSITIVE_INFINITY;
  const declared = Number(request.headers['content-length']);
  if (declared > limit) return done(new errorCodes.FST_ERR_CTP_BODY_TOO_LARGE());
  let received = 0;
  const stop = () => {
    payload.removeListener('data', onData);
    payload.removeListener('end', onEnd);
    payload.removeListener('error', onEnd);
  };
  function onData(chunk: Buffer | string) {
    const bytes = typeof chunk === 'string' ? Buffer.from(chunk) : chunk;
    received += bytes.length;
    if (received > limit) {
      stop();
      return done(new errorCodes.FST_ERR_CTP_BODY_TOO_LARGE());
    }
    try {
      sink.write(bytes);
    } catch (err) {
      stop();
      done(err as Error);
    }
  }
  function onEnd(err?: Error & { statusCode?: number }) {
    stop();
    if (err) {
      if (!(typeof err.statusCode === 'number' && err.statusCode >= 400)) err.statusCode = 400;
      return done(err);
    }
    if (!Number.isNaN(declared) && received !== declared) return done(new errorCodes.FST_ERR_CTP_INVALID_CONTENT_LENGTH());
    let body: unknown;
    try {
      body = sink.end();
    } catch (e) {
      return done(e as Error);
    }
    done(null, body);
  }
  payload.on('data', onData);
  payload.on('end', onEnd);
  payload.on('error', onEnd);
  payload.resume();
}

/**
 * The service's JSON parser. Small bodies: a linear nesting pre-scan, then JSON.parse (json-body.ts).
 * Large ones: parsed chunk by chunk as they arrive (streaming-json.ts), with the route's sample arrays
 * read into Float64Arrays, so a 60 MB capture is never held as text or as boxed numbers.
 */
export function installJsonParser(app: FastifyInstance, options: JsonParsingOptions): void {
  app.removeContentTypeParser('application/json');
  app.addContentTypeParser('application/json', (request, payload, done) => {
    const sink: BodySink = isLargeUpload(request.headers, options.largeBodyBytes)
      ? new StreamingJsonParser({ maxDepth: options.maxDepth, samplePaths: new Set(request.routeOptions.config.sampleArrays ?? []) })
      : new WholeTextSink(request, options.maxDepth);
    readBody(request, payload, sink, done);
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
    if (!isLargeUpload(request.headers, options.thresholdBytes)) return done(null, payload);
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
    reply.raw.once('close', () => {
      active--;
      releaseMemorySoon();
    });
    done(null, payload);
  });
  return {
    get active() {
      return active;
    },
  };
}
