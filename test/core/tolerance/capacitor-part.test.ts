/**
 * The timing capacitor as a real part in the tolerance analysis:
 * - ageing over a service life: the log-decade law C(t) = C(t0)·(1 − k·log10(t/t0))
 *   (the class II ageing law as catalogues state it; k per decade typical of the class);
 * - DC-bias C(V): every corner and sample runs the same non-linear capacitor the
 *   analysis does (the engine's C(v) pieces), checked against the odex integrator
 *   (test/core/circuit/engine-odex-reference.ts) integrating the same C(V) ODE.
 */
import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import { analyzeCircuit } from '../../../src/core/circuit/analyze.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import { resolveCapacitor } from '../../../src/core/parts/capacitor/index.ts';
import { runToleranceAnalysis } from '../../../src/core/tolerance/index.ts';
import { referenceOscillation } from '../circuit/engine-odex-reference.ts';

const ideal = findBuiltInAmplifier('ideal')!;
const HOURS_PER_YEAR = 365.25 * 24; // Julian year

describe('ageing over the service life (log-decade law)', () => {
  // Split-supply astable: f = 1/(2RC·ln((1+β)/(1−β))) (Sedra & Smith), so f ∝ 1/C exactly.
  const circuit: Circuit = {
    topology: 'two-resistor-feedback',
    supply: { positiveV: 12, negativeV: -12 },
    amplifier: ideal,
    parts: { rTiming: 10e3, cTiming: 10e-9, rFeedback: 20e3, rGround: 10e3 },
  };
  const k = 0.02; // X7R-like body, typical of the class (from memory), per decade of hours
  const ageHours = 24; // a day after reflow

  it('the frequency rises by exactly the capacitance the law loses from start to end of service', () => {
    const years = 10;
    const run = runToleranceAnalysis({
      circuit,
      tolerances: {},
      serviceLifeYears: years,
      timingCapacitor: { ageingRatePerDecade: k, ageHours },
      monteCarlo: { samples: 2000, seed: 5 },
    });
    const law = (t: number) => 1 - k * Math.log10(t / 1000);
    const ratio = law(ageHours + years * HOURS_PER_YEAR) / law(ageHours);
    expect(run.ageing).toMatchObject({ role: 'cTiming', ratePerDecade: k, ageStartHours: ageHours, serviceLifeYears: years });
    expect(run.ageing!.ageEndHours).toBeCloseTo(ageHours + years * HOURS_PER_YEAR, 6);
    expect(run.ageing!.changeFraction).toBeCloseTo(ratio - 1, 12);
    // About three and a half decades of hours: near −7 % for a 2 %/decade body.
    expect(ratio - 1).toBeLessThan(-0.065);
    expect(run.worstCase.frequencyMinHz / run.nominal.frequencyHz).toBeCloseTo(1, 12);
    expect(run.worstCase.frequencyMaxHz / run.nominal.frequencyHz).toBeCloseTo(1 / ratio, 10);
    expect(run.worstCase.corners.frequencyMax.deviations.cTiming).toBeCloseTo(ratio - 1, 12);
    // Monte Carlo: a uniform age in service, every sample between the start and the end.
    const f = run.monteCarlo.frequencyHz!;
    expect(f.min).toBeGreaterThanOrEqual(run.worstCase.frequencyMinHz * (1 - 1e-12));
    expect(f.max).toBeLessThanOrEqual(run.worstCase.frequencyMaxHz * (1 + 1e-12));
    expect(run.varianceSources[0]).toMatchObject({ source: 'cTiming ageing', kind: 'ageing' });
  });

  it('without a part object, the dielectric named in temperatureCoefficients gives the rate (at the 1000 h reference age)', () => {
    const run = runToleranceAnalysis({ circuit, tolerances: {}, serviceLifeYears: 5, temperatureCoefficients: { cTiming: { dielectric: 'Y5V' } } }, { parts: { monteCarlo: false, sensitivities: false } });
    const ratio = 1 - 0.07 * Math.log10((1000 + 5 * HOURS_PER_YEAR) / 1000); // class III: about 7 %/decade (typical of the class, from memory)
    expect(run.ageing!.changeFraction).toBeCloseTo(ratio - 1, 12);
  });

  it('a capacitor that ages but no service life: a note says how to include it; film and class I never age', () => {
    const aged = runToleranceAnalysis({ circuit, tolerances: {}, timingCapacitor: { ageingRatePerDecade: k, ageHours } }, { parts: { monteCarlo: false, sensitivities: false } });
    expect(aged.ageing).toBeNull();
    expect(aged.notes.map((n) => n.code)).toContain('ageing-not-included');
    const film = runToleranceAnalysis({ circuit, tolerances: {}, serviceLifeYears: 20, temperatureCoefficients: { cTiming: { dielectric: 'C0G' } } }, { parts: { monteCarlo: false, sensitivities: false } });
    expect(film.ageing).toBeNull();
  });

  it('refuses a service life outside 0…100 years, naming the field', () => {
    expect(() => runToleranceAnalysis({ circuit, tolerances: {}, serviceLifeYears: 1000 })).toThrow(expect.objectContaining({ code: 'invalid-value', pointer: '/serviceLifeYears' }));
  });
});

describe('DC-bias C(V) in every corner and sample', () => {
  // A 5 V clock with three equal threshold resistors (thresholds V+/3, 2V+/3) and a 0402 6.3 V X7R.
  const part = resolveCapacitor({ value: '10n', dielectric: 'X7R', ratedVoltageV: 6.3, caseSize: '0402' });
  const circuit: Circuit = {
    topology: 'three-resistor-divider',
    supply: { positiveV: 5, negativeV: 0 },
    amplifier: ideal,
    parts: { rTiming: 22e3, cTiming: part.capacitanceF, rTop: 68e3, rBottom: 68e3, rFeedback: 68e3 },
    capacitorShape: part.shape,
  };
  const flat: Circuit = { ...circuit, capacitorShape: undefined };
  const run = runToleranceAnalysis({ circuit, tolerances: { rTiming: 0.01, cTiming: 0.1 }, monteCarlo: { samples: 2000, seed: 9 } });

  it('the nominal is the analysis of the same non-linear capacitor, well above the 0 V value\'s frequency', () => {
    expect(run.nominal.frequencyHz).toBeCloseTo(analyzeCircuit(circuit).frequencyHz, 6);
    expect(run.nominal.frequencyHz / analyzeCircuit(flat).frequencyHz).toBeGreaterThan(1.2);
  });

  it('the extreme corners agree with odex integrating the same C(V) at the corner values (1e-6)', () => {
    for (const corner of [run.worstCase.corners.frequencyMin, run.worstCase.corners.frequencyMax]) {
      const atCorner: Circuit = { ...circuit, parts: { ...circuit.parts, ...corner.values } };
      const reference = referenceOscillation(atCorner, { tolerance: 1e-11 });
      expect(Math.abs(corner.frequencyHz * reference.periodS - 1)).toBeLessThan(1e-6);
    }
    // The 10 % part tolerance scales the whole curve: the spread is the linear one's around a derated centre.
    expect(run.worstCase.frequencyMaxHz / run.worstCase.frequencyMinHz).toBeCloseTo((1.1 * 1.01) / (0.9 * 0.99), 6);
  });
});
