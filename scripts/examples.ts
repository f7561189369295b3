/**
 * `npm run openapi:write` runs this first. Writes src/http/schemas/examples.generated.ts from the service's own
 * answers (scripts/response-examples.ts). Run after a change to a scenario or to what a route answers;
 * test/contract/examples-current.test.ts fails until you do.
 */
import { writeFileSync } from 'node:fs';
import { renderResponseExamples, RESPONSE_EXAMPLES_PATH } from './response-examples.ts';

const { text, operations } = await renderResponseExamples();
writeFileSync(RESPONSE_EXAMPLES_PATH, text);
console.log(`wrote ${RESPONSE_EXAMPLES_PATH} (${operations} operations)`);
