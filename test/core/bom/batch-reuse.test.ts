/**
 * A batch shares compiled evaluators across its assemblies (ClosedFormCompileCache) and runs the
 * tolerance analysis without the parts no rule reads. Neither may change a verdict or a figure:
 * the reference is each assembly checked on its own, with no cache of any kind (whose figures
 * rules.test.ts checks against the textbook astable formula).
 */
import { describe, expect, it } from 'vitest';
import { evaluateAssemblies, evaluateAssembly, type BomAssembly } from '../../../src/core/index.ts';
import { baseAssembly, context, NOMINAL_FREQUENCY_HZ } from './fixtures.ts';

/** Our own revisions of the fixture clock (invented values, demo only): timing parts, amplifier, supply, temperature vary. */
function revisions(): BomAssembly[] {
  const timing = ['22K', '27K', '18K', '22K'];
  const caps = ['4n7 50V C0G 2%', '4n7 50V X7R 10%', '3n9 50V NP0 5%', '4n7 50V C0G 2%'];
  const out: BomAssembly[] = [];
  for (let k = 0; k < 24; k++) {
    out.push(
      baseAssembly({
        id: `rev-${k}`,
        lines: [
          { refdes: 'R1', value: `${timing[k % 4]} 1% 0603` },
          { refdes: 'C1', value: caps[(k >> 2) % 4] },
          { refdes: 'R2, R3, R4', value: `${['68K', '56K', '82K'][k % 3]} 1% 0603 ${k % 2 ? '50ppm' : ''}` },
        ],
        amplifier: k % 3 === 0 ? 'ideal' : 'cmos-rrio-fast',
        supply: { positiveV: 5, negativeV: 0, tolerance: k % 2 ? 0.05 : 0 },
        ...(k % 4 === 1 ? { temperature: { minC: -20, maxC: 70 } } : {}),
        spec: { frequencyHz: NOMINAL_FREQUENCY_HZ, frequencyTolerance: 0.1, dutyMin: 0.4, dutyMax: 0.6, ...(k % 3 === 2 ? { minimumYield: 0.9 } : {}) },
      }),
    );
  }
  return out;
}

describe('evaluateAssemblies reuse', () => {
  for (const mode of ['worst-case', 'full'] as const) {
    it(`${mode} mode: a batch gives each assembly's stand-alone result`, () => {
      const batch = revisions();
      const alone = batch.map((a, i) => evaluateAssembly(a, i, context({ mode, monteCarloSamples: 300 })));
      const together = [...evaluateAssemblies(batch, { ...context({ mode, monteCarloSamples: 300 }), spreadCache: new Map() })];
      expect(together).toEqual(alone);
      // The worst case was computed (not skipped) for every assembly.
      for (const r of together) expect(r.rules.some((x) => x.code === 'frequency-within-spec' || x.code === 'frequency-outside-spec')).toBe(true);
    });
  }
});
