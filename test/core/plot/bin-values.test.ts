import { describe, it, expect } from 'vitest';
import { CoreError } from '../../../src/core/errors.ts';
import { binValues } from '../../../src/core/plot/histogram-svg.ts';

// Reference: numpy.histogram (NumPy 2.4.6), outputs obtained by running it on
// the same inputs; its documented rules are half-open bins except the last,
// values outside the range left out, and a zero-width range widened by ±0.5.
describe('binValues', () => {
  it('matches numpy.histogram([1, 2, 1], bins=3)', () => {
    const { edges, counts } = binValues([1, 2, 1], 3);
    expect(Array.from(counts)).toEqual([2, 0, 1]);
    [1, 4 / 3, 5 / 3, 2].forEach((e, k) => expect(edges[k]).toBeCloseTo(e, 12));
  });

  it('puts values that sit exactly on inner edges into the bin to their right, as numpy does', () => {
    // numpy.histogram([0, .1, .25, .3, .5, .6, .75, .9, .9], bins=3, range=(0, .9)) -> [3, 2, 4]
    const { counts } = binValues([0, 0.1, 0.25, 0.3, 0.5, 0.6, 0.75, 0.9, 0.9], 3, { min: 0, max: 0.9 });
    expect(Array.from(counts)).toEqual([3, 2, 4]);
  });

  it('matches numpy for 0.1·i, i = 0..10, in ten bins', () => {
    // numpy.histogram([0.1*i for i in range(11)], bins=10) -> [1]*9 + [2]
    const values = Array.from({ length: 11 }, (_, i) => 0.1 * i);
    const { counts } = binValues(values, 10);
    expect(Array.from(counts)).toEqual([1, 1, 1, 1, 1, 1, 1, 1, 1, 2]);
  });

  it('widens a zero-width range by half a unit each side', () => {
    // numpy.histogram([5, 5, 5], bins=2) -> counts [0, 3], edges [4.5, 5, 5.5]
    const { edges, counts } = binValues([5, 5, 5], 2);
    expect(Array.from(counts)).toEqual([0, 3]);
    expect(Array.from(edges)).toEqual([4.5, 5, 5.5]);
  });

  it('leaves out values outside the range and non-finite values', () => {
    // numpy.histogram([-1, 0, 0.5, 1, 2, nan], bins=2, range=(0, 1)) -> [1, 2]
    const { counts } = binValues([-1, 0, 0.5, 1, 2, Number.NaN], 2, { min: 0, max: 1 });
    expect(Array.from(counts)).toEqual([1, 2]);
  });

  it('refuses a bad bin count or nothing to bin', () => {
    expect(() => binValues([1, 2], 0)).toThrow(CoreError);
    expect(() => binValues([1, 2], 2.5)).toThrow(CoreError);
    expect(() => binValues([Number.NaN], 4)).toThrow(/no finite values/);
  });
});
