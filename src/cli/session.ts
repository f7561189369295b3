/**
 * One command's conversation with the service: picks the transport (in-process
 * or --server), sends JSON or text, turns a problem answer into a CliError
 * (exit 1 when the service says the request cannot be met, 3 otherwise) and
 * prints answers as JSON (--json) or as a readable view.
 */
import type { Readable, Writable } from 'node:stream';
import { CliError, EXIT } from './exit-codes.ts';
import { inProcessTransport } from './in-process.ts';
import { remoteTransport, type Transport } from './transport.ts';

export interface CliIo {
  stdin: Readable;
  stdout: Writable;
  stderr: Writable & { isTTY?: boolean };
  env: NodeJS.ProcessEnv;
}

export interface GlobalOptions {
  server?: string;
  apiKey?: string;
  json?: boolean;
}

/** Problem codes that mean "the circuit or the spec cannot work", not "the call went wrong" (exit 1). */
const SPEC_FAILURE_CODES = new Set(['infeasible', 'no-oscillation']);

export interface RequestOptions {
  json?: unknown;
  text?: string;
  contentType?: string;
  accept?: string;
  headers?: Record<string, string | undefined>;
  query?: Record<string, string | undefined>;
}

export class Session {
  private transport: Transport | undefined;
  readonly json: boolean;

  constructor(
    readonly io: CliIo,
    private readonly globals: GlobalOptions,
  ) {
    this.json = globals.json === true;
  }

  private async open(): Promise<Transport> {
    if (!this.transport) {
      const server = this.globals.server ?? (this.io.env.TICKWRIGHT_SERVER || undefined);
      const apiKey = this.globals.apiKey ?? (this.io.env.TICKWRIGHT_API_KEY || undefined);
      this.transport = server ? remoteTransport(server, apiKey) : await inProcessTransport(this.io.env);
    }
    return this.transport;
  }

  async close(): Promise<void> {
    await this.transport?.close();
  }

  /** Sends the request; a 4xx/5xx answer becomes a CliError carrying the problem body. */
  async request(method: string, path: string, options: RequestOptions = {}): Promise<Response> {
    const transport = await this.open();
    const headers: Record<string, string> = { accept: options.accept ?? 'application/json' };
    for (const [k, v] of Object.entries(options.headers ?? {})) if (v !== undefined) headers[k] = v;
    let body: string | undefined;
    if (options.json !== undefined) {
      body = JSON.stringify(options.json);
      headers['content-type'] = 'application/json';
    } else if (options.text !== undefined) {
      body = options.text;
      headers['content-type'] = options.contentType ?? 'text/plain';
    }
    const query = Object.entries(options.query ?? {}).filter((e): e is [string, string] => e[1] !== undefined);
    const url = query.length > 0 ? `${path}?${new URLSearchParams(query).toString()}` : path;
    const res = await transport.fetch(url, { method, headers, ...(body !== undefined ? { body } : {}) });
    if (res.status >= 400) throw await problemError(res, transport.target);
    return res;
  }

  /** Sends and parses a JSON answer. */
  async call<T>(method: string, path: string, options: RequestOptions = {}): Promise<{ body: T; response: Response }> {
    const response = await this.request(method, path, options);
    const text = await response.text();
    return { body: (text === '' ? undefined : JSON.parse(text)) as T, response };
  }

  /** Prints an answer: JSON with --json, else the view. */
  print<T>(body: T, view: (body: T) => string): void {
    this.io.stdout.write(this.json ? JSON.stringify(body, null, 2) + '\n' : view(body) + '\n');
  }

  note(message: string): void {
    this.io.stderr.write(message + '\n');
  }
}

interface ProblemBody {
  status?: number;
  title?: string;
  detail?: string;
  code?: string;
  errors?: { pointer: string; detail: string }[];
}

async function problemError(res: Response, target: string): Promise<CliError> {
  const text = await res.text();
  let problem: ProblemBody | undefined;
  try {
    problem = JSON.parse(text) as ProblemBody;
  } catch {
    problem = undefined;
  }
  const lines = [`${target}: ${res.status} ${problem?.title ?? res.statusText}${problem?.detail ? ` — ${problem.detail}` : ''}`];
  for (const e of problem?.errors ?? []) lines.push(`  ${e.pointer || '/'}: ${e.detail}`);
  if (res.status === 428) lines.push('  (send the current ETag with --if-match; `get` shows it)');
  const code = res.status === 422 && problem?.code && SPEC_FAILURE_CODES.has(problem.code) ? EXIT.failed : EXIT.service;
  return new CliError(code, lines.join('\n'), problem ?? text);
}
