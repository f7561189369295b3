/** Liveness, readiness, metrics and the contract itself. */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import { Type } from 'typebox';
import { problemResponses } from '../schemas/common.ts';

const Health = Type.Object({ status: Type.String() }, { additionalProperties: false });
const Ready = Type.Object(
  { status: Type.String(), checks: Type.Object({ store: Type.Boolean() }, { additionalProperties: false }) },
  { additionalProperties: false },
);

export const systemRoutes: FastifyPluginAsyncTypebox = async (app) => {
  app.get(
    '/healthz',
    { config: { access: 'public' }, schema: { tags: ['system'], summary: 'Liveness: the process answers', response: { 200: Health } } },
    async () => ({ status: 'ok' }),
  );

  app.get(
    '/readyz',
    {
      config: { access: 'public' },
      schema: { tags: ['system'], summary: 'Readiness: the store answers', response: { 200: Ready, 503: Ready } },
    },
    async (_request, reply) => {
      const store = await app.services.store.ping();
      return reply.code(store ? 200 : 503).send({ status: store ? 'ready' : 'not-ready', checks: { store } });
    },
  );

  app.get(
    '/metrics',
    {
      config: { access: 'public' },
      schema: {
        tags: ['system'],
        summary: 'Prometheus metrics (text exposition format)',
        response: { 200: { description: 'Metrics', content: { 'text/plain': { schema: Type.String() } } } },
      },
    },
    async (_request, reply) => reply.type(app.services.metrics.contentType).send(await app.services.metrics.render()),
  );

  app.get('/openapi.json', { config: { access: 'public' }, schema: { hide: true } }, async () => app.swagger());
  void problemResponses;
};
