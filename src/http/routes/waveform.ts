/**
 * POST /v1/waveform: capacitor, output and threshold-node voltages over N periods
 * on a uniform time grid, from the time-domain engine; as JSON, or as an SVG
 * plot when the caller prefers image/svg+xml. The work runs in the worker pool.
 */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import { checkWaveformOptions, prepareCircuit, type Circuit } from '../../core/index.ts';
import { circuitFromBody, withPointerPrefix } from '../convert.ts';
import { HttpProblem } from '../problem.ts';
import { problemResponses, ref } from '../schemas/common.ts';
import { DEFAULT_WAVEFORM_PERIODS, DEFAULT_WAVEFORM_SAMPLES, Waveform, WaveformRequest } from '../schemas/waveform.ts';
import { runForRequest } from '../workers/run-for-request.ts';

const JSON_TYPE = 'application/json';
const SVG_TYPE = 'image/svg+xml';
const OFFERED = [JSON_TYPE, SVG_TYPE] as const;
type Offered = (typeof OFFERED)[number];

/**
 * Picks the offered media type the Accept header ranks highest (RFC 9110
 * §12.5.1: q-values, then specificity; ties keep our order, JSON first).
 * Returns undefined when the caller accepts neither.
 */
export function negotiateWaveformType(accept: string | undefined): Offered | undefined {
  if (!accept || !accept.trim()) return JSON_TYPE;
  let best: Offered | undefined;
  let bestQ = 0;
  for (const offered of OFFERED) {
    const q = quality(accept, offered);
    if (q > bestQ) {
      best = offered;
      bestQ = q;
    }
  }
  return best;
}

/** q of the most specific Accept range matching a media type (0 when none matches). */
function quality(accept: string, mediaType: string): number {
  const [type, subtype] = mediaType.split('/');
  let q = 0;
  let specificity = -1;
  for (const part of accept.split(',')) {
    const [range, ...params] = part.trim().toLowerCase().split(';');
    const [rt, rs] = range.trim().split('/');
    const matches = (rt === '*' && rs === '*') || (rt === type && (rs === '*' || rs === subtype));
    if (!matches) continue;
    const spec = rt === '*' ? 0 : rs === '*' ? 1 : 2;
    if (spec <= specificity) continue;
    let rangeQ = 1;
    for (const p of params) {
      const [k, v] = p.trim().split('=');
      if (k === 'q') rangeQ = Number(v);
    }
    specificity = spec;
    q = Number.isFinite(rangeQ) ? rangeQ : 0;
  }
  return q;
}

function describe(circuit: Circuit): string {
  return `${circuit.topology}, ${circuit.amplifier.name}`;
}

export const waveformRoutes: FastifyPluginAsyncTypebox = async (app) => {
  app.post(
    '/v1/waveform',
    {
      schema: {
        tags: ['analysis'],
        summary: 'Sampled waveforms of a relaxation oscillator',
        description:
          'Capacitor, output and threshold-node voltages over a number of periods on a uniform time grid, solved exactly piece by piece by the time-domain engine (slew, recovery delay, current limit, clamps and diodes included). Send `Accept: image/svg+xml` for an SVG plot instead of JSON.',
        body: ref(WaveformRequest),
        response: {
          200: {
            description: 'The samples (JSON) or their plot (SVG)',
            content: { [JSON_TYPE]: { schema: ref(Waveform) }, [SVG_TYPE]: { schema: { type: 'string' } } },
          },
          ...problemResponses(400, 401, 403, 406, 413, 415, 422),
        },
      },
    },
    async (request, reply) => {
      const mediaType = negotiateWaveformType(request.headers.accept);
      if (!mediaType) {
        throw new HttpProblem(406, 'not-acceptable', `This resource is available as ${OFFERED.join(' or ')}`);
      }
      const body = request.body;
      const circuit = circuitFromBody(body.circuit, await app.services.amplifiers.forSpecs(body.circuit.amplifier), '/circuit');
      // Validate here (cheap, and the pointers get their /circuit prefix); the walk, the sampling and the
      // serialisation run in a worker thread, so a long waveform never holds the event loop.
      withPointerPrefix('/circuit', () => prepareCircuit(circuit));
      const periods = body.periods ?? DEFAULT_WAVEFORM_PERIODS;
      const samples = body.samples ?? DEFAULT_WAVEFORM_SAMPLES;
      checkWaveformOptions({ periods, samples, includePowerUp: body.includePowerUp ?? false });
      const answer = await runForRequest(
        app.services.workers,
        reply,
        'waveform',
        {
          circuit,
          periods,
          samples,
          includePowerUp: body.includePowerUp ?? false,
          ...(mediaType === SVG_TYPE ? { svg: { title: `Waveform: ${describe(circuit)}` } } : {}),
        },
        'waveform',
      );
      reply.header('vary', 'Accept');
      const bytes = Buffer.from(answer.body.buffer, answer.body.byteOffset, answer.body.byteLength);
      // A Buffer is sent as is (no serialiser pass over the samples).
      return reply.type(mediaType === SVG_TYPE ? `${SVG_TYPE}; charset=utf-8` : JSON_TYPE).send(bytes as never);
    },
  );
};
