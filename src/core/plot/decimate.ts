/**
 * Reduce a long trace to what a screen can show. Within each pixel column only
 * the first, lowest, highest and last samples can change what is drawn, so
 * keeping those (in time order) draws the same envelope, keeps every edge of a
 * square wave vertical and joins neighbouring columns correctly
 * (min/max-per-column decimation, common practice for plotting long captures).
 */

export interface DecimatedTrace {
  timeS: Float64Array;
  values: Float64Array;
}

/**
 * `columnCount` is the plot width in pixels. Time must be ascending; values
 * finite. Traces already short enough come back unchanged (copied).
 */
export function decimateMinMax(
  timeS: ArrayLike<number>,
  values: ArrayLike<number>,
  columnCount: number,
): DecimatedTrace {
  const n = Math.min(timeS.length, values.length);
  const columns = Math.max(1, Math.floor(columnCount));
  if (n <= 4 * columns) {
    return { timeS: Float64Array.from({ length: n }, (_, i) => timeS[i]), values: Float64Array.from({ length: n }, (_, i) => values[i]) };
  }
  const t0 = timeS[0];
  const span = timeS[n - 1] - t0;
  const keptTime: number[] = [];
  const keptValues: number[] = [];
  let i = 0;
  while (i < n) {
    const column = span > 0 ? Math.min(columns - 1, Math.floor(((timeS[i] - t0) / span) * columns)) : 0;
    const first = i;
    let minIndex = i;
    let maxIndex = i;
    let last = i;
    while (i < n) {
      const c = span > 0 ? Math.min(columns - 1, Math.floor(((timeS[i] - t0) / span) * columns)) : 0;
      if (c !== column) break;
      if (values[i] < values[minIndex]) minIndex = i;
      if (values[i] > values[maxIndex]) maxIndex = i;
      last = i;
      i++;
    }
    // Up to four distinct indices, emitted in time order so the path stays a function of time.
    const picks = [first, minIndex, maxIndex, last].sort((a, b) => a - b);
    let previous = -1;
    for (const index of picks) {
      if (index === previous) continue;
      keptTime.push(timeS[index]);
      keptValues.push(values[index]);
      previous = index;
    }
  }
  return { timeS: Float64Array.from(keptTime), values: Float64Array.from(keptValues) };
}
