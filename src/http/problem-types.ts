/**
 * What each stable problem code means, served at GET /problems/{code} so the
 * `type` URI of every problem (RFC 9457 §3.1.1: a URI reference, here relative
 * to the service) resolves to a description a person can read. A code the
 * service emits must be listed here (test/http/problems.test.ts checks the
 * codes it can enumerate). Codes not listed answer 404.
 */
import type { CoreErrorCode } from '../core/errors.ts';
import type { StoreErrorCode } from '../store/errors.ts';

export interface ProblemType {
  /** Usual HTTP status for the code. */
  status: number;
  description: string;
}

const CORE: Record<CoreErrorCode, ProblemType> = {
  'invalid-value': { status: 400, description: 'A number or value text is malformed, out of its documented range or ambiguous; the pointer names the field.' },
  'unknown-reference': { status: 422, description: 'An id (topology, amplifier, series, catalogue …) names nothing that exists.' },
  'missing-part': { status: 400, description: 'A role the topology needs was not given.' },
  'unexpected-part': { status: 400, description: 'A role the topology does not have was given.' },
  'no-oscillation': { status: 422, description: 'The circuit as described latches or cannot switch, so it has no period to report.' },
  infeasible: { status: 422, description: 'No design or snap satisfies the request under its constraints.' },
  'limit-exceeded': { status: 422, description: 'The request asks for more work than a documented cap allows (samples, periods, assemblies …).' },
  'bad-capture': { status: 422, description: 'The measured capture cannot be analysed (too short, no transitions, clipped, unreadable units …).' },
  'not-converged': { status: 422, description: 'An iterative solve did not converge within its bound.' },
  'not-modelled': { status: 422, description: 'The request describes an effect the model does not solve yet (see the pointer); it is refused rather than answered approximately.' },
  'non-finite': { status: 422, description: 'A figure of the answer would not be a finite number; the request is outside what the model can describe.' },
} as Record<CoreErrorCode, ProblemType>;

const STORE: Record<StoreErrorCode, ProblemType> = {
  'not-found': { status: 404, description: 'No resource at this path.' },
  'precondition-required': { status: 428, description: 'Changing an existing document needs If-Match with its current ETag.' },
  'precondition-failed': { status: 412, description: 'The If-Match ETag is not the document’s current one: read it again, then retry.' },
  conflict: { status: 409, description: 'The store could not take the write right now; retry.' },
  'invalid-id': { status: 400, description: 'The document id does not match the documented id pattern.' },
  corrupt: { status: 500, description: 'Stored data could not be read back; the operator has been told through the log.' },
  unavailable: { status: 503, description: 'The store (database) cannot be reached right now; retry after Retry-After seconds.' },
};

const HTTP: Record<string, ProblemType> = {
  validation: { status: 400, description: 'The request does not match the schema; `errors` lists each bad field as a JSON pointer (RFC 6901).' },
  'malformed-body': { status: 400, description: 'The body cannot be parsed as its Content-Type says.' },
  'malformed-json': { status: 400, description: 'The body is not valid JSON.' },
  'empty-body': { status: 400, description: 'The route needs a body and none was sent.' },
  'too-deeply-nested': { status: 400, description: 'The JSON body nests arrays/objects deeper than the configured limit (TICKWRIGHT_MAX_JSON_DEPTH); it was refused before parsing.' },
  'malformed-request': { status: 400, description: 'The request line or headers are not valid HTTP/1.1.' },
  'client-closed': { status: 400, description: 'The client closed the connection before the answer; the work was cancelled.' },
  'api-key-required': { status: 401, description: 'The route needs an API key: send Authorization: Bearer <key> or X-Api-Key.' },
  'api-key-invalid': { status: 401, description: 'The API key matches no configured key.' },
  forbidden: { status: 403, description: 'The API key lacks the scope the route needs (write for PUT/DELETE).' },
  'method-not-allowed': { status: 405, description: 'The path exists but not with this method; Allow lists the methods.' },
  'not-acceptable': { status: 406, description: 'None of the media types in Accept is offered by the route.' },
  'request-timeout': { status: 408, description: 'The request (headers and body) did not arrive within TICKWRIGHT_REQUEST_TIMEOUT_MS.' },
  'read-only': { status: 409, description: 'Built-in entries cannot be changed or removed.' },
  'body-too-large': { status: 413, description: 'The body exceeds TICKWRIGHT_BODY_LIMIT_BYTES.' },
  'unsupported-media-type': { status: 415, description: 'The route does not accept this Content-Type; see the request media types in /openapi.json.' },
  'too-many-auth-failures': { status: 429, description: 'Too many invalid API keys from this client (TICKWRIGHT_AUTH_FAILURE_LIMIT); wait Retry-After seconds.' },
  'headers-too-large': { status: 431, description: 'The request line or headers exceed the server’s limit (a very long query string, for instance).' },
  internal: { status: 500, description: 'An unexpected error; it has been logged with the request id.' },
  overloaded: { status: 503, description: 'The service is under load (event-loop delay or a full worker queue); retry after Retry-After seconds.' },
  'shutting-down': { status: 503, description: 'The replica is shutting down; retry, possibly on another replica.' },
  'deadline-exceeded': { status: 503, description: 'The computation took longer than TICKWRIGHT_TASK_DEADLINE_MS and was stopped; narrow the request or retry later.' },
  'too-many-large-uploads': { status: 503, description: 'The configured number of large uploads (TICKWRIGHT_LARGE_BODY_CONCURRENCY) is already being processed; retry after Retry-After seconds.' },
  'no-samples': { status: 422, description: 'The request asks for a sample-based result but no samples were drawn.' },
};

export const PROBLEM_TYPES: Readonly<Record<string, ProblemType>> = { ...CORE, ...STORE, ...HTTP };

/** Description of a code, including the generic `http-NNN` codes of statuses without a code of their own. */
export function problemType(code: string): ProblemType | undefined {
  if (Object.hasOwn(PROBLEM_TYPES, code)) return PROBLEM_TYPES[code];
  const generic = /^http-([45]\d\d)$/.exec(code);
  if (generic) return { status: Number(generic[1]), description: `HTTP status ${generic[1]} without a more specific code.` };
  return undefined;
}
