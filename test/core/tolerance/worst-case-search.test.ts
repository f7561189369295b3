/**
 * The sensitivity-guided corner search against the exhaustive enumeration of the same box.
 *
 * Reference: every corner of the variation box (2^n of them) evaluated through the same model
 * (buildVariationModel + the prepared evaluator), plus the nominal, enumerated here in the test
 * with no part of the search's code; the extremes of a figure are the smallest and largest over
 * the points that oscillate. That is the definition of the worst case the answer reports, and
 * what the all-corners method computes below MAX_EXHAUSTIVE_DIMENSIONS; above it, the search must
 * land on the same figures. Circuits are drawn with a fixed seed, some of them built to latch at
 * some corners (small hysteresis against an offset range, thresholds near a rail the output
 * cannot reach with its headroom spread, a supply near where the output stops reaching the
 * threshold, an input clamp).
 */
import { describe, expect, it } from 'vitest';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import { CoreError } from '../../../src/core/errors.ts';
import { EVALUATION_STATUS, OUTPUT_LENGTH } from '../../../src/core/circuit/engine/prepared.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import { MAX_EXHAUSTIVE_DIMENSIONS, runToleranceAnalysis, type ToleranceRequest } from '../../../src/core/tolerance/index.ts';
import { createSampleEvaluator } from '../../../src/core/tolerance/sample-evaluator.ts';
import { buildVariationModel } from '../../../src/core/tolerance/variation-model.ts';

/** Small deterministic generator (numerical recipes LCG constants), so every run draws the same circuits. */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

const AMPLIFIERS = [
  'bipolar-single-supply-general',
  'bipolar-split-supply-general',
  'bipolar-low-noise-clamped',
  'jfet-input-general',
  'cmos-rro-micropower',
  'cmos-rrio-fast',
  'comparator-push-pull-cmos',
  'comparator-open-drain-bipolar',
] as const;
type Family = 'plain' | 'small-hysteresis' | 'near-rail' | 'low-supply';
const FAMILIES: readonly Family[] = ['plain', 'small-hysteresis', 'near-rail', 'low-supply'];

/** Our own random scenarios (invented values, test only). */
function drawRequest(rnd: () => number, closedForm: boolean): { request: ToleranceRequest; family: Family } {
  const pick = <T,>(a: readonly T[]): T => a[Math.floor(rnd() * a.length)];
  const logUniform = (lo: number, hi: number) => lo * (hi / lo) ** rnd();
  const family = pick(FAMILIES);
  const amplifier = closedForm ? { ...findBuiltInAmplifier('ideal')!, outputHeadroomHighV: 0.8, outputHeadroomLowV: 0.5, outputResistanceOhm: 50, inputBiasCurrentA: 20e-9 } : findBuiltInAmplifier(pick(AMPLIFIERS))!;
  const openDrain = amplifier.outputStage === 'open-drain';
  const topology = openDrain ? 'open-drain-pullup' : family === 'near-rail' ? 'three-resistor-divider' : closedForm ? 'two-resistor-feedback' : pick(['two-resistor-feedback', 'three-resistor-divider']);
  const single = topology !== 'two-resistor-feedback' && (family === 'near-rail' || rnd() < 0.7);
  const positiveV = family === 'low-supply' ? logUniform(2.5, 4.5) : logUniform(3, 15);
  const supply = { positiveV, negativeV: single ? 0 : -positiveV * logUniform(0.5, 1) };
  const parts: Record<string, number> = { rTiming: logUniform(1e3, 1e5), cTiming: logUniform(1e-9, 1e-7) };
  if (topology === 'two-resistor-feedback') {
    parts.rFeedback = logUniform(1e4, 1e6);
    parts.rGround = parts.rFeedback * (family === 'small-hysteresis' ? logUniform(0.01, 0.05) : logUniform(0.2, 2));
  } else {
    parts.rTop = logUniform(1e4, 1e5);
    parts.rFeedback = parts.rTop * (family === 'small-hysteresis' ? logUniform(30, 300) : logUniform(0.5, 3));
    parts.rBottom = parts.rTop * logUniform(0.3, 3);
    if (openDrain) parts.rPullup = logUniform(1e3, 2e4);
    else if (family === 'near-rail') {
      // The upper threshold a little below the output's high level (V+ less its headroom), so the spreads
      // push it beyond reach at some corners: (V+·gTop + vHigh·gFeedback)/(gTop + gBottom + gFeedback) = target.
      const vHigh = positiveV - amplifier.outputHeadroomHighV;
      const target = vHigh - positiveV * logUniform(0.003, 0.05);
      const gTop = 1 / parts.rTop;
      const gFeedback = 1 / parts.rFeedback;
      const gBottom = (positiveV * gTop + vHigh * gFeedback) / target - gTop - gFeedback;
      if (gBottom > 0) parts.rBottom = 1 / gBottom;
    }
  }
  const circuit: Circuit = { topology, supply, amplifier, parts };
  const tolerances: Record<string, number> = {};
  for (const role of Object.keys(parts)) tolerances[role] = pick([0.01, 0.02, 0.05, 0.1]);
  const spreadFields = closedForm
    ? { outputHeadroomHighV: 0.3, outputHeadroomLowV: 0.3, outputResistanceOhm: 0.5, inputBiasCurrentA: 0.5 }
    : { outputHeadroomHighV: 0.3, outputHeadroomLowV: 0.3, inputBiasCurrentA: 0.5, slewRateVPerS: 0.2, recoveryDelayS: 0.3 };
  const amplifierSpreads: Record<string, number> = {};
  for (const [field, fraction] of Object.entries(spreadFields)) if (closedForm || rnd() < 0.4) amplifierSpreads[field] = fraction;
  if (closedForm || family === 'small-hysteresis' || rnd() < 0.4) amplifierSpreads.inputOffsetRangeV = pick([0.005, 0.01, 0.02]);
  const request: ToleranceRequest = {
    circuit,
    tolerances,
    supplyTolerance: pick([0.02, 0.05, 0.1]),
    supplyRailsIndependent: !single && rnd() < 0.5,
    temperature: { minC: -40, maxC: 85 },
    temperatureCoefficients: {
      rTiming: { tempcoPpmPerK: 100, tempcoTolerancePpmPerK: closedForm || rnd() < 0.5 ? 50 : 0 },
      cTiming: { dielectric: pick(['C0G', 'X7R', 'X5R']) },
      ...(closedForm ? Object.fromEntries(Object.keys(parts).filter((r) => r !== 'rTiming' && r !== 'cTiming').map((r) => [r, { tempcoPpmPerK: 50, tempcoTolerancePpmPerK: 25 }])) : {}),
    },
    amplifierSpreads,
  };
  return { request, family };
}

interface Extremes {
  frequencyMinHz: number;
  frequencyMaxHz: number;
  dutyMin: number;
  dutyMax: number;
  latchedCorners: number;
}

/** The reference: nominal and every corner through the same model, extremes over those that oscillate. */
function exhaustive(request: ToleranceRequest, window: readonly [number, number]): Extremes & { dimensions: number; model: string } | undefined {
  const evaluator = createSampleEvaluator(request.circuit);
  const model = buildVariationModel(request, evaluator.parameters, evaluator.nominal, evaluator.model);
  const dims = model.dimensions;
  if (dims.length < window[0] || dims.length > window[1]) return undefined;
  const values = new Float64Array(model.nominal.length);
  const out = new Float64Array(OUTPUT_LENGTH);
  model.apply(model.referencePoint(), values);
  if (evaluator.evaluate(values, out) !== EVALUATION_STATUS.ok) return undefined;
  const e = { frequencyMinHz: 1 / out[0], frequencyMaxHz: 1 / out[0], dutyMin: out[1], dutyMax: out[1], latchedCorners: 0 };
  const point = new Float64Array(dims.length);
  for (let mask = 0; mask < 2 ** dims.length; mask++) {
    for (let k = 0; k < dims.length; k++) point[k] = (mask >>> k) & 1 ? dims[k].high : dims[k].low;
    model.apply(point, values);
    if (evaluator.evaluate(values, out) !== EVALUATION_STATUS.ok) {
      e.latchedCorners++;
      continue;
    }
    const f = 1 / out[0];
    e.frequencyMinHz = Math.min(e.frequencyMinHz, f);
    e.frequencyMaxHz = Math.max(e.frequencyMaxHz, f);
    e.dutyMin = Math.min(e.dutyMin, out[1]);
    e.dutyMax = Math.max(e.dutyMax, out[1]);
  }
  return { ...e, dimensions: dims.length, model: evaluator.model };
}

/**
 * Relative difference, with one allowance: a figure that does not move over the box at all (the duty
 * of a symmetric slew-limited circuit is 0.5 at every corner) varies only by the walk's rounding,
 * a few 1e-12, and its "extreme" is that rounding; it is compared to 1e-9 of itself instead.
 */
function discrepancy(found: number, reference: number, min: number, max: number): number {
  const rel = Math.abs(found / reference - 1);
  return max - min <= 1e-9 * Math.abs(reference) ? (rel <= 1e-9 ? 0 : rel) : rel;
}

function runCases(closedForm: boolean, count: number, window: readonly [number, number], seed: number) {
  const rnd = lcg(seed);
  const rows: { family: Family; dimensions: number; latchedCorners: number; searchLatched: number; worst: number; cornersEvaluated: number }[] = [];
  let draws = 0;
  while (rows.length < count && draws < count * 20) {
    draws++;
    const { request, family } = drawRequest(rnd, closedForm);
    let reference: ReturnType<typeof exhaustive>;
    try {
      reference = exhaustive(request, window);
    } catch (error) {
      if (!(error instanceof CoreError)) throw error;
      continue; // a drawn circuit the analysis refuses (e.g. a supply beyond the amplifier's rating): draw again
    }
    if (!reference) continue;
    const r = runToleranceAnalysis(request, { parts: { monteCarlo: false, sensitivities: false } });
    expect(r.worstCase.method).toBe('sensitivity-guided');
    const wc = r.worstCase;
    const worst = Math.max(
      discrepancy(wc.frequencyMinHz, reference.frequencyMinHz, reference.frequencyMinHz, reference.frequencyMaxHz),
      discrepancy(wc.frequencyMaxHz, reference.frequencyMaxHz, reference.frequencyMinHz, reference.frequencyMaxHz),
      discrepancy(wc.dutyMin, reference.dutyMin, reference.dutyMin, reference.dutyMax),
      discrepancy(wc.dutyMax, reference.dutyMax, reference.dutyMin, reference.dutyMax),
    );
    rows.push({ family, dimensions: reference.dimensions, latchedCorners: reference.latchedCorners, searchLatched: wc.latchedCorners, worst, cornersEvaluated: wc.cornersEvaluated });
  }
  return rows;
}

function check(rows: ReturnType<typeof runCases>, count: number, minLatchedCases: number, maxEvaluationShare: number) {
  expect(rows.length).toBe(count);
  // The search exists to cost less than the enumeration: its evaluations against 2^n per circuit, over the draw
  // (before the pair screen: about 34 % time-domain, 2.1 % closed form; with it 24.7 % and 1.1 %; with single-flip
  // ascents first and interactions harvested from the squares they complete, 24.1 % and 1.0 %).
  const evaluated = rows.reduce((a, r) => a + r.cornersEvaluated, 0);
  const enumerated = rows.reduce((a, r) => a + 2 ** r.dimensions, 0);
  console.log(`corners evaluated: ${evaluated} of ${enumerated} enumerated (${((100 * evaluated) / enumerated).toFixed(1)} %)`);
  expect(evaluated / enumerated).toBeLessThanOrEqual(maxEvaluationShare);
  const latchedCases = rows.filter((r) => r.latchedCorners > 0);
  // The draw must exercise latching where asked, or the test says nothing about it.
  expect(latchedCases.length).toBeGreaterThanOrEqual(minLatchedCases);
  for (const row of rows) {
    // Same extremes as every corner, to the walk's rounding.
    expect(row.worst, JSON.stringify(row)).toBeLessThanOrEqual(1e-12);
    // latchedCorners counts latched corners the search met: never more than there are, and a design that
    // latches at some corner says so (its extremes sit on the edge of the latching region, which the
    // search walks along).
    expect(row.searchLatched).toBeLessThanOrEqual(row.latchedCorners);
    expect(row.searchLatched > 0, JSON.stringify(row)).toBe(row.latchedCorners > 0);
  }
}

describe('sensitivity-guided worst case = exhaustive corner enumeration', () => {
  it(`time-domain model, ${MAX_EXHAUSTIVE_DIMENSIONS['time-domain'] + 1} to 10 dimensions, random circuits (seed 2026)`, () => {
    const rows = runCases(false, 120, [MAX_EXHAUSTIVE_DIMENSIONS['time-domain'] + 1, 10], 2026);
    check(rows, 120, 15, 0.3);
  }, 120_000);

  // Every resistor with a tempco spread and temperature: the two temperature basins. (Known limit, measured:
  // at 17 dimensions, a divider near the rail with about half its corners latched, 3 of 4 such cases still
  // miss an extreme, by up to 6 %: a step along that latching edge can need four coordinates at once.)
  it(`closed form, ${MAX_EXHAUSTIVE_DIMENSIONS['closed-form'] + 1} to 16 dimensions, random circuits (seed 7)`, () => {
    const rows = runCases(true, 30, [MAX_EXHAUSTIVE_DIMENSIONS['closed-form'] + 1, 16], 7);
    check(rows, 30, 0, 0.015);
  }, 120_000);
});
