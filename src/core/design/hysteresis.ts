/**
 * Candidate threshold networks for the joint search, each with its screening
 * thresholds and dwell factors. Two ways to produce them:
 * - near an ideal network: every combination of the few values either side of
 *   each ideal resistor (a handful of networks);
 * - free ratio (two-resistor feedback): every feedback/ground pair whose feedback fraction
 *   lies in a window. Pairs with the same ratio (decade shifts of one another)
 *   give the same thresholds, so they are merged and the pair whose scale is
 *   nearest the preferred decision-node resistance represents them.
 */
import { findTopology, snappable, TOPOLOGIES, type ThresholdNetworkSpec } from '../circuit/topologies/index.ts';
import { CoreError } from '../errors.ts';
import type { RoleValue } from './snap-value.ts';
import { neighbourIndices } from './snap-value.ts';
import { networkThresholds, timingFactors, type ScreeningContext, type ThresholdPair, type TimingFactors } from './thresholds.ts';
import { lowerBound, type ValueSet } from './value-set.ts';

export interface HysteresisOption {
  /** The threshold-network roles with their fitted values. */
  parts: Record<string, RoleValue>;
  thresholds: ThresholdPair;
  factors: TimingFactors;
  /** Tie-break between equally good networks: smaller is preferred. */
  preference: number;
}

/**
 * Threshold networks as columns of numbers (a free-ratio scan yields tens of
 * thousands): the search reads only the period factor, duty and preference;
 * the parts of a row are built on demand from its two reference numbers.
 */
export class HysteresisTable {
  count = 0;
  periodTau = new Float64Array(64);
  dutyCycle = new Float64Array(64);
  highTau = new Float64Array(64);
  upperV = new Float64Array(64);
  lowerV = new Float64Array(64);
  preference = new Float64Array(64);
  private refA = new Int32Array(64);
  private refB = new Int32Array(64);

  /**
   * `alternatesOf` lists the other networks a merged row stands for (same ratio at
   * other scales): equal in the screening model, they differ slightly once bias
   * current and loading count, so the exact evaluation tries them all.
   */
  constructor(
    private readonly partsOf: (a: number, b: number) => Record<string, RoleValue>,
    private readonly alternatesOf?: (a: number, b: number) => Record<string, RoleValue>[],
  ) {}

  /** The row's network followed by the networks merged into it. */
  realizations(i: number): Record<string, RoleValue>[] {
    const own = this.parts(i);
    return this.alternatesOf ? [own, ...this.alternatesOf(this.refA[i], this.refB[i])] : [own];
  }

  push(t: ThresholdPair, f: TimingFactors, preference: number, a: number, b = 0): void {
    if (this.count === this.periodTau.length) this.grow();
    const i = this.count++;
    this.periodTau[i] = f.periodTau;
    this.dutyCycle[i] = f.dutyCycle;
    this.highTau[i] = f.highTau;
    this.upperV[i] = t.upperV;
    this.lowerV[i] = t.lowerV;
    this.preference[i] = preference;
    this.refA[i] = a;
    this.refB[i] = b;
  }

  parts(i: number): Record<string, RoleValue> {
    return this.partsOf(this.refA[i], this.refB[i]);
  }

  option(i: number): HysteresisOption {
    const periodTau = this.periodTau[i];
    const highTau = this.highTau[i];
    return {
      parts: this.parts(i),
      thresholds: { upperV: this.upperV[i], lowerV: this.lowerV[i] },
      factors: { periodTau, highTau, lowTau: periodTau - highTau, dutyCycle: this.dutyCycle[i] },
      preference: this.preference[i],
    };
  }

  private grow(): void {
    const n = this.periodTau.length * 2;
    const f = (a: Float64Array) => {
      const b = new Float64Array(n);
      b.set(a);
      return b;
    };
    const g = (a: Int32Array) => {
      const b = new Int32Array(n);
      b.set(a);
      return b;
    };
    this.periodTau = f(this.periodTau);
    this.dutyCycle = f(this.dutyCycle);
    this.highTau = f(this.highTau);
    this.upperV = f(this.upperV);
    this.lowerV = f(this.lowerV);
    this.preference = f(this.preference);
    this.refA = g(this.refA);
    this.refB = g(this.refB);
  }
}

export interface HysteresisCandidates {
  table: HysteresisTable;
  /** Networks examined before merging equal ratios. */
  networksConsidered: number;
}

/** A table of explicit networks (near-ideal candidates, or several tables joined). */
export function hysteresisFromOptions(options: readonly HysteresisOption[], networksConsidered = options.length): HysteresisCandidates {
  const table = new HysteresisTable((a) => options[a].parts);
  options.forEach((o, i) => table.push(o.thresholds, o.factors, o.preference, i));
  return { table, networksConsidered };
}

/** Several candidate tables as one. */
export function joinHysteresis(list: readonly HysteresisCandidates[]): HysteresisCandidates {
  const table = new HysteresisTable(
    (a, b) => list[a].table.parts(b),
    (a, b) => list[a].table.realizations(b).slice(1),
  );
  let considered = 0;
  list.forEach((c, a) => {
    considered += c.networksConsidered;
    for (let i = 0; i < c.table.count; i++) {
      const o = c.table.option(i);
      table.push(o.thresholds, o.factors, o.preference, a, i);
    }
  });
  return { table, networksConsidered: considered };
}

/**
 * The threshold network joint snap and plain design size for a topology, from the registry:
 * topologies with one shared timing resistor and a single threshold network.
 */
export function thresholdTopology(topology: string): ThresholdNetworkSpec {
  const def = findTopology(topology);
  if (!def || !snappable(def)) {
    const supported = TOPOLOGIES.filter(snappable).map((t) => t.id);
    throw new CoreError('infeasible', `Threshold-network sizing does not support topology '${topology}' (supported: ${supported.join(', ')})`, '/topology');
  }
  return def.design!.thresholdNetworks[0];
}

/** Distance of a scale from the preferred one, in decades (0 when no preference). */
function scaleDistance(valueOhm: number, preferredOhm: number | undefined): number {
  return preferredOhm ? Math.abs(Math.log10(valueOhm / preferredOhm)) : 0;
}

export interface NearOptions {
  /** Topology whose threshold network to build (ignored when `network` is given). */
  topology?: string;
  /** The threshold network itself (e.g. one of a diode-steered topology's arrangements). */
  network?: ThresholdNetworkSpec;
  /** Ideal values of the threshold-network roles, ohm. */
  ideal: Readonly<Record<string, number>>;
  sets: Readonly<Record<string, ValueSet>>;
  ctx: ScreeningContext;
  /** How many options each side of every ideal value (default 2). */
  neighbours?: number;
  /** Extra preference added to every option (e.g. for a less favoured hysteresis width). */
  basePreference?: number;
}

/** Every combination of the options nearest each ideal value. */
export function hysteresisNear(options: NearOptions): HysteresisCandidates {
  const topo = options.network ?? thresholdTopology(options.topology ?? '');
  const n = options.neighbours ?? 2;
  const perRole = topo.roles.map((role) => {
    const set = options.sets[role];
    const ideal = options.ideal[role];
    if (!set) throw new CoreError('missing-part', `No values for role '${role}'`, `/values/${role}`);
    if (!(ideal > 0)) throw new CoreError('missing-part', `No ideal value for role '${role}'`, `/ideal/${role}`);
    const { below, above } = neighbourIndices(set.values, ideal);
    const idx: number[] = [];
    for (let i = Math.max(0, below - n + 1); i <= below; i++) idx.push(i);
    for (let i = above; i < Math.min(set.values.length, above + n); i++) if (!idx.includes(i)) idx.push(i);
    return { role, set, ideal, idx };
  });
  const out: HysteresisOption[] = [];
  let considered = 0;
  const values: Record<string, number> = {};
  const chosen = new Array<number>(perRole.length).fill(0);
  const visit = (depth: number): void => {
    if (depth === perRole.length) {
      considered++;
      const net = topo.network(values);
      const thresholds = networkThresholds(net, options.ctx);
      const factors = timingFactors(thresholds, options.ctx.levels);
      if (!factors) return;
      const parts: Record<string, RoleValue> = {};
      let deviation = 0;
      perRole.forEach((r, k) => {
        const o = r.set.options[chosen[k]];
        parts[r.role] = { value: o.value, arrangement: 'single', parts: [o] };
        deviation += Math.abs(Math.log10(o.value / r.ideal));
      });
      out.push({ parts, thresholds, factors, preference: (options.basePreference ?? 0) + deviation });
      return;
    }
    const r = perRole[depth];
    for (const i of r.idx) {
      chosen[depth] = i;
      values[r.role] = r.set.values[i];
      visit(depth + 1);
    }
  };
  visit(0);
  return hysteresisFromOptions(out, considered);
}

export interface FreeRatioOptions {
  feedback: ValueSet;
  ground: ValueSet;
  /** Window for the feedback fraction β = rGround / (rGround + rFeedback). */
  feedbackFractionMin: number;
  feedbackFractionMax: number;
  /** Allowed decision-node resistance rFeedback ∥ rGround, ohm. */
  parallelMinOhm?: number;
  parallelMaxOhm?: number;
  /** Scale to prefer among pairs of equal ratio, ohm. */
  preferredParallelOhm?: number;
  /** Screening context; its bias current is ignored here so equal ratios give equal thresholds. */
  ctx: ScreeningContext;
  /** Cap on pairs examined (limit-exceeded beyond it). */
  maxPairs?: number;
}

export const DEFAULT_MAX_PAIRS = 2_000_000;

/**
 * Number of values per decade when the set repeats exactly decade by decade
 * (values[i + p] = 10·values[i] for every i), as series sets do; 0 otherwise.
 */
export function decadePeriod(values: Float64Array): number {
  const n = values.length;
  if (n < 2) return 0;
  const p = lowerBound(values, values[0] * 10 * (1 - 1e-12));
  if (p === 0 || p >= n) return 0;
  for (let i = 0; i + p < n; i++) {
    if (Math.abs(values[i + p] - 10 * values[i]) > 1e-9 * values[i + p]) return 0;
  }
  return p;
}

/** Every two-resistor feedback pair in the fraction window, merged by ratio. */
export function hysteresisFreeRatio(o: FreeRatioOptions): HysteresisCandidates {
  if (!(o.feedbackFractionMin > 0 && o.feedbackFractionMax < 1 && o.feedbackFractionMin <= o.feedbackFractionMax)) {
    throw new CoreError('invalid-value', 'The feedback-fraction window must lie within (0, 1) with min <= max', '/hysteresis');
  }
  const pF = decadePeriod(o.feedback.values);
  const pG = decadePeriod(o.ground.values);
  return pF > 0 && pG > 0 ? freeRatioPeriodic(o, pF, pG) : freeRatioMerged(o);
}

interface FreeRatioScan {
  ctx: ScreeningContext;
  ratioMin: number;
  ratioMax: number;
  pMin: number;
  pMax: number;
  maxPairs: number;
}

function scanSetup(o: FreeRatioOptions): FreeRatioScan {
  return {
    // Bias is left out here so that pairs of equal ratio give equal thresholds; the exact evaluation includes it.
    ctx: { ...o.ctx, inputBiasCurrentA: 0 },
    ratioMin: o.feedbackFractionMin / (1 - o.feedbackFractionMin),
    ratioMax: o.feedbackFractionMax / (1 - o.feedbackFractionMax),
    pMin: o.parallelMinOhm ?? 0,
    pMax: o.parallelMaxOhm ?? Infinity,
    maxPairs: o.maxPairs ?? DEFAULT_MAX_PAIRS,
  };
}

function tooManyPairs(maxPairs: number): never {
  throw new CoreError('limit-exceeded', `More than ${maxPairs} threshold-network pairs: narrow the value ranges or the feedback-fraction window`, '/hysteresis');
}

function pairParts(o: FreeRatioOptions, i: number, j: number): Record<string, RoleValue> {
  return {
    rFeedback: { value: o.feedback.values[i], arrangement: 'single', parts: [o.feedback.options[i]] },
    rGround: { value: o.ground.values[j], arrangement: 'single', parts: [o.ground.options[j]] },
  };
}

function pairTable(o: FreeRatioOptions, alternates: (i: number, j: number) => [number, number][]): HysteresisTable {
  return new HysteresisTable(
    (i, j) => pairParts(o, i, j),
    (i, j) => alternates(i, j).map(([a, b]) => pairParts(o, a, b)),
  );
}

/**
 * Both sets repeat by decades, so pair (i, j) has the ratio of (i + m·pF, j + m·pG):
 * each ratio is computed once for its lowest pair (one index in the first decade)
 * and the decade shift m nearest the preferred scale is picked arithmetically.
 */
function freeRatioPeriodic(o: FreeRatioOptions, pF: number, pG: number): HysteresisCandidates {
  const s = scanSetup(o);
  const fb = o.feedback.values;
  const gr = o.ground.values;
  const prefLog = o.preferredParallelOhm ? Math.log10(o.preferredParallelOhm) : undefined;
  // Other decade shifts of a chosen pair that stay in both sets and in the parallel-resistance bounds.
  const shifts = (i: number, j: number): [number, number][] => {
    const out: [number, number][] = [];
    for (let m = -Math.floor(Math.min(i / pF, j / pG)); i + m * pF < fb.length && j + m * pG < gr.length; m++) {
      if (m === 0) continue;
      const a = fb[i + m * pF];
      const b = gr[j + m * pG];
      const p = (a * b) / (a + b);
      if (p >= s.pMin && p <= s.pMax) out.push([i + m * pF, j + m * pG]);
    }
    return out;
  };
  const table = pairTable(o, shifts);
  let considered = 0;
  for (let i = 0; i < fb.length; i++) {
    const rF = fb[i];
    const from = lowerBound(gr, rF * s.ratioMin * (1 - 1e-12));
    // Beyond the first feedback decade only ground indices in the first decade start a ratio.
    const to = i < pF ? gr.length : Math.min(gr.length, pG);
    for (let j = from; j < to && gr[j] <= rF * s.ratioMax * (1 + 1e-12); j++) {
      const mMax = Math.min(Math.floor((fb.length - 1 - i) / pF), Math.floor((gr.length - 1 - j) / pG));
      const rG = gr[j];
      const p0 = (rF * rG) / (rF + rG);
      // Each decade shift multiplies the parallel resistance by ten: the allowed shifts and the
      // one nearest the preferred scale follow from one logarithm.
      const lp0 = Math.log10(p0);
      const mLo = Math.max(0, s.pMin > 0 ? Math.ceil(Math.log10(s.pMin) - lp0 - 1e-9) : 0);
      const mHi = Math.min(mMax, Number.isFinite(s.pMax) ? Math.floor(Math.log10(s.pMax) - lp0 + 1e-9) : mMax);
      if (mHi < mLo) continue;
      considered += mHi - mLo + 1;
      if (considered > s.maxPairs) tooManyPairs(s.maxPairs);
      const m = prefLog === undefined ? mLo : Math.min(mHi, Math.max(mLo, Math.round(prefLog - lp0)));
      const thresholds = networkThresholds({ toGroundOhm: rG, toOutputOhm: rF }, s.ctx);
      const factors = timingFactors(thresholds, s.ctx.levels);
      if (!factors) continue;
      table.push(thresholds, factors, prefLog === undefined ? 0 : Math.abs(lp0 + m - prefLog), i + m * pF, j + m * pG);
    }
  }
  return { table, networksConsidered: considered };
}

/** Any two value lists (catalogues): pairs merged by their ratio rounded to 1e-12 relative. */
function freeRatioMerged(o: FreeRatioOptions): HysteresisCandidates {
  const s = scanSetup(o);
  const fb = o.feedback.values;
  const gr = o.ground.values;
  const byRatio = new Map<number, { i: number; j: number; preference: number; thresholds: ThresholdPair; factors: TimingFactors; pairs: [number, number][] }>();
  let considered = 0;
  for (let i = 0; i < fb.length; i++) {
    const rF = fb[i];
    const from = lowerBound(gr, rF * s.ratioMin * (1 - 1e-12));
    for (let j = from; j < gr.length && gr[j] <= rF * s.ratioMax * (1 + 1e-12); j++) {
      const rG = gr[j];
      const p = (rF * rG) / (rF + rG);
      if (p < s.pMin || p > s.pMax) continue;
      if (++considered > s.maxPairs) tooManyPairs(s.maxPairs);
      const key = Math.round(Math.log(rG / rF) * 1e12);
      const preference = scaleDistance(p, o.preferredParallelOhm);
      const seen = byRatio.get(key);
      if (seen) {
        seen.pairs.push([i, j]);
        if (preference < seen.preference) Object.assign(seen, { i, j, preference });
        continue;
      }
      const thresholds = networkThresholds({ toGroundOhm: rG, toOutputOhm: rF }, s.ctx);
      const factors = timingFactors(thresholds, s.ctx.levels);
      if (factors) byRatio.set(key, { i, j, preference, thresholds, factors, pairs: [[i, j]] });
    }
  }
  const byPair = new Map<number, [number, number][]>();
  for (const e of byRatio.values()) byPair.set(e.i * gr.length + e.j, e.pairs);
  const table = pairTable(o, (i, j) => (byPair.get(i * gr.length + j) ?? []).filter(([a, b]) => a !== i || b !== j));
  for (const e of byRatio.values()) table.push(e.thresholds, e.factors, e.preference, e.i, e.j);
  return { table, networksConsidered: considered };
}
