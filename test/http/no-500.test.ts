/**
 * No input yields a 500: every POST route gets arbitrary JSON and mutations of a
 * valid body (fields dropped, retyped, set to extreme numbers), property-tested
 * with fast-check under a fixed seed. Each answer must be < 500 and, when it is
 * an error, RFC 9457 problem+json.
 */
import fc from 'fast-check';
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { testApp } from '../helpers/app.ts';
import { bomAssembly } from './fixtures/heavy-requests.ts';

let app: FastifyInstance;
beforeAll(async () => {
  app = await testApp({ config: { workerThreads: 1 } });
});
afterAll(async () => app.close());

const circuit = {
  topology: 'three-resistor-divider',
  supply: { positiveV: 5, negativeV: 0 },
  amplifier: 'cmos-rrio-fast',
  parts: { rTiming: '2k2', cTiming: '180n', rTop: '5k1', rBottom: '5k1', rFeedback: '18k' },
};

// A valid body per route (our own scenario values).
const VALID: Record<string, unknown> = {
  '/v1/analyze': circuit,
  '/v1/waveform': { circuit, periods: 2, samples: 200 },
  '/v1/design': { targetFrequencyHz: 5000, supply: { positiveV: 5 }, amplifier: 'cmos-rrio-fast', count: 1 },
  '/v1/snap': { values: [{ ideal: 15800, kind: 'resistor', source: { series: 'E24' } }] },
  '/v1/tolerance': { circuit, tolerances: { rTiming: 0.01, cTiming: 0.05 }, monteCarlo: { samples: 200, seed: 1, distribution: 'uniform' } },
  '/v1/fit': { circuit, measurements: { frequencyHz: { value: 5100, uncertainty: 5 } } },
  '/v1/bom-checks': { assemblies: [bomAssembly(0)] },
};

const WEIRD_VALUES = fc.oneof(
  fc.constantFrom(null, true, '', 'NaN', '-1', '1e400', '4k7k', 0, -1, 1e308, -1e308, 5e-324, [], {}, 'ideal'),
  fc.double(),
  fc.string({ maxLength: 8 }),
  fc.integer(),
);

/** Paths to every leaf of a JSON value. */
function leaves(value: unknown, path: (string | number)[] = []): (string | number)[][] {
  if (value === null || typeof value !== 'object') return [path];
  const keys = Array.isArray(value) ? value.map((_, i) => i) : Object.keys(value);
  return [path, ...keys.flatMap((k) => leaves((value as Record<string | number, unknown>)[k], [...path, k]))];
}

function mutate(body: unknown, path: (string | number)[], replacement: unknown, drop: boolean): unknown {
  if (path.length === 0) return replacement;
  const copy = structuredClone(body) as Record<string | number, unknown>;
  let node = copy as Record<string | number, unknown>;
  for (const key of path.slice(0, -1)) node = node[key] as Record<string | number, unknown>;
  const last = path[path.length - 1];
  if (drop && !Array.isArray(node)) delete node[last];
  else node[last] = replacement;
  return copy;
}

async function expectNo500(url: string, payload: string, method: 'POST' | 'PUT' = 'POST') {
  const res = await app.inject({ method, url, payload, headers: { 'content-type': 'application/json' } });
  expect(res.statusCode, `${url} ${payload.slice(0, 300)} -> ${res.body.slice(0, 300)}`).toBeLessThan(500);
  if (res.statusCode >= 400) expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
}

describe('no input yields a 500', () => {
  for (const [url, valid] of Object.entries(VALID)) {
    const paths = leaves(valid);
    it(`${url}: mutations of a valid body and arbitrary JSON`, async () => {
      const valid200 = await app.inject({ method: 'POST', url, payload: valid as object });
      expect(valid200.statusCode, valid200.body.slice(0, 300)).toBe(200);
      await fc.assert(
        fc.asyncProperty(fc.constantFrom(...paths), WEIRD_VALUES, fc.boolean(), async (path, replacement, drop) => {
          await expectNo500(url, JSON.stringify(mutate(valid, path, replacement, drop)));
        }),
        { seed: 4242, numRuns: 120 },
      );
      await fc.assert(
        fc.asyncProperty(fc.jsonValue({ maxDepth: 3 }), async (body) => {
          await expectNo500(url, JSON.stringify(body) ?? 'null');
        }),
        { seed: 4243, numRuns: 40 },
      );
    }, 120_000);
  }
});

// PUT bodies go to the store: a mutation must be refused (or stored) cleanly, never crash it.
const STORED: Record<string, unknown> = {
  '/v1/catalogues/fuzz-cat': {
    name: 'Fuzz catalogue',
    parts: [{ kind: 'capacitor', value: '10n', tolerance: 0.05, dielectric: 'C0G', ratedVoltageV: 50, partNumber: 'FZ-1', package: '0603', status: 'preferred' }],
  },
  '/v1/amplifiers/fuzz-amp': { name: 'Fuzz amplifier', base: 'cmos-rrio-fast', slewRateVPerS: 2e6 },
};

let putCounter = 0;

describe('no stored-resource body yields a 500', () => {
  for (const [url, valid] of Object.entries(STORED)) {
    it(`PUT ${url}: mutations of a valid body`, async () => {
      await fc.assert(
        fc.asyncProperty(fc.constantFrom(...leaves(valid)), WEIRD_VALUES, fc.boolean(), async (path, replacement, drop) => {
          // A fresh id per run: creation needs no If-Match, so every mutation reaches validation and the store.
          await expectNo500(`${url}-${++putCounter}`, JSON.stringify(mutate(valid, path, replacement, drop)), 'PUT');
        }),
        { seed: 4244, numRuns: 120 },
      );
      const ready = await app.inject({ method: 'GET', url: '/readyz' });
      expect(ready.statusCode).toBe(200);
    }, 120_000);
  }
});
