/**
 * Worst case over the variation box. With few dimensions every corner is
 * evaluated (the extremes of a function monotone in each variable sit at
 * corners, and the model's parameters enter monotonically or bilinearly). With
 * many, the search starts from the corner the signs of the one-at-a-time
 * effects point to and then flips single coordinates, and when that stalls
 * pairs of coordinates, while that improves the objective (a local search on
 * the corners: it may miss an extreme that needs three coordinates at once).
 */
import { CoreError } from '../errors.ts';
import { EVALUATION_STATUS, OUTPUT_LENGTH } from '../circuit/engine/prepared.ts';
import type { SampleEvaluator } from './sample-evaluator.ts';
import type { Corner, FrequencySpec, WorstCase } from './types.ts';
import type { VariationModel } from './variation-model.ts';

/** Exhaustive corner search up to this many dimensions (2^n corners), by model cost. */
export const MAX_EXHAUSTIVE_DIMENSIONS = { 'closed-form': 14, 'time-domain': 7 } as const;
const MAX_ASCENT_PASSES = 8;

type Objective = 'frequencyMin' | 'frequencyMax' | 'dutyMin' | 'dutyMax';
const OBJECTIVES: readonly Objective[] = ['frequencyMin', 'frequencyMax', 'dutyMin', 'dutyMax'];

interface Found {
  score: number;
  point: Float64Array;
  frequencyHz: number;
  dutyCycle: number;
}

function score(objective: Objective, frequencyHz: number, dutyCycle: number): number {
  switch (objective) {
    case 'frequencyMin': return -frequencyHz;
    case 'frequencyMax': return frequencyHz;
    case 'dutyMin': return -dutyCycle;
    case 'dutyMax': return dutyCycle;
  }
}

export function worstCaseSearch(model: VariationModel, evaluator: SampleEvaluator, spec: FrequencySpec | undefined): WorstCase {
  const dims = model.dimensions;
  const n = dims.length;
  const terms = model.terms;
  const values = new Float64Array(model.nominal.length);
  const out = new Float64Array(OUTPUT_LENGTH);
  let evaluated = 0;
  let latched = 0;
  let allInSpec = true;
  const seenLatched = new Set<string>();
  const evaluate = (point: Float64Array): { frequencyHz: number; dutyCycle: number } | undefined => {
    terms.apply(point, values);
    evaluated++;
    if (evaluator.evaluate(values, out) !== EVALUATION_STATUS.ok) {
      const key = point.join(',');
      if (!seenLatched.has(key)) {
        seenLatched.add(key);
        latched++;
      }
      allInSpec = false;
      return undefined;
    }
    const r = { frequencyHz: 1 / out[0], dutyCycle: out[1] };
    if (spec && !meetsSpec(spec, r.frequencyHz, r.dutyCycle)) allInSpec = false;
    return r;
  };
  // Best point per objective, in OBJECTIVES order; the point is copied only when it improves, because
  // callers may hand in a scratch buffer they go on to overwrite.
  const best: (Found | undefined)[] = OBJECTIVES.map(() => undefined);
  const offer = (point: Float64Array, r: { frequencyHz: number; dutyCycle: number }) => {
    for (let o = 0; o < OBJECTIVES.length; o++) {
      const s = score(OBJECTIVES[o], r.frequencyHz, r.dutyCycle);
      const current = best[o];
      if (!current || s > current.score) best[o] = { score: s, point: point.slice(), frequencyHz: r.frequencyHz, dutyCycle: r.dutyCycle };
    }
  };
  const corner = (bits: (k: number) => boolean) => Float64Array.from(dims, (d, k) => (bits(k) ? d.high : d.low));

  const reference = model.referencePoint();
  const nominal = evaluate(reference);
  if (nominal) offer(reference, nominal);
  let method: WorstCase['method'];
  if (n <= MAX_EXHAUSTIVE_DIMENSIONS[evaluator.model]) {
    method = 'all-corners';
    const count = 2 ** n;
    const low = Float64Array.from(dims, (d) => d.low);
    const high = Float64Array.from(dims, (d) => d.high);
    const point = new Float64Array(n); // one scratch corner: offer copies what it keeps
    for (let mask = 0; mask < count; mask++) {
      for (let k = 0; k < n; k++) point[k] = ((mask >>> k) & 1) === 1 ? high[k] : low[k];
      const r = evaluate(point);
      if (r) offer(point, r);
    }
  } else {
    method = 'sensitivity-guided';
    // One-at-a-time effect of each end of each dimension, from the centre.
    const center = model.centerPoint();
    const ends = dims.map((d, k) =>
      [d.low, d.high].map((x) => {
        const p = center.slice();
        p[k] = x;
        return evaluate(p);
      }),
    );
    // The four ascents revisit corners (each other's starts and neighbours): a corner is evaluated once, keyed
    // by its bits (bit k set: dimension k at its high end). The model is deterministic, so a remembered
    // result is the result; it was offered to every objective when first evaluated.
    // (Bits of a 32-bit integer: beyond 30 dimensions nothing is remembered.)
    const visited = new Map<number, { frequencyHz: number; dutyCycle: number } | undefined>();
    const remember = n <= 30;
    const evaluateCorner = (p: Float64Array, bits: number) => {
      if (!remember) {
        const fresh = evaluate(p);
        if (fresh) offer(p, fresh);
        return fresh;
      }
      if (visited.has(bits)) return visited.get(bits);
      const r = evaluate(p);
      visited.set(bits, r);
      if (r) offer(p, r);
      return r;
    };
    for (const o of OBJECTIVES) {
      let bits = 0;
      const start = corner((k) => {
        const [lo, hi] = ends[k];
        const high = !lo || !hi ? hi !== undefined : score(o, hi.frequencyHz, hi.dutyCycle) >= score(o, lo.frequencyHz, lo.dutyCycle);
        if (high) bits |= 1 << k;
        return high;
      });
      let current = evaluateCorner(start, bits);
      const point = start;
      const better = (r: { frequencyHz: number; dutyCycle: number } | undefined) =>
        r !== undefined && current !== undefined && score(o, r.frequencyHz, r.dutyCycle) > score(o, current.frequencyHz, current.dutyCycle);
      const flip = (p: Float64Array, k: number) => {
        p[k] = p[k] === dims[k].high ? dims[k].low : dims[k].high;
      };
      /** Evaluate the point with coordinates k (and l) flipped; move there when it improves the objective. */
      const tryFlips = (k: number, l?: number): boolean => {
        let candidateBits = bits ^ (1 << k);
        if (l !== undefined) candidateBits ^= 1 << l;
        if (remember && visited.has(candidateBits) && !better(visited.get(candidateBits))) return false;
        // Flipped in place and flipped back when it does not improve (offer copies what it keeps).
        flip(point, k);
        if (l !== undefined) flip(point, l);
        const r = evaluateCorner(point, candidateBits);
        if (!r || !better(r)) {
          flip(point, k);
          if (l !== undefined) flip(point, l);
          return false;
        }
        bits = candidateBits;
        current = r;
        return true;
      };
      // Ascend by single flips; when stuck, try every pair once (interactions such as asymmetric rails and
      // offsets can hide an extreme behind two coordinates); stop when neither helps.
      for (let pass = 0; pass < MAX_ASCENT_PASSES && current; pass++) {
        let improved = false;
        for (let k = 0; k < n; k++) {
          if (tryFlips(k)) improved = true;
        }
        if (improved) continue;
        for (let k = 0; k < n; k++) {
          for (let l = k + 1; l < n; l++) {
            if (tryFlips(k, l)) improved = true;
          }
        }
        if (!improved) break;
      }
    }
  }
  if (best[0] === undefined) throw new CoreError('no-oscillation', 'The circuit oscillates at no point of the tolerance box (nominal and corners all latch)');
  const describe = (o: Objective): Corner => describeCorner(model, best[OBJECTIVES.indexOf(o)]!);
  const corners = { frequencyMin: describe('frequencyMin'), frequencyMax: describe('frequencyMax'), dutyMin: describe('dutyMin'), dutyMax: describe('dutyMax') };
  return {
    frequencyMinHz: corners.frequencyMin.frequencyHz,
    frequencyMaxHz: corners.frequencyMax.frequencyHz,
    dutyMin: corners.dutyMin.dutyCycle,
    dutyMax: corners.dutyMax.dutyCycle,
    method,
    cornersEvaluated: evaluated,
    latchedCorners: latched,
    corners,
    withinSpec: spec ? allInSpec : null,
  };
}

export function meetsSpec(spec: FrequencySpec, frequencyHz: number, dutyCycle: number): boolean {
  return (
    Math.abs(frequencyHz - spec.frequencyHz) <= spec.frequencyHz * spec.frequencyTolerance &&
    dutyCycle >= (spec.dutyMin ?? 0) &&
    dutyCycle <= (spec.dutyMax ?? 1)
  );
}

function describeCorner(model: VariationModel, found: Found): Corner {
  const values = new Float64Array(model.nominal.length);
  model.apply(found.point, values);
  const v: Record<string, number> = {};
  const deviations: Record<string, number> = {};
  for (const i of model.variedParameters) {
    const name = model.parameters[i].name;
    v[name] = values[i];
    const x0 = model.nominal[i];
    if (x0 !== 0 && Number.isFinite(x0)) deviations[name] = values[i] / x0 - 1;
  }
  const t = model.temperatureDimension;
  return {
    frequencyHz: found.frequencyHz,
    dutyCycle: found.dutyCycle,
    temperatureC: t >= 0 ? found.point[t] : null,
    values: v,
    deviations,
  };
}
