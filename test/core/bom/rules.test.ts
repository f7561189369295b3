/**
 * One case per BOM rule, plus a clean assembly that passes. Every triggering
 * figure comes from a named outside source or is marked common practice.
 */
import { describe, expect, it } from 'vitest';
import { evaluateAssembly, type BomAssembly, type BomAssemblyResult, type BomRuleResult } from '../../../src/core/index.ts';
import { isInSeries } from '../../../src/core/parts/index.ts';
import type { Catalogue } from '../../../src/core/parts/index.ts';
import { baseAssembly, C_TIMING_F, context, NOMINAL_FREQUENCY_HZ, R_TIMING_OHM, withLine } from './fixtures.ts';

function check(assembly: BomAssembly, ctx = context()): BomAssemblyResult {
  return evaluateAssembly(assembly, 0, ctx);
}

function find(result: BomAssemblyResult, code: string): BomRuleResult {
  const rule = result.rules.find((r) => r.code === code);
  expect(rule, `${code} not in ${JSON.stringify(result.rules.map((r) => r.code))}`).toBeDefined();
  return rule!;
}

const catalogue: Catalogue = {
  id: 'approved-2024',
  parts: [
    { kind: 'resistor', value: 22e3, tolerance: 0.01, partNumber: 'RES-22K-1', status: 'preferred' },
    { kind: 'resistor', value: 68e3, tolerance: 0.01, partNumber: 'RES-68K-1', status: 'preferred' },
    { kind: 'resistor', value: 10e3, tolerance: 0.05, partNumber: 'RES-10K-5-OLD', status: 'not-for-new-designs' },
    { kind: 'capacitor', value: 4.7e-9, tolerance: 0.02, dielectric: 'C0G', ratedVoltageV: 50, partNumber: 'CAP-4N7-C0G', status: 'active' },
  ],
};

describe('a clean assembly', () => {
  it('passes with no error or warning, and its worst case straddles the textbook nominal', () => {
    const result = check(baseAssembly());
    expect(result.pass).toBe(true);
    expect(result.counts.error).toBe(0);
    expect(result.counts.warning).toBe(0);
    const f = find(result, 'frequency-within-spec').figures;
    // Sedra & Smith: equal resistors, rail-to-rail output -> T = 2·ln2·R·C.
    expect(f.nominalFrequencyHz as number).toBeCloseTo(NOMINAL_FREQUENCY_HZ, 6);
    // R and C alone (±1 %, ±2 %) bound f between 1/(k·R·C·1.01·1.02) and 1/(k·R·C·0.99·0.98); the threshold
    // resistors only widen that, and the spec is ±10 %.
    expect(f.worstCaseMinHz as number).toBeLessThanOrEqual(NOMINAL_FREQUENCY_HZ / (1.01 * 1.02));
    expect(f.worstCaseMaxHz as number).toBeGreaterThanOrEqual(NOMINAL_FREQUENCY_HZ / (0.99 * 0.98));
    expect(f.worstCaseMaxHz as number).toBeLessThan(NOMINAL_FREQUENCY_HZ * 1.1);
    expect(result.rules.filter((r) => r.code === 'value-read')).toHaveLength(5);
  });
});

describe('assembly structure', () => {
  it('topology-unknown', () => {
    expect(find(check(baseAssembly({ topology: 'ring-oscillator' })), 'topology-unknown').severity).toBe('error');
  });
  it('role-unassigned, role-unknown', () => {
    const result = check(baseAssembly({ roles: { rTiming: 'R1', cTiming: 'C1', rTop: 'R2', rBottom: 'R3', rFeedbak: 'R4' } }));
    expect(find(result, 'role-unassigned').role).toBe('rFeedback');
    expect(find(result, 'role-unknown').role).toBe('rFeedbak');
    expect(result.pass).toBe(false);
  });
  it('refdes-missing', () => {
    expect(find(check(baseAssembly({ roles: { ...baseAssembly().roles, cTiming: 'C9' } })), 'refdes-missing').refdes).toBe('C9');
  });
  it('refdes-duplicated', () => {
    const lines = [...baseAssembly().lines, { refdes: 'C1', value: '10n C0G 50V 5%' }];
    expect(find(check(baseAssembly({ lines })), 'refdes-duplicated').refdes).toBe('C1');
  });
  it('amplifier-unresolved', () => {
    expect(find(check(baseAssembly({ amplifier: 'no-such-part' })), 'amplifier-unresolved').figures.coreCode).toBe('unknown-reference');
  });
  it('catalogue-unavailable', () => {
    expect(find(check(baseAssembly({ catalogue: 'missing' })), 'catalogue-unavailable').severity).toBe('error');
  });
  it('series-unknown', () => {
    expect(find(check(baseAssembly({ series: 'E25' as never })), 'series-unknown').figures.series).toBe('E25');
  });
  it('spec-inconsistent', () => {
    expect(find(check(baseAssembly({ spec: { frequencyHz: 7000, frequencyTolerance: 0.1, dutyMin: 0.6, dutyMax: 0.4 } })), 'spec-inconsistent').severity).toBe('error');
  });
});

describe('value text', () => {
  it('value-unreadable: an empty value cell', () => {
    const rule = find(check(withLine('R1', { value: '' })), 'value-unreadable');
    expect(rule.refdes).toBe('R1');
  });
  it('value-text-leftover: words the reader does not know', () => {
    expect(find(check(withLine('R1', { value: '22K 1% thick film' })), 'value-text-leftover').figures.unparsed).toBe('thick film');
  });
  it('tolerance-assumed: 5 % for a resistor with none stated (common practice default)', () => {
    const result = check(withLine('R1', { value: '22K' }));
    expect(find(result, 'tolerance-assumed').figures.assumedTolerance).toBe(0.05);
    expect(result.pass).toBe(true);
  });
});

describe('series and catalogue', () => {
  it('value-off-series: 23.7 kΩ is E96 but not E24 (IEC 60063 tables)', () => {
    expect(isInSeries('E96', 23.7e3)).toBe(true);
    // No series declared: no series rule.
    expect(check(withLine('R1', { value: '23K7 1%' })).rules.some((r) => r.code === 'value-off-series')).toBe(false);
    // One series for every role: 23.7 kΩ is E96; 4.7 nF and 68 kΩ are not (the IEC 60063 E96 table has 4.75 and 68.1).
    const allE96 = check(withLine('R1', { value: '23K7 1%' }, { series: 'E96' })).rules.filter((r) => r.code === 'value-off-series');
    expect(allE96.map((r) => r.refdes)).toEqual(['C1', 'R2', 'R3', 'R4']);
    expect(allE96[0].figures.nearestSeriesValue).toBe(4.75e-9);
    expect(allE96[1].figures.nearestSeriesValue).toBe(68.1e3);
    const withSeries = check(withLine('R1', { value: '23K7 1%' }, { series: { rTiming: 'E24' } }));
    const off = find(withSeries, 'value-off-series');
    expect(off.figures.series).toBe('E24');
    // IEC 60063 E24 neighbours of 23.7: 22 and 24 -> the nearest is 24 kΩ.
    expect(off.figures.nearestSeriesValue).toBe(24e3);
  });
  it('part-number-unlisted', () => {
    expect(find(check(withLine('R1', { partNumber: 'RES-22K-X' }, { catalogue: catalogue.id }), context({}, [catalogue])), 'part-number-unlisted').refdes).toBe('R1');
  });
  it('value-disagrees-with-catalogue', () => {
    const rule = find(check(withLine('R1', { value: '22K 1%', partNumber: 'RES-68K-1' }, { catalogue: catalogue.id }), context({}, [catalogue])), 'value-disagrees-with-catalogue');
    expect(rule.figures.catalogueValue).toBe(68e3);
  });
  it('value-not-in-catalogue', () => {
    expect(find(check(withLine('R1', { value: '24K 1%' }, { catalogue: catalogue.id }), context({}, [catalogue])), 'value-not-in-catalogue').figures.value).toBe(24e3);
  });
  it('part-not-for-new-designs (a warning: the assembly still passes at failOn=error, fails at failOn=warning)', () => {
    const a = withLine('R1', { value: '10K', partNumber: 'RES-10K-5-OLD' }, { catalogue: catalogue.id, spec: { frequencyHz: NOMINAL_FREQUENCY_HZ * 2.2, frequencyTolerance: 0.2 } });
    const lenient = check(a, context({}, [catalogue]));
    expect(find(lenient, 'part-not-for-new-designs').severity).toBe('warning');
    expect(lenient.pass).toBe(true);
    expect(check(a, context({ failOn: 'warning' }, [catalogue])).pass).toBe(false);
  });
  it('a matched part number supplies the tolerance the text leaves out', () => {
    const result = check(withLine('R1', { value: '22K', partNumber: 'RES-22K-1' }, { catalogue: catalogue.id }), context({}, [catalogue]));
    expect(result.rules.some((r) => r.code === 'tolerance-assumed')).toBe(false);
    expect(find(result, 'value-read').figures.value).toBe(R_TIMING_OHM);
  });
});

describe('timing capacitor', () => {
  it('dielectric-unfit-for-timing: Y5V is EIA-198 class III (+22 %/−82 %)', () => {
    const rule = find(check(withLine('C1', { value: '4n7 50V Y5V' })), 'dielectric-unfit-for-timing');
    expect(rule.figures.family).toBe('ceramic-class-3');
    expect(rule.figures.changeMinFraction).toBe(-0.82);
  });
  it('a Y5V band over a temperature range still gets a worst case: its −82 % side folds below 1 (EIA-198)', () => {
    // 10 % part tolerance and the class III fall of 82 %: 1 − 0.9 × 0.18 = 0.838 down, so the frequency can
    // rise to about 1/(1 − 0.838) ≈ 6× nominal, far outside a ±10 % spec — reported, not refused.
    const result = check(withLine('C1', { value: '4n7 50V Y5V 10%' }, { temperature: { minC: 0, maxC: 50 } }));
    expect(result.rules.some((r) => r.code === 'circuit-rejected')).toBe(false);
    const outside = find(result, 'frequency-outside-spec');
    expect(outside.figures.worstCaseMaxHz as number).toBeGreaterThan(5 * NOMINAL_FREQUENCY_HZ);
    expect(result.pass).toBe(false);
  });
  it('dielectric-unfit-for-timing: X7R is EIA-198 class II (±15 %)', () => {
    expect(find(check(withLine('C1', { value: '4n7 50V X7R 10%' })), 'dielectric-unfit-for-timing').figures.changeMaxFraction).toBe(0.15);
  });
  it('electrolytic-in-timing-path, and reverse-biased on split rails', () => {
    const split: Partial<BomAssembly> = {
      topology: 'two-resistor-feedback',
      roles: { rTiming: 'R1', cTiming: 'C1', rFeedback: 'R2', rGround: 'R3' },
      supply: { positiveV: 5, negativeV: -5, tolerance: 0 },
    };
    const rule = find(check(withLine('C1', { value: '4u7 25V electrolytic 20%' }, split)), 'electrolytic-in-timing-path');
    expect(rule.figures.reverseBiased).toBe(true);
  });
  it('dielectric-unstated', () => {
    expect(find(check(withLine('C1', { value: '4n7 50V 2%' })), 'dielectric-unstated').severity).toBe('warning');
  });
  it('voltage-rating-below-supply: a 6.3 V part on a 12 V rail', () => {
    const rule = find(check(withLine('C1', { value: '4n7 6V3 C0G 2%' }, { supply: { positiveV: 12, negativeV: 0, tolerance: 0 } })), 'voltage-rating-below-supply');
    expect(rule.figures.ratedVoltageV).toBe(6.3);
    expect(rule.figures.highestRailV).toBe(12);
  });
  it('voltage-rating-unstated', () => {
    expect(find(check(withLine('C1', { value: '4n7 C0G 2%' })), 'voltage-rating-unstated').severity).toBe('info');
  });
  it('temperature-beyond-part-rating: X5R is rated to 85 °C (EIA-198 digit 5)', () => {
    const result = check(withLine('C1', { value: `${C_TIMING_F * 1e9}n 50V X5R 10%` }, { temperature: { minC: -40, maxC: 125 } }));
    expect(find(result, 'temperature-beyond-part-rating').refdes).toBe('C1');
    expect(find(result, 'tempco-assumed').figures.assumedTempcoPpmPerK).toBe(100);
  });
});

describe('circuit behaviour (analysis checks)', () => {
  it('circuit-rejected: an open-drain comparator cannot drive this topology', () => {
    expect(find(check(baseAssembly({ amplifier: 'comparator-open-drain-bipolar' })), 'circuit-rejected').figures.coreCode).toBe('invalid-value');
  });
  it('supply-outside-amplifier-range: 5 V ±15 % leaves a 5.5 V part at the high end', () => {
    const rule = find(check(baseAssembly({ amplifier: { supplyMaxV: 5.5 }, supply: { positiveV: 5, negativeV: 0, tolerance: 0.15 } })), 'supply-outside-amplifier-range');
    expect(rule.figures.supplyCorner).toBe('high');
    expect(rule.figures.supplySpanV as number).toBeCloseTo(5.75, 12);
  });
  it('output-drive-exceeded: 5 V across 100 Ω asks 50 mA of a 10 mA output', () => {
    const result = check(withLine('R1', { value: '100R 1%' }, { amplifier: { outputCurrentLimitA: 0.01 }, spec: { frequencyHz: 1e6, frequencyTolerance: 0.5 } }));
    const rule = find(result, 'output-drive-exceeded');
    expect(rule.figures.peakCurrentA as number).toBeGreaterThan(0.01);
    expect(result.pass).toBe(false);
  });
  it('inputs-outside-common-mode: the upper threshold 2V+/3 lies above V+ − 2 V', () => {
    // Three equal resistors put the thresholds at V+/3 and 2V+/3 (textbook single-supply case).
    const rule = find(check(baseAssembly({ amplifier: { inputCommonModeHighMarginV: 2 } })), 'inputs-outside-common-mode');
    expect(rule.figures.inputMaxV as number).toBeCloseTo((2 * 5) / 3, 9);
    expect(rule.figures.commonModeHighV).toBe(3);
  });
  it('selv-caution: 72 V is above the 60 V DC SELV limit (IEC 61140)', () => {
    const result = check(withLine('C1', { value: '4n7 100V C0G 2%' }, { supply: { positiveV: 72, negativeV: 0, tolerance: 0 } }));
    const rule = find(result, 'selv-caution');
    expect(rule.severity).toBe('caution');
    expect(rule.figures.limitV).toBe(60);
    expect(result.pass).toBe(true);
  });
});

describe('against the spec', () => {
  it('frequency-outside-spec: a 10 % capacitor cannot hold ±5 % (the capacitor alone moves f by up to 1/0.9)', () => {
    const result = check(withLine('C1', { value: '4n7 50V C0G 10%' }, { spec: { frequencyHz: NOMINAL_FREQUENCY_HZ, frequencyTolerance: 0.05 } }));
    const rule = find(result, 'frequency-outside-spec');
    expect(rule.figures.worstCaseMaxHz as number).toBeGreaterThanOrEqual(NOMINAL_FREQUENCY_HZ / 0.9 - 1e-6);
    expect(result.pass).toBe(false);
  });
  it('duty-outside-spec and duty-within-spec: equal resistors and rail-to-rail output give 50 % duty', () => {
    const tight = check(baseAssembly({ spec: { frequencyHz: NOMINAL_FREQUENCY_HZ, frequencyTolerance: 0.1, dutyMin: 0.499, dutyMax: 0.501 } }));
    expect(find(tight, 'duty-outside-spec').figures.nominalDutyCycle as number).toBeCloseTo(0.5, 9);
    const loose = check(baseAssembly({ spec: { frequencyHz: NOMINAL_FREQUENCY_HZ, frequencyTolerance: 0.1, dutyMin: 0.4, dutyMax: 0.6 } }));
    expect(find(loose, 'duty-within-spec').severity).toBe('info');
  });
  it('yield-below-minimum and yield-met (Monte Carlo in full mode)', () => {
    const spec = { frequencyHz: NOMINAL_FREQUENCY_HZ, frequencyTolerance: 0.03, minimumYield: 0.999 };
    const poor = check(withLine('C1', { value: '4n7 50V C0G 5%' }, { spec }), context({ mode: 'full', monteCarloSamples: 400 }));
    const y = find(poor, 'yield-below-minimum').figures;
    expect(y.yield as number).toBeLessThan(0.999);
    expect(y.samples).toBe(400);
    const good = check(baseAssembly({ spec: { ...spec, frequencyTolerance: 0.1 } }), context({ mode: 'full', monteCarloSamples: 400 }));
    expect(find(good, 'yield-met').figures.yield).toBe(1);
  });
  it('yield-not-evaluated in worst-case mode', () => {
    const result = check(baseAssembly({ spec: { frequencyHz: NOMINAL_FREQUENCY_HZ, frequencyTolerance: 0.1, minimumYield: 0.99 } }), context({ mode: 'worst-case' }));
    expect(find(result, 'yield-not-evaluated').severity).toBe('info');
  });
});
