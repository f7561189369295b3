/** GET /v1/topologies: which circuits the service knows and the part roles each needs. */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import { Type } from 'typebox';
import { TOPOLOGIES } from '../../core/index.ts';
import { problemResponses } from '../schemas/common.ts';

const Role = Type.Object(
  {
    role: Type.String({ description: 'The key to give this part under a circuit\'s `parts` (e.g. rTiming)' }),
    kind: Type.Union([Type.Literal('resistor'), Type.Literal('capacitor')], { description: 'resistor: value in ohm; capacitor: value in farad' }),
    required: Type.Boolean({ description: 'false: the part belongs to one of two alternative arrangements (give the parts of one)' }),
    purpose: Type.Union([Type.Literal('timing'), Type.Literal('thresholds'), Type.Literal('output-level')], {
      description: 'What the role sets: the dwell times, the switching thresholds, or the output high level (a pull-up)',
    }),
    description: Type.String({ description: 'Where the part sits in the network, in words' }),
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
          description: Type.String({ description: 'The network in words: which part connects which nodes' }),
          designable: Type.Boolean({ description: 'POST /v1/design sizes it' }),
          needsOpenDrain: Type.Boolean({ description: 'true: the amplifier must have an open-drain output stage (other topologies refuse one)' }),
          roles: Type.Array(Role, { description: 'The part roles of this topology, each a key of `parts`' }),
        },
        { additionalProperties: false },
      ),
      { description: 'Every topology a circuit can name' },
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
