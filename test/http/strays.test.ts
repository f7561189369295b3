/** Strays and leakage over HTTP: analyze, waveform, tolerance and BOM checks see them; out-of-range values are a 400 naming the field. */
import type { FastifyInstance } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectContract } from '../helpers/contract.ts';
import { testApp } from '../helpers/app.ts';
import { leakyAstablePeriodS } from '../helpers/leaky-astable.ts';

let app: FastifyInstance;
beforeAll(async () => {
  app = await testApp();
});
afterAll(async () => app.close());

// Our own scenario: a ±10 V lab timebase whose timing node picked up flux residue on the board.
const timebase = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 10, negativeV: -10 },
  amplifier: 'ideal',
  parts: { rTiming: '47k', cTiming: '10n', rGround: '10k', rFeedback: '20k' },
};
const R = 47e3;
const C = 10e-9;
const V = 10;
const BETA = 1 / 3;

/** The hand-derived leaky astable (test/helpers/leaky-astable.ts) with a stray beside the timing capacitor. */
function leakyPeriodS(leakOhm: number, strayF = 0): number {
  return leakyAstablePeriodS({ supplyV: V, beta: BETA, rOhm: R, cF: C + strayF, leakOhm });
}

async function post(url: string, payload: unknown) {
  const res = await app.inject({ method: 'POST', url, payload: payload as object });
  await expectContract(res, 'POST', url);
  return res;
}

/** The nominal frequency a BOM result's spec rule reports, Hz. */
function nominalHz(r: { rules: { code: string; figures: Record<string, number> }[] }): number {
  return r.rules.find((x) => x.code === 'frequency-within-spec' || x.code === 'frequency-outside-spec')!.figures.nominalFrequencyHz;
}

/** The lab timebase as a BOM assembly behind a long output trace (470 pF at P, 1 nF on the pin, 200 Ω output). */
function longTraceAssembly(id: string, capacitorText: string, frequencyTolerance: number) {
  return {
    id,
    lines: [
      { refdes: 'R1', value: '47K 1% 0603' },
      { refdes: 'C1', value: capacitorText },
      { refdes: 'R2', value: '10K 1% 0603' },
      { refdes: 'R3', value: '20K 1% 0603' },
    ],
    roles: { rTiming: 'R1', cTiming: 'C1', rGround: 'R2', rFeedback: 'R3' },
    topology: 'two-resistor-feedback',
    amplifier: { outputResistanceOhm: 200 },
    supply: { positiveV: 10, negativeV: -10 },
    spec: { frequencyHz: 1000, frequencyTolerance },
    strays: { thresholdNodeF: 470e-12, outputNodeF: 1e-9 },
  };
}

describe('strays in /v1/analyze', () => {
  it('leakage and timing-node capacitance enter the answer (hand derivation within 1e-12)', async () => {
    const res = await post('/v1/analyze', { ...timebase, strays: { timingLeakageOhm: 2e6, timingNodeF: 220e-12 } });
    expect(res.statusCode).toBe(200);
    const body = res.json();
    expect(Math.abs(body.periodS / leakyPeriodS(2e6, 220e-12) - 1)).toBeLessThan(1e-12);
    // 10 nF against 220 pF: 45× is below the 50× window, so the check fires.
    expect(body.checks.find((c: { code: string }) => c.code === 'stray-capacitance-significant')).toMatchObject({ severity: 'warning', minimumRatio: 50 });
  });

  it('a capacitance at P or at the output pin, or an amplifier input capacitance, is answered (multi-state pieces), as analyze and tolerance alike', async () => {
    for (const body of [
      { ...timebase, amplifier: { outputResistanceOhm: 100 }, strays: { thresholdNodeF: 3e-9 } },
      { ...timebase, amplifier: { outputResistanceOhm: 100 }, strays: { outputNodeF: 20e-9 } },
      { ...timebase, amplifier: { outputResistanceOhm: 100, inputCapacitanceF: 1e-9 } },
    ]) {
      const res = await post('/v1/analyze', body);
      expect(res.statusCode).toBe(200);
      // The stray slows the feedback: the period is longer than without it (the figures against odex: strays-multistate.test.ts).
      const plain = (await post('/v1/analyze', { ...timebase, amplifier: { outputResistanceOhm: 100 } })).json();
      expect(res.json().periodS).toBeGreaterThan(plain.periodS * (1 + 1e-9));
    }
  });

  it('an out-of-range leakage is a 400 naming the field', async () => {
    const res = await post('/v1/analyze', { ...timebase, strays: { timingLeakageOhm: 5 } });
    expect(res.statusCode).toBe(400);
    expect(res.json().errors[0].pointer).toBe('/strays/timingLeakageOhm');
  });
});

describe('strays in /v1/waveform', () => {
  it('the capacitor follows the leakage-loaded charge V_th − (V_th + βV)·e^(−t/τ), τ = (R‖R_L)·(C + C_s) (hand derivation)', async () => {
    const leakOhm = 2e6;
    const strayF = 100e-12;
    const res = await post('/v1/waveform', { circuit: { ...timebase, strays: { timingLeakageOhm: leakOhm, timingNodeF: strayF } }, periods: 1, samples: 201 });
    expect(res.statusCode).toBe(200);
    const body = res.json();
    expect(Math.abs(body.periodS / leakyPeriodS(leakOhm, strayF) - 1)).toBeLessThan(1e-12);
    // The window opens at a rising decision: the capacitor leaves the lower threshold −βV toward V_th.
    const vTh = (V * leakOhm) / (R + leakOhm);
    const tauS = ((R * leakOhm) / (R + leakOhm)) * (C + strayF);
    for (const k of [0, 25, 50, 99]) {
      const t = body.timeS[k] - body.timeS[0];
      expect(body.capacitorV[k]).toBeCloseTo(vTh - (vTh + BETA * V) * Math.exp(-t / tauS), 9);
    }
  });
});

describe('strays in /v1/tolerance (through the prepared model)', () => {
  it('the leakage is a parameter: its sensitivity matches the derivative of the hand formula', async () => {
    const leakOhm = 1e6;
    const res = await post('/v1/tolerance', { circuit: { ...timebase, strays: { timingLeakageOhm: leakOhm } }, tolerances: { rTiming: 0.01 } });
    expect(res.statusCode).toBe(200);
    const body = res.json();
    expect(Math.abs(body.nominal.frequencyHz * leakyPeriodS(leakOhm) - 1)).toBeLessThan(1e-12);
    const s = body.sensitivities.find((x: { role: string }) => x.role === 'timingLeakageOhm');
    expect(s.kind).toBe('stray');
    // d ln f / d ln R_L by a central difference on the closed form above (step 1e-5 in ln R_L).
    const h = 1e-5;
    const expected = -(Math.log(leakyPeriodS(leakOhm * Math.exp(h))) - Math.log(leakyPeriodS(leakOhm * Math.exp(-h)))) / (2 * h);
    expect(s.sensitivity).toBeCloseTo(expected, 6);
  });
});

describe('strays in /v1/bom-checks', () => {
  // Our own scenario: the same 5 V fan-sense clock built twice, once on a clean board, once with flux residue at N.
  const assembly = {
    id: 'clean-board',
    lines: [
      { refdes: 'R1', value: '22K 1% 0603' },
      { refdes: 'C1', value: '4n7 50V C0G 2%' },
      { refdes: 'R2, R3, R4', value: '68K 1% 0603' },
    ],
    roles: { rTiming: 'R1', cTiming: 'C1', rTop: 'R2', rBottom: 'R3', rFeedback: 'R4' },
    topology: 'three-resistor-divider',
    amplifier: 'ideal',
    supply: { positiveV: 5 },
    spec: { frequencyHz: 7000, frequencyTolerance: 0.2 },
  };
  const strays = { timingNodeF: 150e-12, timingLeakageOhm: 300e3 };

  it('every analysis of the assembly includes them (same batch, no cached answer shared), and the stray rule fires', async () => {
    const res = await post('/v1/bom-checks', { assemblies: [assembly, { ...assembly, id: 'residue', strays }] });
    expect(res.statusCode).toBe(200);
    const [clean, residue] = res.json().results;
    const circuit = { topology: 'three-resistor-divider', supply: { positiveV: 5 }, amplifier: 'ideal', parts: { rTiming: '22k', cTiming: '4n7', rTop: '68k', rBottom: '68k', rFeedback: '68k' } };
    const plain = (await post('/v1/analyze', circuit)).json();
    const loaded = (await post('/v1/analyze', { ...circuit, strays })).json();
    expect(nominalHz(clean) / plain.frequencyHz - 1).toBeCloseTo(0, 9);
    expect(nominalHz(residue) / loaded.frequencyHz - 1).toBeCloseTo(0, 9);
    expect(Math.abs(loaded.frequencyHz / plain.frequencyHz - 1)).toBeGreaterThan(0.01);
    // 4.7 nF against 150 pF is 31×, under the 50× window.
    expect(residue.rules.map((r: { code: string }) => r.code)).toContain('stray-capacitance-significant');
    expect(clean.rules.map((r: { code: string }) => r.code)).not.toContain('stray-capacitance-significant');
  });
});

describe('capacitance at P and at the output pin reaches every answer (the same multi-state walk)', () => {
  // Our own scenario: the lab timebase with a long output trace (1 nF) behind a 200 Ω output and 470 pF at P.
  const trace = { ...timebase, amplifier: { outputResistanceOhm: 200 }, strays: { thresholdNodeF: 470e-12, outputNodeF: 1e-9 } };

  it('tolerance: the nominal is analyze\'s, and the new strays are parameters with a sensitivity', async () => {
    const analyzed = (await post('/v1/analyze', trace)).json();
    const res = await post('/v1/tolerance', { circuit: trace, tolerances: { rTiming: 0.01, cTiming: 0.05 } });
    expect(res.statusCode).toBe(200);
    const body = res.json();
    expect(Math.abs(body.nominal.frequencyHz / analyzed.frequencyHz - 1)).toBeLessThan(1e-12);
    for (const role of ['thresholdNodeF', 'outputNodeF']) {
      const s = body.sensitivities.find((x: { role: string }) => x.role === role);
      expect(s).toMatchObject({ kind: 'stray' });
      // More capacitance on the feedback path: a slower clock.
      expect(s.sensitivity).toBeLessThan(0);
    }
  });

  it('waveform: the same period, and the pin leaves the rail through its RC (not a jump)', async () => {
    const analyzed = (await post('/v1/analyze', trace)).json();
    const res = await post('/v1/waveform', { circuit: trace, periods: 1, samples: 2001 });
    expect(res.statusCode).toBe(200);
    const body = res.json();
    expect(Math.abs(body.periodS / analyzed.periodS - 1)).toBeLessThan(1e-12);
    // 200 Ω·1 nF = 200 ns against a ~1 ms period: the 10–90 % rise is about ln 9·200 ns (the divider barely loads the pin).
    expect(analyzed.transitions.riseTimeS / (Math.log(9) * 200 * 1e-9)).toBeGreaterThan(0.95);
    expect(analyzed.transitions.riseTimeS / (Math.log(9) * 200 * 1e-9)).toBeLessThan(1.05);
  });

  it('BOM checks: the assembly\'s strays at P and at the pin are in its analysis', async () => {
    const assembly = longTraceAssembly('long-trace', '10n 50V C0G 2%', 0.2);
    const res = await post('/v1/bom-checks', { assemblies: [assembly] });
    expect(res.statusCode).toBe(200);
    const [result] = res.json().results;
    const analyzed = (await post('/v1/analyze', trace)).json();
    expect(nominalHz(result) / analyzed.frequencyHz - 1).toBeCloseTo(0, 9);
    // 470 pF at P and 1 nF at the pin move it by well under 2 %: no stray rule.
    expect(result.rules.map((r: { code: string }) => r.code)).not.toContain('stray-capacitance-significant');
    // 22 nF at P (a filter capacitor fitted there by mistake) does: the rule names both frequencies.
    const heavy = (await post('/v1/bom-checks', { assemblies: [{ ...assembly, id: 'probe-on-P', strays: { thresholdNodeF: 22e-9 } }] })).json().results[0];
    const stray = heavy.rules.find((r: { code: string }) => r.code === 'stray-capacitance-significant');
    expect(stray.figures).toMatchObject({ thresholdNodeCapacitanceF: 22e-9, maximumFrequencyShift: 0.02 });
    expect(Math.abs(stray.figures.frequencyShift)).toBeGreaterThan(0.02);
  });
});

describe('capacitance at P and at the pin beside a class II C(V) timing capacitor (no 422: the C(V) multi-state pieces)', () => {
  // Our own scenario: the lab timebase built with a small-case X7R part, behind a long output trace.
  const x7r = { value: '10n', dielectric: 'X7R', ratedVoltageV: 6.3, caseSize: '0402' };
  const trace = { ...timebase, amplifier: { outputResistanceOhm: 200 }, parts: { ...timebase.parts, cTiming: x7r }, strays: { thresholdNodeF: 470e-12, outputNodeF: 1e-9 } };

  it('analyze, waveform and tolerance answer with one period; the strays move it from the C(V) circuit without them', async () => {
    const analyzed = await post('/v1/analyze', trace);
    expect(analyzed.statusCode).toBe(200);
    const body = analyzed.json();
    const bare = (await post('/v1/analyze', { ...trace, strays: undefined })).json();
    expect(body.periodS).toBeGreaterThan(bare.periodS * (1 + 1e-6));
    // The capacitor still reports its curve and the effective capacitance over the swing.
    expect(body.capacitor.effectiveCapacitanceF).toBeLessThan(10e-9);
    const wave = (await post('/v1/waveform', { circuit: trace, periods: 1, samples: 501 })).json();
    expect(Math.abs(wave.periodS / body.periodS - 1)).toBeLessThan(1e-12);
    // A few hundred samples: each evaluation solves collocation pieces (milliseconds; the default 10,000 take tens of seconds).
    const tol = (await post('/v1/tolerance', { circuit: trace, tolerances: { rTiming: 0.01 }, monteCarlo: { samples: 200 } })).json();
    expect(Math.abs(tol.nominal.frequencyHz / body.frequencyHz - 1)).toBeLessThan(1e-9);
    for (const role of ['thresholdNodeF', 'outputNodeF']) expect(tol.sensitivities.find((x: { role: string }) => x.role === role)).toMatchObject({ kind: 'stray' });
  });

  it('an amplifier input capacitance beside the C(V) capacitor is answered too', async () => {
    const res = await post('/v1/analyze', { ...trace, amplifier: { outputResistanceOhm: 200, inputCapacitanceF: 5e-12 }, strays: undefined });
    expect(res.statusCode).toBe(200);
  });

  it('BOM checks: an X7R line with strays at P and at the pin is analysed with both', async () => {
    const assembly = longTraceAssembly('x7r-long-trace', '10n 6.3V X7R 10% 0402', 0.5);
    const res = await post('/v1/bom-checks', { assemblies: [assembly, { ...assembly, id: 'x7r-no-trace', strays: undefined }] });
    expect(res.statusCode).toBe(200);
    const [loaded, bare] = res.json().results;
    expect(nominalHz(loaded)).toBeLessThan(nominalHz(bare) * (1 - 1e-6));
  });
});

describe("the timing capacitor's insulation (checked, not applied)", () => {
  // Our own scenario: a 0.1 Hz heartbeat blinker whose 10 µF timing part is an aluminium electrolytic behind 470 kΩ.
  const blinker = {
    topology: 'two-resistor-feedback',
    supply: { positiveV: 10, negativeV: -10 },
    amplifier: 'ideal',
    parts: { rTiming: '470k', cTiming: { value: '10u', dielectric: 'electrolytic' }, rGround: '10k', rFeedback: '20k' },
  };

  it('/v1/analyze reports the frequency at the class-minimum insulation (10 MΩ for 10 µF) beside the answer without it', async () => {
    const body = (await post('/v1/analyze', blinker)).json();
    const check = body.checks.find((c: { code: string }) => c.code === 'capacitor-leakage-significant');
    expect(check).toMatchObject({ severity: 'warning' });
    expect(check.insulationResistanceOhm).toBeCloseTo(10e6, 0);
    // The answer is the part without leakage; the check's figure is the same circuit with 10 MΩ in strays (the one model).
    const leaky = (await post('/v1/analyze', { ...blinker, parts: { ...blinker.parts, cTiming: '10u' }, strays: { timingLeakageOhm: check.insulationResistanceOhm } })).json();
    expect(check.frequencyWithLeakageHz / leaky.frequencyHz - 1).toBeCloseTo(0, 12);
    expect(check.frequencyHz / body.frequencyHz - 1).toBeCloseTo(0, 12);
  });

  it('/v1/bom-checks reports it as a rule for an electrolytic timing line, not for a film one', async () => {
    const assembly = {
      id: 'blinker',
      lines: [
        { refdes: 'R1', value: '470K 1% 0603' },
        { refdes: 'C1', value: '10uF 25V electrolytic 20%' },
        { refdes: 'R2', value: '10K 1% 0603' },
        { refdes: 'R3', value: '20K 1% 0603' },
      ],
      roles: { rTiming: 'R1', cTiming: 'C1', rGround: 'R2', rFeedback: 'R3' },
      topology: 'two-resistor-feedback',
      amplifier: 'ideal',
      supply: { positiveV: 10, negativeV: -10 },
      spec: { frequencyHz: 0.1, frequencyTolerance: 0.5 },
    };
    const film = { ...assembly, id: 'blinker-film', lines: assembly.lines.map((l) => (l.refdes === 'C1' ? { refdes: 'C1', value: '10uF 63V PET 5%' } : l)) };
    const res = await post('/v1/bom-checks', { assemblies: [assembly, film] });
    expect(res.statusCode).toBe(200);
    const [electrolytic, pet] = res.json().results;
    expect(electrolytic.rules.map((r: { code: string }) => r.code)).toContain('capacitor-leakage-significant');
    expect(pet.rules.map((r: { code: string }) => r.code)).not.toContain('capacitor-leakage-significant');
  });
});
