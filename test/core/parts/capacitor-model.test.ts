import { describe, expect, it } from 'vitest';
import { CoreError } from '../../../src/core/errors.ts';
import { parseDielectric } from '../../../src/core/parts/index.ts';
import {
  AGEING_REFERENCE_HOURS,
  ageingFactor,
  ageingRatePerDecade,
  capacitanceUnder,
  curvePoints,
  effectiveCapacitanceF,
  insulationResistanceOhm,
  JohnsonShape,
  resolveCapacitor,
  temperatureBand,
  typicalRetentionAtRated,
  typicalTemperatureChange,
} from '../../../src/core/parts/capacitor/index.ts';
import { forwardDropAtV } from '../../../src/core/parts/diode-drift.ts';

describe('EIA-198 temperature characteristic (EIA-198 class II/III code letters)', () => {
  // EIA-198: first letter low temperature (X −55, Y −30, Z +10 °C), digit high temperature
  // (5 +85, 6 +105, 7 +125, 8 +150 °C), last letter the change band vs 25 °C
  // (R ±15 %, S ±22 %, T +22/−33 %, U +22/−56 %, V +22/−82 %).
  const cases: [string, number, number, number, number][] = [
    ['X7R', -55, 125, 0.15, -0.15],
    ['X5R', -55, 85, 0.15, -0.15],
    ['X6S', -55, 105, 0.22, -0.22],
    ['X7T', -55, 125, 0.22, -0.33],
    ['Z5U', 10, 85, 0.22, -0.56],
    ['Y5V', -30, 85, 0.22, -0.82],
  ];
  for (const [code, tMin, tMax, hi, lo] of cases) {
    it(`${code}: band ${hi}/${lo} inside ${tMin}..${tMax} °C; the typical curve stays inside it`, () => {
      const d = parseDielectric(code);
      const band = temperatureBand(d, tMax);
      expect(band.maxFraction).toBe(hi);
      expect(band.minFraction).toBe(lo);
      expect(band.withinRatedRange).toBe(true);
      expect(temperatureBand(d, tMax + 1).withinRatedRange).toBe(false);
      expect(temperatureBand(d, tMin - 1).withinRatedRange).toBe(false);
      for (let t = tMin; t <= tMax; t += 5) {
        const c = typicalTemperatureChange(d, t);
        expect(c).toBeLessThanOrEqual(hi);
        expect(c).toBeGreaterThanOrEqual(lo);
      }
      expect(typicalTemperatureChange(d, 25)).toBe(0);
      // Class-typical (from memory): a class II/III body sits below its 25 °C value at both extremes.
      expect(typicalTemperatureChange(d, tMax)).toBeLessThan(0);
    });
  }
  it('class I follows its tempco (EIA-198 U2J: −750 ppm/K)', () => {
    expect(typicalTemperatureChange(parseDielectric('U2J'), 85)).toBeCloseTo(-750e-6 * 60, 12);
    expect(typicalTemperatureChange(parseDielectric('C0G'), -40)).toBe(0);
  });
});

describe('log-decade ageing law C(t) = C(t0)·(1 − k·log10(t/t0))', () => {
  it('against its formula, per decade', () => {
    const k = 0.02;
    for (const hours of [10, 100, 1000, 1e4, 1e5, 87660]) {
      expect(ageingFactor(k, hours)).toBeCloseTo(1 - k * Math.log10(hours / AGEING_REFERENCE_HOURS), 14);
    }
    // One decade after the reference age: exactly one k lost; one decade before: one k above.
    expect(ageingFactor(k, 10 * AGEING_REFERENCE_HOURS)).toBeCloseTo(0.98, 14);
    expect(ageingFactor(k, AGEING_REFERENCE_HOURS / 10)).toBeCloseTo(1.02, 14);
    // The law holds from about an hour after de-ageing: younger ages count as 1 h.
    expect(ageingFactor(k, 0)).toBe(ageingFactor(k, 1));
  });
  it('class-typical rates (from memory): class III > X5R > X7R > 0 for class I and film', () => {
    const rate = (c: string) => ageingRatePerDecade(parseDielectric(c));
    expect(rate('Y5V')).toBeGreaterThan(rate('X5R'));
    expect(rate('X5R')).toBeGreaterThan(rate('X7R'));
    expect(rate('X7R')).toBeGreaterThan(0);
    expect(rate('C0G')).toBe(0);
    expect(rate('PP')).toBe(0);
  });
});

describe('class-typical DC-bias curve (Johnson law through a typical retention; from memory)', () => {
  const x7r = parseDielectric('X7R');
  it('small case, low-voltage X7R at half its rating loses a third or more', () => {
    const cap = resolveCapacitor({ value: '100n', dielectric: 'X7R', ratedVoltageV: 6.3, caseSize: '0402' });
    expect(cap.shape.ratio(3.15)).toBeLessThan(2 / 3);
    expect(cap.shape.ratio(6.3)).toBeCloseTo(typicalRetentionAtRated(x7r, 6.3, '0402'), 12);
  });
  it('larger cases and higher ratings retain more; class III retains least', () => {
    expect(typicalRetentionAtRated(x7r, 16, '1206')).toBeGreaterThan(typicalRetentionAtRated(x7r, 16, '0402'));
    expect(typicalRetentionAtRated(x7r, 50, '0805')).toBeGreaterThan(typicalRetentionAtRated(x7r, 10, '0805'));
    expect(typicalRetentionAtRated(parseDielectric('Y5V'), 16, '0805')).toBeLessThan(typicalRetentionAtRated(x7r, 16, '0805'));
  });
  it('Johnson law shape: flat at 0 V, even, falling as V^(−2/3) far out (Johnson 1962)', () => {
    const s = new JohnsonShape(2);
    expect(s.ratio(0)).toBe(1);
    expect(s.ratio(-3)).toBe(s.ratio(3));
    expect(s.ratio(2000) / s.ratio(1000)).toBeCloseTo(2 ** (-2 / 3), 5);
  });
  it('class I and film stay flat; so does a bare value', () => {
    expect(resolveCapacitor({ value: '10n', dielectric: 'C0G', ratedVoltageV: 6.3, caseSize: '0402' }).shape.kind).toBe('flat');
    expect(resolveCapacitor({ value: '10n', dielectric: 'PP' }).shape.ratio(50)).toBe(1);
    expect(resolveCapacitor('10n').shape.kind).toBe('flat');
  });
  it('effective capacitance over a 1.67–3.33 V swing of a 0402 6.3 V X7R is well below nominal', () => {
    const cap = resolveCapacitor({ value: '100n', dielectric: 'X7R', ratedVoltageV: 6.3, caseSize: '0402' });
    const ceff = effectiveCapacitanceF(cap.shape, cap.capacitanceF, 5 / 3, 10 / 3);
    expect(ceff).toBeLessThan(cap.capacitanceF * cap.shape.ratio(5 / 3));
    expect(ceff).toBeGreaterThan(cap.capacitanceF * cap.shape.ratio(10 / 3));
    const pts = curvePoints(cap.shape, cap.capacitanceF, 5 / 3, 10 / 3, 5);
    expect(pts).toHaveLength(5);
    expect(pts[0].voltageV).toBeCloseTo(5 / 3, 12);
    expect(pts[4].capacitanceF).toBeCloseTo(cap.capacitanceF * cap.shape.ratio(10 / 3), 20);
  });
});

describe('capacitor object', () => {
  it('resolves value strings (IEC 60062), tolerance letters and percent, and states defaults', () => {
    const cap = resolveCapacitor({ value: '4n7', tolerance: 'K', dielectric: 'x7r' });
    expect(cap.nominalF).toBeCloseTo(4.7e-9, 20);
    expect(cap.tolerancePlusFraction).toBe(0.1);
    expect(cap.ageHours).toBe(AGEING_REFERENCE_HOURS);
    expect(cap.capacitanceF).toBe(cap.nominalF); // at the reference age the marked value applies
    expect(resolveCapacitor({ value: 1e-9, tolerance: '5%' }).toleranceMinusFraction).toBeCloseTo(0.05, 15);
    expect(resolveCapacitor({ value: 1e-9, tolerance: 0.02 }).tolerancePlusFraction).toBe(0.02);
  });
  it('a freshly reflowed X7R reads above its marked value and ages into it (log-decade law)', () => {
    const fresh = resolveCapacitor({ value: '100n', dielectric: 'X7R', ageHours: 10 });
    expect(fresh.capacitanceF).toBeCloseTo(100e-9 * (1 + 0.02 * 2), 20);
    // Ten years of service from there: C(t) = C(t0)(1 − k log10(t/t0)) relative to its own age.
    const later = capacitanceUnder(fresh, { ageHours: 10 + 10 * 8766 });
    expect(later / fresh.capacitanceF).toBeCloseTo((1 - 0.02 * Math.log10((10 + 87660) / 1000)) / 1.04, 12);
  });
  it('caller points replace the class-typical curve (absolute farads)', () => {
    const cap = resolveCapacitor({
      value: '100n',
      dielectric: 'X7R',
      biasCurve: [
        { voltageV: 5, capacitanceF: 60e-9 },
        { voltageV: 0, capacitanceF: 98e-9 },
      ],
    });
    expect(cap.shape.kind).toBe('points');
    expect(cap.capacitanceF).toBe(98e-9);
    expect(cap.capacitanceF * cap.shape.ratio(2.5)).toBeCloseTo(79e-9, 20);
    expect(cap.capacitanceF * cap.shape.ratio(9)).toBeCloseTo(60e-9, 20);
  });
  it('names the bad field with a JSON pointer', () => {
    const bad: [object, string][] = [
      [{ value: 'abc' }, '/parts/cTiming/value'],
      [{ value: '1n', dielectric: 'paper' }, '/parts/cTiming/dielectric'],
      [{ value: '1n', ratedVoltageV: -5 }, '/parts/cTiming/ratedVoltageV'],
      [{ value: '1n', caseSize: '0404' }, '/parts/cTiming/caseSize'],
      [{ value: '1n', ageHours: -1 }, '/parts/cTiming/ageHours'],
      [{ value: '1n', tolerance: 'Q' }, '/parts/cTiming/tolerance'],
      [{ value: '1n', biasCurve: [{ voltageV: 1, capacitanceF: -1 }] }, '/parts/cTiming/biasCurve/0/capacitanceF'],
    ];
    for (const [spec, pointer] of bad) {
      try {
        resolveCapacitor(spec as never, '/parts/cTiming');
        throw new Error(`accepted ${JSON.stringify(spec)}`);
      } catch (e) {
        expect(e).toBeInstanceOf(CoreError);
        expect((e as CoreError).pointer).toBe(pointer);
      }
    }
  });
});

describe('insulation resistance (catalogue form: min(ceiling, τ/C); class-typical minimums, from memory)', () => {
  it('X7R 100 nF: min(10 GΩ, 500 s / 100 nF) = 5 GΩ; 1 nF hits the ceiling', () => {
    const d = parseDielectric('X7R');
    expect(insulationResistanceOhm(d, 100e-9)).toBeCloseTo(5e9, 0);
    expect(insulationResistanceOhm(d, 1e-9)).toBe(10e9);
    // Hotter: about a decade less per 100 K (class-typical).
    expect(insulationResistanceOhm(d, 1e-9, 125)).toBeCloseTo(1e9, 0);
  });
  it('electrolytic: a leakage of 0.01·C·V (C in µF, I in µA) is 100 s / C', () => {
    expect(insulationResistanceOhm(parseDielectric('electrolytic'), 10e-6)).toBeCloseTo(10e6, 3);
  });
  it('no dielectric: no leakage (stated default)', () => {
    expect(insulationResistanceOhm(undefined, 1e-9)).toBe(Infinity);
  });
});

describe('steering-diode forward drop versus temperature (common practice: about −2 mV/K for silicon)', () => {
  it('0.6 V at 25 °C -> 0.73 V at −40 °C and 0.48 V at 85 °C', () => {
    expect(forwardDropAtV(0.6, -40)).toBeCloseTo(0.73, 12);
    expect(forwardDropAtV(0.6, 85)).toBeCloseTo(0.48, 12);
    expect(forwardDropAtV(0.6, 25)).toBe(0.6);
  });
});
