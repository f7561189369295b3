/**
 * Errors Node's HTTP parser raises before a request reaches fastify (the
 * server's 'clientError' event): oversized headers (431, e.g. a 20 KB query
 * string), a request that did not arrive within the request timeout (408), a
 * malformed request line (400). Answered as problem+json like every other
 * error, then the connection is closed (its parser state is unusable).
 */
import type { Socket } from 'node:net';
import type { FastifyInstance } from 'fastify';
import { PROBLEM_MEDIA_TYPE, problem } from './problem.ts';
import type { ProblemCode } from './problem-types.ts';

function answerFor(err: NodeJS.ErrnoException): { status: number; code: ProblemCode; detail: string } {
  switch (err.code) {
    case 'ERR_HTTP_REQUEST_TIMEOUT':
      return { status: 408, code: 'request-timeout', detail: 'The request did not arrive in time (TICKWRIGHT_REQUEST_TIMEOUT_MS); the connection is closed' };
    case 'HPE_HEADER_OVERFLOW':
      return { status: 431, code: 'headers-too-large', detail: 'The request line and headers exceed the server limit; send long inputs in the body, not the query' };
    default:
      return { status: 400, code: 'malformed-request', detail: 'The request is not valid HTTP/1.1' };
  }
}

export function clientErrorHandler(this: FastifyInstance, err: NodeJS.ErrnoException, socket: Socket): void {
  if (err.code === 'ECONNRESET' || socket.destroyed) return;
  // A response already under way (its headers sent) cannot be replaced: just close.
  const inProgress = (socket as Socket & { _httpMessage?: { headersSent?: boolean } })._httpMessage;
  if (!socket.writable || inProgress?.headersSent) {
    socket.destroy();
    return;
  }
  const { status, code, detail } = answerFor(err);
  this.log.info({ code: err.code }, `client error answered ${status}`);
  const body = JSON.stringify(problem(status, code, detail));
  const reason = status === 408 ? 'Request Timeout' : status === 431 ? 'Request Header Fields Too Large' : 'Bad Request';
  socket.end(
    `HTTP/1.1 ${status} ${reason}\r\nContent-Type: ${PROBLEM_MEDIA_TYPE}\r\nContent-Length: ${Buffer.byteLength(body)}\r\nConnection: close\r\n\r\n${body}`,
  );
  // A client that never reads must not keep the socket: give the answer a second to flush.
  setTimeout(() => socket.destroy(), 1000).unref();
}
