/** POST /v1/fit over HTTP: JSON scalars, JSON capture arrays, CSV (in JSON and as text/csv), and every bad capture. */
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectContract } from '../helpers/contract.ts';
import { testApp } from '../helpers/app.ts';
import { addNoise, quantise } from '../core/fit/capture-synth.ts';
import { synthesizeCapture } from '../core/fit/estimate-capture-synth.ts';
import { bridgeClock, withParts } from '../core/fit/estimate-scenario.ts';

let app: FastifyInstance;
beforeAll(async () => {
  app = await testApp();
});
afterAll(async () => app.close());

// Our own scenario (see test/core/fit/estimate-scenario.ts): a ±2.5 V 10 kHz bridge-excitation clock.
const circuit = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 2.5, negativeV: -2.5 },
  amplifier: { base: 'cmos-rrio-fast', outputResistanceOhm: 0 },
  parts: { rTiming: '16k', cTiming: '4n7', rFeedback: '22k', rGround: '10k' },
};
const tolerances = { cTiming: 0.1, rTiming: 0.01, rFeedback: 0.01, rGround: 0.01 };
const DT = 0.1e-6;
const N = 20_000; // 2 ms

function capture(cTimingF = 4.7e-9, seed = 7) {
  const c = synthesizeCapture(withParts(bridgeClock, { cTiming: cTimingF }), { sampleIntervalS: DT, sampleCount: N, phaseS: 21e-6 });
  addNoise(c.output, 0.02, seed);
  addNoise(c.capacitor, 0.005, seed + 1);
  return { output: Array.from(quantise(c.output, 8, -3, 3)), capacitor: Array.from(quantise(c.capacitor, 8, -1.5, 1.5)) };
}

async function fit(payload: unknown) {
  const res = await app.inject({ method: 'POST', url: '/v1/fit', payload: payload as object });
  await expectContract(res, 'POST', '/v1/fit');
  return res;
}

async function fitCsv(csv: string, query: Record<string, string>) {
  const res = await app.inject({ method: 'POST', url: `/v1/fit?${new URLSearchParams(query).toString()}`, headers: { 'content-type': 'text/csv' }, payload: csv });
  await expectContract(res, 'POST', '/v1/fit');
  return res;
}

function toCsv(c: { output: number[]; capacitor: number[] }): string {
  // A scope-style export: metadata, a header with units, time in µs, channels in V.
  const lines = ['Model,bench scope', 'Record Length,' + c.output.length, 'Time (us),CH1 (V),CH2 (V)'];
  for (let i = 0; i < c.output.length; i++) lines.push(`${(i * DT * 1e6).toFixed(4)},${c.output[i].toFixed(4)},${c.capacitor[i].toFixed(4)}`);
  return lines.join('\r\n');
}

describe('POST /v1/fit', () => {
  it('scalar figures: estimates by part role and amplifier effect, ranked explanations naming their parameter', async () => {
    const res = await fit({ circuit, tolerances, measurements: { frequencyHz: { value: 8000, uncertainty: 5 }, dutyCycle: 0.5 } });
    expect(res.statusCode).toBe(200);
    const body = res.json();
    const names = body.estimates.map((e: { parameter: string }) => e.parameter);
    expect(names).toEqual(expect.arrayContaining(['cTiming', 'rTiming', 'rFeedback', 'rGround', 'outputHighV', 'outputLowV', 'slewRateVPerS', 'recoveryDelayS']));
    for (const e of body.estimates) expect(Object.keys(e)).toEqual(expect.arrayContaining(['parameter', 'nominal', 'estimate', 'standardDeviation']));
    expect(body.explanations.length).toBeGreaterThan(0);
    for (const ex of body.explanations) {
      expect(ex.causes.length).toBeGreaterThan(0);
      for (const c of ex.causes) expect(names).toContain(c.parameter);
    }
    expect(body.verdict.agreesWithNominal).toBe(false);
    expect(body.measurements[0]).toMatchObject({ name: 'frequencyHz', value: 8000, uncertainty: 5, source: 'scalar' });
  });

  it('a capture as JSON arrays: capacitor 8 % high found and ranked first', async () => {
    const res = await fit({ circuit, tolerances, capture: { sampleIntervalS: DT, ...capture(4.7e-9 * 1.08) } });
    expect(res.statusCode).toBe(200);
    const body = res.json();
    expect(body.capture.features.sampleCount).toBe(N);
    expect(body.explanations[0].causes.map((c: { parameter: string }) => c.parameter)).toEqual(['cTiming']);
    const c = body.estimates.find((e: { parameter: string }) => e.parameter === 'cTiming');
    expect(Math.abs(c.estimate - 4.7e-9 * 1.08)).toBeLessThan(3 * c.standardDeviation);
    expect(body.indistinguishable.some((p: { parameters: string[] }) => p.parameters.includes('rTiming') && p.parameters.includes('cTiming'))).toBe(true);
  });

  it('a scope CSV as a text/csv body with the circuit in the query, and the same CSV inside JSON', async () => {
    const csv = toCsv(capture(4.7e-9 * 1.08, 9));
    const asText = await fitCsv(csv, { circuit: JSON.stringify(circuit), tolerances: JSON.stringify(tolerances) });
    expect(asText.statusCode).toBe(200);
    const a = asText.json();
    expect(a.capture.notes.some((n: string) => n.startsWith('csv:'))).toBe(true);
    expect(a.explanations[0].causes[0].parameter).toBe('cTiming');
    const inJson = await fit({ circuit, tolerances, capture: { csv } });
    expect(inJson.statusCode).toBe(200);
    expect(inJson.json().estimates).toEqual(a.estimates);
  });

  it('text/csv without ?circuit, bad query JSON and a bad query circuit -> 400 with pointers', async () => {
    const csv = toCsv(capture());
    const none = await fitCsv(csv, {});
    expect(none.statusCode).toBe(400);
    expect(none.json().errors[0]).toMatchObject({ pointer: '/circuit', in: 'query' });
    const broken = await fitCsv(csv, { circuit: '{"topology":' });
    expect(broken.statusCode).toBe(400);
    const wrong = await fitCsv(csv, { circuit: JSON.stringify({ ...circuit, parts: { ...circuit.parts, rTiming: -1 } }) });
    expect(wrong.statusCode).toBe(400);
    expect(wrong.json().errors[0].pointer).toContain('/circuit/parts/rTiming');
  });

  it('nothing to fit, an unknown tolerance role, a bad measurement -> 400 naming the field', async () => {
    const empty = await fit({ circuit });
    expect(empty.statusCode).toBe(400);
    const role = await fit({ circuit, tolerances: { rTop: 0.01 }, measurements: { frequencyHz: 9000 } });
    expect(role.statusCode).toBe(400);
    expect(role.json().errors[0].pointer).toBe('/tolerances/rTop');
    const duty = await fit({ circuit, measurements: { dutyCycle: 1.5 } });
    expect(duty.statusCode).toBe(400);
    expect(duty.json().errors[0].pointer).toBe('/measurements/dutyCycle');
  });

  it('another media type -> 415', async () => {
    const res = await app.inject({ method: 'POST', url: '/v1/fit', headers: { 'content-type': 'application/xml' }, payload: '<x/>' });
    await expectContract(res, 'POST', '/v1/fit');
    expect(res.statusCode).toBe(415);
  });
});

describe('POST /v1/fit with bad captures -> 422 with the reason', () => {
  const good = capture();
  const cases: [string, Record<string, unknown>][] = [
    ['a flat line', { sampleIntervalS: DT, output: new Array(N).fill(1.2) }],
    ['one edge only', { sampleIntervalS: DT, output: Array.from({ length: N }, (_, i) => (i < N / 2 ? -2.4 : 2.4)) }],
    ['a clipped capacitor channel', { sampleIntervalS: DT, output: good.output, capacitor: good.capacitor.map((v) => Math.max(-0.5, Math.min(0.5, v))) }],
    ['mismatched lengths', { sampleIntervalS: DT, output: good.output, capacitor: good.capacitor.slice(0, N - 10) }],
    ['a missing (null) sample', { sampleIntervalS: DT, output: good.output.map((v, i) => (i === 1234 ? null : v)) }],
    ['an unparseable CSV', { csv: 'this is not\na scope export\nat all' }],
  ];
  for (const [what, cap] of cases) {
    it(what, async () => {
      const res = await fit({ circuit, tolerances, capture: cap });
      expect(res.statusCode).toBe(422);
      const body = res.json();
      expect(body.code).toBe('bad-capture');
      expect(typeof body.figures.reason).toBe('string');
      expect(body.detail.length).toBeGreaterThan(10);
      expect(body.errors[0].pointer.startsWith('/capture')).toBe(true);
    });
  }

  it('the null sample is named by its index', async () => {
    const res = await fit({ circuit, capture: { sampleIntervalS: DT, output: good.output.map((v, i) => (i === 1234 ? null : v)) } });
    expect(res.json().errors[0].pointer).toBe('/capture/output/1234');
  });
});
