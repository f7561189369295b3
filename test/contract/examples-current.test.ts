/**
 * The response examples in the contract are the service's own answers: rendering them again must give the
 * committed src/http/schemas/examples.generated.ts. A physics or wording change that moves an answer fails
 * here until `npm run openapi:write` regenerates the examples (and the document and client that embed them).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { renderResponseExamples, RESPONSE_EXAMPLES_PATH } from '../../scripts/response-examples.ts';

describe('contract response examples', () => {
  it('equal the answers the service gives today (stale: npm run openapi:write)', async () => {
    const { text } = await renderResponseExamples();
    const committed = readFileSync(RESPONSE_EXAMPLES_PATH, 'utf8');
    const fresh = text.split('\n');
    const old = committed.split('\n');
    const differing: string[] = [];
    for (let i = 0; i < Math.max(fresh.length, old.length) && differing.length < 8; i++) {
      if (fresh[i] !== old[i]) differing.push(`line ${i + 1}: committed ${JSON.stringify(old[i])} | today ${JSON.stringify(fresh[i])}`);
    }
    expect(differing, 'contract examples are stale: run npm run openapi:write and commit the regenerated files').toEqual([]);
  }, 120_000);
});
