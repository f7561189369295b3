/**
 * A BOM check and the tolerance analysis must give one verdict: the worst case
 * and the Monte Carlo yield of an assembly are those POST /v1/tolerance gives for
 * the same parts, tolerances, supply band and spec (its core, runToleranceAnalysis,
 * called the way the route calls it: model 'auto', default distribution). Before
 * the one-model change the BOM checks used the closed form and passed assemblies
 * the tolerance analysis failed on slew-limited amplifiers, so the batch includes
 * class-typical slow archetypes whose edges are a sizeable share of the period.
 * Random designs come from a fixed-seed generator (fast-check's property runner
 * would shrink towards trivial assemblies; here every run checks the same 60).
 */
import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import { analyzeCircuit, evaluateAssembly, runToleranceAnalysis, type BomAssembly, type ToleranceRequest } from '../../../src/core/index.ts';
import { context } from './fixtures.ts';

/** Small deterministic generator (a linear congruential generator, Numerical Recipes constants). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32;
}

const AMPLIFIERS = ['ideal', 'cmos-rrio-fast', 'bipolar-single-supply-general', 'cmos-rro-micropower'] as const;
const E12 = [1, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2];

interface Design {
  assembly: BomAssembly;
  request: ToleranceRequest;
}

function design(rnd: () => number, k: number): Design | undefined {
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rnd() * xs.length)];
  const amplifierId = pick(AMPLIFIERS);
  const amplifier = findBuiltInAmplifier(amplifierId)!;
  const positiveV = pick([5, 12]);
  if (positiveV > amplifier.supplyMaxV || positiveV < amplifier.supplyMinV) return undefined;
  const rTimingOhm = pick(E12) * 10 ** (3 + Math.floor(rnd() * 2)); // 1 kΩ .. 82 kΩ
  const cTimingF = pick(E12) * 10 ** (-10 + Math.floor(rnd() * 3)); // 100 pF .. 82 nF
  const rDividerOhm = pick(E12) * 1e4 * (1 + Math.floor(rnd() * 9));
  const circuit = {
    topology: 'three-resistor-divider',
    supply: { positiveV, negativeV: 0 },
    amplifier,
    parts: { rTiming: rTimingOhm, cTiming: cTimingF, rTop: rDividerOhm, rBottom: rDividerOhm, rFeedback: rDividerOhm },
  };
  let nominalHz: number;
  try {
    nominalHz = analyzeCircuit(circuit).frequencyHz;
  } catch {
    return undefined; // a design that does not oscillate is not what this test is about
  }
  const spec = { frequencyHz: nominalHz * (0.96 + 0.08 * rnd()), frequencyTolerance: 0.03 + 0.07 * rnd(), minimumYield: 0.9 };
  const supplyTolerance = 0.05;
  const nf = Number((cTimingF * 1e9).toPrecision(2));
  const assembly: BomAssembly = {
    id: `agreement-${k}`,
    lines: [
      { refdes: 'R1', value: `${Number((rTimingOhm / 1e3).toPrecision(3))}K 1% 0603` },
      { refdes: 'C1', value: `${nf}nF 50V C0G 5%` },
      { refdes: 'R2, R3, R4', value: `${Number((rDividerOhm / 1e3).toPrecision(3))}K 1% 0603` },
    ],
    roles: { rTiming: 'R1', cTiming: 'C1', rTop: 'R2', rBottom: 'R3', rFeedback: 'R4' },
    topology: 'three-resistor-divider',
    amplifier: amplifierId,
    supply: { positiveV, negativeV: 0, tolerance: supplyTolerance },
    spec,
  };
  const request: ToleranceRequest = {
    circuit: { ...circuit, parts: { ...circuit.parts, cTiming: nf * 1e-9 } },
    tolerances: { rTiming: 0.01, cTiming: 0.05, rTop: 0.01, rBottom: 0.01, rFeedback: 0.01 },
    supplyTolerance,
    monteCarlo: { samples: SAMPLES, seed: SEED },
    spec: { frequencyHz: spec.frequencyHz, frequencyTolerance: spec.frequencyTolerance },
  };
  return { assembly, request };
}

const SAMPLES = 200;
const SEED = 7;

describe('BOM verdict = tolerance verdict (one model for both)', () => {
  it('worst case and yield agree on 60 random assemblies, slew-limited amplifiers included', () => {
    const rnd = lcg(2024);
    const designs: Design[] = [];
    for (let k = 0; designs.length < 60 && k < 1000; k++) {
      const d = design(rnd, k);
      if (d) designs.push(d);
    }
    expect(designs.length).toBe(60);
    let slewLimited = 0;
    let failing = 0;
    const ctx = context({ mode: 'full', monteCarloSamples: SAMPLES, seed: SEED });
    for (const [i, { assembly, request }] of designs.entries()) {
      const bom = evaluateAssembly(assembly, i, ctx);
      const tol = runToleranceAnalysis(request, { parts: { sensitivities: false } });
      const freq = bom.rules.find((r) => r.code === 'frequency-within-spec' || r.code === 'frequency-outside-spec');
      expect(freq, `${assembly.id}: ${JSON.stringify(bom.rules.map((r) => r.code))}`).toBeDefined();
      const f = freq!.figures;
      // The BOM folds each tolerance with its (here zero) temperature drift, (1 + t)(1 + 0) − 1: equal to t
      // within rounding, so the figures agree to rounding, not bit for bit.
      expect(Math.abs(Number(f.worstCaseMinHz) / tol.worstCase.frequencyMinHz - 1)).toBeLessThan(1e-12);
      expect(Math.abs(Number(f.worstCaseMaxHz) / tol.worstCase.frequencyMaxHz - 1)).toBeLessThan(1e-12);
      expect(f.model).toBe(tol.model);
      expect(freq!.code === 'frequency-within-spec').toBe(tol.worstCase.withinSpec === true);
      const y = bom.rules.find((r) => r.code === 'yield-met' || r.code === 'yield-below-minimum');
      expect(y?.figures.yield).toBe(tol.monteCarlo?.yield);
      expect(y!.code === 'yield-met').toBe(tol.monteCarlo!.yield! >= 0.9);
      if (tol.modelEffects.includes('slew-rate')) slewLimited++;
      if (tol.worstCase.withinSpec === false) failing++;
    }
    // The batch must exercise both the dynamic model and both verdicts, or it proves little.
    expect(slewLimited).toBeGreaterThanOrEqual(20);
    expect(failing).toBeGreaterThan(0);
    expect(failing).toBeLessThan(designs.length);
  });
});
