/**
 * The fit's forward model against the exact time-domain engine over a range
 * of ramp/τ. Two things are measured:
 * - the forward model as predictFigures chooses it agrees with the engine
 *   within the model error the fit assumes (FORWARD_MODEL_TIMING_ERROR of the
 *   period on timing figures, FORWARD_MODEL_LEVEL_ERROR of the swing on
 *   voltages) on every figure the fit compares with a measurement;
 * - the former mid-ramp rule (each edge a step at half its ramp) is off by the
 *   leading term τ·x²/24 per edge that the first-order ramp response predicts
 *   (x = ramp/τ; the response of an RC to a ramp input is the textbook
 *   v = a0 + k(t − τ) + (v0 − a0 + kτ)e^(−t/τ), written from memory), so the
 *   budget is broken from about x = 0.01 on: why the effective delay is now
 *   τ·ln((e^x − 1)/x).
 */
import { describe, expect, it } from 'vitest';
import { analyzeCircuit, prepareCircuit } from '../../../src/core/circuit/analyze.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import {
  FORWARD_MODEL_LEVEL_ERROR,
  FORWARD_MODEL_TIMING_ERROR,
  forwardModelFor,
  predictFigures,
  rampStepDelayS,
  type PredictedFigures,
} from '../../../src/core/fit/estimate/forward.ts';
import { OBSERVABLES } from '../../../src/core/fit/estimate/measurements.ts';
import { bridgeClock, withAmplifier } from './estimate-scenario.ts';

const TAU_S = 16000 * 4.7e-9;
const SOURCE_SWING_V = 5 - 2 * 0.02;
const RAMP_OVER_TAU = [0.001, 0.003, 0.01, 0.03, 0.1, 0.3, 0.5];

/** The bridge clock with a slew rate giving ramp/τ = x (no current limit, so only slew and delay act). */
function atRampRatio(base: Circuit, x: number, figures: Partial<Circuit['amplifier']> = {}): Circuit {
  return withAmplifier(base, { slewRateVPerS: SOURCE_SWING_V / (x * TAU_S), outputCurrentLimitA: Infinity, ...figures });
}

const TIMING = new Set(['riseTimeS', 'fallTimeS', 'capacitorRisingTauS', 'capacitorFallingTauS']);

/** Largest disagreement over the fit's observables, in units of the assumed model error. */
function worstDisagreement(model: PredictedFigures, engine: PredictedFigures): { name: string; inBudgets: number } {
  const swingV = engine.outputHighV - engine.outputLowV;
  let worst = { name: '', inBudgets: 0 };
  for (const name of OBSERVABLES) {
    const d = Math.abs(model[name] - engine[name]);
    let inBudgets: number;
    if (name === 'frequencyHz') inBudgets = d / engine.frequencyHz / FORWARD_MODEL_TIMING_ERROR;
    else if (name === 'dutyCycle') inBudgets = d / FORWARD_MODEL_TIMING_ERROR;
    else if (TIMING.has(name)) inBudgets = d / engine.periodS / FORWARD_MODEL_TIMING_ERROR;
    else inBudgets = d / swingV / FORWARD_MODEL_LEVEL_ERROR;
    if (!(inBudgets <= worst.inBudgets)) worst = { name, inBudgets };
  }
  return worst;
}

/** The former forward model's period: each edge a step at recovery delay + half its ramp (rebuilt here on purpose). */
function midRampPeriodS(c: Circuit): number {
  const { high, low } = prepareCircuit(c);
  const rampS = Math.abs(high.sourceV - low.sourceV) / c.amplifier.slewRateVPerS;
  const d = c.amplifier.recoveryDelayS + rampS / 2;
  const maxV = high.asymptoteV + (high.switchingV - high.asymptoteV) * Math.exp(-d / high.tauS);
  const minV = low.asymptoteV + (low.switchingV - low.asymptoteV) * Math.exp(-d / low.tauS);
  return high.tauS * Math.log((high.asymptoteV - minV) / (high.asymptoteV - high.switchingV)) + low.tauS * Math.log((low.asymptoteV - maxV) / (low.asymptoteV - low.switchingV)) + 2 * d;
}

describe('forward model against the time-domain engine', () => {
  const scenarios: [string, (x: number) => Circuit][] = [
    ['bridge clock', (x) => atRampRatio(bridgeClock, x)],
    ['bridge clock, 2 µs recovery delay', (x) => atRampRatio(bridgeClock, x, { recoveryDelayS: 2e-6 })],
    ['bridge clock, high level 0.35 V short, 5 mV offset', (x) => atRampRatio(bridgeClock, x, { outputHeadroomHighV: 0.35, inputOffsetV: 5e-3 })],
  ];
  for (const [label, make] of scenarios) {
    it(`${label}: within the assumed model error for ramp/τ from 0.001 to 0.5`, () => {
      for (const x of RAMP_OVER_TAU) {
        const c = make(x);
        const worst = worstDisagreement(predictFigures(c), predictFigures(c, 'time-domain'));
        expect(worst.inBudgets, `ramp/τ ${x}: ${worst.name}`).toBeLessThanOrEqual(1);
      }
    });
  }

  it("the engine path reads the engine's own period and switching levels", () => {
    for (const x of [0.01, 0.3]) {
      const c = atRampRatio(bridgeClock, x, { recoveryDelayS: 1e-6 });
      const engine = analyzeCircuit(c, { model: 'time-domain' });
      const f = predictFigures(c, 'time-domain');
      expect(f.periodS / engine.periodS - 1).toBeCloseTo(0, 12);
      expect(f.upperThresholdV).toBeCloseTo(engine.thresholds.upperV, 12);
      expect(f.lowerThresholdV).toBeCloseTo(engine.thresholds.lowerV, 12);
    }
  });

  it('the former mid-ramp rule errs by the predicted τ·x²/24 per edge and breaks the budget from ramp/τ ≈ 0.01', () => {
    const { high, low } = prepareCircuit(bridgeClock);
    const jumpV = high.asymptoteV - low.asymptoteV;
    for (const x of RAMP_OVER_TAU) {
      const c = atRampRatio(bridgeClock, x);
      const engine = analyzeCircuit(c, { model: 'time-domain' });
      const measured = (midRampPeriodS(c) - engine.periodS) / engine.periodS;
      // Leading term: each edge's dwell is short by τ·(x²/24)·ΔA/|A − v_start| (see forward.ts).
      const f = predictFigures(c);
      const predicted = -((TAU_S * x * x) / 24) * (jumpV / (high.asymptoteV - f.capacitorMinV) + jumpV / (f.capacitorMaxV - low.asymptoteV)) / engine.periodS;
      if (x <= 0.1) expect(Math.abs(measured / predicted - 1)).toBeLessThan(0.05);
      if (x <= 0.003) expect(Math.abs(measured)).toBeLessThan(FORWARD_MODEL_TIMING_ERROR);
      if (x >= 0.03) expect(Math.abs(measured)).toBeGreaterThan(FORWARD_MODEL_TIMING_ERROR);
    }
    // The exact effective delay tends to the mid-ramp one for short ramps: τ·ln((e^x − 1)/x) = Tr/2 + τx²/24 + ...
    expect(rampStepDelayS(1e-4 * TAU_S, TAU_S) / (0.5e-4 * TAU_S) - 1).toBeCloseTo(1e-4 / 12, 10);
    expect(rampStepDelayS(0.5 * TAU_S, TAU_S) / TAU_S).toBeCloseTo(Math.log(Math.expm1(0.5) / 0.5), 14);
  });

  it('hands the engine what the closed form does not model: a slewing output behind 200 Ω', () => {
    const c = atRampRatio(bridgeClock, 0.3, { outputResistanceOhm: 200 });
    expect(forwardModelFor(c)).toBe('time-domain');
    const engine = predictFigures(c, 'time-domain');
    // The pin sags with the load, so its 10–90 % time is no longer 80 % of the source's ramp.
    expect(worstDisagreement(predictFigures(c, 'closed-form'), engine).inBudgets).toBeGreaterThan(1);
    expect(worstDisagreement(predictFigures(c), engine).inBudgets).toBe(0);
  });
});
