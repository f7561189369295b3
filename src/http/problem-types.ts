/**
 * What each stable problem code means, served at GET /problems/{code} so the
 * `type` URI of every problem (RFC 9457 §3.1.1: a URI reference, here relative
 * to the service) resolves to a description a person can read. One row per
 * code: the code, the status its answers carry, what it means. The statuses of
 * core and store errors are read from here (problem.ts), and `ProblemCode` is
 * the type of every code `HttpProblem` and `problem()` accept, so a code the
 * service emits cannot be missing from the table. Codes not listed answer 404.
 */
import type { CoreErrorCode } from '../core/errors.ts';
import type { StoreErrorCode } from '../store/errors.ts';

export interface ProblemType {
  /** HTTP status answers with this code carry. */
  status: number;
  description: string;
}

type Row = readonly [code: string, status: number, description: string];

const ROWS = [
  // Calculation core (CoreError codes).
  ['invalid-value', 400, 'A number or value text is malformed, out of its documented range or ambiguous; the pointer names the field.'],
  ['unknown-reference', 422, 'An id (topology, amplifier, series, catalogue …) names nothing that exists.'],
  ['missing-part', 400, 'A role the topology needs was not given.'],
  ['unexpected-part', 400, 'A role the topology does not have was given.'],
  ['no-oscillation', 422, 'The circuit as described latches or cannot switch, so it has no period to report.'],
  ['infeasible', 422, 'No design or snap satisfies the request under its constraints.'],
  ['limit-exceeded', 422, 'The request asks for more work than a documented cap allows (samples, periods, assemblies …).'],
  ['bad-capture', 422, 'The measured capture cannot be analysed (too short, no transitions, clipped, unreadable units …).'],
  ['not-converged', 422, 'An iterative solve did not converge within its bound.'],
  ['not-modelled', 422, 'The request describes an effect the model does not solve yet (see the pointer); it is refused rather than answered approximately.'],
  // Persistence (StoreError codes).
  ['not-found', 404, 'No resource at this path.'],
  ['precondition-required', 428, 'Changing an existing document needs If-Match with its current ETag.'],
  ['precondition-failed', 412, 'The If-Match ETag is not the document’s current one: read it again, then retry.'],
  ['conflict', 409, 'The store could not take the write right now; retry.'],
  ['invalid-id', 400, 'The document id does not match the documented id pattern.'],
  ['corrupt', 500, 'Stored data could not be read back; the operator has been told through the log.'],
  ['unavailable', 503, 'The store (database) cannot be reached right now; retry after Retry-After seconds.'],
  // HTTP layer.
  ['non-finite-result', 422, 'A figure of the answer would not be a finite number; the request is outside what the model can describe (finite-answer.ts; `answerPointer` names the figure).'],
  ['validation', 400, 'The request does not match the schema; `errors` lists each bad field as a JSON pointer (RFC 6901).'],
  ['malformed-body', 400, 'The body cannot be parsed as its Content-Type says.'],
  ['malformed-json', 400, 'The body is not valid JSON.'],
  ['empty-body', 400, 'The route needs a body and none was sent.'],
  ['too-deeply-nested', 400, 'The JSON body nests arrays/objects deeper than the configured limit (TICKWRIGHT_MAX_JSON_DEPTH); it was refused before parsing.'],
  ['malformed-request', 400, 'The request line or headers are not valid HTTP/1.1.'],
  ['client-closed', 400, 'The client closed the connection before the answer; the work was cancelled.'],
  ['api-key-required', 401, 'The route needs an API key: send Authorization: Bearer <key> or X-Api-Key.'],
  ['api-key-invalid', 401, 'The API key matches no configured key.'],
  ['forbidden', 403, 'The API key lacks the scope the route needs (write for PUT/DELETE).'],
  ['method-not-allowed', 405, 'The path exists but not with this method; Allow lists the methods.'],
  ['not-acceptable', 406, 'None of the media types in Accept is offered by the route.'],
  ['request-timeout', 408, 'The request (headers and body) did not arrive within TICKWRIGHT_REQUEST_TIMEOUT_MS.'],
  ['read-only', 409, 'Built-in entries cannot be changed or removed.'],
  ['body-too-large', 413, 'The body exceeds TICKWRIGHT_BODY_LIMIT_BYTES.'],
  ['unsupported-media-type', 415, 'The route does not accept this Content-Type; see the request media types in /openapi.json.'],
  ['too-many-auth-failures', 429, 'Too many invalid API keys from this client (TICKWRIGHT_AUTH_FAILURE_LIMIT); wait Retry-After seconds.'],
  ['headers-too-large', 431, 'The request line or headers exceed the server’s limit (a very long query string, for instance).'],
  ['internal', 500, 'An unexpected error; it has been logged with the request id.'],
  ['overloaded', 503, 'The service is under load (event-loop delay or a full worker queue); retry after Retry-After seconds.'],
  ['shutting-down', 503, 'The replica is shutting down; retry, possibly on another replica.'],
  ['deadline-exceeded', 503, 'The computation took longer than TICKWRIGHT_TASK_DEADLINE_MS and was stopped; narrow the request or retry later.'],
  ['too-many-large-uploads', 503, 'The configured number of large uploads (TICKWRIGHT_LARGE_BODY_CONCURRENCY) is already being processed; retry after Retry-After seconds.'],
  ['no-samples', 422, 'The request asks for a sample-based result but no samples were drawn.'],
] as const satisfies readonly Row[];

export type ProblemCode = (typeof ROWS)[number][0];
/** Statuses without a code of their own answer `http-NNN` (problem.ts). */
export type GenericProblemCode = `http-${number}`;

export const PROBLEM_TYPES: Readonly<Record<ProblemCode, ProblemType>> = Object.fromEntries(
  ROWS.map(([code, status, description]) => [code, { status, description }]),
) as Record<ProblemCode, ProblemType>;

// Every core and store error code has a row (a compile error names the missing one).
const coreAndStoreCovered: Record<CoreErrorCode | StoreErrorCode, ProblemType> = PROBLEM_TYPES;
void coreAndStoreCovered;

/** Description of a code, including the generic `http-NNN` codes of statuses without a code of their own. */
export function problemType(code: string): ProblemType | undefined {
  if (Object.hasOwn(PROBLEM_TYPES, code)) return PROBLEM_TYPES[code as ProblemCode];
  const generic = /^http-([45]\d\d)$/.exec(code);
  if (generic) return { status: Number(generic[1]), description: `HTTP status ${generic[1]} without a more specific code.` };
  return undefined;
}
