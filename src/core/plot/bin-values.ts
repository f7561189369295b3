/**
 * Equal-width binning of samples, with the conventions of numpy.histogram
 * (NumPy reference, numpy.histogram): every bin but the last is half-open
 * [left, right), the last also holds values equal to the upper edge, values
 * outside the range are left out, and a range of zero width becomes
 * (value − 0.5, value + 0.5).
 */
import { CoreError } from '../errors.ts';

export const MAX_BIN_COUNT = 100_000;

export function binValues(
  values: ArrayLike<number>,
  binCount: number,
  range?: { min: number; max: number },
): { edges: Float64Array; counts: Float64Array } {
  if (!Number.isInteger(binCount) || binCount < 1 || binCount > MAX_BIN_COUNT) {
    throw new CoreError('invalid-value', `binCount must be an integer from 1 to ${MAX_BIN_COUNT}`, undefined, {
      field: 'binCount',
      value: binCount,
    });
  }
  let min: number;
  let max: number;
  if (range !== undefined) {
    if (!Number.isFinite(range.min) || !Number.isFinite(range.max) || range.max < range.min) {
      throw new CoreError('invalid-value', 'range must be finite with max >= min', undefined, { field: 'range' });
    }
    ({ min, max } = range);
  } else {
    min = Infinity;
    max = -Infinity;
    for (let i = 0; i < values.length; i++) {
      const v = values[i];
      if (!Number.isFinite(v)) continue;
      if (v < min) min = v;
      if (v > max) max = v;
    }
    if (min > max) throw new CoreError('invalid-value', 'no finite values to bin', undefined, { field: 'values' });
  }
  if (min === max) {
    min -= 0.5;
    max += 0.5;
  }

  const edges = new Float64Array(binCount + 1);
  const width = max - min;
  // k·step + min, the same rounding as numpy.linspace, so values that sit
  // exactly on an edge fall into the same bin as in the reference.
  const step = width / binCount;
  for (let k = 0; k <= binCount; k++) edges[k] = k * step + min;
  edges[binCount] = max; // exact, whatever the rounding above

  const counts = new Float64Array(binCount);
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!(v >= min && v <= max)) continue; // also drops NaN
    let k = Math.min(binCount - 1, Math.floor(((v - min) / width) * binCount));
    // The division can land one bin off right at an edge; the stored edges decide.
    if (k > 0 && v < edges[k]) k--;
    else if (k < binCount - 1 && v >= edges[k + 1]) k++;
    counts[k]++;
  }
  return { edges, counts };
}
