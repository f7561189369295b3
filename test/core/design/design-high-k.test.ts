/**
 * Design and class II ceramics: a class I (or film) part of the same value is preferred; a class II part is
 * offered only when allowed AND when its DC-bias and ageing shifts fit the frequency tolerance.
 * Outside sources: the Johnson law of a ferroelectric's field dependence, C(V) = C(0)·(1 + (V/Va)²)^(−1/3)
 * (J. Appl. Phys. 33, 2826 (1962)), averaged over the swing by this file's own Simpson rule; the log-decade
 * ageing law C(t) = C(t0)·(1 − k·log10(t/t0)). The retention at the rated voltage and the per-decade rate
 * are the model's class-typical figures (from memory, as it says), taken as inputs here.
 */
import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import { CoreError } from '../../../src/core/errors.ts';
import { designOscillator, type DesignRequest } from '../../../src/core/design/index.ts';
import { highKShift } from '../../../src/core/design/high-k-budget.ts';
import type { Catalogue, CataloguePart } from '../../../src/core/parts/catalogue.ts';
import { ageingRatePerDecade, typicalRetentionAtRated } from '../../../src/core/parts/capacitor/index.ts';
import { parseDielectric } from '../../../src/core/parts/dielectric.ts';
import { seriesValues } from '../../../src/core/parts/series.ts';

const capacitors = (dielectric: string, ratedVoltageV: number, pkg: string, prefix: string): CataloguePart[] =>
  seriesValues('E12', 1e-9, 1e-6).map((value, i) => ({ kind: 'capacitor', value, tolerance: 0.05, dielectric, ratedVoltageV, package: pkg, partNumber: `${prefix}-${i}`, status: 'active' }));

const request = (catalogue: Catalogue, frequencyTolerance: number): DesignRequest => ({
  targetFrequencyHz: 1e3,
  frequencyTolerance,
  supply: { positiveV: 5, negativeV: 0 },
  amplifier: findBuiltInAmplifier('cmos-rrio-fast')!,
  values: { resistor: { series: 'E24', tolerance: 0.01 }, capacitor: { catalogue } },
  constraints: { allowHighKDielectric: true },
  topologies: ['three-resistor-divider'],
  count: 3,
  robustness: { samples: 100 },
});

/** The Johnson-law mean of C(V)/C(0) over [v0, v1], Simpson's rule on 2000 intervals. */
function johnsonMean(retentionAtRated: number, ratedV: number, v0: number, v1: number): number {
  const scaleV = ratedV / Math.sqrt(retentionAtRated ** -3 - 1);
  const c = (v: number) => (1 + (v / scaleV) ** 2) ** (-1 / 3);
  const n = 2000;
  const h = (v1 - v0) / n;
  let s = c(v0) + c(v1);
  for (let k = 1; k < n; k++) s += (k % 2 ? 4 : 2) * c(v0 + k * h);
  return (s * h) / 3 / (v1 - v0);
}

describe('class II timing capacitors in design', () => {
  it('the shifts are the Johnson-law mean over the swing and the log-decade ageing over 10 years', () => {
    const shift = highKShift({ value: 100e-9, tolerance: 0.1, dielectric: 'X7R', ratedVoltageV: 6.3, caseSize: '0402' }, 1.6, 3.4)!;
    const retention = typicalRetentionAtRated(parseDielectric('X7R'), 6.3, '0402');
    expect(shift.biasShift).toBeCloseTo(johnsonMean(retention, 6.3, 1.6, 3.4) - 1, 6);
    // 10 years = 87,660 h against the 1000 h reference age.
    expect(shift.ageingShift).toBeCloseTo(-ageingRatePerDecade(parseDielectric('X7R')) * Math.log10(87_660 / 1000), 12);
    expect(shift.frequencyShift).toBeCloseTo(1 / ((1 + shift.biasShift) * (1 + shift.ageingShift)) - 1, 12);
    // A film or class I part loses nothing.
    expect(highKShift({ value: 100e-9, tolerance: 0.05, dielectric: 'C0G' }, 1.6, 3.4)).toBeUndefined();
  });

  it('prefers a C0G part to an X7R part of the same value', () => {
    const cat: Catalogue = { id: 'mixed', parts: [...capacitors('X7R', 50, '1206', 'x'), ...capacitors('C0G', 50, '1206', 'c')] };
    const { designs } = designOscillator(request(cat, 0.05));
    expect(designs.length).toBeGreaterThan(0);
    for (const d of designs) expect(d.parts.cTiming.parts.every((p) => p.dielectric === 'C0G'), JSON.stringify(d.parts.cTiming)).toBe(true);
  });

  it('refuses a small low-voltage X7R whose DC-bias loss alone spends the tolerance, naming it', () => {
    const cat: Catalogue = { id: 'small-x7r', parts: capacitors('X7R', 6.3, '0402', 'x') };
    let caught: unknown;
    try {
      designOscillator(request(cat, 0.05));
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(CoreError);
    expect((caught as CoreError).code).toBe('infeasible');
    expect((caught as CoreError).message).toMatch(/class II\/III ceramic .*X7R timing capacitor .*DC bias .*ageing over 10 years/);
    expect((caught as CoreError).pointer).toBe('/values/capacitor');
  });

  it('keeps a large high-voltage X7R when its shifts fit a wide tolerance, with the class II warning', () => {
    const cat: Catalogue = { id: 'big-x7r', parts: capacitors('X7R', 50, '1206', 'x') };
    const { designs } = designOscillator(request(cat, 0.15));
    expect(designs.length).toBeGreaterThan(0);
    for (const d of designs) {
      const { minV, maxV } = d.analysis.capacitor;
      const shift = highKShift(d.parts.cTiming.parts[0], minV, maxV)!;
      expect(d.frequencyError + shift.frequencyShift).toBeLessThanOrEqual(0.15);
      expect(d.checks.some((c) => c.code === 'dielectric-unfit-for-timing' && c.severity === 'warning')).toBe(true);
    }
  });
});
