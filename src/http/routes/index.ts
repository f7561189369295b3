/** Every route plugin, in registration order. Add a route: write its plugin and list it here. */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import { amplifierWriteRoutes } from './amplifier-writes.ts';
import { amplifierReadRoutes } from './amplifiers.ts';
import { analyzeRoutes } from './analyze.ts';
import { catalogueRoutes } from './catalogues.ts';
import { seriesRoutes } from './series.ts';
import { systemRoutes } from './system.ts';
import { topologyRoutes } from './topologies.ts';

export const ROUTES: FastifyPluginAsyncTypebox[] = [systemRoutes, analyzeRoutes, topologyRoutes, amplifierReadRoutes, amplifierWriteRoutes, seriesRoutes, catalogueRoutes];
