/**
 * The permutation that sorts a key array ascending. A bucket pass (keys spread
 * over as many buckets as there are keys, then each bucket ordered in place) is
 * linear for the smooth key distributions the searches produce, where a general
 * sort of tens of thousands of keys costs several milliseconds; buckets that
 * come out crowded fall back to an ordinary sort of their own slice.
 */
const SMALL = 32;
const CROWDED = 48;

export function ascendingOrder(keys: Float64Array): Int32Array {
  const n = keys.length;
  const order = new Int32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  if (n < SMALL) return order.sort((a, b) => keys[a] - keys[b]);
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < n; i++) {
    const k = keys[i];
    if (k < min) min = k;
    if (k > max) max = k;
  }
  if (!(max > min) || !Number.isFinite(max - min)) return order.sort((a, b) => keys[a] - keys[b]);
  const scale = (n - 1) / (max - min);
  const start = new Int32Array(n + 1);
  const bucket = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const b = Math.floor((keys[i] - min) * scale);
    bucket[i] = b;
    start[b + 1]++;
  }
  for (let b = 0; b < n; b++) start[b + 1] += start[b];
  const fill = start.slice(0, n);
  for (let i = 0; i < n; i++) order[fill[bucket[i]]++] = i;
  for (let b = 0; b < n; b++) {
    const lo = start[b];
    const hi = start[b + 1];
    if (hi - lo < 2) continue;
    if (hi - lo > CROWDED) {
      order.subarray(lo, hi).sort((x, y) => keys[x] - keys[y]);
      continue;
    }
    for (let i = lo + 1; i < hi; i++) {
      const v = order[i];
      const k = keys[v];
      let j = i - 1;
      while (j >= lo && keys[order[j]] > k) {
        order[j + 1] = order[j];
        j--;
      }
      order[j + 1] = v;
    }
  }
  return order;
}
