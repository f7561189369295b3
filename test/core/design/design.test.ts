import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import type { AmplifierModel } from '../../../src/core/amplifiers/model.ts';
import { CHECK_CODES } from '../../../src/core/circuit/checks.ts';
import { designOscillator, OUTPUT_CURRENT_DERATING, TIMING_CURRENT_SHARE, type DesignRequest } from '../../../src/core/design/index.ts';
import type { Catalogue } from '../../../src/core/parts/catalogue.ts';
import { isInSeries } from '../../../src/core/parts/series.ts';

const amp = (id: string) => findBuiltInAmplifier(id)!;
const e24e12 = { resistor: { series: 'E24' as const }, capacitor: { series: 'E12' as const } };

function request(over: Partial<DesignRequest>): DesignRequest {
  return {
    targetFrequencyHz: 2500,
    frequencyTolerance: 0.01,
    supply: { positiveV: 5, negativeV: 0 },
    amplifier: amp('cmos-rrio-fast'),
    values: e24e12,
    ...over,
  };
}

describe('designOscillator', () => {
  it('returns ranked designs made of E24 resistors and E12 capacitors, inside the tolerances', () => {
    const { designs } = designOscillator(request({}));
    expect(designs.length).toBeGreaterThan(0);
    for (const d of designs) {
      for (const [role, v] of Object.entries(d.parts)) {
        // IEC 60063: every value is a member of the chosen series.
        expect(isInSeries(role.startsWith('c') ? 'E12' : 'E24', v.value), `${role}=${v.value}`).toBe(true);
      }
      expect(Math.abs(d.frequencyError)).toBeLessThanOrEqual(0.01);
      expect(Math.abs(d.dutyCycleError)).toBeLessThanOrEqual(0.02);
      expect(d.frequencyError).toBeCloseTo(d.predicted.frequencyHz / 2500 - 1, 12);
    }
    // Ranked by yield in whole percent first (design.ts), so yields never rise down the list.
    const yields = designs.map((d) => Math.floor(d.robustness!.yield * 100 + 1e-9));
    expect([...yields].sort((a, b) => b - a)).toEqual(yields);
  });

  it('reaches 20 % and 85 % duty cycles by threshold placement', () => {
    for (const duty of [0.2, 0.85]) {
      const { designs } = designOscillator(request({ targetDutyCycle: duty, targetFrequencyHz: 800 }));
      expect(designs.length).toBeGreaterThan(0);
      for (const d of designs) {
        expect(d.topology).toBe('three-resistor-divider');
        expect(Math.abs(d.predicted.dutyCycle - duty)).toBeLessThanOrEqual(0.02);
      }
    }
  });

  it('designs for split rails with an archetype whose output stops short of the rails', () => {
    const { designs } = designOscillator(request({ supply: { positiveV: 12, negativeV: -12 }, amplifier: amp('bipolar-split-supply-general'), targetFrequencyHz: 300 }));
    expect(designs.some((d) => d.topology === 'two-resistor-feedback')).toBe(true);
  });

  it('keeps the timing resistor where the output can drive it (the trade rule on output current)', () => {
    // Common practice: the timing resistor must be large enough that the output is not asked for more than it can give.
    const weak: AmplifierModel = { ...amp('cmos-rrio-fast'), outputCurrentLimitA: 1e-3 };
    const { designs } = designOscillator(request({ amplifier: weak }));
    expect(designs.length).toBeGreaterThan(0);
    for (const d of designs) {
      const worstV = Math.max(5 - d.analysis.thresholds.lowerV, d.analysis.thresholds.upperV);
      expect(d.parts.rTiming.value).toBeGreaterThanOrEqual((0.98 * worstV) / (1e-3 * OUTPUT_CURRENT_DERATING * TIMING_CURRENT_SHARE));
      expect(d.checks.map((c) => c.code)).not.toContain(CHECK_CODES.outputOverload);
    }
  });

  it('keeps resistances low enough that bias current does not shift the thresholds', () => {
    const leaky: AmplifierModel = { ...amp('cmos-rrio-fast'), inputBiasCurrentA: 200e-9 };
    const { designs } = designOscillator(request({ amplifier: leaky, targetFrequencyHz: 50 }));
    expect(designs.length).toBeGreaterThan(0);
    for (const d of designs) expect(d.checks.map((c) => c.code)).not.toContain(CHECK_CODES.biasShift);
  });

  it('uses only designable parts of a catalogue and names them', () => {
    const resistors = [1000, 2200, 3300, 4700, 6800, 10000, 15000, 22000, 33000, 47000, 68000, 100000, 150000, 220000];
    const cat: Catalogue = {
      id: 'lab',
      parts: [
        ...resistors.map((v, i) => ({ kind: 'resistor' as const, value: v, tolerance: 0.01, partNumber: `LR-${i}`, status: 'active' as const })),
        { kind: 'capacitor', value: 10e-9, tolerance: 0.05, partNumber: 'LC-1', dielectric: 'C0G', status: 'preferred' },
        { kind: 'capacitor', value: 4.7e-9, tolerance: 0.05, partNumber: 'LC-2', dielectric: 'C0G', status: 'active' },
        { kind: 'capacitor', value: 22e-9, tolerance: 0.05, partNumber: 'LC-3', dielectric: 'X7R', status: 'not-for-new-designs' },
      ],
    };
    const { designs } = designOscillator(request({ values: { resistor: { catalogue: cat }, capacitor: { catalogue: cat } }, frequencyTolerance: 0.05 }));
    expect(designs.length).toBeGreaterThan(0);
    for (const d of designs) {
      for (const v of Object.values(d.parts)) {
        for (const p of v.parts) {
          const part = cat.parts.find((c) => c.partNumber === p.partNumber);
          expect(part?.value).toBe(p.value);
          expect(part?.status).not.toBe('not-for-new-designs');
        }
      }
    }
  });

  it('answers infeasible with the reason for impossible requests', () => {
    const cases: [Partial<DesignRequest>, RegExp, string | undefined][] = [
      [{ supply: { positiveV: 12, negativeV: -12 }, amplifier: amp('bipolar-split-supply-general'), targetFrequencyHz: 50e3 }, /frequency ceiling/, '/targetFrequencyHz'],
      [{ supply: { positiveV: 15, negativeV: 0 } }, /outside the amplifier's rated/, '/supply'],
      // Threshold placement alone stops at 90 % (diode steering, tested in steered-design.test.ts, goes further).
      [{ targetDutyCycle: 0.95, topologies: ['three-resistor-divider'] }, /duty cycle/, '/targetDutyCycle'],
      [{ values: { resistor: { series: 'E24' }, capacitor: { catalogue: { id: 'empty', parts: [] } } } }, /no designable capacitor/, '/values/capacitor'],
      [{ constraints: { maxSupplyCurrentA: 1e-4 } }, /supply-current budget/, '/constraints/maxSupplyCurrentA'],
      [
        { frequencyTolerance: 1e-4, values: { resistor: { series: 'E3' }, capacitor: { series: 'E3' } }, constraints: { rMinOhm: 10e3, rMaxOhm: 47e3, cMinF: 10e-9, cMaxF: 22e-9 } },
        /No design meets/,
        undefined,
      ],
    ];
    for (const [over, message, pointer] of cases) {
      let caught: unknown;
      try {
        designOscillator(request(over));
      } catch (err) {
        caught = err;
      }
      expect(caught, String(message)).toMatchObject({ code: 'infeasible', pointer });
      expect((caught as Error).message).toMatch(message);
    }
  });
});
