/**
 * The one error type the calculation core throws. `code` is stable (callers and
 * the HTTP layer switch on it); `pointer` names the offending input field as a
 * JSON pointer relative to the request body when the core knows it.
 */
export type CoreErrorCode =
  | 'invalid-value' // a number or value string that is malformed, out of range or ambiguous
  | 'unknown-reference' // an id (topology, amplifier, series, catalogue...) that does not exist
  | 'missing-part' // a role the topology needs was not given
  | 'unexpected-part' // a role the topology does not have
  | 'no-oscillation' // the circuit latches or cannot switch
  | 'infeasible' // a design/snap request with no solution under its constraints
  | 'limit-exceeded' // a request beyond a sample/size cap
  | 'bad-capture' // a measurement capture that cannot be analysed
  | 'not-converged' // an iterative solve that did not converge in its bound
  | 'not-modelled'; // a physical effect the request describes that the model does not solve yet (never approximated silently)

export class CoreError extends Error {
  readonly code: CoreErrorCode;
  readonly pointer: string | undefined;
  readonly details: Record<string, unknown> | undefined;

  constructor(code: CoreErrorCode, message: string, pointer?: string, details?: Record<string, unknown>) {
    super(message);
    this.name = 'CoreError';
    this.code = code;
    this.pointer = pointer;
    this.details = details;
  }
}
