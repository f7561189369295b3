/**
 * The `tickwright` command line: argument parsing (commander) -> one HTTP
 * request -> a readable view or JSON. No physics here: every figure is the
 * service's answer, in-process or from a deployment (--server).
 */
import { Command, CommanderError, Option } from 'commander';
import cliProgress from 'cli-progress';
import { bomFormat, bomRequest } from './bom-input.ts';
import { CliError, EXIT, usageError, type ExitCode } from './exit-codes.ts';
import { looksLikeJson, parseJson, readJson, readSource } from './input.ts';
import { Session, type CliIo, type GlobalOptions } from './session.ts';
import {
  amplifierListView,
  analysisView,
  bomView,
  catalogueListView,
  catalogueView,
  designView,
  fitView,
  recordView,
  snapView,
  toleranceView,
  type AnalysisView,
  type BomResultView,
  type CatalogueView,
  type DesignView,
  type FitView,
  type SnapView,
  type ToleranceView,
} from './views.ts';

function positiveNumber(name: string) {
  return (raw: string): number => {
    const n = Number(raw);
    if (!Number.isFinite(n) || n <= 0) throw usageError(`${name} must be a positive number, got '${raw}'`);
    return n;
  };
}

function integer(name: string) {
  return (raw: string): number => {
    const n = Number(raw);
    if (!Number.isInteger(n) || n < 0) throw usageError(`${name} must be a non-negative integer, got '${raw}'`);
    return n;
  };
}

export function buildProgram(io: CliIo, setExit: (code: ExitCode) => void): Command {
  const program = new Command('tickwright');
  program
    .description(
      'Size, check and diagnose RC relaxation oscillators from scripts. Runs the service in this process, or calls a deployment with --server.\n' +
        'Exit codes: 0 ok, 1 a check or spec failed, 2 usage, 3 service error.',
    )
    .option('--server <url>', 'call a deployment at this URL (env TICKWRIGHT_SERVER); default: in-process, same store settings as the server')
    .option('--api-key <key>', 'API key for --server (env TICKWRIGHT_API_KEY)')
    .option('--json', 'machine output: the service answer as JSON (bom: NDJSON, one result per line)')
    .exitOverride()
    .configureOutput({ writeOut: (s) => io.stdout.write(s), writeErr: (s) => io.stderr.write(s) })
    .showHelpAfterError('(tickwright --help for usage)')
    .allowExcessArguments(false);

  /** Wraps an action: a session for the command, closed afterwards; CliErrors end with their exit code. */
  const run =
    <A extends unknown[]>(action: (session: Session, ...args: A) => Promise<ExitCode>) =>
    async (...args: unknown[]): Promise<void> => {
      const command = args[args.length - 1] as Command;
      const session = new Session(io, command.optsWithGlobals<GlobalOptions>());
      try {
        setExit(await action(session, ...(args.slice(0, -1) as A)));
      } finally {
        await session.close();
      }
    };

  program
    .command('analyze')
    .description('analyse a circuit (a Circuit JSON: topology, supply, amplifier, parts); exit 1 when a check has severity error')
    .argument('<file>', 'circuit JSON file, or - for standard input')
    .action(
      run(async (s, file: string) => {
        const { body } = await s.call<AnalysisView>('POST', '/v1/analyze', { json: await readJson(file, io.stdin) });
        s.print(body, analysisView);
        return body.checks.some((c) => c.severity === 'error') ? EXIT.failed : EXIT.ok;
      }),
    );

  program
    .command('design')
    .description('design circuits from a target (a DesignRequest JSON); exit 1 when nothing meets it')
    .argument('<file>', 'request JSON file, or -')
    .action(
      run(async (s, file: string) => {
        const { body } = await s.call<DesignView>('POST', '/v1/design', { json: await readJson(file, io.stdin) });
        s.print(body, designView);
        return body.designs.length === 0 ? EXIT.failed : EXIT.ok;
      }),
    );

  program
    .command('snap')
    .description('round values to a series or catalogue, or search a joint combination (a SnapRequest JSON)')
    .argument('<file>', 'request JSON file, or -')
    .action(
      run(async (s, file: string) => {
        const { body } = await s.call<SnapView>('POST', '/v1/snap', { json: await readJson(file, io.stdin) });
        s.print(body, snapView);
        return EXIT.ok;
      }),
    );

  program
    .command('tolerance')
    .description('worst case, Monte Carlo and sensitivities (a ToleranceRequest JSON); exit 1 when the spec fails')
    .argument('<file>', 'request JSON file, or -')
    .option('--min-yield <fraction>', 'judge by Monte Carlo yield instead of the worst case: exit 1 below this fraction', positiveNumber('--min-yield'))
    .action(
      run(async (s, file: string, options: { minYield?: number }) => {
        const { body } = await s.call<ToleranceView>('POST', '/v1/tolerance', { json: await readJson(file, io.stdin) });
        s.print(body, toleranceView);
        if (options.minYield !== undefined) {
          const y = body.monteCarlo?.yield;
          if (y === null || y === undefined) throw usageError('--min-yield needs a request with monteCarlo and spec');
          return y < options.minYield ? EXIT.failed : EXIT.ok;
        }
        return body.worstCase.withinSpec === false ? EXIT.failed : EXIT.ok;
      }),
    );

  program
    .command('fit')
    .description('fit a scope capture (CSV export) or a FitRequest JSON to the circuit; exit 1 when the board departs from nominal')
    .argument('<capture>', 'scope CSV file (with --circuit) or FitRequest JSON, or -')
    .option('--circuit <file>', 'circuit JSON (required with a CSV capture)')
    .option('--tolerances <file>', 'part tolerances JSON, e.g. {"cTiming": 0.1}')
    .option('--measurements <file>', 'scalar measurements JSON to fit beside the capture')
    .option('--output-channel <name>', 'CSV column of the output')
    .option('--capacitor-channel <name>', 'CSV column of the capacitor voltage')
    .option('--sample-interval <seconds>', 'sample interval when the CSV has no time column', positiveNumber('--sample-interval'))
    .option('--max-causes <n>', 'largest number of causes in one explanation', integer('--max-causes'))
    .action(
      run(
        async (
          s,
          file: string,
          o: { circuit?: string; tolerances?: string; measurements?: string; outputChannel?: string; capacitorChannel?: string; sampleInterval?: number; maxCauses?: number },
        ) => {
          const text = await readSource(file, io.stdin);
          let answer: { body: FitView };
          if (looksLikeJson(text)) {
            answer = await s.call<FitView>('POST', '/v1/fit', { json: parseJson(text, file) });
          } else {
            if (!o.circuit) throw usageError('a CSV capture needs --circuit <file.json>');
            const asQuery = async (f: string | undefined) => (f === undefined ? undefined : JSON.stringify(await readJson(f, io.stdin)));
            answer = await s.call<FitView>('POST', '/v1/fit', {
              text,
              contentType: 'text/csv',
              query: {
                circuit: await asQuery(o.circuit),
                tolerances: await asQuery(o.tolerances),
                measurements: await asQuery(o.measurements),
                outputChannel: o.outputChannel,
                capacitorChannel: o.capacitorChannel,
                sampleIntervalS: o.sampleInterval?.toString(),
                maxCauses: o.maxCauses?.toString(),
              },
            });
          }
          s.print(answer.body, fitView);
          return answer.body.verdict.agreesWithNominal ? EXIT.ok : EXIT.failed;
        },
      ),
    );

  program
    .command('bom')
    .description('check BOM assemblies (CSV with --assembly, or JSON); results as they finish, NDJSON with --json; exit 1 when any fails')
    .argument('<file>', 'BOM CSV or JSON file, or -')
    .option('--assembly <file>', 'JSON shared by the CSV assemblies: roles, topology, amplifier, supply, spec (series, catalogue ...)')
    .option('--id <id>', 'assembly id for a CSV without an assembly column (default: the file name)')
    .addOption(new Option('--format <format>', 'input format (default: from the extension or content)').choices(['csv', 'json']))
    .addOption(new Option('--mode <mode>', 'full (with Monte Carlo yield) or worst-case').choices(['full', 'worst-case']))
    .addOption(new Option('--fail-on <severity>', 'lowest rule severity that fails an assembly').choices(['error', 'warning']))
    .option('--samples <n>', 'Monte Carlo samples per assembly', integer('--samples'))
    .option('--seed <n>', 'Monte Carlo seed', integer('--seed'))
    .addOption(new Option('--progress <when>', 'progress bar on stderr').choices(['auto', 'always', 'never']).default('auto'))
    .action(
      run(
        async (
          s,
          file: string,
          o: { assembly?: string; id?: string; format?: string; mode?: string; failOn?: string; samples?: number; seed?: number; progress: string },
        ) => {
          const text = await readSource(file, io.stdin);
          const format = bomFormat(text, file, o.format);
          const template = o.assembly === undefined ? undefined : await readJson(o.assembly, io.stdin);
          const options: Record<string, unknown> = {};
          if (o.mode) options.mode = o.mode;
          if (o.failOn) options.failOn = o.failOn;
          if (o.samples !== undefined) options.monteCarloSamples = o.samples;
          if (o.seed !== undefined) options.seed = o.seed;
          const request = bomRequest(text, file, format, template, o.id, options);
          const total = (request.assemblies as unknown[]).length;
          const show = o.progress === 'always' || (o.progress === 'auto' && io.stderr.isTTY === true);
          const bar = new cliProgress.SingleBar(
            {
              stream: io.stderr as NodeJS.WriteStream,
              format: 'checking [{bar}] {value}/{total} assemblies, {failed} failed',
              noTTYOutput: o.progress === 'always',
              notTTYSchedule: 250,
              hideCursor: false,
            },
            cliProgress.Presets.legacy,
          );
          const results: BomResultView[] = [];
          let failed = 0;
          const res = await s.request('POST', '/v1/bom-checks', { json: request, accept: 'application/x-ndjson' });
          // Started once the service has answered, so the bar measures checking, not start-up.
          if (show) bar.start(total, 0, { failed });
          try {
            for await (const line of ndjsonLines(res)) {
              const result = JSON.parse(line) as BomResultView;
              results.push(result);
              if (!result.pass) failed++;
              if (s.json) io.stdout.write(line + '\n');
              if (show) bar.increment(1, { failed });
            }
          } finally {
            if (show) bar.stop();
          }
          if (!s.json) io.stdout.write(bomView(results) + '\n');
          return failed > 0 ? EXIT.failed : EXIT.ok;
        },
      ),
    );

  resourceCommands(program, io, run, {
    name: 'amplifiers',
    path: '/v1/amplifiers',
    what: 'amplifier',
    whats: 'amplifiers (built-in archetypes and registered ones)',
    list: (b) => amplifierListView(b as Parameters<typeof amplifierListView>[0]),
    one: (b) => recordView(b as Record<string, unknown>),
  });
  resourceCommands(program, io, run, {
    name: 'catalogues',
    path: '/v1/catalogues',
    what: 'parts catalogue',
    whats: 'parts catalogues',
    list: (b) => catalogueListView(b as Parameters<typeof catalogueListView>[0]),
    one: (b) => catalogueView(b as CatalogueView),
  });
  return program;
}

interface ResourceSpec {
  name: string;
  path: string;
  what: string;
  whats: string;
  list: (body: unknown) => string;
  one: (body: unknown) => string;
}

/** list / get / put / delete for a stored collection; writes carry If-Match (RFC 9110 §13.1.1). */
function resourceCommands(program: Command, io: CliIo, run: <A extends unknown[]>(a: (s: Session, ...args: A) => Promise<ExitCode>) => (...args: unknown[]) => Promise<void>, spec: ResourceSpec): void {
  const group = program.command(spec.name).description(`list, show, store or delete ${spec.whats}`);
  const one = (id: string) => `${spec.path}/${encodeURIComponent(id)}`;
  group
    .command('list')
    .description(`list ${spec.whats}`)
    .action(
      run(async (s) => {
        const { body } = await s.call<unknown>('GET', spec.path);
        s.print(body, spec.list);
        return EXIT.ok;
      }),
    );
  group
    .command('get')
    .description(`show one ${spec.what} (with its ETag)`)
    .argument('<id>')
    .action(
      run(async (s, id: string) => {
        const { body, response } = await s.call<unknown>('GET', one(id));
        s.print(body, spec.one);
        const etag = response.headers.get('etag');
        if (etag && !s.json) s.note(`ETag: ${etag}`);
        return EXIT.ok;
      }),
    );
  group
    .command('put')
    .description(`create or replace one ${spec.what} from a JSON file; replacing needs --if-match`)
    .argument('<id>')
    .argument('<file>', 'JSON file, or -')
    .option('--if-match <etag>', 'the current ETag (from get or the last put)')
    .option('--create-only', 'fail with 412 when it already exists (If-None-Match: *)')
    .action(
      run(async (s, id: string, file: string, o: { ifMatch?: string; createOnly?: boolean }) => {
        const { body, response } = await s.call<unknown>('PUT', one(id), {
          json: await readJson(file, io.stdin),
          headers: { 'if-match': o.ifMatch, 'if-none-match': o.createOnly ? '*' : undefined },
        });
        s.print(body, spec.one);
        if (!s.json) s.note(`${response.status === 201 ? 'created' : 'replaced'} ${id}; ETag: ${response.headers.get('etag') ?? '—'}`);
        return EXIT.ok;
      }),
    );
  group
    .command('delete')
    .description(`delete one ${spec.what}; needs --if-match`)
    .argument('<id>')
    .option('--if-match <etag>', 'the current ETag')
    .action(
      run(async (s, id: string, o: { ifMatch?: string }) => {
        await s.request('DELETE', one(id), { headers: { 'if-match': o.ifMatch } });
        if (s.json) io.stdout.write(JSON.stringify({ deleted: id }) + '\n');
        else s.note(`deleted ${id}`);
        return EXIT.ok;
      }),
    );
}

async function* ndjsonLines(res: Response): AsyncGenerator<string> {
  if (!res.body) return;
  const decoder = new TextDecoder();
  let pending = '';
  for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) {
    pending += decoder.decode(chunk, { stream: true });
    let nl: number;
    while ((nl = pending.indexOf('\n')) >= 0) {
      const line = pending.slice(0, nl).trim();
      pending = pending.slice(nl + 1);
      if (line !== '') yield line;
    }
  }
  pending += decoder.decode();
  if (pending.trim() !== '') yield pending.trim();
}

/** Runs the command line; resolves to the exit code (never calls process.exit). */
export async function runCli(argv: string[], io: CliIo): Promise<ExitCode> {
  let exit: ExitCode = EXIT.ok;
  const program = buildProgram(io, (code) => {
    exit = code;
  });
  try {
    await program.parseAsync(argv, { from: 'user' });
    return exit;
  } catch (err) {
    if (err instanceof CommanderError) {
      // Help and version end with 0; every other parse error is a usage error.
      return err.exitCode === 0 ? EXIT.ok : EXIT.usage;
    }
    if (err instanceof CliError) {
      if (err.exitCode !== EXIT.usage && program.opts<GlobalOptions>().json && err.body !== undefined) io.stdout.write(JSON.stringify(err.body, null, 2) + '\n');
      io.stderr.write(`tickwright: ${err.message}\n`);
      return err.exitCode;
    }
    io.stderr.write(`tickwright: ${(err as Error).stack ?? String(err)}\n`);
    return EXIT.service;
  }
}
