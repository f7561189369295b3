/** Liveness, readiness, metrics and the contract itself. */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import { Type } from 'typebox';
import { problemResponses } from '../schemas/common.ts';
import { HttpProblem } from '../problem.ts';
import { problemType } from '../problem-types.ts';

const Health = Type.Object(
  { status: Type.String({ description: 'Always "ok": an answer at all means the process lives (load and store state are on /readyz)' }) },
  { additionalProperties: false, description: 'Liveness' },
);
const Ready = Type.Object(
  {
    status: Type.String({ description: '"ready" (status 200) when every check holds, "not-ready" (status 503) otherwise' }),
    checks: Type.Object(
      {
        store: Type.Boolean({ description: 'true when the store (SQLite file or PostgreSQL database) answered a ping just now' }),
        load: Type.Boolean({ description: 'false while requests are being shed for event-loop delay, or while shutting down' }),
      },
      { additionalProperties: false, description: 'Each readiness condition on its own, so an orchestrator log says which one failed' },
    ),
  },
  { additionalProperties: false, description: 'Readiness: whether this replica should receive traffic' },
);
const ProblemDescription = Type.Object(
  {
    code: Type.String({ description: 'The problem code, as in the `code` member of problem answers' }),
    status: Type.Integer({ description: 'HTTP status answers with this code carry' }),
    description: Type.String({ description: 'What the code means and what a caller can do about it' }),
  },
  { additionalProperties: false, description: 'What a problem code means (the target of a problem `type` URI)' },
);

export const systemRoutes: FastifyPluginAsyncTypebox = async (app) => {
  app.get(
    '/healthz',
    {
      // Never shed: liveness says the process answers, not that it is idle (pressure shows on /readyz).
      config: { access: 'public', shed: false },
      schema: { tags: ['system'], summary: 'Liveness: the process answers (never shed for load)', response: { 200: Health } },
    },
    async () => ({ status: 'ok' }),
  );

  app.get(
    '/readyz',
    {
      config: { access: 'public' },
      schema: { tags: ['system'], summary: 'Readiness: the store answers and the service is not shedding load', response: { 200: Ready, 503: Ready } },
    },
    async (_request, reply) => {
      const store = await app.services.store.ping();
      const load = !app.pressure().underPressure && !app.lifecycle.draining;
      const ready = store && load;
      return reply.code(ready ? 200 : 503).send({ status: ready ? 'ready' : 'not-ready', checks: { store, load } });
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

  app.get(
    '/problems/:code',
    {
      config: { access: 'public' },
      schema: {
        tags: ['system'],
        summary: 'What a problem code means: the target of the `type` URI of every problem answer',
        params: Type.Object({ code: Type.String({ maxLength: 64, description: 'A problem code, e.g. validation (the last segment of a problem `type` URI)' }) }),
        response: { 200: ProblemDescription, ...problemResponses(404) },
      },
    },
    async (request) => {
      const { code } = request.params;
      const described = problemType(code);
      if (!described) throw new HttpProblem(404, 'not-found', `No problem code '${code}'`);
      return { code, status: described.status, description: described.description };
    },
  );

  app.get('/openapi.json', { config: { access: 'public' }, schema: { hide: true } }, async () => app.swagger());
  void problemResponses;
};
