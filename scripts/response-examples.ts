/**
 * The service's own answers (status 200) to the request examples in src/http/schemas/examples.ts, plus the
 * read routes after those writes, as the text of src/http/schemas/examples.generated.ts.
 * `npm run examples:write` (scripts/examples.ts) writes it; test/contract/examples-current.test.ts renders it
 * again and compares, so an answer that changed without regenerating the contract examples fails a test.
 */
import { buildApp } from '../src/http/app.ts';
import { AMPLIFIER_EXAMPLE_ID, CATALOGUE_EXAMPLE_ID, REQUEST_EXAMPLES, type ExampleTable } from '../src/http/schemas/examples.ts';
import { openSqliteStore } from '../src/store/index.ts';

export const RESPONSE_EXAMPLES_PATH = 'src/http/schemas/examples.generated.ts';

/** Monte Carlo rate the examples show (the measured one depends on the machine and its load). */
const NOMINAL_SAMPLES_PER_S = 1e6;

/**
 * What changes from run to run is pinned, so regenerating leaves the contract alone unless an answer
 * really changed: store timestamps and ETags, Monte Carlo timing, and the metrics text (abridged to its
 * help lines and the service's own counters; latency histograms and process figures vary).
 */
function steady(value: unknown, key = ''): unknown {
  if (Array.isArray(value)) return value.map((v) => steady(v));
  if (value !== null && typeof value === 'object') {
    const o = value as Record<string, unknown>;
    // Monte Carlo timing depends on the machine and its load (rounding it to a power of ten still flipped
    // between runs): the example shows a nominal rate, consistent with its sample count.
    if (typeof o.samples === 'number' && typeof o.elapsedS === 'number' && typeof o.samplesPerSecond === 'number') {
      return Object.fromEntries(
        Object.entries({ ...o, elapsedS: o.samples / NOMINAL_SAMPLES_PER_S, samplesPerSecond: NOMINAL_SAMPLES_PER_S }).map(([k, v]) => [k, steady(v, k)]),
      );
    }
    return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, steady(v, k)]));
  }
  if (key === 'createdAt' || key === 'updatedAt') return '2026-01-05T09:30:00.000Z';
  if (key === 'etag' && typeof value === 'string') return value.replace(/-[^"]*"$/, '-5f0c3a9e2b7d4e61"');
  return value;
}

function steadyMetrics(text: string): string {
  return text
    .split('\n')
    // Process and runtime figures (CPU seconds, active handles) vary from run to run even when named *_total.
    .filter((line) => line.startsWith('#') || (/^\w+_total[{ ]/.test(line) && !/^[a-z]+_(process|nodejs)_/.test(line)))
    .join('\n');
}

export async function renderResponseExamples(): Promise<{ text: string; operations: number }> {
  const app = await buildApp({ store: openSqliteStore(':memory:'), config: { apiKeys: undefined, maxEventLoopDelayMs: 0 } });
  await app.ready();
  const responses: ExampleTable = {};

  async function answer(method: 'GET' | 'POST' | 'PUT', url: string, route: string, payload?: unknown, headers: Record<string, string> = {}) {
    const res = await app.inject({ method, url, headers, ...(payload === undefined ? {} : { payload: payload as object }) });
    if (res.statusCode >= 300) throw new Error(`${method} ${url} answered ${res.statusCode}: ${res.body.slice(0, 500)}`);
    const isJson = String(res.headers['content-type']).includes('json');
    return { status: res.statusCode, etag: res.headers.etag as string | undefined, value: isJson ? (res.json() as unknown) : res.body, route };
  }

  function record(key: string, name: string, summary: string, value: unknown): void {
    (responses[key] ??= {})[name] = { summary, value: typeof value === 'string' && key === 'GET /metrics' ? steadyMetrics(value) : steady(value) };
  }

  try {
    // Writes first (create, then replace with If-Match: the replacement is the 200), so the reads show them.
    for (const [key, id] of [
      ['PUT /v1/catalogues/{id}', CATALOGUE_EXAMPLE_ID],
      ['PUT /v1/amplifiers/{id}', AMPLIFIER_EXAMPLE_ID],
    ] as const) {
      for (const [name, example] of Object.entries(REQUEST_EXAMPLES[key])) {
        const url = key.split(' ')[1].replace('{id}', id);
        const created = await answer('PUT', url, key, example.value);
        const replaced = await answer('PUT', url, key, example.value, { 'if-match': created.etag! });
        record(key, name, `Replacing ${id} with If-Match (version 2); creating it answers 201 with the same shape`, replaced.value);
      }
    }
    for (const [key, examples] of Object.entries(REQUEST_EXAMPLES)) {
      const [method, path] = key.split(' ');
      if (method !== 'POST') continue;
      for (const [name, example] of Object.entries(examples)) {
        const res = await answer('POST', path, key, example.value, { accept: 'application/json' });
        record(key, name, `The answer to the ${name} request example`, res.value);
      }
    }
    const reads: [string, string, string][] = [
      ['/healthz', '/healthz', 'Alive'],
      ['/readyz', '/readyz', 'Ready: the store answers'],
      ['/metrics', '/metrics', 'Prometheus text exposition after the examples above ran (abridged: help lines and counters)'],
      ['/problems/{code}', '/problems/invalid-value', 'What the invalid-value problem type means'],
      ['/v1/topologies', '/v1/topologies', 'The topologies and the roles each needs'],
      ['/v1/amplifiers', '/v1/amplifiers', 'Built-in archetypes and the registered example amplifier'],
      ['/v1/amplifiers/{id}', `/v1/amplifiers/${AMPLIFIER_EXAMPLE_ID}`, 'The registered example amplifier'],
      ['/v1/series', '/v1/series', 'The IEC 60063 series'],
      ['/v1/series/{name}', '/v1/series/E6', 'E6 over the default decades'],
      ['/v1/catalogues', '/v1/catalogues', 'The example catalogue, summarised'],
      ['/v1/catalogues/{id}', `/v1/catalogues/${CATALOGUE_EXAMPLE_ID}`, 'The example catalogue'],
    ];
    for (const [path, url, summary] of reads) {
      const res = await answer('GET', url, path);
      record(`GET ${path}`, 'example', summary, res.value);
    }
  } finally {
    await app.close();
  }
  const text =
    '// Generated by `npm run examples:write` (scripts/examples.ts) from the service\'s own answers: do not edit.\n' +
    `export const RESPONSE_EXAMPLES: Record<string, Record<string, { summary: string; value: unknown }>> = ${JSON.stringify(responses, null, 2)};\n`;
  return { text, operations: Object.keys(responses).length };
}
