/** GET /v1/topologies: which circuits the service knows and the part roles each needs. */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import { Type } from 'typebox';
import { TOPOLOGIES } from '../../core/index.ts';
import { problemResponses } from '../schemas/common.ts';

const Role = Type.Object(
  {
    role: Type.String(),
    kind: Type.Union([Type.Literal('resistor'), Type.Literal('capacitor')]),
    required: Type.Boolean(),
    purpose: Type.Union([Type.Literal('timing'), Type.Literal('thresholds'), Type.Literal('output-level')], {
      description: 'What the role sets: the dwell times, the switching thresholds, or the output high level (a pull-up)',
    }),
    description: Type.String(),
  },
  { additionalProperties: false },
);

const TopologyList = Type.Object(
  {
    topologies: Type.Array(
      Type.Object(
        {
          id: Type.String({ description: 'Names the network; the supply is its own field' }),
          deprecatedAliases: Type.Array(Type.String(), { description: 'Earlier ids still accepted as input for one release; answers use `id`' }),
          description: Type.String(),
          designable: Type.Boolean({ description: 'POST /v1/design sizes it' }),
          needsOpenDrain: Type.Boolean(),
          roles: Type.Array(Role),
        },
        { additionalProperties: false },
      ),
    ),
  },
  { additionalProperties: false },
);

export const topologyRoutes: FastifyPluginAsyncTypebox = async (app) => {
  app.get(
    '/v1/topologies',
    {
      schema: {
        tags: ['analysis'],
        summary: 'List supported topologies and their part roles',
        response: { 200: TopologyList, ...problemResponses(401, 403) },
      },
    },
    async () => ({
      topologies: TOPOLOGIES.map((t) => ({
        id: t.id,
        deprecatedAliases: [...(t.aliases ?? [])],
        description: t.description,
        designable: t.design !== undefined,
        needsOpenDrain: t.needsOpenDrain,
        roles: Object.entries(t.roles).map(([role, spec]) => ({ role, kind: spec.kind, required: spec.required, purpose: spec.purpose, description: spec.description })),
      })),
    }),
  );
};
