/**
 * POST /v1/tolerance: worst case, Monte Carlo, sensitivities over part
 * tolerances, temperature, supply and amplifier spreads. The run happens in
 * the worker pool; this handler converts, checks the sample cap and the Accept
 * header before queueing, and shapes JSON or an SVG histogram.
 */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import { Type } from 'typebox';
import { renderHistogramSvg } from '../../core/plot/index.ts';
import { monteCarloOptions, type ToleranceRequest, type ToleranceResult } from '../../core/tolerance/index.ts';
import { circuitFromBody, timingCapacitorFromParts, withPointerPrefix } from '../convert.ts';
import { HttpProblem } from '../problem.ts';
import { ANALYSIS_DEADLINE_SHARE } from '../workers/pool.ts';
import { runForRequest } from '../workers/run-for-request.ts';
import { problemResponses, ref } from '../schemas/common.ts';
import { ToleranceRequest as ToleranceRequestSchema, ToleranceResult as ToleranceResultSchema, type ToleranceRequestBody } from '../schemas/tolerance.ts';

export const DEFAULT_HISTOGRAM_BINS = 60;
const SVG = 'image/svg+xml';
const JSON_TYPE = 'application/json';

/** Picks the response type from Accept (RFC 9110 §12.5.1 q-values); undefined when nothing we make is acceptable. */
export function negotiate(accept: string | undefined): 'json' | 'svg' | undefined {
  if (!accept || accept.trim() === '') return 'json';
  let best: { kind: 'json' | 'svg'; q: number; specificity: number } | undefined;
  for (const part of accept.split(',')) {
    const [range, ...params] = part.trim().toLowerCase().split(';').map((s) => s.trim());
    const qParam = params.find((p) => p.startsWith('q='));
    const q = qParam ? Number(qParam.slice(2)) : 1;
    if (!(q > 0)) continue;
    const candidates: { kind: 'json' | 'svg'; specificity: number }[] = [];
    if (range === JSON_TYPE) candidates.push({ kind: 'json', specificity: 2 });
    else if (range === SVG) candidates.push({ kind: 'svg', specificity: 2 });
    else if (range === 'application/*') candidates.push({ kind: 'json', specificity: 1 });
    else if (range === 'image/*') candidates.push({ kind: 'svg', specificity: 1 });
    else if (range === '*/*') candidates.push({ kind: 'json', specificity: 0 });
    for (const c of candidates) {
      if (!best || q > best.q || (q === best.q && c.specificity > best.specificity)) best = { ...c, q };
    }
  }
  return best?.kind;
}

export const toleranceRoutes: FastifyPluginAsyncTypebox = async (app) => {
  app.post(
    '/v1/tolerance',
    {
      schema: {
        tags: ['tolerance'],
        summary: 'Worst case, Monte Carlo and sensitivities over tolerance, temperature and supply',
        description:
          'Corners (all of them for up to 14 varied quantities, a sensitivity-guided search beyond), a seeded Monte Carlo (uniform, or normal with σ = tolerance/3 truncated at the tolerance) with percentiles and yield against a spec, d ln f / d ln x per part with each part\'s share of the first-order variance. With Accept: image/svg+xml, a histogram of the Monte Carlo frequencies with the spec limits and percentiles marked. Runs in a worker thread.',
        body: ref(ToleranceRequestSchema),
        response: {
          200: {
            description: 'The analysis (JSON) or its frequency histogram (SVG)',
            content: {
              [JSON_TYPE]: { schema: ref(ToleranceResultSchema) },
              [SVG]: { schema: Type.String({ description: 'SVG document' }) },
            },
          },
          ...problemResponses(400, 401, 403, 406, 413, 415, 422, 503),
        },
      },
    },
    async (request, reply) => {
      const kind = negotiate(request.headers.accept);
      if (!kind) {
        throw new HttpProblem(406, 'not-acceptable', `This resource answers ${JSON_TYPE} or ${SVG}; Accept was '${request.headers.accept}'`);
      }
      const body = request.body as ToleranceRequestBody;
      const amplifiers = await app.services.amplifiers.forSpecs(body.circuit.amplifier);
      const circuit = withPointerPrefix('/circuit', () => circuitFromBody(body.circuit, amplifiers, '/circuit'));
      const coreRequest = toCoreRequest(body, circuit, kind === 'svg');
      const capacitor = withPointerPrefix('/circuit', () => timingCapacitorFromParts(body.circuit.topology, body.circuit.parts as Parameters<typeof timingCapacitorFromParts>[1], '/circuit/parts'));
      if (capacitor) {
        coreRequest.timingCapacitor = {
          ageingRatePerDecade: capacitor.ageingRatePerDecade,
          ageHours: capacitor.ageHours,
          ...(capacitor.dielectric ? { dielectric: capacitor.dielectric.code } : {}),
          ...(capacitor.tolerancePlusFraction !== undefined
            ? { toleranceFraction: Math.max(capacitor.tolerancePlusFraction, capacitor.toleranceMinusFraction ?? 0) }
            : {}),
        };
      }
      // Refuse an oversized run before it takes a thread.
      monteCarloOptions(coreRequest);
      const budgetMs = app.services.workers.deadlineMs * ANALYSIS_DEADLINE_SHARE;
      const result: ToleranceResult = await runForRequest(app.services.workers, reply, 'tolerance', { request: coreRequest, budgetMs }, 'run');
      if (kind === 'svg') return reply.type(SVG).send(histogramSvg(result, coreRequest));
      const { histogram: _omit, ...json } = result;
      void _omit;
      return reply.type(JSON_TYPE).send({ topology: circuit.topology, ...json });
    },
  );
};

function toCoreRequest(body: ToleranceRequestBody, circuit: ToleranceRequest['circuit'], wantHistogram: boolean): ToleranceRequest {
  const request: ToleranceRequest = {
    circuit,
    model: body.circuit.model ?? 'auto',
    tolerances: dropUndefined(body.tolerances as Record<string, number | undefined>),
  };
  if (body.temperatureCoefficients) request.temperatureCoefficients = dropUndefined(body.temperatureCoefficients as Record<string, ToleranceRequest['temperatureCoefficients'] extends Readonly<Record<string, infer T>> | undefined ? T | undefined : never>);
  if (body.temperature) request.temperature = body.temperature;
  if (body.serviceLifeYears !== undefined) request.serviceLifeYears = body.serviceLifeYears;
  if (body.supplyTolerance !== undefined) request.supplyTolerance = body.supplyTolerance;
  if (body.supplyRailsIndependent !== undefined) request.supplyRailsIndependent = body.supplyRailsIndependent;
  if (body.amplifierSpreads) request.amplifierSpreads = body.amplifierSpreads as ToleranceRequest['amplifierSpreads'];
  if (body.tracking) request.tracking = body.tracking.map((g) => ({ ...g, roles: [...g.roles] as string[] }));
  if (body.monteCarlo) request.monteCarlo = body.monteCarlo;
  if (body.spec) request.spec = body.spec;
  if (wantHistogram) request.histogramBins = body.histogramBins ?? DEFAULT_HISTOGRAM_BINS;
  return request;
}

function dropUndefined<T>(record: Record<string, T | undefined>): Record<string, T> {
  const out: Record<string, T> = {};
  for (const [k, v] of Object.entries(record)) if (v !== undefined) out[k] = v;
  return out;
}

function histogramSvg(result: ToleranceResult, request: ToleranceRequest): string {
  const mc = result.monteCarlo;
  const f = mc.frequencyHz;
  const bins = result.histogram;
  if (!f || !bins || bins.counts.length === 0) {
    throw new HttpProblem(422, 'no-samples', 'No Monte Carlo sample oscillates: there is nothing to plot');
  }
  const spec = request.spec;
  const yieldText = mc.yield === null ? '' : `, yield ${(mc.yield * 100).toFixed(mc.yield > 0.999 ? 3 : 1)} %`;
  return renderHistogramSvg({
    bins,
    unit: 'Hz',
    title: `Monte Carlo frequency, ${result.model}`,
    subtitle: `${mc.samples} samples, ${mc.distribution}, seed ${mc.seed}${yieldText}`,
    specLimits: spec ? { low: spec.frequencyHz * (1 - spec.frequencyTolerance), high: spec.frequencyHz * (1 + spec.frequencyTolerance) } : undefined,
    markers: [
      { label: 'p0.1', value: f.p0_1 },
      { label: 'p5', value: f.p5 },
      { label: 'p50', value: f.p50 },
      { label: 'p95', value: f.p95 },
      { label: 'p99.9', value: f.p99_9 },
    ],
  });
}
