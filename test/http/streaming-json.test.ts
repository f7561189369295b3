/**
 * The streaming JSON reader for large bodies against the reference: ECMAScript's
 * JSON.parse (ECMA-262 §25.5.1, RFC 8259 grammar) on the same text, with the
 * text cut into chunks at random places (multi-byte UTF-8 characters, escapes
 * and numbers split across chunks), and the sample arrays against the numbers
 * JSON.parse reads. Then the same reader through the service: a capture body
 * above the large-body threshold gives the same fit as the same body below it.
 */
import { describe, expect, it } from 'vitest';
import { buildApp } from '../../src/http/app.ts';
import { HttpProblem } from '../../src/http/problem.ts';
import { parseJsonNumber, sampleArraysOf, StreamingJsonParser } from '../../src/http/streaming-json.ts';

function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function parseInChunks(text: string, random: () => number, samplePaths: string[] = [], maxDepth = 64): unknown {
  const bytes = Buffer.from(text, 'utf8');
  const parser = new StreamingJsonParser({ maxDepth, samplePaths: new Set(samplePaths) });
  for (let at = 0; at < bytes.length; ) {
    const size = 1 + Math.floor(random() * 17);
    parser.write(bytes.subarray(at, at + size));
    at += size;
  }
  return parser.end();
}

/** Numbers written the ways JSON producers write them. */
function randomNumberText(random: () => number): string {
  const x = (random() - 0.5) * 10 ** Math.floor(random() * 40 - 20);
  switch (Math.floor(random() * 6)) {
    case 0:
      return String(x);
    case 1:
      return x.toFixed(Math.floor(random() * 8));
    case 2:
      return x.toExponential(Math.floor(random() * 17)).replace('e+', random() < 0.5 ? 'e' : 'E+');
    case 3:
      return String(Math.round(x * 1e6));
    case 4:
      return x.toPrecision(1 + Math.floor(random() * 21));
    default:
      return ['0', '-0', '0.0', '1e308', '5e-324', '2.2250738585072014e-308', '9007199254740993', '123456789012345678901234567890', '0.1', '1E400'][Math.floor(random() * 10)];
  }
}

function randomValue(random: () => number, depth: number): string {
  const r = random();
  if (depth > 4 || r < 0.35) return randomNumberText(random);
  if (r < 0.5) return JSON.stringify(['', 'plain', 'ümlaut → ∞ 😀', 'quote " and \\ back', 'tab\tnew\nline', '\u0001'][Math.floor(random() * 6)]);
  if (r < 0.6) return ['true', 'false', 'null'][Math.floor(random() * 3)];
  if (r < 0.8) return `[${Array.from({ length: Math.floor(random() * 5) }, () => randomValue(random, depth + 1)).join(random() < 0.5 ? ',' : ' , ')}]`;
  const keys = ['a', 'b', 'ключ', 'with/slash', 'x~y', ''];
  return `{ ${Array.from({ length: Math.floor(random() * 5) }, () => `${JSON.stringify(keys[Math.floor(random() * keys.length)])} : ${randomValue(random, depth + 1)}`).join(',\n')} }`;
}

function problemOf(fn: () => unknown): HttpProblem {
  try {
    fn();
  } catch (err) {
    if (err instanceof HttpProblem) return err;
    throw err;
  }
  throw new Error('expected a problem');
}

describe('streaming JSON reader = JSON.parse', () => {
  it('reads 2,000 random documents cut at random places exactly as JSON.parse does', () => {
    const random = mulberry32(181);
    for (let k = 0; k < 2000; k++) {
      const text = randomValue(random, 0);
      expect(parseInChunks(text, random), text).toStrictEqual(JSON.parse(text));
    }
  });

  it('rounds numbers correctly: 100,000 random numbers bit-identical to JSON.parse', () => {
    const random = mulberry32(7);
    const differing: string[] = [];
    for (let k = 0; k < 100_000; k++) {
      const text = randomNumberText(random);
      const bytes = Buffer.from(text, 'latin1');
      if (!Object.is(parseJsonNumber(bytes, bytes.length), JSON.parse(text) as number)) differing.push(text);
    }
    expect(differing).toStrictEqual([]);
  });

  it('refuses what JSON.parse refuses', () => {
    const random = mulberry32(3);
    for (const text of ['', ' ', '{', '[1,]', '{"a":1,}', '01', '1.', '.5', '+1', '-', '1e', 'tru', 'nul', '"a\\x"', '"\u0001"', '{"a" 1}', '[1 2]', '{} x', 'NaN', '[Infinity]', "'a'"]) {
      expect(() => JSON.parse(text), text).toThrow();
      const p = problemOf(() => parseInChunks(text, random));
      expect(p.status, text).toBe(400);
      expect(['malformed-body', 'empty-body']).toContain(p.code);
    }
  });

  it('refuses nesting deeper than the limit and prototype keys, naming the field', () => {
    const random = mulberry32(5);
    expect(problemOf(() => parseInChunks('[[[[1]]]]', random, [], 3)).code).toBe('too-deeply-nested');
    expect(parseInChunks('[[[1]]]', random, [], 3)).toStrictEqual([[[1]]]);
    const proto = problemOf(() => parseInChunks('{"a":{"__proto__":{"x":1}}}', random));
    expect(proto.errors?.[0].pointer).toBe('/a/__proto__');
    const ctor = problemOf(() => parseInChunks('{"constructor":{"prototype":{}}}', random));
    expect(ctor.errors?.[0].pointer).toBe('/constructor/prototype');
  });

  it('reads sample arrays into Float64Arrays (null as NaN) and leaves [] in the body', () => {
    const random = mulberry32(11);
    const numbers = Array.from({ length: 5000 }, () => randomNumberText(random)).filter((t) => Number.isFinite(JSON.parse(t) as number));
    const text = `{"capture":{"output":[${numbers.join(',')},null],"other":[1,2]},"output":[3]}`;
    const body = parseInChunks(text, random, ['/capture/output']) as { capture: { output: unknown[]; other: number[] }; output: number[] };
    expect(body.capture.output).toStrictEqual([]);
    expect(body.capture.other).toStrictEqual([1, 2]);
    expect(body.output).toStrictEqual([3]);
    const samples = sampleArraysOf(body)!.get('/capture/output')!;
    expect(samples).toBeInstanceOf(Float64Array);
    expect(samples.length).toBe(numbers.length + 1);
    numbers.forEach((t, i) => expect(samples[i]).toBe(JSON.parse(t) as number));
    expect(samples[numbers.length]).toBeNaN();
    const bad = problemOf(() => parseInChunks('{"capture":{"output":[1,"2"]}}', random, ['/capture/output']));
    expect(bad.errors?.[0].pointer).toBe('/capture/output/1');
    const nested = problemOf(() => parseInChunks('{"capture":{"output":[1,[2]]}}', random, ['/capture/output']));
    expect(nested.errors?.[0].pointer).toBe('/capture/output/1');
  });
});

describe('a large capture body through the service', () => {
  it('gives the same fit as the same body read whole, and a bad sample is a 400 naming it', async () => {
    // Our own scenario: a ±5 V clock on the ideal archetype; the capture is the service's own waveform.
    const circuit = { topology: 'two-resistor-feedback', supply: { positiveV: 5, negativeV: -5 }, amplifier: 'ideal', parts: { rTiming: 10000, cTiming: 1e-8, rFeedback: 10000, rGround: 10000 } };
    const analyzed = await (async () => {
      const app = await buildApp({ config: { databasePath: ':memory:', workerThreads: 0 } });
      try {
        const r = await app.inject({ method: 'POST', url: '/v1/waveform', payload: { circuit, samples: 1200, periods: 4 } });
        return r.json() as { timeS: number[]; outputV: number[]; capacitorV: number[] };
      } finally {
        await app.close();
      }
    })();
    expect(analyzed.timeS, 'waveform answer shape').toHaveLength(1200);
    const body = JSON.stringify({ circuit, capture: { timeS: analyzed.timeS, output: analyzed.outputV, capacitor: analyzed.capacitorV } });
    const answers: unknown[] = [];
    for (const largeBodyBytes of [1024 * 1024 * 1024, 1024]) {
      const app = await buildApp({ config: { databasePath: ':memory:', workerThreads: 1, largeBodyBytes } });
      try {
        const r = await app.inject({ method: 'POST', url: '/v1/fit', headers: { 'content-type': 'application/json' }, payload: body });
        expect(r.statusCode, r.body).toBe(200);
        answers.push(r.json());
        const bad = body.replace(/"output":\[([^,]+),/, '"output":[$1,"x",');
        const rb = await app.inject({ method: 'POST', url: '/v1/fit', headers: { 'content-type': 'application/json' }, payload: bad });
        expect(rb.statusCode).toBe(400);
        expect((rb.json() as { errors: { pointer: string }[] }).errors[0].pointer).toBe('/capture/output/1');
      } finally {
        await app.close();
      }
    }
    expect(answers[1]).toStrictEqual(answers[0]);
  }, 180_000);
});
