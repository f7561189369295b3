/**
 * runToleranceAnalysis with `parts`: a part left out must change nothing in the others. The
 * reference for each figure is the full run on the same request (whose figures
 * tolerance-analysis.test.ts checks against the textbook astable formula), so the worst case of a
 * worst-case-only run must equal the full run's number for number, and a compile cache must not
 * change any figure either.
 */
import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import { runToleranceAnalysis, type ToleranceRequest } from '../../../src/core/tolerance/index.ts';

const ideal = findBuiltInAmplifier('ideal')!;

// Our own scenarios (invented values, demo only).
const split: Circuit = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 12, negativeV: -12 },
  amplifier: ideal,
  parts: { rTiming: 10e3, cTiming: 10e-9, rFeedback: 20e3, rGround: 10e3 },
};
const requests: Record<string, ToleranceRequest> = {
  // Few dimensions: every corner.
  'all corners, with temperature and a spec': {
    circuit: split,
    tolerances: { rTiming: 0.01, cTiming: 0.05, rFeedback: 0.01, rGround: 0.01 },
    temperature: { minC: -20, maxC: 85 },
    temperatureCoefficients: { cTiming: { dielectric: 'X7R' }, rTiming: { tempcoPpmPerK: 100, tempcoTolerancePpmPerK: 50 } },
    supplyTolerance: 0.05,
    supplyRailsIndependent: true,
    monteCarlo: { samples: 2000, seed: 7 },
    spec: { frequencyHz: 2275, frequencyTolerance: 0.1, dutyMin: 0.45, dutyMax: 0.55 },
  },
  // More dimensions than the exhaustive limit: the sensitivity-guided search.
  'sensitivity-guided, amplifier spreads': {
    circuit: { ...split, amplifier: { ...findBuiltInAmplifier('cmos-rrio-fast')! } },
    tolerances: { rTiming: 0.02, cTiming: 0.05, rFeedback: 0.01, rGround: 0.01 },
    temperature: { minC: 0, maxC: 70 },
    temperatureCoefficients: {
      cTiming: { tempcoPpmPerK: 0, tempcoTolerancePpmPerK: 30 },
      rTiming: { tempcoPpmPerK: 100, tempcoTolerancePpmPerK: 25 },
      rFeedback: { tempcoPpmPerK: 50, tempcoTolerancePpmPerK: 25 },
      rGround: { tempcoPpmPerK: 50, tempcoTolerancePpmPerK: 25 },
    },
    supplyTolerance: 0.05,
    supplyRailsIndependent: true,
    amplifierSpreads: { outputHeadroomHighV: 0.2, outputHeadroomLowV: 0.2, outputResistanceOhm: 0.3, inputBiasCurrentA: 0.5, inputOffsetRangeV: 0.002 },
    monteCarlo: { samples: 1000, seed: 3, distribution: 'uniform' },
  },
};

/** A result without its timing fields (elapsed time and rate differ between any two runs). */
function timeless<T extends { monteCarlo?: { elapsedS: number; samplesPerSecond: number } }>(r: T) {
  if (!r.monteCarlo) return r;
  return { ...r, monteCarlo: { ...r.monteCarlo, elapsedS: 0, samplesPerSecond: 0 } };
}

describe('runToleranceAnalysis parts', () => {
  for (const [name, request] of Object.entries(requests)) {
    it(`${name}: worst-case only gives the full run's nominal, worst case and notes (less Monte Carlo's)`, () => {
      const full = runToleranceAnalysis(request);
      const wc = runToleranceAnalysis(request, { parts: { monteCarlo: false, sensitivities: false } });
      expect(full.worstCase.method).toBe(name.startsWith('all corners') ? 'all-corners' : 'sensitivity-guided');
      expect(wc.worstCase).toEqual(full.worstCase);
      expect(wc.nominal).toEqual(full.nominal);
      expect(wc.model).toBe(full.model);
      expect(wc.temperatureModels).toEqual(full.temperatureModels);
      expect(wc.notes).toEqual(full.notes.filter((n) => n.code !== 'samples-latch'));
      for (const field of ['monteCarlo', 'sensitivities', 'varianceSources', 'linearEstimate', 'histogram'] as const) expect(wc).not.toHaveProperty(field);
    });

    it(`${name}: each part alone equals the same part of the full run`, () => {
      const full = timeless(runToleranceAnalysis({ ...request, histogramBins: 20 }));
      const mcOnly = timeless(runToleranceAnalysis({ ...request, histogramBins: 20 }, { parts: { sensitivities: false } }));
      expect(mcOnly.monteCarlo).toEqual(full.monteCarlo);
      expect(mcOnly.histogram).toEqual(full.histogram);
      expect(mcOnly).not.toHaveProperty('sensitivities');
      const sensOnly = runToleranceAnalysis(request, { parts: { monteCarlo: false } });
      expect(sensOnly.sensitivities).toEqual(full.sensitivities);
      expect(sensOnly.varianceSources).toEqual(full.varianceSources);
      expect(sensOnly.linearEstimate).toEqual(full.linearEstimate);
      expect(sensOnly).not.toHaveProperty('monteCarlo');
      // All parts asked for explicitly: the full run, field order included (JSON answers keep their shape).
      const explicit = timeless(runToleranceAnalysis({ ...request, histogramBins: 20 }, { parts: { monteCarlo: true, sensitivities: true } }));
      expect(Object.keys(explicit)).toEqual(Object.keys(full));
      expect(explicit).toEqual(full);
    });
  }

  it('skipped Monte Carlo options are not checked; the variance budget still checks its sigma', () => {
    const request = requests['all corners, with temperature and a spec'];
    const tooMany = { ...request, monteCarlo: { samples: 10_000_000, seed: 1 } };
    expect(() => runToleranceAnalysis(tooMany)).toThrow(expect.objectContaining({ code: 'limit-exceeded' }));
    expect(runToleranceAnalysis(tooMany, { parts: { monteCarlo: false, sensitivities: false } }).worstCase).toEqual(runToleranceAnalysis(request).worstCase);
    const badSigma = { ...request, monteCarlo: { samples: 100, seed: 1, sigmaPerTolerance: 2 } };
    expect(() => runToleranceAnalysis(badSigma, { parts: { monteCarlo: false } })).toThrow(
      expect.objectContaining({ code: 'invalid-value', pointer: '/monteCarlo/sigmaPerTolerance' }),
    );
    expect(() => runToleranceAnalysis(badSigma, { parts: { monteCarlo: false, sensitivities: false } })).not.toThrow();
  });
});
