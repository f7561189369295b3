/**
 * Forward design of the diode-steered astable, checked against dwell times
 * derived by hand here (first-order exponential law with the diode drop), the
 * output-current trade rule, and an exhaustive search over a small catalogue.
 */
import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import type { AmplifierModel } from '../../../src/core/amplifiers/model.ts';
import { analyzeCircuit } from '../../../src/core/circuit/analyze.ts';
import { CHECK_CODES } from '../../../src/core/circuit/checks.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import {
  centredThresholds,
  designOscillator,
  OUTPUT_CURRENT_DERATING,
  steeredDwellFactors,
  TIMING_CURRENT_SHARE,
  type Design,
  type DesignRequest,
} from '../../../src/core/design/index.ts';
import type { Catalogue, CataloguePart } from '../../../src/core/parts/catalogue.ts';
import { isInSeries } from '../../../src/core/parts/series.ts';

const amp = (id: string) => findBuiltInAmplifier(id)!;
const ideal = amp('ideal');
const e24e12 = { resistor: { series: 'E24' as const }, capacitor: { series: 'E12' as const } };

function request(over: Partial<DesignRequest>): DesignRequest {
  return {
    targetFrequencyHz: 1000,
    frequencyTolerance: 0.01,
    supply: { positiveV: 5, negativeV: 0 },
    amplifier: ideal,
    values: e24e12,
    ...over,
  };
}

function designError(req: DesignRequest): { code: string; pointer?: string; message: string; details?: Record<string, unknown> } {
  try {
    designOscillator(req);
  } catch (err) {
    return err as never;
  }
  throw new Error('expected the design to be refused');
}

/**
 * Thresholds of a decision node by superposition (Millman's theorem): P is the
 * conductance-weighted mean of the voltages its resistors return to.
 */
function handThresholds(d: Design, supply: { positiveV: number; negativeV: number }): { upperV: number; lowerV: number } {
  const p = (role: string) => d.parts[role]?.value;
  const branches = (outV: number): [number, number][] =>
    p('rTop') !== undefined
      ? [
          [p('rTop')!, supply.positiveV],
          [p('rBottom')!, 0],
          [p('rFeedback')!, outV],
        ]
      : [
          [p('rGround')!, 0],
          [p('rFeedback')!, outV],
        ];
  const millman = (bs: [number, number][]) => bs.reduce((s, [r, v]) => s + v / r, 0) / bs.reduce((s, [r]) => s + 1 / r, 0);
  return { upperV: millman(branches(supply.positiveV)), lowerV: millman(branches(supply.negativeV)) };
}

/**
 * Hand derivation, ideal rail-to-rail output: while high the capacitor charges from L toward
 * V+ − Vf through rCharge + rD, while low it discharges from U toward V− + Vf through
 * rDischarge + rD (v(t) = v∞ + (v0 − v∞)·e^(−t/τ), so t = τ·ln((v∞ − v0)/(v∞ − v1))).
 */
function handDwellTimes(d: Design, supply: { positiveV: number; negativeV: number }, diode: { forwardDropV: number; resistanceOhm: number }) {
  const { upperV: U, lowerV: L } = handThresholds(d, supply);
  const C = d.parts.cTiming.value;
  const top = supply.positiveV - diode.forwardDropV;
  const bottom = supply.negativeV + diode.forwardDropV;
  return {
    highS: (d.parts.rCharge.value + diode.resistanceOhm) * C * Math.log((top - L) / (top - U)),
    lowS: (d.parts.rDischarge.value + diode.resistanceOhm) * C * Math.log((U - bottom) / (L - bottom)),
  };
}

describe('steered dwell factors', () => {
  it('match the exponential law with the asymptotes moved in by the forward drop (hand derivation)', () => {
    // Three equal divider resistors on 9 V put the thresholds at 3 V and 6 V (textbook single-supply case);
    // with a 0.6 V drop the capacitor heads for 8.4 V while high and 0.6 V while low.
    const f = steeredDwellFactors({ lowerV: 3, upperV: 6 }, { highV: 9, lowV: 0 }, 0.6)!;
    expect(f.highTau).toBeCloseTo(Math.log(5.4 / 2.4), 14);
    expect(f.lowTau).toBeCloseTo(Math.log(5.4 / 2.4), 14);
    const g = steeredDwellFactors({ lowerV: 2, upperV: 6 }, { highV: 9, lowV: 0 }, 0.7)!;
    expect(g.highTau).toBeCloseTo(Math.log(6.3 / 2.3), 14);
    expect(g.lowTau).toBeCloseTo(Math.log(5.3 / 1.3), 14);
    // A threshold beyond an asymptote never switches.
    expect(steeredDwellFactors({ lowerV: 0.5, upperV: 6 }, { highV: 9, lowV: 0 }, 0.6)).toBeNull();
  });

  it('a centred pair gives equal factors, so duty is the path-resistance ratio (hand derivation)', () => {
    // Symmetric about mid-swing, both asymptotes one drop inside the levels: the two logarithms coincide.
    const t = centredThresholds(1.5, { highV: 5, lowV: 0 });
    expect(t.lowerV).toBeCloseTo(1.75, 14);
    expect(t.upperV).toBeCloseTo(3.25, 14);
    const f = steeredDwellFactors(t, { highV: 5, lowV: 0 }, 0.6)!;
    expect(f.highTau).toBeCloseTo(f.lowTau, 14);
  });
});

describe('designOscillator beyond threshold placement (diode steering)', () => {
  it('designs 4 %, 6 %, 94 % and 97 % duty on one rail from E24/E12, each half as derived by hand', () => {
    for (const duty of [0.04, 0.06, 0.94, 0.97]) {
      const { designs } = designOscillator(request({ targetDutyCycle: duty, dutyTolerance: 0.005 }));
      expect(designs.length, `duty ${duty}`).toBeGreaterThan(0);
      for (const d of designs) {
        expect(d.topology).toBe('diode-steered');
        for (const [role, v] of Object.entries(d.parts)) {
          // IEC 60063: every value is a member of the chosen series.
          expect(isInSeries(role.startsWith('c') ? 'E12' : 'E24', v.value), `${role}=${v.value}`).toBe(true);
        }
        expect(d.diode).toEqual({ forwardDropV: 0.6, resistanceOhm: 10 });
        const hand = handDwellTimes(d, { positiveV: 5, negativeV: 0 }, d.diode!);
        expect(d.analysis.timeHighS / hand.highS - 1).toBeCloseTo(0, 9);
        expect(d.analysis.timeLowS / hand.lowS - 1).toBeCloseTo(0, 9);
        const handHz = 1 / (hand.highS + hand.lowS);
        expect(d.frequencyError).toBeCloseTo(handHz / 1000 - 1, 9);
        expect(Math.abs(d.frequencyError)).toBeLessThanOrEqual(0.01);
        expect(Math.abs(hand.highS / (hand.highS + hand.lowS) - duty)).toBeLessThanOrEqual(0.005);
        expect(d.dutyCycleError).toBeCloseTo(d.predicted.dutyCycle - duty, 12);
      }
      // Ranked by yield in whole percent first (design.ts), so yields never rise down the list.
      const yields = designs.map((d) => Math.floor(d.robustness!.yield * 100 + 1e-9));
      expect([...yields].sort((a, b) => b - a)).toEqual(yields);
    }
  });

  it('designs split rails with rFeedback + rGround and a caller-chosen diode (hand derivation)', () => {
    const diode = { forwardDropV: 0.3, resistanceOhm: 4 };
    const supply = { positiveV: 6, negativeV: -6 };
    const { designs } = designOscillator(request({ supply, targetDutyCycle: 0.03, targetFrequencyHz: 250, dutyTolerance: 0.005, diode }));
    expect(designs.length).toBeGreaterThan(0);
    for (const d of designs) {
      expect(Object.keys(d.parts).sort()).toEqual(['cTiming', 'rCharge', 'rDischarge', 'rFeedback', 'rGround']);
      expect(d.diode).toEqual(diode);
      const hand = handDwellTimes(d, supply, diode);
      expect(d.analysis.timeHighS / hand.highS - 1).toBeCloseTo(0, 9);
      expect(d.analysis.timeLowS / hand.lowS - 1).toBeCloseTo(0, 9);
    }
  });

  it('offers steered designs inside 10..90 % only when asked for', () => {
    const plain = designOscillator(request({ targetDutyCycle: 0.5 }));
    expect(plain.designs.every((d) => d.topology !== 'diode-steered')).toBe(true);
    const asked = designOscillator(request({ targetDutyCycle: 0.5, topologies: ['diode-steered', 'three-resistor-divider'] }));
    expect(asked.designs.some((d) => d.topology === 'diode-steered')).toBe(true);
  });

  it('keeps each steering path within what the output can drive (the trade rule on output current)', () => {
    // Common practice: a path resistor must be large enough that the output is not asked for more than
    // it can give. Charging starts at L with the output high, discharging at U with it low.
    const weak: AmplifierModel = { ...amp('cmos-rrio-fast'), outputCurrentLimitA: 1e-3 };
    const usableA = 1e-3 * OUTPUT_CURRENT_DERATING * TIMING_CURRENT_SHARE;
    for (const duty of [0.05, 0.95]) {
      const { designs } = designOscillator(request({ amplifier: weak, targetDutyCycle: duty, targetFrequencyHz: 2000 }));
      expect(designs.length).toBeGreaterThan(0);
      for (const d of designs) {
        const { upperV: U, lowerV: L } = d.analysis.thresholds;
        const highV = 5 - weak.outputHeadroomHighV;
        const lowV = weak.outputHeadroomLowV;
        expect(d.parts.rCharge.value + 10).toBeGreaterThanOrEqual((0.98 * (highV - 0.6 - L)) / usableA);
        expect(d.parts.rDischarge.value + 10).toBeGreaterThanOrEqual((0.98 * (U - lowV - 0.6)) / usableA);
        expect(d.checks.map((c) => c.code)).not.toContain(CHECK_CODES.outputOverload);
      }
    }
  });

  it('keeps path resistances low enough that bias current does not shift the switching', () => {
    const leaky: AmplifierModel = { ...amp('cmos-rrio-fast'), inputBiasCurrentA: 20e-9 };
    const { designs } = designOscillator(request({ amplifier: leaky, targetDutyCycle: 0.95, targetFrequencyHz: 50 }));
    expect(designs.length).toBeGreaterThan(0);
    for (const d of designs) expect(d.checks.map((c) => c.code)).not.toContain(CHECK_CODES.biasShift);
  });

  it('answers infeasible at /targetDutyCycle when the resistor ratio the duty needs leaves the bounds', () => {
    // Centred thresholds give equal dwell factors (hand derivation above), so the paths must stand in the
    // ratio d/(1 − d); 1 kΩ..47 kΩ allows at most (47k + 10)/(1k + 10) ≈ 46.5.
    const duty = 0.99;
    const e = designError(request({ targetDutyCycle: duty, dutyTolerance: 0.002, constraints: { rMinOhm: 1e3, rMaxOhm: 47e3 } }));
    expect(e.code).toBe('infeasible');
    expect(e.pointer).toBe('/targetDutyCycle');
    expect(e.message).toMatch(/ratio/);
    expect(e.details!.requiredResistanceRatio as number).toBeCloseTo(duty / (1 - duty), 9);
    expect(e.details!.largestResistanceRatio as number).toBeCloseTo((47e3 + 10) / (1e3 + 10), 9);
  });

  it('still refuses a duty cycle outside placement when the topologies named exclude steering', () => {
    const e = designError(request({ targetDutyCycle: 0.05, topologies: ['three-resistor-divider'] }));
    expect(e.code).toBe('infeasible');
    expect(e.pointer).toBe('/targetDutyCycle');
    expect(e.message).toMatch(/diode-steered/);
  });
});

describe('steered search against an exhaustive search over a small catalogue', () => {
  // Coarse E6 steps (IEC 60063) and few capacitors, with tolerances that weigh frequency and duty alike, so
  // that the best tuple is often not the nearest value to either ideal resistance (a nearest-value search
  // misses the optimum at every target below).
  const e6 = [1, 1.5, 2.2, 3.3, 4.7, 6.8];
  const resistorValues = [1e3, 10e3, 100e3].flatMap((dec) => e6.map((m) => Math.round(m * dec)));
  const capacitorValues = [1e-9, 4.7e-9, 22e-9];
  const part = (kind: 'resistor' | 'capacitor', value: number, i: number): CataloguePart => ({
    kind,
    value,
    tolerance: 0.01,
    partNumber: `${kind[0]}-${i}`,
    status: 'active',
  });
  const timing: Catalogue = {
    id: 'bench-drawer',
    parts: [...resistorValues.map((v, i) => part('resistor', v, i)), ...capacitorValues.map((v, i) => part('capacitor', v, i))],
  };
  // One value per threshold role fixes the network: three equal resistors, thresholds at V+/3 and 2V+/3.
  const fixed = (value: number): Catalogue => ({ id: `fixed-${value}`, parts: [part('resistor', value, 0)] });
  const values = {
    resistor: { catalogue: timing },
    capacitor: { catalogue: timing },
    roles: { rTop: { catalogue: fixed(47e3) }, rBottom: { catalogue: fixed(47e3) }, rFeedback: { catalogue: fixed(47e3) } },
  };

  for (const [frequencyHz, duty] of [
    [430, 0.05],
    [1000, 0.07],
    [1370, 0.97],
    [2900, 0.95],
  ]) {
    it(`finds the exhaustive optimum at ${frequencyHz} Hz, ${duty * 100} % duty`, () => {
      const frequencyTolerance = 0.05;
      const dutyTolerance = 0.05;
      const score = (fe: number, de: number) => Math.abs(fe) / frequencyTolerance + Math.abs(de) / dutyTolerance;
      // Exhaustive: every rCharge × rDischarge × cTiming of the catalogue, analysed in full.
      let best: { score: number; key: string } | undefined;
      for (const rCharge of resistorValues) {
        for (const rDischarge of resistorValues) {
          for (const cTiming of capacitorValues) {
            const circuit: Circuit = {
              topology: 'diode-steered',
              supply: { positiveV: 5, negativeV: 0 },
              amplifier: ideal,
              parts: { rTop: 47e3, rBottom: 47e3, rFeedback: 47e3, rCharge, rDischarge, cTiming },
              diode: { forwardDropV: 0.6, resistanceOhm: 10 },
            };
            const a = analyzeCircuit(circuit);
            const fe = a.frequencyHz / frequencyHz - 1;
            const de = a.dutyCycle - duty;
            if (Math.abs(fe) > frequencyTolerance || Math.abs(de) > dutyTolerance) continue;
            const s = score(fe, de);
            if (!best || s < best.score) best = { score: s, key: `${rCharge}/${rDischarge}/${cTiming}` };
          }
        }
      }
      expect(best).toBeDefined();
      const { designs } = designOscillator(request({ targetFrequencyHz: frequencyHz, targetDutyCycle: duty, frequencyTolerance, dutyTolerance, values }));
      // The search's nominal optimum is among the designs offered (the final order is by yield, margin, practicality).
      const top = designs.find((d) => `${d.parts.rCharge.value}/${d.parts.rDischarge.value}/${d.parts.cTiming.value}` === best!.key);
      expect(top, best!.key).toBeDefined();
      expect(score(top!.frequencyError, top!.dutyCycleError)).toBeCloseTo(best!.score, 12);
      for (const role of ['rCharge', 'rDischarge', 'cTiming']) expect(top!.parts[role].parts[0].catalogueId).toBe('bench-drawer');
    });
  }
});
