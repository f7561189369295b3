/**
 * Contract checking against the generated OpenAPI document: every response a
 * test sees can be validated against the schema the document declares for that
 * route, status and media type (Ajv 2020-12, resolving $refs into the document).
 */
import Ajv2020Module from 'ajv/dist/2020.js';
import addFormats from 'ajv-formats';
import type { LightMyRequestResponse } from 'fastify';
import { expect } from 'vitest';
import { generateOpenApiDocument } from '../../src/http/openapi-document.ts';

// ajv ships CommonJS: under NodeNext the class is the default export's `default`.
const Ajv2020 = (Ajv2020Module as unknown as { default: typeof Ajv2020Module.default }).default ?? Ajv2020Module;

type Doc = { paths: Record<string, Record<string, { responses: Record<string, { content?: Record<string, { schema: unknown }> }> }>> };

let docPromise: Promise<Doc> | undefined;
let ajv: InstanceType<typeof Ajv2020Module.default> | undefined;

export function openApiDocument(): Promise<Doc> {
  docPromise ??= generateOpenApiDocument().then((s) => JSON.parse(s) as Doc);
  return docPromise;
}

async function validator() {
  if (!ajv) {
    const doc = await openApiDocument();
    ajv = new Ajv2020({ strict: false, allErrors: true });
    (addFormats as unknown as (a: unknown) => void)(ajv);
    ajv.addSchema(doc as object, 'openapi');
  }
  return ajv;
}

/** OpenAPI path template for a fastify route url ("/v1/amplifiers/:id" -> "/v1/amplifiers/{id}"). */
export function openApiPath(route: string): string {
  return route.replace(/:([A-Za-z0-9_]+)/g, '{$1}');
}

/**
 * Asserts the response matches the document: the route and status are declared,
 * the media type is declared for that status, and a JSON body validates.
 */
export async function expectContract(res: LightMyRequestResponse, method: string, route: string): Promise<void> {
  const doc = await openApiDocument();
  const path = openApiPath(route);
  const op = doc.paths[path]?.[method.toLowerCase()];
  expect(op, `${method} ${path} is not in the OpenAPI document`).toBeDefined();
  const status = String(res.statusCode);
  const declared = op!.responses[status];
  expect(declared, `${method} ${path} does not declare status ${status}`).toBeDefined();
  const content = declared.content ?? {};
  // 204 and 304 carry no body (RFC 9110 §15.3.5, §15.4.5): the document must not promise one.
  if (res.statusCode === 204 || res.statusCode === 304) {
    expect(res.body, `${method} ${path} ${status} must have an empty body`).toBe('');
    expect(Object.keys(content), `${method} ${path} ${status} declares a body`).toEqual([]);
    return;
  }
  const mediaType = String(res.headers['content-type'] ?? '').split(';')[0].trim();
  expect(Object.keys(content), `${method} ${path} ${status} does not declare ${mediaType}`).toContain(mediaType);
  if (mediaType.endsWith('json')) {
    const pointer = `openapi#/paths/${path.replace(/~/g, '~0').replace(/\//g, '~1')}/${method.toLowerCase()}/responses/${status}/content/${mediaType.replace(/\//g, '~1')}/schema`;
    const v = await validator();
    const validate = v.getSchema(pointer);
    expect(validate, `no schema at ${pointer}`).toBeDefined();
    const body = res.json();
    const ok = validate!(body);
    expect(ok, `${method} ${path} ${status} body violates the contract: ${JSON.stringify(validate!.errors)}`).toBe(true);
  }
}
