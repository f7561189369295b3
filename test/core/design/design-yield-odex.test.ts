/**
 * The yield a design reports agrees with an independent Monte Carlo on the odex reference integrator
 * (engine-odex-reference.ts: Gragg–Bulirsch–Stoer extrapolation from the npm registry, its own nodal
 * solve and amplifier behaviour) within the two estimates' sampling error. Parts vary alone here
 * (25 °C, exact supply) so the independent draw is simple: each part x0·(1 + t·z), z normal with
 * σ = 1/3 truncated at ±1 (tolerance = 3σ, common practice), drawn from this file's own generator.
 * Sample counts are modest on purpose; the check is at 4 combined standard errors.
 */
import { describe, expect, it } from 'vitest';
import { BUILT_IN_AMPLIFIERS, findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import type { CoreError } from '../../../src/core/errors.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import { designOscillator, type DesignRequest } from '../../../src/core/design/index.ts';
import { referenceOscillation } from '../circuit/engine-odex-reference.ts';

/** mulberry32 (a small public-domain generator) and Box–Muller: independent of the service's sampler. */
function normalSource(seed: number): () => number {
  let a = seed >>> 0;
  const uniform = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

function referenceYield(circuit: Circuit, tolerances: Record<string, number>, req: DesignRequest, samples: number): number {
  const z = normalSource(20261202);
  const dutyTol = req.dutyTolerance ?? 0.02;
  let passing = 0;
  for (let i = 0; i < samples; i++) {
    const parts: Record<string, number> = {};
    for (const [role, v] of Object.entries(circuit.parts)) {
      let u: number;
      do u = z() / 3;
      while (Math.abs(u) > 1);
      parts[role] = v * (1 + tolerances[role] * u);
    }
    const r = referenceOscillation({ ...circuit, parts }, { tolerance: 1e-7 });
    const fOk = Math.abs(1 / r.periodS / req.targetFrequencyHz - 1) <= req.frequencyTolerance;
    const dOk = Math.abs(r.dutyCycle - (req.targetDutyCycle ?? 0.5)) <= dutyTol;
    if (fOk && dOk) passing++;
  }
  return passing / samples;
}

const CASES: [string, DesignRequest, number][] = [
  [
    'ideal amplifier, 2 kHz, 50 % (closed form)',
    {
      targetFrequencyHz: 2000,
      frequencyTolerance: 0.02,
      supply: { positiveV: 5, negativeV: 0 },
      amplifier: findBuiltInAmplifier('ideal')!,
      values: { resistor: { series: 'E24', tolerance: 0.01 }, capacitor: { series: 'E12', tolerance: 0.05 } },
      count: 1,
      robustness: { temperature: { minC: 25, maxC: 25 }, supplyTolerance: 0, samples: 2000, seed: 7 },
    },
    120,
  ],
  [
    'fast CMOS archetype, 800 Hz, 30 % (time-domain)',
    {
      targetFrequencyHz: 800,
      targetDutyCycle: 0.3,
      frequencyTolerance: 0.02,
      dutyTolerance: 0.01,
      supply: { positiveV: 5, negativeV: 0 },
      amplifier: findBuiltInAmplifier('cmos-rrio-fast')!,
      values: { resistor: { series: 'E24', tolerance: 0.01 }, capacitor: { series: 'E12', tolerance: 0.05 } },
      count: 1,
      robustness: { temperature: { minC: 25, maxC: 25 }, supplyTolerance: 0, samples: 500, seed: 7 },
    },
    80,
  ],
  [
    'clamped bipolar archetype, 1 kHz, 50 %, ±12 V (the input clamp conducts every cycle)',
    {
      targetFrequencyHz: 1000,
      frequencyTolerance: 0.01,
      supply: { positiveV: 12, negativeV: -12 },
      amplifier: findBuiltInAmplifier('bipolar-low-noise-clamped')!,
      values: { resistor: { series: 'E24', tolerance: 0.01 }, capacitor: { series: 'E12', tolerance: 0.05 } },
      count: 1,
      robustness: { temperature: { minC: 25, maxC: 25 }, supplyTolerance: 0, samples: 500, seed: 7 },
    },
    60,
  ],
];

/**
 * The grid (0.1 Hz–1 MHz, 10–90 % duty, each archetype) is long on the reference integrator:
 * TICKWRIGHT_DESIGN_GRID=full runs it (top design of each target, yields against odex); CI runs the cases above.
 */
const FULL_GRID = process.env.TICKWRIGHT_DESIGN_GRID === 'full';
const GRID_TARGETS: [number, number][] = [
  [0.1, 0.5],
  [100, 0.1],
  [1e3, 0.5],
  [10e3, 0.9],
  [1e6, 0.5],
];

function supplyFor(id: string) {
  if (id.includes('split') || id.includes('jfet') || id.includes('low-noise')) return { positiveV: 12, negativeV: -12 };
  if (id.includes('bipolar')) return { positiveV: 12, negativeV: 0 };
  return { positiveV: 5, negativeV: 0 };
}

describe.runIf(FULL_GRID)('design yield over the full grid against the odex reference (TICKWRIGHT_DESIGN_GRID=full)', () => {
  for (const amplifier of BUILT_IN_AMPLIFIERS) {
    for (const [frequencyHz, duty] of GRID_TARGETS) {
      it(`${amplifier.id}, ${frequencyHz} Hz, ${duty * 100} %`, () => {
        const req: DesignRequest = {
          targetFrequencyHz: frequencyHz,
          targetDutyCycle: duty,
          frequencyTolerance: 0.02,
          supply: supplyFor(amplifier.id),
          amplifier,
          values: { resistor: { series: 'E24', tolerance: 0.01 }, capacitor: { series: 'E12', tolerance: 0.05 } },
          count: 1,
          robustness: { temperature: { minC: 25, maxC: 25 }, supplyTolerance: 0, samples: 400, seed: 3 },
        };
        let d;
        try {
          d = designOscillator(req).designs[0];
        } catch (err) {
          // Refusals are the design-grid test's subject (they name the binding limit).
          expect((err as CoreError).code).toBe('infeasible');
          return;
        }
        const r = d.robustness!;
        const circuit: Circuit = { topology: d.topology, supply: req.supply, amplifier, parts: Object.fromEntries(Object.entries(d.parts).map(([k, v]) => [k, v.value])), ...(d.diode ? { diode: d.diode } : {}) };
        const samples = 60;
        const ref = referenceYield(circuit, r.partTolerances, req, samples);
        const se = Math.sqrt((r.yield * (1 - r.yield)) / r.samples + (ref * (1 - ref)) / samples);
        expect(Math.abs(r.yield - ref), `service ${r.yield}, odex ${ref}`).toBeLessThanOrEqual(Math.max(4 * se, 1 / samples));
      }, 600_000);
    }
  }
});

describe('design yield against an independent Monte Carlo on the odex reference', () => {
  for (const [label, req, samples] of CASES) {
    it(label, () => {
      const d = designOscillator(req).designs[0];
      const r = d.robustness!;
      const circuit: Circuit = { topology: d.topology, supply: req.supply, amplifier: req.amplifier, parts: Object.fromEntries(Object.entries(d.parts).map(([k, v]) => [k, v.value])) };
      const ref = referenceYield(circuit, r.partTolerances, req, samples);
      const se = Math.sqrt((r.yield * (1 - r.yield)) / r.samples + (ref * (1 - ref)) / samples);
      // A yield of exactly 0 or 1 on both sides has no spread: allow one reference sample either way.
      expect(Math.abs(r.yield - ref), `service ${r.yield}, odex ${ref}`).toBeLessThanOrEqual(Math.max(4 * se, 1 / samples));
      // Not a trivial case: the tolerance is tight enough that some boards fail.
      expect(r.yield).toBeLessThan(0.995);
    });
  }
});
