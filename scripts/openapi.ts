/**
 * Writes or checks the committed OpenAPI document. The document is generated
 * from the typebox route schemas (app.swagger()); `check` fails when the
 * committed copy is stale so CI catches a contract change nobody regenerated.
 */
import { readFileSync, writeFileSync, mkdirSync } from 'node:fs';
import { generateOpenApiDocument, OPENAPI_PATH } from '../src/http/openapi-document.ts';

const mode = process.argv[2];
const generated = (await generateOpenApiDocument()) + '\n';
if (mode === 'write') {
  mkdirSync('openapi', { recursive: true });
  writeFileSync(OPENAPI_PATH, generated);
  console.log(`wrote ${OPENAPI_PATH}`);
} else if (mode === 'check') {
  let committed = '';
  try {
    committed = readFileSync(OPENAPI_PATH, 'utf8');
  } catch {
    console.error(`${OPENAPI_PATH} is missing: run npm run openapi:write`);
    process.exit(1);
  }
  if (committed !== generated) {
    console.error(`${OPENAPI_PATH} is stale: run npm run openapi:write and commit it`);
    process.exit(1);
  }
  console.log(`${OPENAPI_PATH} is up to date`);
} else {
  console.error('usage: openapi.ts write|check');
  process.exit(2);
}
