/**
 * Turns the committed OpenAPI document into TypeScript types with
 * openapi-typescript. One function, used by the generate script and by the
 * test that keeps the committed types in step with the contract.
 */
import openapiTS, { astToString } from 'openapi-typescript';

export const CONTRACT_PATH = 'openapi/openapi.json';
export const SCHEMA_PATH = 'client/src/schema.ts';

const HEADER =
  '/**\n' +
  ' * Generated from openapi/openapi.json by openapi-typescript: do not edit.\n' +
  ' * Regenerate with `npm run client:generate` (`npm run openapi:write` runs it too).\n' +
  ' */\n\n';

export async function generateSchemaSource(contract: object): Promise<string> {
  // The document is passed as an object, so nothing is fetched; $refs are local to it. A field with a
  // default stays optional (defaultNonNullable: false): callers may leave it out of a request.
  const ast = await openapiTS(contract as Parameters<typeof openapiTS>[0], { alphabetize: false, defaultNonNullable: false });
  return HEADER + astToString(ast);
}
