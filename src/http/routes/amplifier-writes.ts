/**
 * PUT and DELETE /v1/amplifiers/{id}: caller-registered amplifiers in the store.
 * Built-in archetypes are read-only (409). Figures are checked for physical
 * sanity before storing; changing or deleting needs If-Match like catalogues.
 */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import type { FastifyRequest } from 'fastify';
import { Type } from 'typebox';
import { findBuiltInAmplifier, isBuiltInAmplifierId, resolveAmplifier } from '../../core/index.ts';
import type { AmplifierBody } from '../../store/index.ts';
import { inlineAmplifierFromBody } from '../convert.ts';
import { HttpProblem } from '../problem.ts';
import { Amplifier, AmplifierRegistration, READ_ONLY_AMPLIFIER_FIELDS } from '../schemas/amplifier.ts';
import { AmplifierId, problemResponses, ref } from '../schemas/common.ts';
import { storedBodyToModel } from '../stored-amplifiers.ts';
import { amplifierRecord } from './amplifiers.ts';
import { ETAG_HEADER, PRECONDITION_HEADERS, ifMatchForStore, jsonResponse } from '../preconditions.ts';

const idParams = Type.Object({ id: AmplifierId });

/** Runs before body validation so any write to a built-in id is a 409, whatever the body. */
async function refuseBuiltIn(request: FastifyRequest): Promise<void> {
  const { id } = request.params as { id: string };
  if (isBuiltInAmplifierId(id)) {
    throw new HttpProblem(409, 'read-only', `'${id}' is a built-in archetype and cannot be changed or deleted; register your own id`);
  }
}

export const amplifierWriteRoutes: FastifyPluginAsyncTypebox = async (app) => {
  const collection = app.services.store.amplifiers;

  app.put(
    '/v1/amplifiers/:id',
    {
      preValidation: refuseBuiltIn,
      schema: {
        tags: ['amplifiers'],
        summary: 'Register or replace an amplifier',
        description:
          'Creates (201) or replaces (200) a registered amplifier. Omitted figures are ideal, or come from `base` (a built-in archetype). ' +
          'Replacing needs the current ETag in If-Match. Built-in ids answer 409.',
        params: idParams,
        headers: PRECONDITION_HEADERS,
        body: ref(AmplifierRegistration),
        response: {
          200: jsonResponse('Replaced', ref(Amplifier)),
          201: jsonResponse('Created', ref(Amplifier), { ...ETAG_HEADER, location: { type: 'string', description: 'URL of the new amplifier' } }),
          ...problemResponses(400, 401, 403, 409, 412, 413, 415, 422, 428),
        },
      },
    },
    async (request, reply) => {
      const { id } = request.params;
      // A GET body round-trips: its read-only fields are accepted and not stored.
      const body: Record<string, unknown> = { ...request.body };
      for (const field of READ_ONLY_AMPLIFIER_FIELDS) delete body[field];
      // The one figure validation inline amplifiers get too (resolveAmplifier), with pointers into this body.
      resolveAmplifier(inlineAmplifierFromBody(body), findBuiltInAmplifier, '');
      const expected = await ifMatchForStore(request.headers['if-match'], async () => (await collection.get(id))?.etag);
      const result = await collection.put(id, body as unknown as AmplifierBody, expected);
      reply.header('etag', result.doc.etag);
      if (result.outcome === 'created') reply.code(201).header('location', `/v1/amplifiers/${id}`);
      else reply.code(200);
      return reply.send(amplifierRecord(storedBodyToModel(id, result.doc.body)));
    },
  );

  app.delete(
    '/v1/amplifiers/:id',
    {
      preValidation: refuseBuiltIn,
      schema: {
        tags: ['amplifiers'],
        summary: 'Delete a registered amplifier',
        description: 'Needs the current ETag in If-Match. Built-in ids answer 409.',
        params: idParams,
        headers: PRECONDITION_HEADERS,
        response: { 204: { description: 'Deleted', type: 'null' }, ...problemResponses(400, 401, 403, 404, 409, 412, 428) },
      },
    },
    async (request, reply) => {
      const { id } = request.params;
      await collection.delete(id, await ifMatchForStore(request.headers['if-match'], async () => (await collection.get(id))?.etag));
      return reply.code(204).send(null);
    },
  );
};
