/** What routes need besides the request: the amplifier directory, the store, the key ring. */
import type { Store } from '../store/index.ts';
import type { AmplifierDirectory } from './amplifier-directory.ts';
import type { ApiKeyRing } from './auth/api-keys.ts';
import type { Metrics } from './metrics.ts';
import type { WorkerPool } from './workers/pool.ts';

export interface Services {
  amplifiers: AmplifierDirectory;
  store: Store;
  keys: ApiKeyRing;
  metrics: Metrics;
  /** Worker threads for heavy pure-core tasks (see workers/tasks.ts). */
  workers: WorkerPool;
}

declare module 'fastify' {
  interface FastifyInstance {
    services: Services;
  }
}
