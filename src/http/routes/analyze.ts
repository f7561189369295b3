/** POST /v1/analyze: a given circuit -> frequency, duty, levels, currents, checks. */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import { analyzeCircuit } from '../../core/index.ts';
import { circuitFromBody } from '../convert.ts';
import { Analysis } from '../schemas/analysis.ts';
import { circuitSchemaRef } from '../schemas/circuit.ts';
import { problemResponses, ref } from '../schemas/common.ts';

export const analyzeRoutes: FastifyPluginAsyncTypebox = async (app) => {
  app.post(
    '/v1/analyze',
    {
      schema: {
        tags: ['analysis'],
        summary: 'Analyse a relaxation oscillator',
        description:
          'Steady-state frequency, duty cycle, thresholds, output levels, dwell times, time to the first edge, currents and design checks for a given circuit and amplifier.',
        body: circuitSchemaRef,
        response: { 200: ref(Analysis), ...problemResponses(400, 401, 403, 413, 415, 422) },
      },
    },
    async (request) => {
      const circuit = circuitFromBody(request.body, await app.services.amplifiers.forSpecs(request.body.amplifier));
      const result = analyzeCircuit(circuit, { model: request.body.model ?? 'auto', edgeFractionLimit: request.body.edgeFractionLimit });
      return {
        topology: circuit.topology,
        amplifier: { id: circuit.amplifier.id, name: circuit.amplifier.name, figuresBasis: circuit.amplifier.figuresBasis },
        ...result,
      };
    },
  );
};
