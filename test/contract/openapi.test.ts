/**
 * The generated document is valid OpenAPI 3.1 (checked with the
 * @seriousme/openapi-schema-validator package, which holds the official
 * OpenAPI JSON schemas) and equals the committed openapi/openapi.json.
 */
import { readFileSync } from 'node:fs';
import { Validator } from '@seriousme/openapi-schema-validator';
import { describe, expect, it } from 'vitest';
import { generateOpenApiDocument, OPENAPI_PATH } from '../../src/http/openapi-document.ts';

describe('OpenAPI contract document', () => {
  it('validates as OpenAPI 3.1', async () => {
    const doc = JSON.parse(await generateOpenApiDocument());
    const validator = new Validator();
    const result = await validator.validate(doc);
    expect(result.errors ?? []).toEqual([]);
    expect(result.valid).toBe(true);
    expect(validator.version).toBe('3.1');
  });

  it('equals the committed openapi/openapi.json (run npm run openapi:write after changing a schema)', async () => {
    const generated = (await generateOpenApiDocument()) + '\n';
    expect(readFileSync(OPENAPI_PATH, 'utf8')).toBe(generated);
  });

  it('names shared schemas by their $id, not def-N', async () => {
    const doc = JSON.parse(await generateOpenApiDocument());
    const names = Object.keys(doc.components.schemas);
    expect(names).toContain('Circuit');
    expect(names).toContain('Problem');
    expect(names.some((n) => /^def-\d+$/.test(n))).toBe(false);
  });
});
