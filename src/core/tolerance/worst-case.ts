/**
 * Worst case over the variation box. With few dimensions every corner is
 * evaluated (the extremes of a function monotone in each variable sit at
 * corners, and the model's parameters enter monotonically or bilinearly). With
 * many, the search starts from the corner the signs of the one-at-a-time
 * effects point to and then flips single coordinates, and when that stalls
 * pairs of coordinates, while that improves the objective (a local search on
 * the corners: it may miss an extreme that needs three coordinates at once).
 * Every start is ascended by single flips first and by pairs only then, from
 * where the single flips stopped. A pair whose interaction, as measured on the
 * squares of corners met so far, is far too small to outweigh what each of its
 * flips alone loses is not tried (PairInteractions below).
 * Where the board temperature reverses the effect of other dimensions (tempco
 * spreads, offset drift of unknown sign) it starts from both temperature ends.
 *
 * Extremes are over the corners that oscillate. A latched corner is no
 * candidate but no dead end either: when an objective's start corner latches,
 * the search backs off to its best oscillating neighbour (or walks away from it
 * until the circuit oscillates) and ascends from there, along the edge of the
 * latching region where such extremes sit (there a step may need three
 * coordinates, one of which alone would latch: those triples are tried too).
 * Last, every objective is ascended again from the best corner met for each
 * objective (the ascents cross each other's ground).
 *
 * Checked against the exhaustive enumeration on random circuits, latching ones
 * included (test/core/tolerance/worst-case-search.test.ts).
 */
import { CoreError } from '../errors.ts';
import { EVALUATION_STATUS, OUTPUT_LENGTH } from '../circuit/engine/prepared.ts';
import type { SampleEvaluator } from './sample-evaluator.ts';
import type { Corner, FrequencySpec, WorstCase } from './types.ts';
import type { VariationModel } from './variation-model.ts';

/** Exhaustive corner search up to this many dimensions (2^n corners), by model cost. */
export const MAX_EXHAUSTIVE_DIMENSIONS = { 'closed-form': 14, 'time-domain': 7 } as const;
/**
 * Safety stop for one ascent, in passes (a pass tries every single flip, and every pair when no single
 * flip helps). Each pass that continues improves the objective strictly, so an ascent ends by itself;
 * the cap only bounds a pathological staircase. Observed: at most a handful of passes.
 */
const MAX_ASCENT_PASSES = 64;
/** Rounds of re-ascending from the best corners met (stops earlier when a round changes no extreme). */
const MAX_POLISH_ROUNDS = 4;

/**
 * The four figures searched, by number (the ascents compare scores millions of times per batch):
 * frequency min and max, duty min and max. A score is the figure signed so that larger is worse.
 */
const FREQUENCY_MIN = 0;
const FREQUENCY_MAX = 1;
const DUTY_MIN = 2;
const DUTY_MAX = 3;
type Objective = typeof FREQUENCY_MIN | typeof FREQUENCY_MAX | typeof DUTY_MIN | typeof DUTY_MAX;
const OBJECTIVES: readonly Objective[] = [FREQUENCY_MIN, FREQUENCY_MAX, DUTY_MIN, DUTY_MAX];

interface Found {
  score: number;
  point: Float64Array;
  /** Whether point is a corner of the box (the nominal is not): an ascent may start there. */
  corner: boolean;
  frequencyHz: number;
  dutyCycle: number;
}

interface Figures {
  frequencyHz: number;
  dutyCycle: number;
}

function score(objective: Objective, frequencyHz: number, dutyCycle: number): number {
  return objective === FREQUENCY_MIN ? -frequencyHz : objective === FREQUENCY_MAX ? frequencyHz : objective === DUTY_MIN ? -dutyCycle : dutyCycle;
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
  /** Evaluates a point; a latched corner is counted once (isCorner false: a probe inside the box, not counted). */
  const evaluate = (point: Float64Array, isCorner: boolean): Figures | undefined => {
    terms.apply(point, values);
    evaluated++;
    if (evaluator.evaluate(values, out) !== EVALUATION_STATUS.ok) {
      if (isCorner) {
        const key = point.join(',');
        if (!seenLatched.has(key)) {
          seenLatched.add(key);
          latched++;
        }
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
  const offer = (point: Float64Array, r: Figures, corner: boolean) => {
    let kept: Float64Array | undefined; // one copy for every objective it improves (kept points are never written)
    for (let o = 0; o < OBJECTIVES.length; o++) {
      const s = score(OBJECTIVES[o], r.frequencyHz, r.dutyCycle);
      const current = best[o];
      if (!current || s > current.score) best[o] = { score: s, point: (kept ??= point.slice()), corner, frequencyHz: r.frequencyHz, dutyCycle: r.dutyCycle };
    }
  };

  const reference = model.referencePoint();
  const nominal = evaluate(reference, false);
  if (nominal) offer(reference, nominal, false);
  let method: WorstCase['method'];
  if (n <= MAX_EXHAUSTIVE_DIMENSIONS[evaluator.model]) {
    method = 'all-corners';
    const count = 2 ** n;
    const low = Float64Array.from(dims, (d) => d.low);
    const high = Float64Array.from(dims, (d) => d.high);
    const point = new Float64Array(n); // one scratch corner: offer copies what it keeps
    for (let mask = 0; mask < count; mask++) {
      for (let k = 0; k < n; k++) point[k] = ((mask >>> k) & 1) === 1 ? high[k] : low[k];
      const r = evaluate(point, true);
      if (r) offer(point, r, true);
    }
  } else {
    method = 'sensitivity-guided';
    // One-at-a-time effect of each end of each dimension, from the centre (probes inside the box).
    const center = model.centerPoint();
    const probe = center.slice(); // one scratch point, put back to the centre after each probe (offer copies)
    const probeAt = (k: number, x: number): Figures | undefined => {
      probe[k] = x;
      const r = evaluate(probe, false);
      probe[k] = center[k];
      return r;
    };
    // A part tolerance scales its value linearly across a band symmetric about the nominal, and a small
    // band moves the figures almost linearly: its low end is predicted by mirroring the high end's effect
    // about the nominal (when the nominal is the centre) instead of evaluated. The probes only choose the
    // ascents' start corners, which the ascents correct.
    const centerFigures = nominal && reference.every((x, k) => x === center[k]) ? nominal : undefined;
    const ends = dims.map((d, k): (Figures | undefined)[] => {
      const high = probeAt(k, d.high);
      if (d.kind === 'part-tolerance' && high && centerFigures) {
        return [{ frequencyHz: 2 * centerFigures.frequencyHz - high.frequencyHz, dutyCycle: 2 * centerFigures.dutyCycle - high.dutyCycle }, high];
      }
      return [probeAt(k, d.low), high];
    });
    // The ascents revisit corners (each other's starts and neighbours): a corner is evaluated once, keyed
    // by its bits (bit k set: dimension k at its high end). The model is deterministic, so a remembered
    // result is the result; it was offered to every objective when first evaluated.
    // (Bits of a 32-bit integer: beyond 30 dimensions nothing is remembered.)
    const remember = n <= 30;
    const visited = new CornerMemo(remember ? n : 0);
    const interactions = new PairInteractions(n);
    const evaluateCorner = (p: Float64Array, bits: number): Figures | undefined => {
      if (!remember) {
        const fresh = evaluate(p, true);
        if (fresh) offer(p, fresh, true);
        return fresh;
      }
      const seen = visited.lookup(bits);
      if (seen !== UNSEEN) return seen === LATCHED ? undefined : seen;
      const r = evaluate(p, true);
      visited.set(bits, r);
      if (r) {
        offer(p, r, true);
        interactions.harvest(bits, visited); // the single-flip ascents measure interactions as they go
      }
      return r;
    };
    // The working corner of the ascent under way: its coordinates, bits and figures (undefined: latched).
    const point = new Float64Array(n);
    let bits = 0;
    let current: Figures | undefined;
    const lowEnd = new Float64Array(n);
    const highEnd = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      lowEnd[k] = dims[k].low;
      highEnd[k] = dims[k].high;
    }
    const flip = (k: number) => {
      point[k] = point[k] === highEnd[k] ? lowEnd[k] : highEnd[k];
      bits ^= 1 << k;
    };
    const moveTo = (p: Float64Array) => {
      bits = 0;
      for (let k = 0; k < n; k++) {
        point[k] = p[k];
        if (p[k] === highEnd[k]) bits |= 1 << k;
      }
    };
    const scoreOf = (o: Objective, r: Figures | undefined) => (r === undefined ? -Infinity : score(o, r.frequencyHz, r.dutyCycle));
    /** Flip coordinates k (and l, m when not -1); stay when the objective improves on an oscillating corner, else flip back. */
    const tryFlips = (o: Objective, k: number, l: number, m: number): boolean => {
      const currentScore = scoreOf(o, current);
      if (remember) {
        let candidateBits = bits ^ (1 << k);
        if (l >= 0) candidateBits ^= 1 << l;
        if (m >= 0) candidateBits ^= 1 << m;
        const seen = visited.lookup(candidateBits);
        if (seen !== UNSEEN && !(scoreOf(o, seen === LATCHED ? undefined : seen) > currentScore)) return false;
      }
      // Flipped in place and flipped back when it does not improve (offer copies what it keeps).
      flip(k);
      if (l >= 0) flip(l);
      if (m >= 0) flip(m);
      const r = evaluateCorner(point, bits);
      if (!(scoreOf(o, r) > currentScore)) {
        flip(k);
        if (l >= 0) flip(l);
        if (m >= 0) flip(m);
        return false;
      }
      current = r;
      return true;
    };
    // Ascend by single flips; when stuck, try every pair once (interactions such as asymmetric rails and
    // offsets can hide an extreme behind two coordinates); stop when neither helps. Latched corners never
    // improve (score -Infinity), so the ascent keeps to oscillating corners. True when it ended by itself
    // (no flip, pair or triple it tries improves), false at the pass cap or without memory.
    const ascend = (o: Objective, singlesOnly = false): boolean => {
      for (let pass = 0; pass < MAX_ASCENT_PASSES; pass++) {
        let improved = false;
        for (let k = 0; k < n; k++) {
          if (tryFlips(o, k, -1, -1)) improved = true;
        }
        if (improved) continue;
        if (singlesOnly) return false;
        for (let k = 0; k < n; k++) {
          for (let l = k + 1; l < n; l++) {
            if (remember && interactions.rulesOut(o, k, l, bits, current, visited)) continue;
            const from = bits;
            if (tryFlips(o, k, l, -1)) improved = true;
            if (remember) interactions.record(k, l, from, visited);
          }
        }
        if (improved) continue;
        if (!remember) return false;
        // On the edge of the latching region the way on may lead through three coordinates, one of which
        // alone would latch: try each such coordinate with every pair of the others.
        for (let k = 0; k < n && !improved; k++) {
          if (visited.lookup(bits ^ (1 << k)) !== LATCHED) continue;
          for (let l = 0; l < n && !improved; l++) {
            for (let m = l + 1; m < n && !improved; m++) {
              if (l !== k && m !== k && tryFlips(o, k, l, m)) improved = true;
            }
          }
        }
        if (!improved) return true;
      }
      return false;
    };
    // Corners where an ascent for an objective ended by itself: every flip, pair and triple it tries there
    // was met and none improves, and remembered corners never change, so an ascent for that objective
    // started there again would end at once without evaluating anything. It is skipped.
    const settled = new Set<number>();
    const settledKey = (o: Objective) => bits * OBJECTIVES.length + o;
    const ascendFrom = (o: Objective) => {
      if (settled.has(settledKey(o))) return;
      if (ascend(o)) settled.add(settledKey(o));
    };
    /**
     * The start corner latches: the extreme lies on the edge of the latching region. Back off to the best
     * oscillating single-flip neighbour; when every neighbour latches too, give up the coordinates that
     * are predicted to matter least first, one after another, until the circuit oscillates.
     */
    const backOff = (o: Objective, gain: Float64Array) => {
      let bestK = -1;
      let bestScore = -Infinity;
      for (let k = 0; k < n; k++) {
        flip(k);
        const s = scoreOf(o, evaluateCorner(point, bits));
        flip(k);
        if (s > bestScore) {
          bestScore = s;
          bestK = k;
        }
      }
      if (bestK >= 0) {
        flip(bestK);
        current = evaluateCorner(point, bits);
        return;
      }
      const order = Array.from({ length: n }, (_, k) => k).sort((a, b) => gain[a] - gain[b]);
      for (const k of order) {
        flip(k);
        current = evaluateCorner(point, bits);
        if (current) return;
      }
    };
    // The board temperature multiplies the dimensions whose effect changes sign with it (a tempco's spread,
    // an offset drift of unknown sign: value ∝ w·ΔT), so each temperature end is a basin of its own whose
    // best signs for those dimensions are opposite. At the centre ΔT ≈ 0 and their effects say nothing:
    // they are probed at each temperature end, and the search starts from both ends.
    const t = model.temperatureDimension;
    const signDims: number[] = [];
    for (let k = 0; t >= 0 && k < n; k++) if (dims[k].kind === 'tempco-spread') signDims.push(k);
    const basins = signDims.length > 0 ? [dims[t].low, dims[t].high] : [];
    const basinEnds = basins.map((temperature) => {
      const byDim = new Map<number, (Figures | undefined)[]>();
      for (const k of signDims) {
        probe[t] = temperature;
        byDim.set(k, [probeAt(k, dims[k].low), probeAt(k, dims[k].high)]);
        probe[t] = center[t];
      }
      return byDim;
    });
    const gain = new Float64Array(n);
    const start = new Float64Array(n);
    /**
     * Start where the one-at-a-time effects point (at the basin's temperature end for the sign dimensions;
     * basin −1: no basins); gain[k]: what the chosen end of k is predicted to add.
     */
    const predict = (o: Objective, basin: number) => {
      for (let k = 0; k < n; k++) {
        if (basin >= 0 && k === t) {
          start[k] = basins[basin];
          gain[k] = Infinity;
          continue;
        }
        const [lo, hi] = (basin >= 0 ? basinEnds[basin].get(k) : undefined) ?? ends[k];
        const high = !lo || !hi ? hi !== undefined : score(o, hi.frequencyHz, hi.dutyCycle) >= score(o, lo.frequencyHz, lo.dutyCycle);
        start[k] = high ? dims[k].high : dims[k].low;
        gain[k] = lo && hi ? Math.abs(score(o, hi.frequencyHz, hi.dutyCycle) - score(o, lo.frequencyHz, lo.dutyCycle)) : Infinity;
      }
    };
    // Every start is first ascended by single flips alone, and only then by pairs and triples from where
    // those stopped: the single-flip ascents complete many squares of corners on the way (harvest), so the
    // pair screen has measured interactions before the first pair scan instead of trying every pair there.
    const stops: { o: Objective; at: Float64Array; figures: Figures }[] = [];
    for (const o of OBJECTIVES) {
      for (let basin = basins.length > 0 ? 0 : -1; basin < basins.length; basin++) {
        predict(o, basin);
        moveTo(start);
        current = evaluateCorner(point, bits);
        if (!current) backOff(o, gain);
        if (current && remember) {
          ascend(o, true);
          stops.push({ o, at: point.slice(), figures: current });
        } else if (current) ascendFrom(o);
      }
    }
    for (const stop of stops) {
      moveTo(stop.at);
      current = stop.figures;
      ascendFrom(stop.o);
    }
    // Polish: ascend again for each objective from the best corner met for every objective (an extreme of
    // one figure is often next to another's). Remembered corners cost nothing, so a start whose
    // neighbourhood was searched adds nothing; without memory (beyond 30 dimensions) it would repeat
    // every ascent, so it is left out there.
    for (let round = 0; remember && round < MAX_POLISH_ROUNDS; round++) {
      const before = best.map((b) => b?.score);
      for (let o = 0; o < OBJECTIVES.length; o++) {
        for (let from = 0; from < OBJECTIVES.length; from++) {
          const found = best[from];
          if (!found || !found.corner) continue;
          moveTo(found.point);
          current = { frequencyHz: found.frequencyHz, dutyCycle: found.dutyCycle };
          ascendFrom(OBJECTIVES[o]);
        }
      }
      if (best.every((b, o) => b?.score === before[o])) break;
    }
  }
  if (best[0] === undefined) throw new CoreError('no-oscillation', 'The circuit oscillates at no point of the tolerance box (nominal and corners all latch)');
  const describe = (o: Objective): Corner => describeCorner(model, best[o]!, values);
  const corners = { frequencyMin: describe(FREQUENCY_MIN), frequencyMax: describe(FREQUENCY_MAX), dutyMin: describe(DUTY_MIN), dutyMax: describe(DUTY_MAX) };
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

/**
 * Safety factor of the pair screen: a pair is skipped only when the largest interaction measured for it
 * would have to grow by more than this to make the pair improve (PairInteractions).
 */
export const PAIR_SCREEN_SAFETY = 16;

/**
 * What flipping two coordinates together adds beyond flipping each alone, measured on the squares of
 * corners the search met (where it tried pairs, and where single-flip ascents completed one): for the
 * square of corners x, x^k, x^l, x^kl the interaction f(x^kl) − f(x^k) − f(x^l) + f(x), largest |value|
 * met per pair, for the frequency and for the duty cycle.
 *
 * Why a screen may skip a pair: at a corner where no single flip improves, flipping k alone changes the
 * objective by g_k ≤ 0 and l alone by g_l ≤ 0, so the pair improves only if its interaction exceeds
 * |g_k| + |g_l|. Part tolerances enter the period to first order on their own and to second order
 * together (a product of two small relative changes), so interactions are small and vary slowly over the
 * box while single-flip losses are first order. A pair is skipped when PAIR_SCREEN_SAFETY times the largest
 * interaction measured for it is still below that loss; a pair never measured, or next to a latched corner
 * (where the figures jump), is always tried. A pair no square has measured yet is tried at the first
 * pair scan, and every pair a scan tries adds to what is known. Checked against the exhaustive enumeration
 * (test/core/tolerance/worst-case-search.test.ts).
 */
class PairInteractions {
  /** Largest |interaction| per pair (index k·n + l, k < l), frequency then duty; NaN: never measured. */
  private readonly frequencyHz: Float64Array;
  private readonly duty: Float64Array;

  constructor(private readonly n: number) {
    this.frequencyHz = new Float64Array(n * n).fill(Number.NaN);
    this.duty = new Float64Array(n * n).fill(Number.NaN);
  }

  /** Whether the pair (k, l) cannot improve objective o at the corner `bits` (figures `at`) by the measured interactions. */
  rulesOut(o: Objective, k: number, l: number, bits: number, at: Figures | undefined, memo: CornerMemo): boolean {
    if (at === undefined) return false;
    const known = (o === FREQUENCY_MIN || o === FREQUENCY_MAX ? this.frequencyHz : this.duty)[k * this.n + l];
    if (Number.isNaN(known)) return false;
    const fk = memo.lookup(bits ^ (1 << k));
    const fl = memo.lookup(bits ^ (1 << l));
    if (!oscillates(fk) || !oscillates(fl)) return false;
    const s = score(o, at.frequencyHz, at.dutyCycle);
    const lossK = s - score(o, fk.frequencyHz, fk.dutyCycle);
    const lossL = s - score(o, fl.frequencyHz, fl.dutyCycle);
    // Only at a corner the single flips could not improve (each loss ≥ 0) does the pair need its interaction.
    if (!(lossK >= 0 && lossL >= 0)) return false;
    return PAIR_SCREEN_SAFETY * known < lossK + lossL;
  }

  /**
   * Measures the pairs not measured yet on the squares the corner `bits` completes (its other three corners
   * met and oscillating). Pairs already measured are left to record(): this runs for every corner met.
   */
  harvest(bits: number, memo: CornerMemo): void {
    for (let k = 0; k < this.n; k++) {
      if (!oscillates(memo.lookup(bits ^ (1 << k)))) continue;
      for (let l = k + 1; l < this.n; l++) if (Number.isNaN(this.frequencyHz[k * this.n + l])) this.record(k, l, bits, memo);
    }
  }

  /** Adds the square of corners `bits`, ^k, ^l, ^kl when all four oscillate. */
  record(k: number, l: number, bits: number, memo: CornerMemo): void {
    const a = memo.lookup(bits);
    const b = memo.lookup(bits ^ (1 << k));
    const c = memo.lookup(bits ^ (1 << l));
    const d = memo.lookup(bits ^ (1 << k) ^ (1 << l));
    if (!oscillates(a) || !oscillates(b) || !oscillates(c) || !oscillates(d)) return;
    const i = k * this.n + l;
    const frequency = Math.abs(d.frequencyHz - b.frequencyHz - c.frequencyHz + a.frequencyHz);
    const duty = Math.abs(d.dutyCycle - b.dutyCycle - c.dutyCycle + a.dutyCycle);
    if (!(this.frequencyHz[i] >= frequency)) this.frequencyHz[i] = frequency;
    if (!(this.duty[i] >= duty)) this.duty[i] = duty;
  }
}

/** What a CornerMemo holds for a corner not evaluated yet, and for one that latched. */
const UNSEEN: Figures = { frequencyHz: Number.NaN, dutyCycle: Number.NaN };
const LATCHED: Figures = { frequencyHz: Number.NaN, dutyCycle: Number.NaN };
/** Whether a CornerMemo entry holds figures (a corner met that oscillates). */
const oscillates = (r: Figures) => r !== UNSEEN && r !== LATCHED;
/** Most dimensions whose corners a CornerMemo keeps in a flat table (2^16 entries). */
const MEMO_TABLE_DIMENSIONS = 16;

/**
 * The corners the ascents met, by their bits: UNSEEN, LATCHED or the figures. The ascents look a corner up
 * several times for each one they evaluate, so up to MEMO_TABLE_DIMENSIONS dimensions the bits index a
 * flat table (no hashing); beyond that, a map.
 */
class CornerMemo {
  private readonly table: Figures[] | undefined;
  private readonly map: Map<number, Figures> | undefined;

  constructor(dimensions: number) {
    if (dimensions <= MEMO_TABLE_DIMENSIONS) this.table = new Array<Figures>(2 ** dimensions).fill(UNSEEN);
    else this.map = new Map();
  }

  lookup(bits: number): Figures {
    return this.table ? this.table[bits] : (this.map!.get(bits) ?? UNSEEN);
  }

  set(bits: number, r: Figures | undefined): void {
    if (this.table) this.table[bits] = r ?? LATCHED;
    else this.map!.set(bits, r ?? LATCHED);
  }
}

export function meetsSpec(spec: FrequencySpec, frequencyHz: number, dutyCycle: number): boolean {
  return (
    Math.abs(frequencyHz - spec.frequencyHz) <= spec.frequencyHz * spec.frequencyTolerance &&
    dutyCycle >= (spec.dutyMin ?? 0) &&
    dutyCycle <= (spec.dutyMax ?? 1)
  );
}

/** The corner's figures and values; `values` is a scratch vector of the model's length. */
function describeCorner(model: VariationModel, found: Found, values: Float64Array): Corner {
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
