/**
 * POST /v1/bom-checks: up to 5000 assemblies per request, one verdict each.
 *
 * application/json (default): { results, summary }, written as the results come.
 * application/x-ndjson (Accept): one BomCheckResult per line, written as each
 * assembly finishes. The stream is pulled by the socket (Readable.from), so a
 * slow client holds back the work instead of piling up results: memory stays
 * at one slice of results, not the batch. Either way the work is done in time
 * slices with setImmediate between them, so one large batch cannot stall other
 * requests on the event loop.
 */
import { Readable } from 'node:stream';
import { setImmediate as nextTurn } from 'node:timers/promises';
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import {
  canonicalTopologyId,
  CoreError,
  DEFAULT_BOM_OPTIONS,
  evaluateAssemblies,
  tallyBomResult,
  type BomAssembly,
  type BomAssemblyResult,
  type BomBatchSummary,
  type BomCheckContext,
} from '../../core/index.ts';
import type { Catalogue, SeriesName } from '../../core/parts/index.ts';
import { catalogueLookupFor, type CatalogueLookup } from '../catalogue-source.ts';
import { inlineAmplifierFromBody, straysFromBody } from '../convert.ts';
import { BomCheckRequest, BomCheckResponse, BomCheckResult, type BomAssemblyBody } from '../schemas/bom.ts';
import { problemResponses, ref } from '../schemas/common.ts';
import { ANALYSIS_DEADLINE_SHARE } from '../workers/pool.ts';

export const NDJSON_MEDIA_TYPE = 'application/x-ndjson';

/** Longest stretch of checking between two turns of the event loop, ms (our own figure). */
const SLICE_BUDGET_MS = 10;
/** Most results held before they are handed to the socket. */
const SLICE_MAX_RESULTS = 64;

// ---------------------------------------------------------------- body -> core

/** Series names are case-insensitive on the wire; an unknown name is left for the assembly's rules to report. */
function seriesFromBody(series: BomAssemblyBody['series']): BomAssembly['series'] {
  if (series === undefined) return undefined;
  if (typeof series === 'string') return series.toUpperCase() as SeriesName;
  const out: Record<string, SeriesName> = {};
  for (const [role, name] of Object.entries(series)) out[role] = name.toUpperCase() as SeriesName;
  return out;
}

export function bomAssemblyFromBody(body: BomAssemblyBody): BomAssembly {
  const assembly: BomAssembly = {
    id: body.id,
    lines: body.lines.map((l) => ({ ...l, value: l.value ?? '' })),
    roles: body.roles,
    topology: canonicalTopologyId(body.topology),
    amplifier: typeof body.amplifier === 'string' ? body.amplifier : inlineAmplifierFromBody(body.amplifier as Record<string, unknown>),
    supply: { positiveV: body.supply.positiveV, negativeV: body.supply.negativeV ?? 0, tolerance: body.supply.tolerance ?? 0 },
    spec: body.spec,
  };
  if (body.temperature) assembly.temperature = body.temperature;
  if (body.serviceLifeYears !== undefined) assembly.serviceLifeYears = body.serviceLifeYears;
  if (body.catalogue !== undefined) assembly.catalogue = body.catalogue;
  const series = seriesFromBody(body.series);
  if (series !== undefined) assembly.series = series;
  if (body.assumedTolerance) assembly.assumedTolerance = body.assumedTolerance;
  if (body.strays) assembly.strays = straysFromBody(body.strays);
  return assembly;
}

// ---------------------------------------------------------------- streaming

function wantsNdjson(accept: string | undefined): boolean {
  return typeof accept === 'string' && accept.toLowerCase().includes(NDJSON_MEDIA_TYPE);
}

/** Catalogue lookups for one request: each id was read from the store once up front, failures included. */
function catalogueLookup(read: CatalogueLookup): (id: string) => Catalogue {
  const cache = new Map<string, Catalogue | CoreError>();
  return (id) => {
    let entry = cache.get(id);
    if (entry === undefined) {
      try {
        entry = read(id, '/catalogue');
      } catch (error) {
        entry =
          error instanceof CoreError
            ? error
            : new CoreError('unknown-reference', `Catalogue '${id}' could not be read: ${error instanceof Error ? error.message : String(error)}`, '/catalogue');
      }
      cache.set(id, entry);
    }
    if (entry instanceof CoreError) throw entry;
    return entry;
  };
}

/** Results in request order, handed out in slices between turns of the event loop. */
async function* slices(results: Iterator<BomAssemblyResult>): AsyncGenerator<BomAssemblyResult[]> {
  for (;;) {
    const slice: BomAssemblyResult[] = [];
    const started = performance.now();
    let next = results.next();
    while (!next.done) {
      slice.push(next.value);
      if (slice.length >= SLICE_MAX_RESULTS || performance.now() - started >= SLICE_BUDGET_MS) break;
      next = results.next();
    }
    if (slice.length > 0) yield slice;
    if (next.done) return;
    await nextTurn();
  }
}

async function* ndjsonChunks(results: Iterator<BomAssemblyResult>): AsyncGenerator<string> {
  for await (const slice of slices(results)) {
    let chunk = '';
    for (const r of slice) chunk += JSON.stringify(r) + '\n';
    yield chunk;
  }
}

/**
 * Takes the first result before anything is sent: a request-level error (as opposed to a failed assembly,
 * which is a result) then becomes a problem answer instead of a cut-off 200 stream.
 */
function startEagerly(results: Iterator<BomAssemblyResult>): Iterator<BomAssemblyResult> {
  let head: IteratorResult<BomAssemblyResult> | undefined = results.next();
  return {
    next() {
      if (head === undefined) return results.next();
      const first = head;
      head = undefined;
      return first;
    },
  };
}

/** `{"results":[…],"summary":{…}}` written slice by slice, the summary tallied on the way. */
async function* jsonDocumentChunks(results: Iterator<BomAssemblyResult>): AsyncGenerator<string> {
  const summary: BomBatchSummary = { assemblies: 0, passed: 0, failed: 0 };
  let first = true;
  yield '{"results":[';
  for await (const slice of slices(results)) {
    let chunk = '';
    for (const r of slice) {
      tallyBomResult(summary, r);
      chunk += (first ? '' : ',') + JSON.stringify(r);
      first = false;
    }
    yield chunk;
  }
  yield `],"summary":${JSON.stringify(summary)}}`;
}

export const bomCheckRoutes: FastifyPluginAsyncTypebox = async (app) => {
  app.post(
    '/v1/bom-checks',
    {
      schema: {
        tags: ['bom'],
        summary: 'Check BOM assemblies against their timing spec',
        description:
          'For each assembly: reads the BOM value text of the parts the role map names, checks values against the declared series or catalogue, part status, dielectric, electrolytics, voltage rating, the analysis checks (output drive, common-mode range, supply range, SELV) and the worst-case frequency, duty and Monte Carlo yield against the spec. ' +
          'A bad assembly gets a failed result explaining why; it never fails the batch. With Accept: application/x-ndjson the results stream one JSON object per line, in request order, as they finish.',
        body: ref(BomCheckRequest),
        response: {
          200: {
            description: 'One result per assembly: a JSON document, or NDJSON (one BomCheckResult per line) on request',
            content: {
              'application/json': { schema: ref(BomCheckResponse) },
              [NDJSON_MEDIA_TYPE]: { schema: ref(BomCheckResult) },
            },
          },
          ...problemResponses(400, 401, 403, 413, 415, 422),
        },
      },
    },
    async (request, reply) => {
      const body = request.body;
      const [amplifiers, catalogues] = await Promise.all([
        app.services.amplifiers.forSpecs(...body.assemblies.map((a) => a.amplifier)),
        catalogueLookupFor(app.services, body.assemblies.map((a) => a.catalogue)),
      ]);
      const ctx: BomCheckContext = {
        lookupAmplifier: amplifiers.lookup,
        lookupCatalogue: catalogueLookup(catalogues),
        // One assembly's analysis gets the share of the task deadline a /v1/tolerance run gets.
        options: { ...DEFAULT_BOM_OPTIONS, ...body.options, monteCarloBudgetMs: app.services.workers.deadlineMs * ANALYSIS_DEADLINE_SHARE },
        spreadCache: new Map(),
      };
      const assemblies = body.assemblies.map(bomAssemblyFromBody);
      const results = startEagerly(evaluateAssemblies(assemblies, ctx));
      if (wantsNdjson(request.headers.accept)) {
        reply.type(NDJSON_MEDIA_TYPE);
        // The typed reply knows the JSON shapes only; fastify sends a stream as is, without serialising.
        const stream = Readable.from(ndjsonChunks(results), { objectMode: false });
        return reply.send(stream as unknown as BomAssemblyResult);
      }
      // The JSON document is streamed too: serialising 5,000 results in one go (tens of MB) would hold the
      // event loop for seconds; slice by slice it never holds it longer than one slice.
      reply.type('application/json');
      const stream = Readable.from(jsonDocumentChunks(results), { objectMode: false });
      return reply.send(stream as unknown as BomAssemblyResult);
    },
  );
};
