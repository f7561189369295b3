/**
 * The assembly against its spec: worst-case frequency and duty inside the
 * allowed band, and the Monte Carlo yield at or above the minimum. The figures
 * come from the tolerance analysis (src/core/tolerance); these rules only judge.
 */
import { formatSi } from '../../circuit/format.ts';
import { BOM_RULES } from '../codes.ts';
import { ruleResult } from '../rule.ts';
import type { BomSpec, BomRuleResult } from '../types.ts';

export interface WorstCaseFigures {
  nominalFrequencyHz: number;
  frequencyMinHz: number;
  frequencyMaxHz: number;
  nominalDutyCycle: number;
  dutyMin: number;
  dutyMax: number;
  /** How the extremes were found, as the tolerance analysis names it. */
  method: string;
  cornersEvaluated: number;
  /** Corners of the tolerance box at which the circuit does not oscillate. */
  latchedCorners: number;
  /** Which model evaluated every corner (as the tolerance analysis names it) and its amplifier effects, comma-separated. */
  model: string;
  modelEffects: string;
}

export interface YieldFigures {
  /** Fraction of samples inside the spec, 0..1. */
  yield: number;
  samples: number;
  /** Samples that did not oscillate (counted as outside the spec). */
  failedSamples: number;
  seed: number;
}

function pct(fraction: number): string {
  return `${Number((fraction * 100).toPrecision(4))} %`;
}

export function frequencyBand(spec: BomSpec): { lowHz: number; highHz: number } {
  return { lowHz: spec.frequencyHz * (1 - spec.frequencyTolerance), highHz: spec.frequencyHz * (1 + spec.frequencyTolerance) };
}

export function frequencyRule(spec: BomSpec, wc: WorstCaseFigures): BomRuleResult {
  const { lowHz, highHz } = frequencyBand(spec);
  const inside = wc.latchedCorners === 0 && wc.frequencyMinHz >= lowHz && wc.frequencyMaxHz <= highHz;
  const figures = {
    specFrequencyHz: spec.frequencyHz,
    specLowHz: lowHz,
    specHighHz: highHz,
    nominalFrequencyHz: wc.nominalFrequencyHz,
    worstCaseMinHz: wc.frequencyMinHz,
    worstCaseMaxHz: wc.frequencyMaxHz,
    method: wc.method,
    cornersEvaluated: wc.cornersEvaluated,
    latchedCorners: wc.latchedCorners,
    model: wc.model,
    modelEffects: wc.modelEffects,
  };
  const latched = wc.latchedCorners > 0 ? `; ${wc.latchedCorners} corner(s) of the tolerance box do not oscillate at all` : '';
  const range = `${formatSi(wc.frequencyMinHz, 'Hz')} to ${formatSi(wc.frequencyMaxHz, 'Hz')}`;
  const band = `${formatSi(lowHz, 'Hz')} to ${formatSi(highHz, 'Hz')}`;
  return inside
    ? ruleResult(BOM_RULES.frequencyWithinSpec, `Worst-case frequency ${range} lies inside the spec ${band}`, figures)
    : ruleResult(BOM_RULES.frequencyOutsideSpec, `Worst-case frequency ${range} leaves the spec ${band} (nominal ${formatSi(wc.nominalFrequencyHz, 'Hz')})${latched}`, figures);
}

/** Only when the spec gives a duty range. */
export function dutyRule(spec: BomSpec, wc: WorstCaseFigures): BomRuleResult | undefined {
  if (spec.dutyMin === undefined && spec.dutyMax === undefined) return undefined;
  const low = spec.dutyMin ?? 0;
  const high = spec.dutyMax ?? 1;
  const inside = wc.dutyMin >= low && wc.dutyMax <= high;
  const figures = { specDutyMin: low, specDutyMax: high, nominalDutyCycle: wc.nominalDutyCycle, worstCaseDutyMin: wc.dutyMin, worstCaseDutyMax: wc.dutyMax, method: wc.method };
  const range = `${pct(wc.dutyMin)} to ${pct(wc.dutyMax)}`;
  return inside
    ? ruleResult(BOM_RULES.dutyWithinSpec, `Worst-case duty cycle ${range} lies inside the spec ${pct(low)} to ${pct(high)}`, figures)
    : ruleResult(BOM_RULES.dutyOutsideSpec, `Worst-case duty cycle ${range} leaves the spec ${pct(low)} to ${pct(high)}`, figures);
}

export function yieldRule(spec: BomSpec, y: YieldFigures): BomRuleResult | undefined {
  if (spec.minimumYield === undefined) return undefined;
  const figures = { yield: y.yield, minimumYield: spec.minimumYield, samples: y.samples, failedSamples: y.failedSamples, seed: y.seed };
  return y.yield >= spec.minimumYield
    ? ruleResult(BOM_RULES.yieldMet, `Monte Carlo yield ${pct(y.yield)} (${y.samples} samples) meets the minimum ${pct(spec.minimumYield)}`, figures)
    : ruleResult(BOM_RULES.yieldBelowMinimum, `Monte Carlo yield ${pct(y.yield)} (${y.samples} samples) is below the minimum ${pct(spec.minimumYield)}`, figures);
}

export function yieldSkippedRule(spec: BomSpec, why: string): BomRuleResult | undefined {
  if (spec.minimumYield === undefined) return undefined;
  return ruleResult(BOM_RULES.yieldNotEvaluated, `The yield was not evaluated: ${why}`, { minimumYield: spec.minimumYield });
}
