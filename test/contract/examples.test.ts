/**
 * Examples in the contract (OpenAPI 3.1 §4.8.14 Media Type Object `examples`):
 * every POST and PUT carries a request example, every 200 a response example;
 * each validates against the schema the document declares beside it
 * (JSON Schema 2020-12, Ajv), and each request example is accepted by the
 * service as it stands.
 */
import Ajv2020Module from 'ajv/dist/2020.js';
import addFormats from 'ajv-formats';
import { describe, expect, it } from 'vitest';
import { AMPLIFIER_EXAMPLE_ID, CATALOGUE_EXAMPLE_ID } from '../../src/http/schemas/examples.ts';
import { testApp } from '../helpers/app.ts';
import { openApiDocument } from '../helpers/contract.ts';

const Ajv2020 = (Ajv2020Module as unknown as { default: typeof Ajv2020Module.default }).default ?? Ajv2020Module;

type Media = { schema?: unknown; examples?: Record<string, { summary?: string; value: unknown }> };
type Operation = { requestBody?: { content?: Record<string, Media> }; responses: Record<string, { content?: Record<string, Media> }> };

async function operations(): Promise<{ key: string; method: string; path: string; op: Operation }[]> {
  const doc = (await openApiDocument()) as unknown as { paths: Record<string, Record<string, Operation>> };
  return Object.entries(doc.paths).flatMap(([path, ops]) => Object.entries(ops).map(([method, op]) => ({ key: `${method.toUpperCase()} ${path}`, method, path, op })));
}

const escape = (s: string) => s.replace(/~/g, '~0').replace(/\//g, '~1');

describe('examples in the contract', () => {
  it('every POST and PUT has a JSON request example; every 200 with a body has a response example', async () => {
    const missing: string[] = [];
    for (const { key, method, op } of await operations()) {
      if (method === 'post' || method === 'put') {
        if (Object.keys(op.requestBody?.content?.['application/json']?.examples ?? {}).length === 0) missing.push(`${key} request`);
      }
      const ok = op.responses['200']?.content;
      if (ok && !Object.values(ok).some((m) => Object.keys(m.examples ?? {}).length > 0)) missing.push(`${key} 200`);
    }
    expect(missing, 'add a request example to src/http/schemas/examples.ts, then npm run examples:write && npm run openapi:write').toEqual([]);
  });

  it('every example validates against its schema (stale ones: npm run examples:write && npm run openapi:write)', async () => {
    const doc = await openApiDocument();
    const ajv = new Ajv2020({ strict: false, allErrors: true });
    (addFormats as unknown as (a: unknown) => void)(ajv);
    ajv.addSchema(doc as object, 'openapi');
    const failures: string[] = [];
    let checked = 0;
    for (const { key, method, path, op } of await operations()) {
      const places: [string, Record<string, Media> | undefined][] = [
        ['requestBody', op.requestBody?.content],
        ...Object.entries(op.responses).map(([status, r]): [string, Record<string, Media> | undefined] => [`responses/${status}`, r.content]),
      ];
      for (const [place, content] of places) {
        for (const [mediaType, media] of Object.entries(content ?? {})) {
          for (const [name, example] of Object.entries(media.examples ?? {})) {
            const pointer = `openapi#/paths/${escape(path)}/${method}/${place}/content/${escape(mediaType)}/schema`;
            const validate = ajv.getSchema(pointer);
            if (!validate) {
              failures.push(`${key} ${place} ${mediaType}: no schema`);
              continue;
            }
            checked++;
            if (!validate(example.value)) failures.push(`${key} ${place} ${mediaType} ${name}: ${ajv.errorsText(validate.errors)}`);
          }
        }
      }
    }
    expect(failures).toEqual([]);
    expect(checked).toBeGreaterThanOrEqual(25);
  });

  it('the service accepts every request example (200, or 201 for a first PUT)', async () => {
    const app = await testApp();
    try {
      for (const { key, method, path, op } of await operations()) {
        if (method !== 'post' && method !== 'put') continue;
        const url = path.replace('{id}', path.includes('catalogues') ? CATALOGUE_EXAMPLE_ID : AMPLIFIER_EXAMPLE_ID);
        for (const [name, example] of Object.entries(op.requestBody?.content?.['application/json']?.examples ?? {})) {
          const res = await app.inject({ method: method.toUpperCase() as 'POST' | 'PUT', url, payload: example.value as object, ...(method === 'put' ? { headers: { 'if-none-match': '*' } } : {}) });
          expect([200, 201], `${key} ${name}: ${res.body.slice(0, 300)}`).toContain(res.statusCode);
        }
      }
    } finally {
      await app.close();
    }
  });

  it('every property of these components has a description (the list only grows)', async () => {
    const doc = (await openApiDocument()) as unknown as { components: { schemas: Record<string, unknown> } };
    // Components whose every property is described; the others are still to do (see the final report).
    const described = [
      'ComponentValue', 'Supply', 'InlineAmplifier', 'AmplifierSpec', 'Check', 'Problem', 'OutputLoad', 'Diode', 'BomLine',
      'BomSupply', 'BomTemperatureRange', 'BomSpec', 'BomCheckOptions', 'FitCapture', 'Tolerances', 'ValueSource', 'TemperatureCoefficient',
      'Series', 'SeriesList',
    ];
    const undescribed: string[] = [];
    const walk = (node: unknown, path: string): void => {
      if (node === null || typeof node !== 'object') return;
      const n = node as Record<string, unknown>;
      for (const [name, property] of Object.entries((n.properties ?? {}) as Record<string, Record<string, unknown>>)) {
        if (typeof property === 'object' && property !== null && !('$ref' in property) && property.description === undefined) undescribed.push(`${path}/${name}`);
        walk(property, `${path}/${name}`);
      }
      for (const key of ['items', 'anyOf', 'oneOf', 'allOf', 'additionalProperties']) {
        const sub = n[key];
        if (Array.isArray(sub)) sub.forEach((x, i) => walk(x, `${path}/${key}${i}`));
        else walk(sub, `${path}/${key}`);
      }
    };
    for (const name of described) {
      expect(doc.components.schemas[name], `${name} is not a component`).toBeDefined();
      walk(doc.components.schemas[name], name);
    }
    expect(undescribed).toEqual([]);
  });
});

