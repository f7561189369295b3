/** POST /v1/design: a frequency (and duty) target -> ranked designs built from a series or catalogue. */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import type { Design } from '../../core/design/index.ts';
import { DEFAULT_DIODE, resolveAmplifierSpec } from '../convert.ts';
import { problemResponses, ref } from '../schemas/common.ts';
import { DEFAULT_DESIGN_FREQUENCY_TOLERANCE, DesignRequest, DesignResponse, type DesignRequestBody } from '../schemas/design.ts';
import { runForRequest } from '../workers/run-for-request.ts';
import { fittedPartsJson, predictionJson, roleSourcesFromBody, storedFor } from './snap.ts';

/** Series most boards stock (common practice): E24 metal-film resistors at 1 %, E12 C0G capacitors at 5 %. */
const DEFAULT_VALUES = { resistor: { series: 'E24', tolerance: 0.01 }, capacitor: { series: 'E12', tolerance: 0.05 } } as const;

function designJson(d: Design, rank: number, body: DesignRequestBody) {
  const parts: Record<string, number> = {};
  for (const [role, v] of Object.entries(d.parts)) parts[role] = v.value;
  return {
    rank,
    topology: d.topology,
    parts: fittedPartsJson(d.parts),
    predicted: predictionJson(d.analysis),
    frequencyError: d.frequencyError,
    dutyCycleError: d.dutyCycleError,
    hysteresisFraction: d.hysteresisFraction,
    robustness: d.robustness!,
    practicality: d.practicality!,
    limits: d.limits,
    // Ready to POST to /v1/analyze (or /v1/tolerance) as it stands.
    circuit: { topology: d.topology, supply: body.supply, amplifier: body.amplifier, parts, ...(d.diode ? { diode: d.diode } : {}) },
    checks: d.checks,
  };
}

export const designRoutes: FastifyPluginAsyncTypebox = async (app) => {
  app.post(
    '/v1/design',
    {
      schema: {
        tags: ['design'],
        summary: 'Design an oscillator from a frequency target',
        description:
          'Ranked complete designs whose every part comes from the chosen series or catalogue, each analysed in full (predicted frequency and duty, checks). ' +
          'Duty cycles from 10 % to 90 % by threshold placement in the single-supply divider, beyond that by diode steering (diode-steered: separate charge and ' +
          'discharge resistors, the duty set by their ratio; also offered inside that range when `topologies` names it). Timing resistances are bounded below by what the output can drive ' +
          'and above by the bias-current error. No design within the tolerance, a supply outside the amplifier rating, a target above its frequency ceiling ' +
          'or an empty value source answers 422 with the reason (and the closest design found in `figures`).',
        body: ref(DesignRequest),
        response: { 200: ref(DesignResponse), ...problemResponses(400, 401, 403, 413, 415, 422) },
      },
    },
    async (request, reply) => {
      const body = request.body;
      const stored = await storedFor(app.services, [body.amplifier], body.values);
      const amplifier = resolveAmplifierSpec(body.amplifier as string | Record<string, unknown>, stored.amplifiers, '/amplifier');
      // Off the event loop: a search with full analyses of its best candidates can take a few hundred ms.
      const result = await runForRequest(app.services.workers, reply, 'design', {
        targetFrequencyHz: body.targetFrequencyHz,
        targetDutyCycle: body.targetDutyCycle,
        dutyTolerance: body.dutyTolerance,
        frequencyTolerance: body.frequencyTolerance ?? DEFAULT_DESIGN_FREQUENCY_TOLERANCE,
        supply: { positiveV: body.supply.positiveV, negativeV: body.supply.negativeV ?? 0 },
        amplifier,
        // A kind the caller leaves out keeps its default series (values.resistor alone still gets E12 capacitors).
        values: roleSourcesFromBody({ ...DEFAULT_VALUES, ...body.values } as never, stored),
        constraints: body.constraints,
        topologies: body.topologies,
        diode: body.diode ? { forwardDropV: body.diode.forwardDropV ?? DEFAULT_DIODE.forwardDropV, resistanceOhm: body.diode.resistanceOhm ?? DEFAULT_DIODE.resistanceOhm } : undefined,
        count: body.count,
        robustness: body.robustness,
      }, 'design');
      return { designs: result.designs.map((d, i) => designJson(d, i + 1, body)), notes: result.notes } as never;
    },
  );
};
