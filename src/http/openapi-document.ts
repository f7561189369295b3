/** Generates the OpenAPI document from the routes (used by the script and the contract tests). */
import { openSqliteStore } from '../store/index.ts';
import { buildApp } from './app.ts';

export const OPENAPI_PATH = 'openapi/openapi.json';

export async function generateOpenApiDocument(): Promise<string> {
  const app = await buildApp({ store: openSqliteStore(':memory:'), config: { apiKeys: undefined } });
  await app.ready();
  const doc = JSON.stringify(app.swagger(), null, 2);
  await app.close();
  return doc;
}
