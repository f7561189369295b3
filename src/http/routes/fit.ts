/**
 * POST /v1/fit: nominal circuit + measurements (scalar figures and/or a scope
 * capture) -> fitted effective parameters with uncertainties and ranked
 * explanations.
 *
 * Two ways to send a capture:
 *  - application/json: the FitRequest body; the capture as arrays or as CSV
 *    text in capture.csv;
 *  - text/csv: the scope's export as the body, the circuit (and optionally
 *    tolerances, measurements, channel names) as URL-encoded JSON in the query.
 * The text/csv parser is added inside this plugin, so other routes keep
 * answering 415 to it. Both share the app's body limit. The work itself runs
 * in the worker pool.
 */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import type { FastifyRequest } from 'fastify';
import type { Static } from 'typebox';
import type { CaptureSpec, FitInput, FitReport } from '../../core/fit/index.ts';
import { circuitFromBody, withPointerPrefix } from '../convert.ts';
import { HttpProblem, validationToPointer } from '../problem.ts';
import { sampleArraysOf } from '../streaming-json.ts';
import { runForRequest } from '../workers/run-for-request.ts';
import { FitCsvQuery, FitRequest, FitResult, type FitCsvQueryString, type FitRequestBody } from '../schemas/fit.ts';
import { problemResponses, ref } from '../schemas/common.ts';
import type { CircuitBody } from '../schemas/circuit.ts';

/** Only text/csv is CSV (RFC 7111); any other text is not read as a capture. */
const CSV_TYPES = ['text/csv'];

function toSamples(xs: readonly (number | null)[] | undefined): Float64Array | undefined {
  if (xs === undefined) return undefined;
  const out = new Float64Array(xs.length);
  for (let i = 0; i < xs.length; i++) out[i] = xs[i] ?? Number.NaN; // null: a missing sample, rejected by the capture analysis
  return out;
}

/** Sample arrays of the JSON body; a large body's were read straight into Float64Arrays (streaming-json.ts). */
const SAMPLE_ARRAYS = ['/capture/output', '/capture/capacitor', '/capture/timeS'];

function captureSpec(c: NonNullable<FitRequestBody['capture']>, streamed: ReadonlyMap<string, Float64Array> | undefined): CaptureSpec {
  const spec: CaptureSpec = {};
  const output = streamed?.get('/capture/output') ?? toSamples(c.output);
  const capacitor = streamed?.get('/capture/capacitor') ?? toSamples(c.capacitor);
  const timeS = streamed?.get('/capture/timeS') ?? toSamples(c.timeS);
  if (output) spec.output = output;
  if (capacitor) spec.capacitor = capacitor;
  if (timeS) spec.timeS = timeS;
  if (c.sampleIntervalS !== undefined) spec.sampleIntervalS = c.sampleIntervalS;
  if (c.csv !== undefined) spec.csv = c.csv;
  if (c.outputChannel !== undefined) spec.outputChannel = c.outputChannel;
  if (c.capacitorChannel !== undefined) spec.capacitorChannel = c.capacitorChannel;
  if (c.verticalUncertainty !== undefined) spec.verticalUncertainty = c.verticalUncertainty;
  if (c.timebaseUncertainty !== undefined) spec.timebaseUncertainty = c.timebaseUncertainty;
  return spec;
}

/** Query JSON -> the JSON-body shape, validated by the same FitRequest schema. */
function bodyFromCsvRequest(request: FastifyRequest, csv: string, query: FitCsvQueryString): FitRequestBody {
  if (query.circuit === undefined) {
    throw new HttpProblem(400, 'validation', 'A text/csv body needs the circuit as URL-encoded JSON in ?circuit=', [
      { pointer: '/circuit', in: 'query', detail: 'is required with a text/csv body' },
    ]);
  }
  const json = (name: 'circuit' | 'tolerances' | 'measurements'): unknown => {
    const raw = query[name];
    if (raw === undefined) return undefined;
    try {
      return JSON.parse(raw);
    } catch (err) {
      throw new HttpProblem(400, 'validation', `?${name} is not valid JSON: ${(err as Error).message}`, [{ pointer: `/${name}`, in: 'query', detail: 'is not valid JSON' }]);
    }
  };
  const capture: Record<string, unknown> = { csv };
  if (query.outputChannel !== undefined) capture.outputChannel = query.outputChannel;
  if (query.capacitorChannel !== undefined) capture.capacitorChannel = query.capacitorChannel;
  if (query.sampleIntervalS !== undefined) capture.sampleIntervalS = Number(query.sampleIntervalS);
  const body: Record<string, unknown> = { circuit: json('circuit'), capture };
  const tolerances = json('tolerances');
  const measurements = json('measurements');
  if (tolerances !== undefined) body.tolerances = tolerances;
  if (measurements !== undefined) body.measurements = measurements;
  if (query.maxCauses !== undefined) body.diagnosis = { maxCauses: Number(query.maxCauses) };
  const validate = request.compileValidationSchema({ $ref: 'FitRequest#' });
  if (!validate(body)) {
    const errors = (validate.errors ?? []).map((e) => validationToPointer(e as Parameters<typeof validationToPointer>[0], undefined));
    throw new HttpProblem(400, 'validation', `Invalid request: ${errors.map((e) => `${e.pointer} ${e.detail}`).join('; ')}`, errors);
  }
  return body as unknown as FitRequestBody;
}

/** JSON has no Infinity or NaN: unbounded figures (an instant slew rate) go out as null. */
function finiteOrNull(value: unknown): unknown {
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  if (Array.isArray(value)) return value.map(finiteOrNull);
  if (value !== null && typeof value === 'object' && !ArrayBuffer.isView(value)) {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) out[k] = finiteOrNull(v);
    return out;
  }
  return value;
}

export function shapeFitReport(report: FitReport): Static<typeof FitResult> {
  const { estimation, diagnosis } = report;
  const names = estimation.estimates.map((e) => e.parameter);
  const out: Record<string, unknown> = {
    forwardModel: report.forwardModel,
    nominal: report.nominal,
    fitted: estimation.fitted,
    measurements: report.measurements,
    estimates: estimation.estimates,
    hysteresisRatio: estimation.hysteresisRatio,
    indistinguishable: estimation.indistinguishable.map((p) => ({
      ...p,
      note: `${p.parameters[0]} and ${p.parameters[1]} cannot be told apart from these measurements (each mimics the other to within ${p.distinguishingSigma.toPrecision(2)} σ of the measurements): the data fix one combination of them and their split follows the priors`,
    })),
    uninformed: estimation.estimates.filter((e) => e.posteriorToPriorSd > 0.9).map((e) => e.parameter),
    correlation: { parameters: names, matrix: estimation.correlation },
    fit: {
      chiSquare: estimation.dataChiSquare,
      priorChiSquare: estimation.priorChiSquare,
      measurementCount: report.measurements.length,
      iterations: estimation.iterations,
      converged: estimation.converged,
    },
    verdict: diagnosis.verdict,
    explanations: diagnosis.explanations,
    ambiguities: diagnosis.ambiguities,
    candidateCount: diagnosis.candidateCount,
    warnings: report.warnings,
  };
  if (report.capture) out.capture = report.capture;
  return finiteOrNull(out) as Static<typeof FitResult>;
}

export const fitRoutes: FastifyPluginAsyncTypebox = async (app) => {
  app.addContentTypeParser(CSV_TYPES, { parseAs: 'string' }, (_request, body, done) => done(null, body));

  app.post(
    '/v1/fit',
    {
      config: { sampleArrays: SAMPLE_ARRAYS },
      schema: {
        tags: ['fit'],
        summary: 'Fit measurements to the circuit and diagnose the difference',
        description:
          'From scalar scope figures and/or a capture (one or two channels: output, capacitor) to fitted effective parameters (part values, output levels, slew rate, recovery delay) with uncertainties, the pairs the data cannot tell apart, and ranked one- and two-cause explanations. ' +
          'Captures are analysed by IEEE Std 181 (histogram state levels, 50 % crossings, 10–90 % transitions) plus exponential fits of the capacitor segments. ' +
          'Send JSON (FitRequest; a CSV export may go in capture.csv), or the scope CSV itself as a text/csv body with the circuit as URL-encoded JSON in ?circuit= (and optionally ?tolerances=, ?measurements=, ?outputChannel=, ?capacitorChannel=, ?sampleIntervalS=). ' +
          'Bad captures (flat line, too few edges, clipped channel, mismatched lengths, missing samples, unreadable CSV) answer 422 with the reason.',
        querystring: FitCsvQuery,
        body: {
          content: {
            'application/json': { schema: ref(FitRequest) },
            'text/csv': { schema: { type: 'string', description: 'A scope CSV export; the circuit goes in ?circuit=' } },
          },
        } as unknown as typeof FitRequest,
        response: { 200: ref(FitResult), ...problemResponses(400, 401, 403, 413, 415, 422, 503) },
      },
    },
    async (request, reply) => {
      const raw = request.body as unknown;
      const contentType = (request.headers['content-type'] ?? '').split(';')[0].trim().toLowerCase();
      if (raw === undefined || raw === null) {
        throw new HttpProblem(400, 'validation', 'POST /v1/fit needs a body: a FitRequest as application/json, or a scope CSV as text/csv', [{ pointer: '', detail: 'a body is required' }]);
      }
      if (typeof raw === 'string' && !CSV_TYPES.includes(contentType)) {
        throw new HttpProblem(415, 'unsupported-media-type', `/v1/fit reads application/json or text/csv, not ${contentType || 'an untyped body'}`);
      }
      const body = typeof raw === 'string' ? bodyFromCsvRequest(request, raw, request.query as FitCsvQueryString) : (raw as FitRequestBody);
      const amplifiers = await app.services.amplifiers.forSpecs((body.circuit as CircuitBody | undefined)?.amplifier);
      const circuit = withPointerPrefix('/circuit', () => circuitFromBody(body.circuit as CircuitBody, amplifiers, '/circuit'));
      const input: FitInput = { circuit };
      if (body.tolerances) input.tolerances = body.tolerances;
      if (body.measurements) input.measurements = body.measurements as FitInput['measurements'];
      if (body.capture) input.capture = captureSpec(body.capture, sampleArraysOf(raw));
      if (body.diagnosis) input.diagnosis = body.diagnosis;
      // Off the event loop: a capture of millions of samples takes a good part of a second. The samples
      // move to the thread rather than being copied (the largest part of a large request's memory).
      const samples = [input.capture?.output, input.capture?.capacitor, input.capture?.timeS].filter((a): a is Float64Array => a instanceof Float64Array);
      const report: FitReport = await runForRequest(app.services.workers, reply, 'fit', input, 'fit', samples);
      return shapeFitReport(report);
    },
  );
};
