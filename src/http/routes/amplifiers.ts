/** Read access to the amplifier table: built-in archetypes plus registered amplifiers. */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import { Type } from 'typebox';
import { isBuiltInAmplifierId } from '../../core/index.ts';
import { amplifierToJson } from '../convert.ts';
import { HttpProblem } from '../problem.ts';
import { Amplifier, AmplifierList } from '../schemas/amplifier.ts';
import { AmplifierId, problemResponses, ref } from '../schemas/common.ts';

export function amplifierRecord(a: Parameters<typeof amplifierToJson>[0]) {
  return { ...amplifierToJson(a), source: isBuiltInAmplifierId(a.id) ? 'built-in' : 'registered' } as never;
}

export const amplifierReadRoutes: FastifyPluginAsyncTypebox = async (app) => {
  app.get(
    '/v1/amplifiers',
    {
      schema: {
        tags: ['amplifiers'],
        summary: 'List amplifiers',
        description: 'Built-in technology-class archetypes (figures typical of the class) and registered amplifiers.',
        response: { 200: ref(AmplifierList), ...problemResponses(401, 403) },
      },
    },
    async () => ({ amplifiers: (await app.services.amplifiers.list()).map(amplifierRecord) }),
  );

  app.get(
    '/v1/amplifiers/:id',
    {
      schema: {
        tags: ['amplifiers'],
        summary: 'Get one amplifier',
        params: Type.Object({ id: AmplifierId }),
        response: { 200: ref(Amplifier), ...problemResponses(400, 401, 403, 404, 422) },
      },
    },
    async (request, reply) => {
      const amp = await app.services.amplifiers.get(request.params.id);
      if (!amp) throw new HttpProblem(404, 'not-found', `No amplifier with id '${request.params.id}'`);
      // Registered amplifiers carry their store ETag so a caller can update or delete with If-Match.
      if (!isBuiltInAmplifierId(amp.id)) {
        const doc = await app.services.store.amplifiers.get(amp.id);
        if (doc) reply.header('etag', doc.etag);
      }
      return amplifierRecord(amp);
    },
  );
};
