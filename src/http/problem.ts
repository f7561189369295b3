/**
 * RFC 9457 problem details for every error the service returns. Validation
 * errors become JSON pointers (RFC 6901) into the request; core and store errors
 * map by their stable codes; nothing a caller sends can produce a 500.
 */
import type { FastifyError, FastifyReply, FastifyRequest } from 'fastify';
import { CoreError } from '../core/errors.ts';
import { StoreError } from '../store/errors.ts';
import { PROBLEM_TYPES, type GenericProblemCode, type ProblemCode } from './problem-types.ts';
import type { ProblemBody } from './schemas/common.ts';

/**
 * Problem `type` URIs are relative references (RFC 9457 §3.1.1 resolves them against the answer's URI),
 * so they point at this service: GET /problems/{code} describes each code.
 */
export const PROBLEM_TYPE_BASE = '/problems/';
export const PROBLEM_MEDIA_TYPE = 'application/problem+json';

const TITLES: Record<number, string> = {
  400: 'Bad Request',
  401: 'Unauthorized',
  403: 'Forbidden',
  404: 'Not Found',
  405: 'Method Not Allowed',
  406: 'Not Acceptable',
  408: 'Request Timeout',
  409: 'Conflict',
  412: 'Precondition Failed',
  413: 'Content Too Large',
  415: 'Unsupported Media Type',
  431: 'Request Header Fields Too Large',
  422: 'Unprocessable Content',
  428: 'Precondition Required',
  429: 'Too Many Requests',
  500: 'Internal Server Error',
  503: 'Service Unavailable',
};

export class HttpProblem extends Error {
  constructor(
    readonly status: number,
    readonly code: ProblemCode | GenericProblemCode,
    message: string,
    readonly errors?: ProblemBody['errors'],
    readonly headers?: Record<string, string>,
    readonly extra?: Record<string, unknown>,
  ) {
    super(message);
  }
}

export function problem(status: number, code: ProblemCode | GenericProblemCode, detail: string, instance?: string, errors?: ProblemBody['errors'], extra?: Record<string, unknown>): ProblemBody {
  const body: ProblemBody = { type: PROBLEM_TYPE_BASE + code, title: TITLES[status] ?? 'Error', status, code, detail };
  if (instance) body.instance = instance;
  if (errors && errors.length) body.errors = errors;
  return extra ? { ...body, ...extra } : body;
}

interface ValidationItem {
  instancePath?: string;
  keyword?: string;
  message?: string;
  params?: Record<string, unknown>;
}

/** Where a validated part of the request sits, as problem `errors[].in` (RFC 6901 pointers are relative to it). */
const CONTEXT_LOCATION: Record<string, 'query' | 'path' | 'header'> = { querystring: 'query', params: 'path', headers: 'header' };

/**
 * One ajv error -> a JSON pointer and a sentence a caller can act on. The
 * pointer is RFC 6901 into the part of the request that failed; for the query
 * string, path parameters and headers `in` says which part ("/circuit" in the query).
 */
export function validationToPointer(item: ValidationItem, context: string | undefined): { pointer: string; detail: string; in?: 'query' | 'path' | 'header' } {
  let pointer = item.instancePath ?? '';
  const params = item.params ?? {};
  let detail = item.message ?? 'is invalid';
  if (item.keyword === 'required' && typeof params.missingProperty === 'string') {
    pointer += `/${escapePointer(params.missingProperty)}`;
    detail = 'is required';
  } else if (item.keyword === 'additionalProperties' && typeof params.additionalProperty === 'string') {
    pointer += `/${escapePointer(params.additionalProperty)}`;
    detail = 'is not a known field';
  } else if (item.keyword === 'anyOf' || item.keyword === 'oneOf') {
    detail = 'does not match any accepted form';
  }
  const location = context ? CONTEXT_LOCATION[context] : undefined;
  return location ? { pointer: pointer || '/', detail, in: location } : { pointer: pointer || '/', detail };
}

function escapePointer(segment: string): string {
  return segment.replace(/~/g, '~0').replace(/\//g, '~1');
}

export function sendProblem(reply: FastifyReply, body: ProblemBody, headers?: Record<string, string>): FastifyReply {
  if (headers) reply.headers(headers);
  return reply.code(body.status).type(PROBLEM_MEDIA_TYPE).send(body);
}

export function errorHandler(error: FastifyError | Error, request: FastifyRequest, reply: FastifyReply): FastifyReply {
  const instance = request.url;
  if (error instanceof HttpProblem) {
    return sendProblem(reply, problem(error.status, error.code, error.message, instance, error.errors, error.extra), error.headers);
  }
  if (error instanceof CoreError) {
    const status = PROBLEM_TYPES[error.code].status;
    const errors = error.pointer !== undefined ? [{ pointer: error.pointer, detail: error.message }] : undefined;
    return sendProblem(reply, problem(status, error.code, error.message, instance, errors, error.details ? { figures: error.details } : undefined));
  }
  if (error instanceof StoreError) {
    const status = PROBLEM_TYPES[error.code].status;
    if (status >= 500) request.log.error({ err: error }, 'store error');
    return sendProblem(reply, problem(status, error.code, error.message, instance), status === 503 ? { 'retry-after': '5' } : undefined);
  }
  const fe = error as FastifyError & { validation?: ValidationItem[]; validationContext?: string };
  if (fe.validation) {
    const seen = new Set<string>();
    const errors = fe.validation
      .map((v) => validationToPointer(v, fe.validationContext))
      .filter((e) => (seen.has(e.pointer) ? false : (seen.add(e.pointer), true)));
    const detail = errors.map((e) => `${e.pointer} ${e.detail}`).join('; ');
    return sendProblem(reply, problem(400, 'validation', `Invalid request: ${detail}`, instance, errors));
  }
  switch (fe.code) {
    case 'FST_ERR_CTP_BODY_TOO_LARGE':
      return sendProblem(reply, problem(413, 'body-too-large', 'The request body exceeds the configured limit', instance));
    case 'FST_ERR_CTP_INVALID_MEDIA_TYPE':
      return sendProblem(
        reply,
        problem(
          415,
          'unsupported-media-type',
          `Content-Type '${request.headers['content-type'] ?? ''}' is not accepted by this route; see the request body media types in /openapi.json (application/json unless stated)`,
          instance,
        ),
      );
    case 'FST_ERR_CTP_EMPTY_JSON_BODY':
      return sendProblem(reply, problem(400, 'empty-body', 'The JSON body is empty', instance, [{ pointer: '/', detail: 'body is empty' }]));
    case 'FST_ERR_CTP_INVALID_JSON_BODY':
    case 'FST_ERR_CTP_INVALID_CONTENT_LENGTH':
      return sendProblem(reply, problem(400, 'malformed-body', fe.message, instance, [{ pointer: '/', detail: fe.message }]));
  }
  const status = typeof fe.statusCode === 'number' ? fe.statusCode : 500;
  if (status >= 400 && status < 500) {
    const code: ProblemCode | GenericProblemCode = status === 400 && error instanceof SyntaxError ? 'malformed-json' : `http-${status}`;
    return sendProblem(reply, problem(status, code, fe.message, instance, status === 400 ? [{ pointer: '/', detail: fe.message }] : undefined));
  }
  if (status === 503) return sendProblem(reply, problem(503, 'unavailable', fe.message, instance), { 'retry-after': '5' });
  request.log.error({ err: error }, 'unhandled error');
  return sendProblem(reply, problem(500, 'internal', 'An internal error occurred; it has been logged', instance));
}
