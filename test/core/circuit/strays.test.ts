/**
 * Strays and leakage (docs/model.md, "strays and leakage") against hand
 * derivations written out here (Thevenin's theorem and the RC charging law, as in
 * Sedra & Smith's op-amp astable) and against the odex reference integrator
 * (engine-odex-reference.ts), which adds the leakage branches and the timing-node
 * capacitance from their description, not from the engine.
 */
import { describe, expect, it } from 'vitest';
import { analyzeCircuit, BUILT_IN_AMPLIFIERS, findBuiltInAmplifier, IDEAL_FIGURES, prepareModel, type AmplifierModel, type Circuit } from '../../../src/core/index.ts';
import { NO_STRAYS, type Strays } from '../../../src/core/circuit/strays.ts';
import { OUTPUT_LENGTH, OUTPUT_SLOT } from '../../../src/core/circuit/engine/prepared.ts';
import { JohnsonShape } from '../../../src/core/parts/capacitor/index.ts';
import { referenceOscillation } from './engine-odex-reference.ts';

const ideal = findBuiltInAmplifier('ideal')!;
const strays = (s: Partial<Strays>): Strays => ({ ...NO_STRAYS, ...s });

function split(parts: { rTiming: number; cTiming: number; rGround: number; rFeedback: number }, railV: number, s?: Partial<Strays>, amplifier: AmplifierModel = ideal): Circuit {
  const c: Circuit = { topology: 'two-resistor-feedback', supply: { positiveV: railV, negativeV: -railV }, amplifier, parts };
  if (s) c.strays = strays(s);
  return c;
}

const parallel = (a: number, b: number) => (a * b) / (a + b);

describe('leakage across the timing capacitor (hand derivation: Thevenin + RC charging)', () => {
  it('split-supply astable: T = 2·R_th·C·ln((V_th + βV)/(V_th − βV)), V_th = V·R_L/(R + R_L), R_th = R‖R_L', () => {
    const V = 10;
    const R = 47e3;
    const C = 10e-9;
    const beta = 1 / 3; // rGround 10 kΩ, rFeedback 20 kΩ
    for (const leakOhm of [1e9, 10e6, 1e6, 300e3]) {
      const r = analyzeCircuit(split({ rTiming: R, cTiming: C, rGround: 10e3, rFeedback: 20e3 }, V, { timingLeakageOhm: leakOhm }));
      const vTh = (V * leakOhm) / (R + leakOhm);
      const expected = 2 * parallel(R, leakOhm) * C * Math.log((vTh + beta * V) / (vTh - beta * V));
      expect(Math.abs(r.periodS / expected - 1)).toBeLessThan(1e-12);
      expect(r.dutyCycle).toBeCloseTo(0.5, 12);
    }
  });

  it('a leakage that pulls the asymptote inside the thresholds stops the oscillation (no-oscillation, not a wrong period)', () => {
    // V_th = 10·R_L/(R + R_L) < βV = 3.33 V for R_L < R/2.
    expect(() => analyzeCircuit(split({ rTiming: 47e3, cTiming: 10e-9, rGround: 10e3, rFeedback: 20e3 }, 10, { timingLeakageOhm: 20e3 }))).toThrow(
      expect.objectContaining({ code: 'no-oscillation' }),
    );
  });
});

describe('leakage at the threshold node (hand derivation: the leakage parallels rGround)', () => {
  it('T = 2RC·ln((1+β′)/(1−β′)), β′ = (rGround‖R_L)/((rGround‖R_L) + rFeedback)', () => {
    const R = 10e3;
    const C = 22e-9;
    for (const leakOhm of [1e8, 1e6, 50e3]) {
      const r = analyzeCircuit(split({ rTiming: R, cTiming: C, rGround: 20e3, rFeedback: 20e3 }, 12, { thresholdLeakageOhm: leakOhm }));
      const g = parallel(20e3, leakOhm);
      const b = g / (g + 20e3);
      expect(Math.abs(r.periodS / (2 * R * C * Math.log((1 + b) / (1 - b))) - 1)).toBeLessThan(1e-12);
      expect(r.thresholds.upperV).toBeCloseTo(12 * b, 12);
    }
  });
});

describe('capacitance at the timing node', () => {
  it('adds to the timing capacitor: T = 2R(C + C_s)·ln((1+β)/(1−β)) (Sedra & Smith astable with the parallel capacitance)', () => {
    const R = 100e3;
    const C = 1e-9;
    const cs = 15e-12;
    const r = analyzeCircuit(split({ rTiming: R, cTiming: C, rGround: 10e3, rFeedback: 10e3 }, 5, { timingNodeF: cs }));
    expect(Math.abs(r.periodS / (2 * R * (C + cs) * Math.log(3)) - 1)).toBeLessThan(1e-12);
  });

  it('warns when the timing capacitor is below 50× the stray at its node, not above', () => {
    const base = { rTiming: 100e3, cTiming: 100e-12, rGround: 10e3, rFeedback: 10e3 };
    const warned = analyzeCircuit(split(base, 5, { timingNodeF: 5e-12 }));
    const check = warned.checks.find((c) => c.code === 'stray-capacitance-significant');
    expect(check).toMatchObject({ severity: 'warning', strayCapacitanceF: 5e-12 });
    expect(check?.ratio).toBeCloseTo(20, 9);
    expect(analyzeCircuit(split(base, 5, { timingNodeF: 1e-12 })).checks.some((c) => c.code === 'stray-capacitance-significant')).toBe(false);
  });
});

describe('zero strays change nothing', () => {
  it('an explicit all-default strays object answers bit for bit like no strays', () => {
    const amp = findBuiltInAmplifier('cmos-rrio-fast')!;
    const parts = { rTiming: 33e3, cTiming: 4.7e-9, rGround: 10e3, rFeedback: 47e3 };
    const plain = analyzeCircuit(split(parts, 5, undefined, amp));
    const zero = analyzeCircuit(split(parts, 5, {}, amp));
    expect(zero.periodS).toBe(plain.periodS);
    expect(zero.dutyCycle).toBe(plain.dutyCycle);
    expect(zero.output).toEqual(plain.output);
  });
});

describe('strays against the odex reference (independent integration of the same network ODE)', () => {
  const amps = BUILT_IN_AMPLIFIERS.filter((a) => a.id !== 'ideal');
  const pushPull = amps.filter((a) => a.outputStage === 'push-pull');
  const openDrain = amps.find((a) => a.outputStage === 'open-drain')!;
  const cases: Circuit[] = [
    split({ rTiming: 22e3, cTiming: 2.2e-9, rGround: 10e3, rFeedback: 33e3 }, 9, { timingNodeF: 47e-12, timingLeakageOhm: 2e6, thresholdLeakageOhm: 5e6 }, pushPull[0]),
    {
      topology: 'three-resistor-divider',
      supply: { positiveV: 5, negativeV: 0 },
      amplifier: pushPull[pushPull.length - 1],
      parts: { rTiming: 15e3, cTiming: 1e-9, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 },
      strays: strays({ timingNodeF: 10e-12, timingLeakageOhm: 1e6, thresholdLeakageOhm: 1e6 }),
    },
    {
      topology: 'open-drain-pullup',
      supply: { positiveV: 5, negativeV: 0 },
      amplifier: openDrain,
      parts: { rPullup: 4.7e3, rTiming: 47e3, cTiming: 3.3e-9, rTop: 100e3, rBottom: 100e3, rFeedback: 220e3 },
      strays: strays({ timingNodeF: 22e-12, timingLeakageOhm: 3e6 }),
    },
    {
      topology: 'diode-steered',
      supply: { positiveV: 5, negativeV: 0 },
      amplifier: pushPull[0],
      parts: { rCharge: 4.7e3, rDischarge: 47e3, cTiming: 10e-9, rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 },
      strays: strays({ timingLeakageOhm: 500e3, thresholdLeakageOhm: 2e6 }),
    },
  ];
  for (const circuit of cases) {
    it(`${circuit.topology} with ${circuit.amplifier.id}: period and duty within 1e-6`, () => {
      const engine = analyzeCircuit(circuit);
      const ref = referenceOscillation(circuit);
      expect(Math.abs(engine.periodS / ref.periodS - 1)).toBeLessThan(1e-6);
      expect(Math.abs(engine.dutyCycle - ref.dutyCycle)).toBeLessThan(1e-6);
      // The strays matter here: the same circuit without them is measurably different.
      const bare = analyzeCircuit({ ...circuit, strays: undefined });
      expect(Math.abs(bare.periodS / engine.periodS - 1)).toBeGreaterThan(1e-4);
    });
  }

  it('the prepared model carries the strays as parameters: evaluate(vector) = analyzeCircuit(circuitAt(vector)) within 1e-12', () => {
    const circuit = cases[0];
    const model = prepareModel(circuit);
    for (const name of ['timingNodeF', 'timingLeakageOhm', 'thresholdLeakageOhm']) expect(model.parameters[model.indexOf(name)].kind).toBe('stray');
    const values = Float64Array.from(model.nominal);
    values[model.indexOf('timingLeakageOhm')] = 800e3;
    values[model.indexOf('timingNodeF')] = 100e-12;
    const out = new Float64Array(OUTPUT_LENGTH);
    expect(model.evaluate(values, out)).toBe(0);
    expect(model.circuitAt(values).strays).toMatchObject({ timingLeakageOhm: 800e3, timingNodeF: 100e-12 });
    const direct = analyzeCircuit(model.circuitAt(values));
    expect(Math.abs(out[OUTPUT_SLOT.periodS] / direct.periodS - 1)).toBeLessThan(1e-12);
    expect(Math.abs(out[OUTPUT_SLOT.dutyCycle] - direct.dutyCycle)).toBeLessThan(1e-12);
    // A negative stray capacitance is not a circuit.
    values[model.indexOf('timingNodeF')] = -1e-12;
    expect(model.evaluate(values, out)).not.toBe(0);
  });
});

describe('a stray beside a C(V) timing capacitor', () => {
  it('charges as C0·r(v) + C_s: engine and odex (integrating that ODE) agree within 1e-6, and the stray moves the period', () => {
    const circuit: Circuit = {
      ...split({ rTiming: 22e3, cTiming: 1e-9, rGround: 10e3, rFeedback: 15e3 }, 5, { timingNodeF: 100e-12, timingLeakageOhm: 5e6 }, findBuiltInAmplifier('cmos-rrio-fast')!),
      capacitorShape: new JohnsonShape(4),
    };
    const engine = analyzeCircuit(circuit);
    const ref = referenceOscillation(circuit);
    expect(Math.abs(engine.periodS / ref.periodS - 1)).toBeLessThan(1e-6);
    expect(Math.abs(engine.dutyCycle - ref.dutyCycle)).toBeLessThan(1e-6);
    const withoutStray = analyzeCircuit({ ...circuit, strays: strays({ timingLeakageOhm: 5e6 }) });
    expect(engine.periodS / withoutStray.periodS - 1).toBeGreaterThan(0.01);
    // The prepared model (the same stray-loaded curve, fraction from the vector) agrees with the analysis.
    const model = prepareModel(circuit);
    const out = new Float64Array(OUTPUT_LENGTH);
    expect(model.evaluate(model.nominal, out)).toBe(0);
    expect(Math.abs(out[OUTPUT_SLOT.periodS] / engine.periodS - 1)).toBeLessThan(1e-12);
  });
});

describe('every stray in range is modelled; out-of-range values are refused, naming the field', () => {
  const parts = { rTiming: 10e3, cTiming: 10e-9, rGround: 10e3, rFeedback: 10e3 };
  it('capacitance at P, at the output pin, and the amplifier input capacitance beside a C(V) timing capacitor are answered (strays-curved.test.ts checks them against odex)', () => {
    const curve = (c: Circuit): Circuit => ({ ...c, capacitorShape: new JohnsonShape(4) });
    const flat = analyzeCircuit(curve(split(parts, 5)));
    for (const c of [
      curve(split(parts, 5, { thresholdNodeF: 2e-12 })),
      curve(split(parts, 5, { outputNodeF: 10e-12 })),
      curve(split(parts, 5, undefined, { ...ideal, ...IDEAL_FIGURES, inputCapacitanceF: 3e-12 })),
    ]) {
      const r = analyzeCircuit(c);
      // A few picofarads beside 10 nF: a small, non-zero shift (the multi-state C(V) pieces ran).
      expect(r.periodS).not.toBe(flat.periodS);
      expect(Math.abs(r.periodS / flat.periodS - 1)).toBeLessThan(1e-2);
    }
  });
  it('with a linear timing capacitor they are answered (strays-multistate.test.ts checks the figures)', () => {
    expect(analyzeCircuit(split(parts, 5, { thresholdNodeF: 2e-12, outputNodeF: 10e-12 })).periodS).toBeGreaterThan(0);
  });
  it('out-of-range values are 400-class invalid-value errors naming the field', () => {
    expect(() => analyzeCircuit(split(parts, 5, { timingLeakageOhm: 10 }))).toThrow(expect.objectContaining({ code: 'invalid-value', pointer: '/strays/timingLeakageOhm' }));
    expect(() => analyzeCircuit(split(parts, 5, { timingNodeF: -1e-12 }))).toThrow(expect.objectContaining({ code: 'invalid-value', pointer: '/strays/timingNodeF' }));
  });
});
