/**
 * Exit codes of the command line, for scripts: 0 ok, 1 the answer says a check
 * or spec failed, 2 the command was used wrongly (options, unreadable input),
 * 3 the service answered with a problem or could not be reached.
 */
export const EXIT = { ok: 0, failed: 1, usage: 2, service: 3 } as const;
export type ExitCode = (typeof EXIT)[keyof typeof EXIT];

/** An error that ends the command with a given exit code; `message` goes to stderr. */
export class CliError extends Error {
  constructor(
    readonly exitCode: ExitCode,
    message: string,
    /** A problem+json body to print with --json (service errors). */
    readonly body?: unknown,
  ) {
    super(message);
  }
}

export const usageError = (message: string): CliError => new CliError(EXIT.usage, message);
