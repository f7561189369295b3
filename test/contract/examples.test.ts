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

  it('every component, every property of every schema in the document and every parameter has a description', async () => {
    const doc = await openApiDocument();
    // The walker must find what it is meant to find: a nested property, an undescribed component, one inside
    // array items, one in an anyOf branch and an undescribed parameter (so this check cannot pass by walking nothing).
    const planted = undescribedFields({
      components: { schemas: { A: { type: 'object', description: 'x', properties: { ok: { type: 'number', description: 'x' }, inner: { type: 'object', description: 'x', properties: { bare: { type: 'number' } } } } }, B: { type: 'string' } } },
      paths: {
        '/p': {
          get: {
            parameters: [{ in: 'query', name: 'q', schema: { type: 'string' } }],
            responses: { 200: { content: { 'application/json': { schema: { type: 'array', items: { anyOf: [{ type: 'object', properties: { deep: { type: 'string' } } }] } } } } } },
          },
        },
      },
    });
    expect(planted).toEqual(['#/components/schemas/A/properties/inner/properties/bare', '#/components/schemas/B', 'GET /p parameter q', 'GET /p responses/200 application/json: items/anyOf/0/properties/deep']);

    const undescribed = undescribedFields(doc as unknown as DocumentShape);
    expect(undescribed, 'describe these fields in src/http/schemas (unit, meaning, default, range), then npm run openapi:write').toEqual([]);
    // A document of this size has hundreds of fields: make sure they were walked.
    expect(countedFields(doc as unknown as DocumentShape)).toBeGreaterThan(500);
  });
});

type SchemaNode = Record<string, unknown>;
type DocumentShape = {
  components?: { schemas?: Record<string, SchemaNode> };
  paths: Record<string, Record<string, { parameters?: SchemaNode[]; requestBody?: { content?: Record<string, Media> }; responses: Record<string, { content?: Record<string, Media> }> }>>;
};

/** Calls `visit` for every property schema under `node`, following every subschema keyword of JSON Schema 2020-12 that can hold properties. */
function walkProperties(node: unknown, path: string, visit: (property: SchemaNode, path: string) => void): void {
  if (node === null || typeof node !== 'object') return;
  const n = node as SchemaNode;
  for (const [name, property] of Object.entries((n.properties ?? {}) as Record<string, unknown>)) {
    if (property !== null && typeof property === 'object') visit(property as SchemaNode, `${path}/properties/${name}`);
    walkProperties(property, `${path}/properties/${name}`, visit);
  }
  for (const [pattern, sub] of Object.entries((n.patternProperties ?? {}) as Record<string, unknown>)) walkProperties(sub, `${path}/patternProperties/${pattern}`, visit);
  for (const key of ['items', 'prefixItems', 'anyOf', 'oneOf', 'allOf', 'not', 'additionalProperties', 'if', 'then', 'else']) {
    const sub = n[key];
    if (Array.isArray(sub)) sub.forEach((x, i) => walkProperties(x, `${path}/${key}/${i}`, visit));
    else walkProperties(sub, `${path}/${key}`, visit);
  }
}

/** Every schema of the document: the components, each operation's parameters, request bodies and responses. */
function forEachField(doc: DocumentShape, visit: (property: SchemaNode, where: string) => void, visitParameter: (parameter: SchemaNode, where: string) => void): void {
  for (const [name, schema] of Object.entries(doc.components?.schemas ?? {})) {
    // A shared schema says what it is, once, for every place that references it.
    visit(schema, `#/components/schemas/${name}`);
    walkProperties(schema, `#/components/schemas/${name}`, visit);
  }
  for (const [path, operations] of Object.entries(doc.paths)) {
    for (const [method, op] of Object.entries(operations)) {
      const key = `${method.toUpperCase()} ${path}`;
      for (const parameter of op.parameters ?? []) {
        visitParameter(parameter, `${key} parameter ${String(parameter.name)}`);
        walkProperties(parameter.schema, `${key} parameter ${String(parameter.name)}:`, visit);
      }
      for (const [mediaType, media] of Object.entries(op.requestBody?.content ?? {})) walkProperties(media.schema, `${key} requestBody ${mediaType}:`, visit);
      for (const [status, response] of Object.entries(op.responses)) {
        for (const [mediaType, media] of Object.entries(response.content ?? {})) walkProperties(media.schema, `${key} responses/${status} ${mediaType}:`, visit);
      }
    }
  }
}

const hasDescription = (node: SchemaNode) => typeof node.description === 'string' && node.description.trim().length > 0;

/** Fields without a description. A property that only references a component needs its own (ref() in src/http/schemas/common.ts). */
function undescribedFields(doc: DocumentShape): string[] {
  const out: string[] = [];
  forEachField(
    doc,
    (property, where) => {
      if (!hasDescription(property)) out.push(where.replace(/: ?\//, ': '));
    },
    (parameter, where) => {
      if (!hasDescription(parameter) && !hasDescription((parameter.schema ?? {}) as SchemaNode)) out.push(where);
    },
  );
  return out;
}

function countedFields(doc: DocumentShape): number {
  let n = 0;
  forEachField(doc, () => n++, () => n++);
  return n;
}

