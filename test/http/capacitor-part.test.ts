/**
 * The timing capacitor as a part over HTTP (/v1/analyze, /v1/waveform): the
 * binding object shape, the effective capacitance and curve in the answer,
 * bad fields named by JSON pointer. Scenario of our own: a 5 V moisture-probe
 * clock whose 10 nF C0G was swapped for a small-case 6.3 V X7R on a later revision.
 */
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectContract } from '../helpers/contract.ts';
import { testApp } from '../helpers/app.ts';
import { effectiveCapacitanceF, resolveCapacitor } from '../../src/core/parts/capacitor/index.ts';
import { odexTimeTo } from '../core/parts/capacitor-odex-reference.ts';

let app: FastifyInstance;
beforeAll(async () => {
  app = await testApp();
});
afterAll(async () => app.close());

const x7r = { value: '10n', dielectric: 'X7R', ratedVoltageV: 6.3, caseSize: '0402' };
const probe = (cTiming: unknown) => ({
  topology: 'three-resistor-divider',
  supply: { positiveV: 5, negativeV: 0 },
  amplifier: 'ideal',
  parts: { rTiming: '22k', cTiming, rTop: '68k', rBottom: '68k', rFeedback: '68k' },
});

async function post(url: string, payload: unknown) {
  const res = await app.inject({ method: 'POST', url, payload: payload as object });
  await expectContract(res, 'POST', url);
  return res;
}

describe('timing capacitor object', () => {
  it('a C0G object answers like the bare value (class I: flat)', async () => {
    const bare = (await post('/v1/analyze', probe('10n'))).json();
    const part = (await post('/v1/analyze', probe({ value: '10n', dielectric: 'C0G', ratedVoltageV: 50, caseSize: '0603' }))).json();
    expect(part.periodS).toBe(bare.periodS);
    expect(part.capacitor.effectiveCapacitanceF).toBeUndefined();
  });

  it('a 0402 6.3 V X7R: effective capacitance and curve over the swing; the period agrees with odex on the same C(V)', async () => {
    const res = await post('/v1/analyze', probe(x7r));
    expect(res.statusCode).toBe(200);
    const body = res.json();
    // Thresholds at V+/3 and 2V+/3 (three equal resistors, Sedra & Smith).
    expect(body.capacitor.minV).toBeCloseTo(5 / 3, 9);
    expect(body.capacitor.maxV).toBeCloseTo(10 / 3, 9);
    const model = resolveCapacitor(x7r);
    expect(body.capacitor.effectiveCapacitanceF).toBeCloseTo(effectiveCapacitanceF(model.shape, 10e-9, 5 / 3, 10 / 3), 18);
    expect(body.capacitor.effectiveCapacitanceF).toBeLessThan(0.8 * 10e-9);
    expect(body.capacitor.capacitanceCurve).toHaveLength(9);
    expect(body.capacitor.capacitanceCurve[0].voltageV).toBeCloseTo(5 / 3, 9);
    // Reference: each state's RC charge (Thevenin 22 kΩ, toward 5 V and 0 V) integrated in time by odex with the same C(V).
    const tau = 22e3 * 10e-9;
    const high = odexTimeTo({ shape: model.shape, capacitanceF: tau, i0A: 5, conductanceS: 1 }, 5 / 3, 10 / 3, 10 * tau);
    const low = odexTimeTo({ shape: model.shape, capacitanceF: tau, i0A: 0, conductanceS: 1 }, 10 / 3, 5 / 3, 10 * tau);
    expect(Math.abs(body.periodS / (high + low) - 1)).toBeLessThan(1e-6);
  });

  it('waveform accepts the object too', async () => {
    const res = await post('/v1/waveform', { circuit: probe(x7r), periods: 2, samples: 200 });
    expect(res.statusCode).toBe(200);
    const analysis = (await post('/v1/analyze', probe(x7r))).json();
    expect(res.json().periodS).toBeCloseTo(analysis.periodS, 15);
  });

  it('tolerance runs the same C(V) part (nominal = analyze) and ages it over serviceLifeYears by the log-decade law', async () => {
    const aged = { ...x7r, ageHours: 24 };
    const analysis = (await post('/v1/analyze', probe(aged))).json();
    const res = await post('/v1/tolerance', { circuit: probe(aged), tolerances: {}, serviceLifeYears: 10, monteCarlo: { samples: 500 } });
    expect(res.statusCode).toBe(200);
    const body = res.json();
    // The worker thread received the C(v) shape: the nominal is the non-linear capacitor's, not the 0 V value's.
    expect(body.nominal.frequencyHz).toBeCloseTo(analysis.frequencyHz, 6);
    // Log-decade law C(t) = C(t0)(1 − k·log10(t/t0)), X7R-like k = 2 %/decade (typical of the class), 10 Julian years.
    const law = (t: number) => 1 - 0.02 * Math.log10(t / 1000);
    const ratio = law(24 + 10 * 8766) / law(24);
    expect(body.ageing.changeFraction).toBeCloseTo(ratio - 1, 12);
    // The C(V) curve scales with the aged capacitance, so the charge over the swing, and the frequency, scale by 1/ratio.
    expect(body.worstCase.frequencyMaxHz / body.nominal.frequencyHz).toBeCloseTo(1 / ratio, 6);
  });

  it('tolerance takes the part\'s own tolerance and dielectric where the request does not name the capacitor', async () => {
    const part = { ...x7r, tolerance: 'K' }; // IEC 60062 letter K: ±10 %
    const body = (await post('/v1/tolerance', { circuit: probe(part), tolerances: { rTiming: 0.01 }, temperature: { minC: -55, maxC: 125 }, monteCarlo: { samples: 200 } })).json();
    // EIA-198 X7R: ±15 % over −55…125 °C.
    expect(body.temperatureModels).toEqual([expect.objectContaining({ role: 'cTiming', model: 'dielectric', dielectric: 'X7R', changeMinFraction: -0.15, changeMaxFraction: 0.15 })]);
    expect(body.varianceSources.map((v: { source: string }) => v.source)).toEqual(expect.arrayContaining(['cTiming', 'cTiming dielectric', 'rTiming']));
    // A request that names the capacitor keeps its own figures.
    const named = (await post('/v1/tolerance', { circuit: probe(part), tolerances: { cTiming: 0.05 }, temperature: { minC: 0, maxC: 50 }, temperatureCoefficients: { cTiming: { dielectric: 'X5R' } }, monteCarlo: { samples: 200 } })).json();
    expect(named.temperatureModels[0].dielectric).toBe('X5R');
    expect(named.worstCase.corners.frequencyMax.deviations.cTiming).toBeLessThan(-0.05 * 0.999);
  });

  it('names the bad field under /parts/cTiming', async () => {
    for (const [bad, pointer] of [
      [{ ...x7r, caseSize: '0404' }, '/parts/cTiming'],
      [{ ...x7r, dielectric: 'paper' }, '/parts/cTiming/dielectric'],
      [{ ...x7r, ratedVoltageV: -1 }, '/parts/cTiming'],
    ] as const) {
      const res = await post('/v1/analyze', probe(bad));
      expect(res.statusCode).toBe(400);
      const problem = res.json();
      const pointers = JSON.stringify(problem);
      expect(pointers).toContain(pointer);
    }
  });
});
