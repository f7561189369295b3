/**
 * Cost-aware admission of Monte Carlo (time-budget.ts): a run whose projection (pilot cost × the work
 * left) does not fit the caller's limit is refused with limit-exceeded at /monteCarlo/samples before the
 * bulk of its samples; an admitted run is the unlimited run, sample for sample. The clocks here are our
 * own fakes, so every verdict is deterministic; the projection is plain arithmetic on their readings.
 */
import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import { NO_STRAYS } from '../../../src/core/circuit/strays.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import { CoreError } from '../../../src/core/errors.ts';
import { resolveCapacitor } from '../../../src/core/parts/capacitor/index.ts';
import { PILOT_MEASURE_MS, PILOT_STRIDE, PILOT_WARMUP_MS, readableFloor, runToleranceAnalysis, type ToleranceRequest } from '../../../src/core/tolerance/index.ts';
import { refusal } from '../../helpers/core-error.ts';

const ideal = findBuiltInAmplifier('ideal')!;
// Our own scenarios: a ±12 V astable with a film capacitor, and the ±10 V timebase with a small-case X7R
// part, 470 pF at P and 1 nF on the pin behind 200 Ω (the slow circuit of bench/capacitor.bench.ts).
const linear: Circuit = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 12, negativeV: -12 },
  amplifier: ideal,
  parts: { rTiming: 10e3, cTiming: 10e-9, rFeedback: 20e3, rGround: 10e3 },
};
const x7r = resolveCapacitor({ value: '10n', dielectric: 'X7R', ratedVoltageV: 6.3, caseSize: '0402' });
const curvedWithStrays: Circuit = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 10, negativeV: -10 },
  amplifier: { ...ideal, outputResistanceOhm: 200 },
  parts: { rTiming: 47e3, cTiming: x7r.capacitanceF, rGround: 10e3, rFeedback: 20e3 },
  strays: { ...NO_STRAYS, thresholdNodeF: 470e-12, outputNodeF: 1e-9 },
  capacitorShape: x7r.shape,
};

/** A clock that moves `stepMs` at every reading: its figures depend only on how often it is read. */
function steppingClock(stepMs: number) {
  let t = 0;
  const clock = () => (t += stepMs);
  clock.readings = () => t / stepMs;
  return clock;
}

const request = (circuit: Circuit, samples: number, seed = 3): ToleranceRequest => ({
  circuit,
  tolerances: { rTiming: 0.01, cTiming: 0.05, rFeedback: 0.01 },
  supplyTolerance: 0.05,
  monteCarlo: { samples, seed },
  spec: { frequencyHz: 1, frequencyTolerance: 0.5 },
});

/** Everything but the timing figures, which differ between any two runs. */
function withoutTiming<T extends { monteCarlo?: { elapsedS: number; samplesPerSecond: number } }>(run: T) {
  const { elapsedS: _e, samplesPerSecond: _s, ...mc } = run.monteCarlo!;
  void _e;
  void _s;
  return { ...run, monteCarlo: mc };
}

describe('Monte Carlo admission by projected time', () => {
  it('refuses over the limit with limit-exceeded at /monteCarlo/samples, a readable limit that is then admitted', () => {
    // 10 ms per reading, one reading per PILOT_STRIDE samples: the warm-up ends after PILOT_WARMUP_MS / 10 readings,
    // the measure takes PILOT_MEASURE_MS / 10 more, so a sample reads 10 / PILOT_STRIDE ms (0.16): 10,000 project to ~1.6 s.
    const limitMs = 500;
    const pilotSamples = ((PILOT_WARMUP_MS + PILOT_MEASURE_MS) / 10) * PILOT_STRIDE;
    const perSampleMs = 10 / PILOT_STRIDE;
    const err = refusal(() => runToleranceAnalysis(request(linear, 10_000), { budget: { limitMs, clock: steppingClock(10) } }));
    expect(err.code).toBe('limit-exceeded');
    expect(err.pointer).toBe('/monteCarlo/samples');
    const { limit, requested } = err.details as { limit: number; requested: number };
    expect(requested).toBe(10_000);
    expect(limit).toBeGreaterThan(pilotSamples);
    expect(limit).toBeLessThan(requested);
    expect(readableFloor(limit)).toBe(limit); // two significant figures
    // Arithmetic of the projection: the samples after the pilot fit in what the limit leaves.
    expect((limit - pilotSamples) * perSampleMs).toBeLessThan(limitMs - PILOT_WARMUP_MS - PILOT_MEASURE_MS);
    expect(err.message).toMatch(/10,000 Monte Carlo samples would take about 1\.\d s/);
    expect(err.message).toContain(`at most ${limit.toLocaleString('en-US')} samples`);
    // The figure offered is admitted under the same clock, and a tenth more than the unrounded fit is not.
    expect(() => runToleranceAnalysis(request(linear, limit), { budget: { limitMs, clock: steppingClock(10) } })).not.toThrow();
    expect(() => runToleranceAnalysis(request(linear, Math.ceil(limit * 1.1) + 100), { budget: { limitMs, clock: steppingClock(10) } })).toThrow(CoreError);
  });

  it('admitted: the same result as the run without a limit, the seeded stream sample for sample', () => {
    const unlimited = runToleranceAnalysis(request(linear, 5000), { keepSamples: true });
    // 3 ms a reading: the pilot decides (and admits) after ~67 readings, ~4,300 samples into the 5,000.
    const clock = steppingClock(3);
    const limited = runToleranceAnalysis(request(linear, 5000), { keepSamples: true, budget: { limitMs: 60_000, clock } });
    expect(clock.readings()).toBeGreaterThan((PILOT_WARMUP_MS + PILOT_MEASURE_MS) / 3);
    expect(limited.samples!.frequencyHz).toEqual(unlimited.samples!.frequencyHz);
    expect(limited.samples!.dutyCycle).toEqual(unlimited.samples!.dutyCycle);
    expect(withoutTiming(limited)).toEqual(withoutTiming(unlimited));
  });

  it('admitted on the slow C(V) circuit with strays: unchanged too (the pilot is the run\'s first samples)', () => {
    const unlimited = runToleranceAnalysis(request(curvedWithStrays, 160), { keepSamples: true });
    // 100 ms a reading: the warm-up ends at the first look, the pilot decides at the second, 128 samples into the 160.
    const limited = runToleranceAnalysis(request(curvedWithStrays, 160), { keepSamples: true, budget: { limitMs: 60_000, clock: steppingClock(Math.max(PILOT_WARMUP_MS, PILOT_MEASURE_MS)) } });
    expect(limited.samples!.frequencyHz).toEqual(unlimited.samples!.frequencyHz);
    expect(withoutTiming(limited)).toEqual(withoutTiming(unlimited));
  });

  it('on the real clock, the C(V) circuit with strays is refused at once and the message says why', () => {
    const started = performance.now();
    const err = refusal(() => runToleranceAnalysis(request(curvedWithStrays, 10_000), { budget: { limitMs: 2000, alternative: 'leave Monte Carlo out' } }));
    expect(err.code).toBe('limit-exceeded');
    expect(err.message).toMatch(/≈[\d.]+ (ms|µs) per evaluation: a C\(V\) timing capacitor with strays at P and on the output pin is solved piece by piece/);
    expect(err.message).toMatch(/, or leave Monte Carlo out$/);
    const { limit } = err.details as { limit: number };
    expect(limit).toBeLessThan(10_000);
    // Not a timed test: the refusal comes after the pilot, long before the 10,000 samples would have ended.
    expect(performance.now() - started).toBeLessThan(2000 + 10_000);
  });

  it('a run that ends before its pilot has measured is never refused', () => {
    // 1 ms a reading: 10,000 samples make 156 readings, short of the pilot's warm-up and measure, so the 1 ms limit is never applied.
    expect(() => runToleranceAnalysis(request(linear, 10_000), { budget: { limitMs: 1, clock: steppingClock(1) } })).not.toThrow();
    expect(() => runToleranceAnalysis(request(linear, 20_000), { budget: { limitMs: 1, clock: steppingClock(1) } })).toThrow(CoreError);
  });
});

describe('readableFloor', () => {
  it('rounds down to two significant figures', () => {
    expect([0.5, 7, 99, 100, 4372, 14_960, 999_999].map(readableFloor)).toEqual([0, 7, 99, 100, 4300, 14_000, 990_000]);
  });
});
