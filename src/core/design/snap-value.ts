/**
 * One ideal value against a value set: the nearest, next-lower and next-higher
 * options with their relative errors, and optionally the best two-part series
 * or parallel combination.
 */
import { CoreError } from '../errors.ts';
import { lowerBound, type PartOption, type ValueSet } from './value-set.ts';

export type Arrangement = 'single' | 'series' | 'parallel';

/** A role's value as fitted: one part, or two in series or in parallel. */
export interface RoleValue {
  /** Effective resistance (ohm) or capacitance (farad). */
  value: number;
  arrangement: Arrangement;
  parts: readonly PartOption[];
}

export interface SnapChoice extends RoleValue {
  /** (value − ideal) / ideal. */
  error: number;
}

export interface ValueSnap {
  ideal: number;
  nearest: SnapChoice;
  /** Largest option <= ideal (null when every option is above it). */
  lower: SnapChoice | null;
  /** Smallest option >= ideal (null when every option is below it). */
  higher: SnapChoice | null;
  /** Best two-part combination, when asked for and one beats the nearest single part. */
  combination?: SnapChoice | null;
}

/** Ideal values within this relative distance of an option count as that option (arithmetic noise). */
const SAME_VALUE_REL = 1e-12;

function single(option: PartOption, ideal: number): SnapChoice {
  return { value: option.value, arrangement: 'single', parts: [option], error: (option.value - ideal) / ideal };
}

/** Series resistors and parallel capacitors add; the other pairings add reciprocally. */
export function combinedValue(kind: ValueSet['kind'], arrangement: Exclude<Arrangement, 'single'>, a: number, b: number): number {
  const adds = (kind === 'resistor') === (arrangement === 'series');
  return adds ? a + b : (a * b) / (a + b);
}

/** Neighbours of x in a value set: index of the largest value <= x and of the smallest >= x (-1 / length when absent). */
export function neighbourIndices(values: Float64Array, x: number): { below: number; above: number } {
  const i = lowerBound(values, x * (1 - SAME_VALUE_REL));
  if (i < values.length && Math.abs(values[i] - x) <= SAME_VALUE_REL * x) return { below: i, above: i };
  return { below: i - 1, above: i };
}

export function snapValue(ideal: number, set: ValueSet, withCombination = false): ValueSnap {
  if (!(ideal > 0) || !Number.isFinite(ideal)) throw new CoreError('invalid-value', `An ideal value must be a finite number > 0, got ${ideal}`);
  const { below, above } = neighbourIndices(set.values, ideal);
  const lower = below >= 0 ? single(set.options[below], ideal) : null;
  const higher = above < set.values.length ? single(set.options[above], ideal) : null;
  // Ties go to the higher value, as the series neighbour lookup does.
  const nearest = lower && (!higher || Math.abs(lower.error) < Math.abs(higher.error)) ? lower : higher!;
  const out: ValueSnap = { ideal, nearest, lower, higher };
  if (withCombination) {
    const combo = bestCombination(ideal, set);
    out.combination = combo && Math.abs(combo.error) < Math.abs(nearest.error) ? combo : null;
  }
  return out;
}

/**
 * Best two-part combination for an ideal value. For an adding pairing (a + b = x)
 * the larger part a lies in [x/2, x); for a reciprocal pairing (ab/(a+b) = x) the
 * smaller part a lies in (x, 2x]. For each such a the ideal partner is solved and
 * bisected, so the work is one octave of the set times a bisection, not all pairs.
 */
export function bestCombination(ideal: number, set: ValueSet): SnapChoice | null {
  let best: SnapChoice | null = null;
  for (const arrangement of ['series', 'parallel'] as const) {
    const adds = (set.kind === 'resistor') === (arrangement === 'series');
    // The octave is widened by 10 % at its x/2 (or 2x) end so that near-equal pairs (a ≈ b ≈ x/2)
    // stay reachable; pairs found from the widened part are still valid, only visited twice.
    const from = adds ? lowerBound(set.values, 0.45 * ideal) : lowerBound(set.values, ideal * (1 + SAME_VALUE_REL));
    const to = adds ? lowerBound(set.values, ideal * (1 - SAME_VALUE_REL)) : lowerBound(set.values, 2.2 * ideal);
    for (let i = from; i < to; i++) {
      const a = set.values[i];
      const partnerIdeal = adds ? ideal - a : (a * ideal) / (a - ideal);
      const { below, above } = neighbourIndices(set.values, partnerIdeal);
      for (const j of [below, above]) {
        if (j < 0 || j >= set.values.length) continue;
        // Each unordered pair once: the partner is never larger (adding) / smaller (reciprocal) than a.
        if (adds ? j > i : j < i) continue;
        const value = combinedValue(set.kind, arrangement, a, set.values[j]);
        const error = (value - ideal) / ideal;
        if (!best || Math.abs(error) < Math.abs(best.error)) {
          best = { value, arrangement, parts: [set.options[i], set.options[j]], error };
        }
      }
    }
  }
  return best;
}
