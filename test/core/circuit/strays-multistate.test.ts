/**
 * Capacitance at the threshold node P and at the output pin (docs/model.md, "strays and leakage"):
 * the multi-state pieces (engine/modal.ts) against
 * - the RC charging law of the released open-drain pin (textbook: the 10–90 % rise of a single RC is
 *   R·C·ln 9 = 2.197·R·C; with the timing node on the pin, the two-node RC network's solution as a sum
 *   of two exponentials, its rates the roots of the characteristic quadratic, derived here by hand);
 * - the odex reference integrator (engine-odex-reference.ts) integrating the same multi-capacitor ODE;
 * - the one-capacitor model, which the multi-state answer must approach as the strays vanish.
 */
import { describe, expect, it } from 'vitest';
import { analyzeCircuit, findBuiltInAmplifier, prepareModel, type AmplifierModel, type Circuit } from '../../../src/core/index.ts';
import { NO_STRAYS, type Strays } from '../../../src/core/circuit/strays.ts';
import { OUTPUT_LENGTH, OUTPUT_SLOT } from '../../../src/core/circuit/engine/prepared.ts';
import { referenceOscillation } from './engine-odex-reference.ts';

const ideal = findBuiltInAmplifier('ideal')!;
const openDrainIdeal: AmplifierModel = { ...ideal, outputStage: 'open-drain' };
const strays = (s: Partial<Strays>): Strays => ({ ...NO_STRAYS, ...s });
const rel = (a: number, b: number) => Math.abs(a / b - 1);

// Our own scenario: a 5 V open-drain clock with a long trace on its output.
const VDD = 5;
const RP = 2.2e3;
const RT = 100e3;
const CT = 1e-9;
const RTOP = 100e3;
const RBOT = 100e3;
const RF = 100e3;
function openDrainClock(outputNodeF: number): Circuit {
  return {
    topology: 'open-drain-pullup',
    supply: { positiveV: VDD, negativeV: 0 },
    amplifier: openDrainIdeal,
    parts: { rPullup: RP, rTiming: RT, cTiming: CT, rTop: RTOP, rBottom: RBOT, rFeedback: RF },
    strays: strays({ outputNodeF }),
  };
}

/**
 * The released pin and the timing node as a two-node RC network (hand derivation, KCL):
 *   Co·dO/dt = (VDD − O)/Rp − (O − N)/Rt − (O − Vd)/Rd,   C·dN/dt = (O − N)/Rt,
 * Rd, Vd the Thevenin equivalent of the threshold divider seen from the pin (Rf + rTop‖rBottom,
 * VDD·rBottom/(rTop + rBottom)). x = [O, N] obeys x' = A·x + b; with A's eigenvalues from the
 * characteristic quadratic, x(t) = x∞ + Σ_k c_k·u_k·e^(λ_k·t).
 */
function releasedPin(co: number, o0: number, n0: number): (t: number) => number {
  const rd = RF + (RTOP * RBOT) / (RTOP + RBOT);
  const vd = (VDD * RBOT) / (RTOP + RBOT);
  const a11 = -(1 / RP + 1 / RT + 1 / rd) / co;
  const a12 = 1 / RT / co;
  const a21 = 1 / RT / CT;
  const a22 = -1 / RT / CT;
  const b1 = (VDD / RP + vd / rd) / co;
  // Fixed point: A·x∞ = −b.
  const det = a11 * a22 - a12 * a21;
  const oInf = (-b1 * a22) / det;
  const nInf = (a21 * b1) / det;
  const tr = a11 + a22;
  const disc = Math.sqrt(tr * tr - 4 * det);
  const l1 = (tr + disc) / 2;
  const l2 = (tr - disc) / 2;
  // Eigenvectors (a12, λ − a11); deviation d0 = x0 − x∞ = c1·u1 + c2·u2.
  const u1 = [a12, l1 - a11];
  const u2 = [a12, l2 - a11];
  const d0 = [o0 - oInf, n0 - nInf];
  const dd = u1[0] * u2[1] - u2[0] * u1[1];
  const c1 = (d0[0] * u2[1] - u2[0] * d0[1]) / dd;
  const c2 = (u1[0] * d0[1] - d0[0] * u1[1]) / dd;
  return (t: number) => oInf + c1 * u1[0] * Math.exp(l1 * t) + c2 * u2[0] * Math.exp(l2 * t);
}

/** First time the (rising) pin reaches `level`, by bisection on the closed form. */
function reach(pin: (t: number) => number, level: number, hi: number): number {
  let a = 0;
  let b = hi;
  for (let i = 0; i < 200; i++) {
    const m = 0.5 * (a + b);
    if (pin(m) < level) a = m;
    else b = m;
  }
  return 0.5 * (a + b);
}

describe('Strays: an RC pull-up rise against its closed form', () => {
  it('the released pin follows the two-node RC solution: 10–90 % rise within 1e-9', () => {
    for (const co of [10e-12, 100e-12, 1e-9]) {
      const r = analyzeCircuit(openDrainClock(co));
      const { highV, lowV } = r.output;
      // The rise starts at the rising decision: pin at its low level, N on the lower threshold.
      const pin = releasedPin(co, lowV, r.thresholds.lowerV);
      const t10 = reach(pin, lowV + 0.1 * (highV - lowV), 1e-3);
      const t90 = reach(pin, lowV + 0.9 * (highV - lowV), 1e-3);
      expect(rel(r.transitions.riseTimeS, t90 - t10)).toBeLessThan(1e-9);
      // The pull-down is instant (an ideal open drain): no fall time.
      expect(r.transitions.fallTimeS).toBe(0);
    }
  });

  it('the same rise and period through the prepared form (tolerance, BOM checks, fit)', () => {
    for (const co of [10e-12, 100e-12]) {
      const r = analyzeCircuit(openDrainClock(co));
      const model = prepareModel(openDrainClock(co), { transitions: true });
      const out = new Float64Array(OUTPUT_LENGTH);
      model.evaluate(model.nominal, out);
      expect(rel(out[OUTPUT_SLOT.riseTimeS], r.transitions.riseTimeS)).toBeLessThan(1e-12);
      expect(rel(out[OUTPUT_SLOT.periodS], r.periodS)).toBeLessThan(1e-12);
    }
  });

  it('a pin far faster than the timing node rises as the textbook single RC, ln 9·R_th·Co (R_th: everything the pin sees)', () => {
    // The pin's own RC between its start and its asymptote with N held (the single-RC limit of the
    // two-node solution): exactly ln 9·R_th·Co, whatever the start.
    const rd = RF + (RTOP * RBOT) / (RTOP + RBOT);
    const rth = 1 / (1 / RP + 1 / rd + 1 / RT);
    const co = 10e-12;
    const oInf = rth * (VDD / RP + (VDD * RBOT) / (RTOP + RBOT) / rd + 1 / RT);
    const pin = (t: number) => oInf + (0.1 - oInf) * Math.exp(-t / (rth * co));
    const t10 = reach(pin, 0.1 + 0.1 * (oInf - 0.1), 1e-6);
    const t90 = reach(pin, 0.1 + 0.9 * (oInf - 0.1), 1e-6);
    expect(rel(t90 - t10, Math.log(9) * rth * co)).toBeLessThan(1e-12);
    // The engine's rise (between the pin's state levels, N moving) is that RC to within the timing node's pull on the pin.
    const r = analyzeCircuit(openDrainClock(co));
    expect(rel(r.transitions.riseTimeS, Math.log(9) * rth * co)).toBeLessThan(0.05);
  });
});

describe('edge times with a capacitance on the pin (slew-limited check and frequency ceiling)', () => {
  it('the released pin reaches 90 % of its swing when the two-node RC solution does: the edge, its check and the ceiling see the RC', () => {
    // 2.2 nF behind 2.2 kΩ: the pin's RC is some 8 % of the period, beyond the 5 % edge allowance (our design margin).
    const co = 2.2e-9;
    const r = analyzeCircuit(openDrainClock(co));
    const { highV, lowV } = r.output;
    // An ideal open drain releases the pin at the decision: from there the pin is the hand-derived solution.
    const pin = releasedPin(co, lowV, r.thresholds.lowerV);
    const settleS = reach(pin, lowV + 0.9 * (highV - lowV), 1e-3);
    expect(rel(r.edges!.riseSettleS, settleS)).toBeLessThan(1e-9);
    // The pull-down is instant: nothing on the falling edge.
    expect(r.edges!.fallSettleS).toBe(0);
    const check = r.checks.find((c) => c.code === 'slew-limited');
    expect(check?.message).toMatch(/the output pin's RC/);
    expect(check?.edgeTimeS).toBeCloseTo(settleS, 12);
    expect(r.frequencyCeilingHz).toBeCloseTo(0.05 / settleS, 3);
    expect(r.frequencyHz).toBeGreaterThan(r.frequencyCeilingHz!);
  });

  it('without capacitance on the pin the ideal open drain has instant edges: no check, no ceiling', () => {
    const r = analyzeCircuit(openDrainClock(0));
    expect(r.edges).toEqual({ riseSettleS: 0, fallSettleS: 0 });
    expect(r.checks.some((c) => c.code === 'slew-limited')).toBe(false);
    expect(r.frequencyCeilingHz).toBeNull();
  });
});

describe('the stray-loaded threshold node against the reference integrator (odex, the same multi-capacitor ODE)', () => {
  const cases: { name: string; circuit: Circuit }[] = [
    {
      name: 'split supply, output resistance, capacitance at P and at the pin',
      circuit: {
        topology: 'two-resistor-feedback',
        supply: { positiveV: 5, negativeV: -5 },
        amplifier: { ...ideal, outputResistanceOhm: 200 },
        parts: { rTiming: 47e3, cTiming: 2.2e-9, rGround: 22e3, rFeedback: 22e3 },
        strays: strays({ thresholdNodeF: 470e-12, outputNodeF: 1e-9 }),
      },
    },
    {
      name: 'single supply divider, input capacitance at P (and N), slew-limited output',
      circuit: {
        topology: 'three-resistor-divider',
        supply: { positiveV: 5, negativeV: 0 },
        amplifier: { ...ideal, outputResistanceOhm: 50, inputCapacitanceF: 100e-12, slewRateVPerS: 2e6 },
        parts: { rTiming: 15e3, cTiming: 4.7e-9, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 },
        strays: strays({ thresholdNodeF: 220e-12 }),
      },
    },
    {
      name: 'strongly loaded: 10 nF at P and at the pin (the feedback lags; a quarter of the unloaded period)',
      circuit: {
        topology: 'two-resistor-feedback',
        supply: { positiveV: 5, negativeV: -5 },
        amplifier: { ...ideal, outputResistanceOhm: 100 },
        parts: { rTiming: 100e3, cTiming: 1e-9, rGround: 10e3, rFeedback: 10e3 },
        strays: strays({ thresholdNodeF: 10e-9, outputNodeF: 10e-9 }),
      },
    },
    {
      // The stage's current is the one through its output resistance, the pin's capacitance taking its share.
      name: 'diode-steered, current-limited stage driving 2 nF on the pin through 400 Ω, with delay and input clamp',
      circuit: {
        topology: 'diode-steered',
        supply: { positiveV: 15, negativeV: -15 },
        amplifier: { ...ideal, outputResistanceOhm: 400, outputCurrentLimitA: 5e-3, recoveryDelayS: 5e-6, differentialClampV: 0.8, inputOffsetV: 1e-3 },
        parts: { rCharge: 4.7e3, rDischarge: 4.7e3, cTiming: 1e-9, rFeedback: 71.5e3, rGround: 96.5e3 },
        diode: { forwardDropV: 0.415, resistanceOhm: 50 },
        strays: strays({ outputNodeF: 2e-9 }),
      },
    },
    {
      name: 'open drain with capacitance at P and at the pin, leakage at P',
      circuit: {
        ...openDrainClock(330e-12),
        strays: strays({ outputNodeF: 330e-12, thresholdNodeF: 150e-12, thresholdLeakageOhm: 10e6 }),
      },
    },
  ];
  for (const { name, circuit } of cases) {
    it(`${name}: frequency and duty within 1e-6`, { timeout: 120_000 }, () => {
      const engine = analyzeCircuit(circuit);
      const ref = referenceOscillation(circuit, { tolerance: 1e-11 });
      expect(rel(engine.periodS, ref.periodS)).toBeLessThan(1e-6);
      expect(Math.abs(engine.dutyCycle - ref.dutyCycle)).toBeLessThan(1e-6);
      expect(rel(engine.thresholds.upperV, ref.upperV)).toBeLessThan(1e-6);
    });
  }
});

describe('a threshold node slower than the timing node', () => {
  it('is refused as no-oscillation (the comparator would switch straight back: chatter), not answered with a period', () => {
    // τ_P = (10 kΩ‖10 kΩ)·1 nF = 5 µs against τ_N = 1 kΩ·1 nF = 1 µs: after each switch N overtakes P at once.
    const circuit: Circuit = {
      topology: 'two-resistor-feedback',
      supply: { positiveV: 5, negativeV: -5 },
      amplifier: ideal,
      parts: { rTiming: 1e3, cTiming: 1e-9, rGround: 10e3, rFeedback: 10e3 },
      strays: strays({ thresholdNodeF: 1e-9 }),
    };
    expect(() => analyzeCircuit(circuit)).toThrow(expect.objectContaining({ code: 'no-oscillation', message: expect.stringContaining('chatters') }));
  });
});

describe('the one-capacitor model is the limit of the multi-state one', () => {
  it('tiny capacitance at P and at the pin: the period converges to the one-state answer, linearly in the stray', () => {
    const base: Circuit = {
      topology: 'two-resistor-feedback',
      supply: { positiveV: 5, negativeV: -5 },
      amplifier: { ...ideal, outputResistanceOhm: 100 },
      parts: { rTiming: 100e3, cTiming: 1e-9, rGround: 10e3, rFeedback: 10e3 },
    };
    const one = analyzeCircuit(base);
    const gaps = [1e-12, 1e-13, 1e-14, 1e-15].map((c) => rel(analyzeCircuit({ ...base, strays: strays({ thresholdNodeF: c, outputNodeF: c }) }).periodS, one.periodS));
    // First order in the stray: each decade down takes a decade off the gap, to 1.5e-9 at 1 fF.
    for (let k = 1; k < gaps.length; k++) expect(gaps[k - 1] / gaps[k]).toBeGreaterThan(9);
    expect(gaps[gaps.length - 1]).toBeLessThan(2e-9);
  });
});

describe('the prepared form (tolerance, BOM checks, fit) gives analyze\'s answer for every vector', () => {
  it('perturbed parts and strays, started from the nominal\'s steady state: period and duty within 1e-12', () => {
    const circuit: Circuit = {
      topology: 'two-resistor-feedback',
      supply: { positiveV: 12, negativeV: -12 },
      amplifier: findBuiltInAmplifier('bipolar-split-supply-general')!,
      parts: { rTiming: 10e3, cTiming: 10e-9, rFeedback: 10e3, rGround: 10e3 },
      strays: strays({ thresholdNodeF: 470e-12, outputNodeF: 1e-9 }),
    };
    const model = prepareModel(circuit);
    const out = new Float64Array(OUTPUT_LENGTH);
    for (let k = 0; k < 12; k++) {
      const values = Float64Array.from(model.nominal);
      for (const name of ['rTiming', 'cTiming', 'rGround', 'thresholdNodeF', 'outputNodeF']) values[model.indexOf(name)] *= 1 + 0.1 * Math.sin(k * 7.3 + name.length);
      model.evaluate(values, out);
      const analyzed = analyzeCircuit(model.circuitAt(values));
      expect(rel(out[OUTPUT_SLOT.periodS], analyzed.periodS)).toBeLessThan(1e-12);
      expect(Math.abs(out[OUTPUT_SLOT.dutyCycle] - analyzed.dutyCycle)).toBeLessThan(1e-12);
    }
  });
});

describe('a stiff output charging the capacitance on its pin (charge balance: Q = C·ΔV per edge)', () => {
  it('the timing is unchanged and the supply carries Co·swing per period more', () => {
    const base: Circuit = {
      topology: 'two-resistor-feedback',
      supply: { positiveV: 5, negativeV: -5 },
      amplifier: ideal,
      parts: { rTiming: 47e3, cTiming: 2.2e-9, rGround: 22e3, rFeedback: 22e3 },
    };
    const co = 1e-9;
    const plain = analyzeCircuit(base);
    const loaded = analyzeCircuit({ ...base, strays: strays({ outputNodeF: co }) });
    // The pin is the ideal source itself: its capacitance cannot move it.
    expect(rel(loaded.periodS, plain.periodS)).toBeLessThan(1e-12);
    const extraA = (co * loaded.output.swingV) / loaded.periodS;
    expect(rel(loaded.currents.supplyAverageA - plain.currents.supplyAverageA, extraA)).toBeLessThan(1e-9);
  });
});

describe('check stray-capacitance-significant covers P and the pin (the same 2 % margin as at N)', () => {
  const base: Circuit = {
    topology: 'two-resistor-feedback',
    supply: { positiveV: 5, negativeV: -5 },
    amplifier: { ...ideal, outputResistanceOhm: 100 },
    parts: { rTiming: 100e3, cTiming: 1e-9, rGround: 10e3, rFeedback: 10e3 },
  };
  it('fires when they move the frequency by more than 2 %, with the frequency without them (its own analysis)', () => {
    const loaded = analyzeCircuit({ ...base, strays: strays({ thresholdNodeF: 10e-9, outputNodeF: 10e-9 }) });
    const plain = analyzeCircuit(base);
    const check = loaded.checks.find((c) => c.code === 'stray-capacitance-significant');
    expect(check).toMatchObject({ severity: 'warning', thresholdNodeCapacitanceF: 10e-9, outputNodeCapacitanceF: 10e-9, maximumFrequencyShift: 0.02 });
    expect(rel(check!.frequencyWithoutNodeStraysHz as number, plain.frequencyHz)).toBeLessThan(1e-12);
    expect(check!.frequencyShift).toBeCloseTo(loaded.frequencyHz / plain.frequencyHz - 1, 12);
  });
  it('stays quiet below 2 % (470 pF at P, 1 nF at the pin)', () => {
    const loaded = analyzeCircuit({ ...base, strays: strays({ thresholdNodeF: 470e-12, outputNodeF: 1e-9 }) });
    expect(loaded.checks.some((c) => c.code === 'stray-capacitance-significant')).toBe(false);
  });
});
