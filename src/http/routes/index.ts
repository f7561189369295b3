/** Every route plugin, in registration order. Add a route: write its plugin and list it here. */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import { amplifierWriteRoutes } from './amplifier-writes.ts';
import { amplifierReadRoutes } from './amplifiers.ts';
import { analyzeRoutes } from './analyze.ts';
import { bomCheckRoutes } from './bom-checks.ts';
import { catalogueRoutes } from './catalogues.ts';
import { fitRoutes } from './fit.ts';
import { seriesRoutes } from './series.ts';
import { snapRoutes } from './snap.ts';
import { designRoutes } from './design.ts';
import { systemRoutes } from './system.ts';
import { toleranceRoutes } from './tolerance.ts';
import { waveformRoutes } from './waveform.ts';
import { topologyRoutes } from './topologies.ts';

export const ROUTES: FastifyPluginAsyncTypebox[] = [systemRoutes, analyzeRoutes, topologyRoutes, amplifierReadRoutes, amplifierWriteRoutes, seriesRoutes, catalogueRoutes, bomCheckRoutes, fitRoutes, snapRoutes, designRoutes, toleranceRoutes, waveformRoutes];
