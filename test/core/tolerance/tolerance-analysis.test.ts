/**
 * Tolerance analysis on the ideal split-supply astable, where the textbook
 * result (Sedra & Smith, Microelectronic Circuits, op-amp astable):
 *     f = 1 / (2·R·C·ln((1+β)/(1−β))),  β = rGround / (rGround + rFeedback)
 * makes every expected figure derivable in the test itself.
 */
import referenceErf from '@stdlib/math-base-special-erf';
import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import { runToleranceAnalysis, type ToleranceRequest } from '../../../src/core/tolerance/index.ts';
import { createSampleEvaluator } from '../../../src/core/tolerance/sample-evaluator.ts';
import { buildVariationModel } from '../../../src/core/tolerance/variation-model.ts';

const ideal = findBuiltInAmplifier('ideal')!;
const parts = { rTiming: 10e3, cTiming: 10e-9, rFeedback: 20e3, rGround: 10e3 };
const circuit: Circuit = { topology: 'two-resistor-feedback', supply: { positiveV: 12, negativeV: -12 }, amplifier: ideal, parts };
const beta = parts.rGround / (parts.rGround + parts.rFeedback);
const L = Math.log((1 + beta) / (1 - beta));
const f0 = 1 / (2 * parts.rTiming * parts.cTiming * L);
const phi = (z: number) => 0.5 * (1 + referenceErf(z / Math.SQRT2)); // standard normal CDF via erf (@stdlib reference)

function run(extra: Partial<ToleranceRequest>, keepSamples = false) {
  return runToleranceAnalysis({ circuit, tolerances: {}, ...extra }, { keepSamples });
}

describe('first-order propagation (root sum of squares)', () => {
  // ln f = const − ln rTiming − ln cTiming, so to first order var(ln f) = var(ln R) + var(ln C):
  // the relative std of f is the root sum of squares of the parts' relative stds.
  // Uniform on ±t has std t/√3; a normal with σ = t/3 truncated at ±t has std (t/3)·√v(3), v = truncated variance.
  const tR = 0.01;
  const tC = 0.05;
  const n = 200_000;

  it('uniform tolerances: linear estimate is the RSS, Monte Carlo agrees within sampling error', () => {
    const r = run({ tolerances: { rTiming: tR, cTiming: tC }, monteCarlo: { samples: n, seed: 11, distribution: 'uniform' } });
    const rss = Math.sqrt(tR ** 2 / 3 + tC ** 2 / 3);
    expect(r.linearEstimate.frequencyRelativeStd).toBeCloseTo(rss, 8);
    const mc = r.monteCarlo.frequencyHz!;
    // Sampling error of a std estimate ≈ σ/√(2n) (0.16 % here), plus second-order terms O(t²) ≈ 0.1 %: allow 1 %.
    expect(Math.abs(mc.std / mc.mean / rss - 1)).toBeLessThan(0.01);
  });

  it('normal tolerances (σ = t/3, truncated at ±t): same, with the truncated variance', () => {
    const r = run({ tolerances: { rTiming: tR, cTiming: tC }, monteCarlo: { samples: n, seed: 12, distribution: 'normal' } });
    // Truncated at 3σ: variance factor 1 − 6φ(3)/(2Φ(3) − 1), φ the density (Johnson, Kotz & Balakrishnan).
    const v3 = 1 - (6 * Math.exp(-4.5)) / Math.sqrt(2 * Math.PI) / (2 * phi(3) - 1);
    const rss = Math.sqrt(((tR / 3) ** 2 + (tC / 3) ** 2) * v3);
    expect(r.linearEstimate.frequencyRelativeStd).toBeCloseTo(rss, 8);
    const mc = r.monteCarlo.frequencyHz!;
    expect(Math.abs(mc.std / mc.mean / rss - 1)).toBeLessThan(0.01);
    expect(Math.abs(mc.mean / f0 - 1)).toBeLessThan(5 * rss / Math.sqrt(n) + 2 * rss * rss);
  });

  it('sensitivities match the derivatives of the textbook formula; shares split by tolerance²', () => {
    const r = run({ tolerances: { rTiming: tR, cTiming: tC, rFeedback: 0.01, rGround: 0.01 }, monteCarlo: { samples: 1000, seed: 1 } });
    const by = Object.fromEntries(r.sensitivities.map((s) => [s.role, s]));
    // d ln f/d ln R = d ln f/d ln C = −1; d ln f/d ln rFeedback = (2rG/(2rG + rF))/L = −d ln f/d ln rGround.
    expect(by.rTiming.sensitivity).toBeCloseTo(-1, 8);
    expect(by.cTiming.sensitivity).toBeCloseTo(-1, 8);
    const sF = (2 * parts.rGround) / (2 * parts.rGround + parts.rFeedback) / L;
    expect(by.rFeedback.sensitivity).toBeCloseTo(sF, 8);
    expect(by.rGround.sensitivity).toBeCloseTo(-sF, 8);
    // Shares ∝ (S·t)²; they sum to 1 and rank cTiming first.
    const weights = { rTiming: tR ** 2, cTiming: tC ** 2, rFeedback: (sF * 0.01) ** 2, rGround: (sF * 0.01) ** 2 };
    const total = Object.values(weights).reduce((a, b) => a + b, 0);
    for (const [role, w] of Object.entries(weights)) expect(by[role].varianceShare).toBeCloseTo(w / total, 6);
    expect(r.varianceSources[0].source).toBe('cTiming');
  });
});

describe('worst case', () => {
  it('corners are the exact extremes f0/((1∓tR)(1∓tC)) and contain every Monte Carlo sample', () => {
    const r = run({ tolerances: { rTiming: 0.02, cTiming: 0.1, rFeedback: 0.01, rGround: 0.01 }, monteCarlo: { samples: 50_000, seed: 5, distribution: 'uniform' } }, true);
    const wc = r.worstCase;
    expect(wc.method).toBe('all-corners');
    const betaAt = (rF: number, rG: number) => rG / (rG + rF);
    const fAt = (R: number, C: number, b: number) => 1 / (2 * R * C * Math.log((1 + b) / (1 - b)));
    // β is largest with rFeedback low and rGround high; f falls as β rises.
    const fMax = fAt(parts.rTiming * 0.98, parts.cTiming * 0.9, betaAt(parts.rFeedback * 1.01, parts.rGround * 0.99));
    const fMin = fAt(parts.rTiming * 1.02, parts.cTiming * 1.1, betaAt(parts.rFeedback * 0.99, parts.rGround * 1.01));
    expect(wc.frequencyMaxHz / fMax - 1).toBeCloseTo(0, 12);
    expect(wc.frequencyMinHz / fMin - 1).toBeCloseTo(0, 12);
    expect(wc.corners.frequencyMax.deviations.rTiming).toBeCloseTo(-0.02, 12);
    expect(wc.corners.frequencyMax.deviations.cTiming).toBeCloseTo(-0.1, 12);
    const f = r.samples!.frequencyHz;
    const d = r.samples!.dutyCycle;
    let outside = 0;
    for (let i = 0; i < f.length; i++) {
      if (f[i] < wc.frequencyMinHz || f[i] > wc.frequencyMaxHz || d[i] < wc.dutyMin - 1e-15 || d[i] > wc.dutyMax + 1e-15) outside++;
    }
    expect(outside).toBe(0);
  });

  it('independent rails move the duty cycle; the duty extremes still contain every sample', () => {
    // Unequal rails give unequal thresholds (±β·V), so the high and low dwell times differ.
    const r = run({ tolerances: { rTiming: 0.02 }, supplyTolerance: 0.1, supplyRailsIndependent: true, monteCarlo: { samples: 20_000, seed: 6, distribution: 'uniform' } }, true);
    const wc = r.worstCase;
    expect(wc.dutyMax).toBeGreaterThan(0.5);
    expect(wc.dutyMin).toBeLessThan(0.5);
    // tHigh = RC·ln((V+ + β|V−|)/((1 − β)·V+)) falls as V+ rises and grows with |V−|: the longest high time
    // (largest duty) is at V+ low and |V−| high.
    expect(wc.corners.dutyMax.deviations.supplyPositiveV).toBeCloseTo(-0.1, 12);
    expect(wc.corners.dutyMax.deviations.supplyNegativeV).toBeCloseTo(0.1, 12);
    const d = r.samples!.dutyCycle;
    const f = r.samples!.frequencyHz;
    expect(d.every((x) => x >= wc.dutyMin && x <= wc.dutyMax)).toBe(true);
    expect(f.every((x) => x >= wc.frequencyMinHz && x <= wc.frequencyMaxHz)).toBe(true);
  });

  it('the sensitivity-guided search finds the extremes of an all-corner enumeration when many parameters vary', () => {
    const amplifier = { ...ideal, outputHeadroomHighV: 1.2, outputHeadroomLowV: 0.8, outputResistanceOhm: 50, inputBiasCurrentA: 50e-9 };
    const request: ToleranceRequest = {
      circuit: { ...circuit, amplifier },
      tolerances: { rTiming: 0.02, cTiming: 0.1 },
      tracking: [{ roles: ['rFeedback', 'rGround'], tolerance: 0.01, residualTolerance: 0.005 }],
      supplyTolerance: 0.05,
      supplyRailsIndependent: true,
      temperature: { minC: -40, maxC: 85 },
      temperatureCoefficients: { rTiming: { tempcoPpmPerK: 100, tempcoTolerancePpmPerK: 50 }, cTiming: { dielectric: 'C0G' } },
      amplifierSpreads: { outputHeadroomHighV: 0.3, outputHeadroomLowV: 0.3, outputResistanceOhm: 0.5, inputBiasCurrentA: 0.5, inputOffsetRangeV: 0.005 },
      monteCarlo: { samples: 20_000, seed: 9, distribution: 'uniform' },
    };
    const r = runToleranceAnalysis(request, { keepSamples: true });
    expect(r.worstCase.method).toBe('sensitivity-guided');
    // Brute force over every corner of the same box, through the same model.
    const evaluator = createSampleEvaluator(request.circuit);
    const model = buildVariationModel(request, evaluator.parameters, evaluator.nominal, evaluator.model);
    const dims = model.dimensions;
    expect(dims.length).toBeGreaterThan(14);
    const values = new Float64Array(model.nominal.length);
    const out = new Float64Array(4);
    let fMin = Infinity;
    let fMax = -Infinity;
    for (let mask = 0; mask < 2 ** dims.length; mask++) {
      model.apply(Float64Array.from(dims, (d, k) => ((mask >>> k) & 1 ? d.high : d.low)), values);
      evaluator.evaluate(values, out);
      fMin = Math.min(fMin, 1 / out[0]);
      fMax = Math.max(fMax, 1 / out[0]);
    }
    expect(r.worstCase.frequencyMinHz / fMin - 1).toBeCloseTo(0, 12);
    expect(r.worstCase.frequencyMaxHz / fMax - 1).toBeCloseTo(0, 12);
    const f = r.samples!.frequencyHz;
    expect(f.every((x) => x >= r.worstCase.frequencyMinHz && x <= r.worstCase.frequencyMaxHz)).toBe(true);
  });
});

describe('reproducibility', () => {
  it('the same seed gives an identical result; another seed does not', () => {
    const req = { tolerances: { rTiming: 0.01, cTiming: 0.05 }, monteCarlo: { samples: 5000, seed: 123, distribution: 'normal' as const } };
    const strip = (r: ReturnType<typeof run>) => ({ ...r, monteCarlo: { ...r.monteCarlo, elapsedS: 0, samplesPerSecond: 0 } });
    const a = strip(run(req));
    const b = strip(run(req));
    expect(b).toEqual(a);
    const c = strip(run({ ...req, monteCarlo: { ...req.monteCarlo, seed: 124 } }));
    expect(c.monteCarlo.frequencyHz!.p50).not.toBe(a.monteCarlo.frequencyHz!.p50);
  });
});

describe('yield', () => {
  it('of a normally distributed part equals the (truncated) normal CDF within sampling error', () => {
    // Only rTiming varies: δ ~ N(0, σ²), σ = t/3, truncated at ±t. f = f0/(1+δ) lies within f0·(1 ± s) exactly when
    // δ ∈ [1/(1+s) − 1, 1/(1−s) − 1]; the truncated-normal probability of that interval is
    // (Φ(zHi) − Φ(zLo)) / (Φ(3) − Φ(−3)), Φ from erf.
    const t = 0.01;
    const sigma = t / 3;
    const s = 0.004;
    const n = 200_000;
    const r = run({ tolerances: { rTiming: t }, monteCarlo: { samples: n, seed: 77, distribution: 'normal' }, spec: { frequencyHz: f0, frequencyTolerance: s } });
    const zLo = (1 / (1 + s) - 1) / sigma;
    const zHi = (1 / (1 - s) - 1) / sigma;
    const expected = (phi(zHi) - phi(zLo)) / (phi(3) - phi(-3));
    const se = Math.sqrt((expected * (1 - expected)) / n);
    expect(Math.abs(r.monteCarlo.yield! - expected)).toBeLessThan(4 * se);
    const ci = r.monteCarlo.yieldDetail!.interval95;
    expect(ci.low).toBeLessThan(r.monteCarlo.yield!);
    expect(ci.high).toBeGreaterThan(r.monteCarlo.yield!);
    expect(r.worstCase.withinSpec).toBe(false);
  });

  it('a duty window counts against the yield and latched samples fail', () => {
    const r = run({ tolerances: { rTiming: 0.01 }, supplyTolerance: 0.2, supplyRailsIndependent: true, monteCarlo: { samples: 20_000, seed: 3 }, spec: { frequencyHz: f0, frequencyTolerance: 0.5, dutyMin: 0.49, dutyMax: 0.51 } });
    const y = r.monteCarlo.yieldDetail!;
    expect(y.frequencyPassFraction).toBe(1);
    expect(y.dutyPassFraction).toBeLessThan(1);
    expect(r.monteCarlo.yield).toBeCloseTo(y.dutyPassFraction, 12);
  });
});

describe('temperature from EIA-198 dielectric codes', () => {
  // EIA-198 class II codes: X7R −55..125 °C ±15 %, X5R −55..85 °C ±15 %, Y5V −30..85 °C +22/−82 %;
  // class I C0G: 0 ±30 ppm/K. Here f ∝ 1/C, so the frequency extremes are f0/(1 + change).
  const cases = [
    { code: 'X7R', minC: -55, maxC: 125, lo: -0.15, hi: 0.15 },
    { code: 'X5R', minC: -55, maxC: 85, lo: -0.15, hi: 0.15 },
    { code: 'Y5V', minC: -30, maxC: 85, lo: -0.82, hi: 0.22 },
  ];
  for (const c of cases) {
    it(`${c.code} over ${c.minC}..${c.maxC} °C spans its band`, () => {
      const r = run({ temperature: { minC: c.minC, maxC: c.maxC }, temperatureCoefficients: { cTiming: { dielectric: c.code } }, monteCarlo: { samples: 2000, seed: 1 } });
      expect(r.temperatureModels[0]).toMatchObject({ role: 'cTiming', model: 'dielectric', dielectric: c.code, changeMinFraction: c.lo, changeMaxFraction: c.hi, withinRatedRange: true });
      expect(r.worstCase.frequencyMaxHz / (f0 / (1 + c.lo)) - 1).toBeCloseTo(0, 12);
      expect(r.worstCase.frequencyMinHz / (f0 / (1 + c.hi)) - 1).toBeCloseTo(0, 12);
      expect(r.notes.map((n) => n.code)).not.toContain('outside-rated-temperature');
    });
  }

  it('X5R asked to 125 °C is flagged as outside its rated range', () => {
    const r = run({ temperature: { minC: -55, maxC: 125 }, temperatureCoefficients: { cTiming: { dielectric: 'X5R' } }, monteCarlo: { samples: 100, seed: 1 } });
    expect(r.notes.map((n) => n.code)).toContain('outside-rated-temperature');
    expect(r.temperatureModels[0].withinRatedRange).toBe(false);
  });

  it('C0G moves at most 30 ppm/K from 25 °C', () => {
    const r = run({ temperature: { minC: -55, maxC: 125 }, temperatureCoefficients: { cTiming: { dielectric: 'C0G' } }, monteCarlo: { samples: 100, seed: 1 } });
    // Largest |ΔT| is 100 K (at 125 °C): ±30e-6·100 = ±0.3 %.
    expect(r.temperatureModels[0].changeMinFraction).toBeCloseTo(-0.003, 12);
    expect(r.temperatureModels[0].changeMaxFraction).toBeCloseTo(0.003, 12);
    expect(r.worstCase.frequencyMaxHz / (f0 / 0.997) - 1).toBeCloseTo(0, 12);
    expect(r.worstCase.frequencyMinHz / (f0 / 1.003) - 1).toBeCloseTo(0, 12);
  });

  it('a resistor tempco scales the value by 1 + α·(T − 25 °C)', () => {
    const r = run({ temperature: { minC: 25, maxC: 125 }, temperatureCoefficients: { rTiming: { tempcoPpmPerK: 100 } }, monteCarlo: { samples: 100, seed: 1 } });
    expect(r.worstCase.frequencyMinHz / (f0 / 1.01) - 1).toBeCloseTo(0, 12);
    expect(r.worstCase.corners.frequencyMin.temperatureC).toBe(125);
    expect(r.worstCase.frequencyMaxHz / f0 - 1).toBeCloseTo(0, 12);
  });
});

describe('tracking groups', () => {
  it('a tracked rFeedback/rGround pair keeps β fixed, so it adds no spread', () => {
    // β = rG/(rG + rF) is unchanged when both move by the same factor.
    const tracked = run({ tolerances: { rTiming: 0.01, rFeedback: 0.05, rGround: 0.05 }, tracking: [{ roles: ['rFeedback', 'rGround'] }], monteCarlo: { samples: 1000, seed: 2 } });
    const alone = run({ tolerances: { rTiming: 0.01 }, monteCarlo: { samples: 1000, seed: 2 } });
    expect(tracked.worstCase.frequencyMinHz / alone.worstCase.frequencyMinHz - 1).toBeCloseTo(0, 12);
    expect(tracked.worstCase.frequencyMaxHz / alone.worstCase.frequencyMaxHz - 1).toBeCloseTo(0, 12);
    const group = tracked.varianceSources.find((s) => s.source === 'tracking[0]')!;
    expect(group.share).toBeLessThan(1e-9);
  });

  it('a residual on top of the shared draw does spread β', () => {
    const r = run({ tolerances: { rTiming: 0.01 }, tracking: [{ roles: ['rFeedback', 'rGround'], tolerance: 0.05, residualTolerance: 0.005 }], monteCarlo: { samples: 1000, seed: 2 } });
    expect(r.varianceSources.find((s) => s.source === 'rGround residual')!.share).toBeGreaterThan(0.01);
  });
});

describe('limits and input errors', () => {
  it('refuses more than 1e6 samples with limit-exceeded', () => {
    expect(() => run({ monteCarlo: { samples: 1_000_001, seed: 1 } })).toThrow(expect.objectContaining({ code: 'limit-exceeded', pointer: '/monteCarlo/samples' }));
  });

  it('names the offending field', () => {
    expect(() => run({ tolerances: { rTop: 0.01 } })).toThrow(expect.objectContaining({ code: 'invalid-value', pointer: '/tolerances/rTop' }));
    expect(() => run({ temperature: { minC: 0, maxC: 70 }, temperatureCoefficients: { rTiming: { dielectric: 'X7R' } } })).toThrow(
      expect.objectContaining({ pointer: '/temperatureCoefficients/rTiming/dielectric' }),
    );
    expect(() => run({ temperature: { minC: 0, maxC: 70 }, temperatureCoefficients: { cTiming: { dielectric: 'Q9Q' } } })).toThrow(
      expect.objectContaining({ pointer: '/temperatureCoefficients/cTiming/dielectric' }),
    );
    expect(() => run({ tracking: [{ roles: ['rTiming', 'rTiming'] }] })).toThrow(expect.objectContaining({ pointer: '/tracking/0/roles/1' }));
  });
});

describe('the time-domain path (slew and delay matter)', () => {
  // A slew-limited amplifier: the analysis answers with the time-domain engine for every sample.
  const slow: Circuit = { ...circuit, amplifier: { ...ideal, slewRateVPerS: 2e6, recoveryDelayS: 2e-6 } };

  it('evaluates each sample with analyzeCircuit, so slew and delay spreads count', () => {
    const r = runToleranceAnalysis({
      circuit: slow,
      tolerances: { rTiming: 0.01 },
      amplifierSpreads: { slewRateVPerS: 0.3, recoveryDelayS: 0.5 },
      monteCarlo: { samples: 300, seed: 1, distribution: 'uniform' },
    }, { keepSamples: true });
    expect(r.model).toBe('time-domain');
    // Finite edges and a delay lengthen each half period: the frequency is below the instant-edge textbook value.
    expect(r.nominal.frequencyHz).toBeLessThan(f0);
    const byRole = Object.fromEntries(r.sensitivities.map((s) => [s.role, s.sensitivity]));
    expect(byRole.slewRateVPerS).toBeGreaterThan(0); // faster edges, higher frequency
    expect(byRole.recoveryDelayS).toBeLessThan(0); // longer delay, lower frequency
    const sources = r.varianceSources.map((s) => s.source);
    expect(sources).toContain('slewRateVPerS');
    expect(sources).toContain('recoveryDelayS');
    const f = r.samples!.frequencyHz;
    expect(f.every((x) => x >= r.worstCase.frequencyMinHz * (1 - 1e-9) && x <= r.worstCase.frequencyMaxHz * (1 + 1e-9))).toBe(true);
  });

  it('has no lower sample cap for slew-limited circuits: one cap for every model', () => {
    const r = runToleranceAnalysis({ circuit: slow, tolerances: { rTiming: 0.01 }, monteCarlo: { samples: 20_001, seed: 1 } }, { parts: { sensitivities: false } });
    expect(r.model).toBe('time-domain');
    expect(r.modelEffects).toContain('slew-rate');
    expect(r.monteCarlo?.samples).toBe(20_001);
    expect(() => runToleranceAnalysis({ circuit: slow, tolerances: {}, monteCarlo: { samples: 1_000_001, seed: 1 } })).toThrow(
      expect.objectContaining({ code: 'limit-exceeded' }),
    );
  });

  it('says so when slew and delay spreads cannot matter (closed form)', () => {
    const r = run({ tolerances: { rTiming: 0.01 }, amplifierSpreads: { slewRateVPerS: 0.3 }, monteCarlo: { samples: 100, seed: 1 } });
    expect(r.model).toBe('closed-form');
    expect(r.notes.map((n) => n.code)).toContain('spread-not-modelled');
  });
});
