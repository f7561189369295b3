/**
 * Joint choice of timing resistor, timing capacitor and threshold network for a
 * frequency target.
 *
 * In the screening model the period is periodTau · (R + r0) · C, with periodTau
 * from the threshold network and r0 the output resistance in series with R.
 * Threshold networks are sorted by periodTau; for each value of the outer part
 * (the capacitor, unless the capacitor may be a two-part combination) the ideal
 * inner value T / (periodTau · outer) rises monotonically along that order, so
 * one forward pointer through the sorted inner values finds both neighbours of
 * every ideal (a merged bisection). Networks whose ideal falls so far outside the
 * inner range that even the end value cannot beat the current N-th best are
 * never visited (bounds pruning), and a newcomer is only allocated when it beats
 * the N-th best. The kept pairs are then re-evaluated by the exact closed form
 * and the best ones analysed in full (analyzeCircuit, which uses the time-domain
 * engine whenever one is registered and the amplifier has dynamics).
 */
import type { AmplifierModel } from '../amplifiers/model.ts';
import { screenTiming } from '../circuit/analyze.ts';
import type { AnalysisResult } from '../circuit/result.ts';
import { findTopology } from '../circuit/topologies/index.ts';
import type { Circuit, Supply } from '../circuit/types.ts';
import { CoreError } from '../errors.ts';
import { analyseInRankOrder } from './full-analysis.ts';
import type { HysteresisCandidates, HysteresisTable } from './hysteresis.ts';
import { ascendingOrder } from './sorted-order.ts';
import { bestCombination, type RoleValue } from './snap-value.ts';
import { TopN } from './top-n.ts';
import type { ValueSet } from './value-set.ts';

export interface TimingSpace {
  resistor: ValueSet;
  capacitor: ValueSet;
  /** The role that may also be a two-part combination (it becomes the inner role of the search). */
  combine?: 'resistor' | 'capacitor';
  /** Resistance in series with the timing resistor in the screening model (the amplifier's output resistance), ohm. */
  seriesResistanceOhm: number;
  /** Timing resistance to prefer among equally good pairs, ohm (tie-break only). */
  preferredResistanceOhm?: number;
}

export interface ScreenedPair {
  /** Row of the threshold-network table. */
  option: number;
  resistor: RoleValue;
  capacitor: RoleValue;
  /** Screening-model frequency error, (f − target) / target. */
  error: number;
  preference: number;
}

export interface ScreenResult {
  pairs: ScreenedPair[];
  /** (network, outer value, inner neighbour) triples evaluated. */
  examined: number;
}

/** Extra preference for a two-part combination: an extra part is only worth it when it is closer. */
const COMBINATION_PREFERENCE = 1;
/** Cap on (network × outer value) lookups when combinations are searched. */
export const MAX_COMBINATION_LOOKUPS = 400_000;

function worse(a: ScreenedPair, b: ScreenedPair): boolean {
  const ea = Math.abs(a.error);
  const eb = Math.abs(b.error);
  return ea !== eb ? ea > eb : a.preference > b.preference;
}

function single(set: ValueSet, i: number): RoleValue {
  return { value: set.values[i], arrangement: 'single', parts: [set.options[i]] };
}

/**
 * The `keep` best (network, R, C) triples of the screening model among the table
 * rows listed in `rows` (all rows when absent).
 */
export function screenTimingPairs(table: HysteresisTable, timing: TimingSpace, targetPeriodS: number, keep: number, rows?: Int32Array): ScreenResult {
  const heap = new TopN<ScreenedPair>(keep, worse);
  const active = rows ?? allRows(table.count);
  const nK = active.length;
  const nR = timing.resistor.values.length;
  const nC = timing.capacitor.values.length;
  if (nK === 0) return { pairs: [], examined: 0 };
  // Which dimension to bisect: the threshold networks when they are the densest (free
  // ratio), else the inner part value. Costs in elementary steps, roughly.
  const costByNetwork = nK * (timing.combine === 'capacitor' ? nR : nC) * 2;
  const costByPart = nR * nC * (2 + Math.log2(nK) / 4);
  const examined = !timing.combine && costByPart < costByNetwork
    ? screenBisectingNetworks(sortedRows(table, active, 1), timing, targetPeriodS, heap)
    : screenBisectingParts(sortedRows(table, active, -1), timing, targetPeriodS, heap);
  return { pairs: heap.sorted(), examined };
}

function allRows(n: number): Int32Array {
  const rows = new Int32Array(n);
  for (let i = 0; i < n; i++) rows[i] = i;
  return rows;
}

interface SortedRows {
  /** Table row of each position. */
  order: Int32Array;
  /** Period factor at each position, sorted. */
  ks: Float64Array;
  prefs: Float64Array;
}

/** Active rows ordered by period factor (direction 1 ascending, -1 descending). */
function sortedRows(table: HysteresisTable, active: Int32Array, direction: 1 | -1): SortedRows {
  const n = active.length;
  const keys = new Float64Array(n);
  for (let i = 0; i < n; i++) keys[i] = direction * table.periodTau[active[i]];
  const pos = ascendingOrder(keys);
  const order = new Int32Array(n);
  const ks = new Float64Array(n);
  const prefs = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const r = active[pos[i]];
    order[i] = r;
    ks[i] = table.periodTau[r];
    prefs[i] = table.preference[r];
  }
  return { order, ks, prefs };
}

function resistorPreference(timing: TimingSpace, ohm: number): number {
  return timing.preferredResistanceOhm ? Math.abs(Math.log10(ohm / timing.preferredResistanceOhm)) : 0;
}

/** Current acceptance bound: a newcomer must miss by less than the N-th best. */
function acceptBound(heap: TopN<ScreenedPair>): number {
  return heap.full ? Math.abs(heap.peekWorst()!.error) : Infinity;
}

/**
 * For each network (by descending period factor) and each outer value, a forward
 * pointer through the sorted inner values gives the two neighbours of the ideal.
 */
function screenBisectingParts(rows: SortedRows, timing: TimingSpace, T: number, heap: TopN<ScreenedPair>): number {
  const innerIsCap = timing.combine === 'capacitor';
  const inner = innerIsCap ? timing.capacitor : timing.resistor;
  const outer = innerIsCap ? timing.resistor : timing.capacitor;
  const r0 = timing.seriesResistanceOhm;
  const innerShift = innerIsCap ? 0 : r0;
  const outerShift = innerIsCap ? r0 : 0;
  const innerEff = new Float64Array(inner.values.length);
  for (let i = 0; i < innerEff.length; i++) innerEff[i] = inner.values[i] + innerShift;
  const nInner = innerEff.length;
  const effMin = innerEff[0];
  const effMax = innerEff[nInner - 1];

  const { order, ks, prefs } = rows;
  if (timing.combine && ks.length * outer.values.length > MAX_COMBINATION_LOOKUPS) {
    throw new CoreError(
      'limit-exceeded',
      `Two-part combinations over ${ks.length} threshold networks × ${outer.values.length} values exceed ${MAX_COMBINATION_LOOKUPS} lookups: fix the threshold network or narrow the ranges`,
      '/combinations',
    );
  }
  let examined = 0;
  const consider = (g: number, o: number, innerValue: RoleValue, innerValueEff: number, oEff: number, extraPreference: number) => {
    examined++;
    const error = T / (ks[g] * innerValueEff * oEff) - 1;
    if (Math.abs(error) > acceptBound(heap)) return;
    const outerValue = single(outer, o);
    const resistor = innerIsCap ? outerValue : innerValue;
    const capacitor = innerIsCap ? innerValue : outerValue;
    heap.offer({
      option: order[g],
      resistor,
      capacitor,
      error,
      preference: prefs[g] + resistorPreference(timing, resistor.value) + extraPreference,
    });
  };

  for (let o = 0; o < outer.values.length; o++) {
    const oEff = outer.values[o] + outerShift;
    // Skip networks whose ideal lies below effMin·(1 − e*): the smallest value already misses by more than e*.
    const w0 = acceptBound(heap);
    let g = w0 < 1 ? firstAtMost(ks, T / (oEff * effMin * (1 - w0))) : 0;
    let j = 0;
    for (; g < ks.length; g++) {
      const idealEff = T / (ks[g] * oEff);
      // Ideals only rise from here; once above effMax·(1 + e*) nothing further can qualify.
      if (idealEff > effMax * (1 + acceptBound(heap))) break;
      while (j < nInner && innerEff[j] < idealEff) j++;
      if (j > 0) consider(g, o, single(inner, j - 1), innerEff[j - 1], oEff, 0);
      if (j < nInner) consider(g, o, single(inner, j), innerEff[j], oEff, 0);
      if (timing.combine) {
        const combo = bestCombination(idealEff - innerShift, inner);
        if (combo) consider(g, o, combo, combo.value + innerShift, oEff, COMBINATION_PREFERENCE);
      }
    }
  }
  return examined;
}

/**
 * Dense threshold networks (free ratio): for each (R, C) the ideal period factor
 * T / ((R + r0)·C) is bisected among the sorted factors; pairs whose ideal lies
 * outside the factor range by more than the N-th best error are skipped.
 */
function screenBisectingNetworks(rows: SortedRows, timing: TimingSpace, T: number, heap: TopN<ScreenedPair>): number {
  const { order, ks, prefs } = rows;
  const nK = ks.length;
  const kMin = ks[0];
  const kMax = ks[nK - 1];
  const R = timing.resistor;
  const C = timing.capacitor;
  const r0 = timing.seriesResistanceOhm;
  let examined = 0;
  const consider = (g: number, ri: number, ci: number, tau: number) => {
    examined++;
    const error = T / (ks[g] * tau) - 1;
    if (Math.abs(error) > acceptBound(heap)) return;
    const resistor = single(R, ri);
    heap.offer({
      option: order[g],
      resistor,
      capacitor: single(C, ci),
      error,
      preference: prefs[g] + resistorPreference(timing, resistor.value),
    });
  };
  for (let ci = 0; ci < C.values.length; ci++) {
    const c = C.values[ci];
    for (let ri = 0; ri < R.values.length; ri++) {
      const tau = (R.values[ri] + r0) * c;
      const idealK = T / tau;
      const w = acceptBound(heap);
      if (idealK > kMax * (1 + w) || idealK < kMin * (1 - w)) continue;
      let lo = 0;
      let hi = nK;
      while (lo < hi) {
        const mid = (lo + hi) >>> 1;
        if (ks[mid] < idealK) lo = mid + 1;
        else hi = mid;
      }
      if (lo > 0) consider(lo - 1, ri, ci, tau);
      if (lo < nK) consider(lo, ri, ci, tau);
    }
  }
  return examined;
}

/** First index of a descending array whose value is <= x. */
function firstAtMost(desc: Float64Array, x: number): number {
  let lo = 0;
  let hi = desc.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (desc[mid] > x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

export interface JointSearchInput {
  topology: string;
  supply: Supply;
  amplifier: AmplifierModel;
  targetFrequencyHz: number;
  /** When given, candidates whose duty cycle misses it by more than dutyTolerance are dropped. */
  targetDutyCycle?: number;
  /** Absolute duty-cycle tolerance (default 0.02). */
  dutyTolerance?: number;
  hysteresis: HysteresisCandidates;
  timing: TimingSpace;
  /** How many candidates to return. */
  count: number;
  /** Screened pairs re-checked by the exact closed form (default max(8·count, 48)). */
  screenKeep?: number;
  /** Most further pairs re-checked when the screening model's mismatch leaves the optimum open (default MAX_BAND). */
  bandLimit?: number;
}

export interface JointCandidate {
  topology: string;
  /** Every role with its fitted value. */
  parts: Record<string, RoleValue>;
  /** The circuit as analysed (role values are the effective values of combinations). */
  circuit: Circuit;
  analysis: AnalysisResult;
  /** (predicted − target) / target from the full analysis. */
  frequencyError: number;
  /** predicted − target duty cycle (null when no duty target). */
  dutyCycleError: number | null;
  preference: number;
}

export interface JointSearchStats {
  /** Threshold networks examined (before merging equal ratios). */
  thresholdNetworks: number;
  /** Distinct threshold networks searched (after merging and the duty screen). */
  distinctThresholdNetworks: number;
  resistorValues: number;
  capacitorValues: number;
  /** Candidate evaluations made by the screening search. */
  pairsExamined: number;
  /** Size of the full space an exhaustive search would walk (networks × R × C). */
  exhaustiveTuples: number;
  /** Candidates re-evaluated with the closed form / the full analysis. */
  closedFormEvaluations: number;
  fullAnalyses: number;
}

export interface JointSearchResult {
  candidates: JointCandidate[];
  stats: JointSearchStats;
}

export const DEFAULT_DUTY_TOLERANCE = 0.02;
/** Most screened pairs re-checked exactly when the screening model's mismatch leaves the optimum open. */
export const MAX_BAND = 3000;
/** Tie-break against a merged network at another scale than the preferred one. */
const ALTERNATE_PREFERENCE = 0.01;

function circuitFor(input: JointSearchInput, parts: Record<string, RoleValue>): Circuit {
  const values: Record<string, number> = {};
  for (const [role, v] of Object.entries(parts)) values[role] = v.value;
  return { topology: input.topology, supply: input.supply, amplifier: input.amplifier, parts: values };
}

function partsKey(parts: Record<string, RoleValue>): string {
  return Object.keys(parts)
    .sort()
    .map((r) => `${r}=${parts[r].arrangement}:${parts[r].parts.map((p) => p.value).join('+')}`)
    .join(',');
}

interface Evaluated {
  key: string;
  parts: Record<string, RoleValue>;
  circuit: Circuit;
  /** Closed-form frequency, Hz. */
  frequencyHz: number;
  preference: number;
}

function rankEvaluated(a: { frequencyError: number; preference: number }, b: { frequencyError: number; preference: number }): number {
  return Math.abs(a.frequencyError) - Math.abs(b.frequencyError) || a.preference - b.preference;
}

/** Full analyses a capacitor re-pick may add per analysed candidate (the two series neighbours of its ideal). */
const REPICK_NEIGHBOURS = 2;

/**
 * The full model can move the period against the closed form by a factor that differs from one threshold
 * network and resistor to the next (a conducting input clamp loads the network: measured factors from 0.3 to
 * 0.9 on one request), so one correction for all leaves most candidates off target. At a fixed network and
 * resistor every piece of the walk is linear in the capacitor's time scale (slew and delay aside, which are
 * short against a period the design keeps them short against), so each analysed candidate's own period says
 * which capacitor lands it on the target: C · f_analysed / f_target. Its series neighbours are analysed in full.
 */
function repickCapacitors(input: JointSearchInput, analysed: JointCandidate[], analysedKeys: Set<string>, stats: JointSearchStats, dutyOk: (d: number) => boolean): void {
  const roles = findTopology(input.topology)!.design!.timing;
  if (roles.kind !== 'shared' || input.timing.combine === 'capacitor') return;
  const set = input.timing.capacitor;
  const f = input.targetFrequencyHz;
  const queue: { key: string; circuit: Circuit; parts: Record<string, RoleValue>; preference: number }[] = [];
  for (const c of [...analysed]) {
    const ideal = c.parts[roles.capacitor].value * (1 + c.frequencyError);
    // First series value at or above the ideal, and the one below it.
    let hi = 0;
    while (hi < set.values.length && set.values[hi] < ideal) hi++;
    for (let j = Math.max(0, hi - 1); j <= Math.min(set.values.length - 1, hi - 1 + REPICK_NEIGHBOURS - 1); j++) {
      const parts = { ...c.parts, [roles.capacitor]: single(set, j) };
      const key = partsKey(parts);
      if (analysedKeys.has(key)) continue;
      queue.push({ key, circuit: circuitFor(input, parts), parts, preference: c.preference });
    }
  }
  analyseInRankOrder(queue, queue.length, analysedKeys, stats, (e, analysis) => {
    if (!dutyOk(analysis.dutyCycle)) return;
    analysed.push({
      topology: input.topology,
      parts: e.parts,
      circuit: e.circuit,
      analysis,
      frequencyError: analysis.frequencyHz / f - 1,
      dutyCycleError: input.targetDutyCycle === undefined ? null : analysis.dutyCycle - input.targetDutyCycle,
      preference: e.preference,
    });
  });
}

export function jointSearch(request: JointSearchInput): JointSearchResult {
  const def = findTopology(request.topology);
  // Answers carry the current id even when the request named a deprecated alias.
  const input: JointSearchInput = def ? { ...request, topology: def.id } : request;
  const f = input.targetFrequencyHz;
  if (!(f > 0) || !Number.isFinite(f)) throw new CoreError('invalid-value', 'targetFrequencyHz must be a finite frequency > 0', '/targetFrequencyHz');
  const roles = def?.design?.timing;
  if (roles?.kind !== 'shared') throw new CoreError('infeasible', `The joint search sizes topologies with one shared timing resistor, not '${input.topology}'`, '/topology');
  const dutyTol = input.dutyTolerance ?? DEFAULT_DUTY_TOLERANCE;
  const duty = input.targetDutyCycle;
  const dutyOk = (d: number) => duty === undefined || Math.abs(d - duty) <= dutyTol;
  const table = input.hysteresis.table;
  const activeList: number[] = [];
  for (let i = 0; i < table.count; i++) if (dutyOk(table.dutyCycle[i])) activeList.push(i);
  const rows = Int32Array.from(activeList);
  const stats: JointSearchStats = {
    thresholdNetworks: input.hysteresis.networksConsidered,
    distinctThresholdNetworks: rows.length,
    resistorValues: input.timing.resistor.values.length,
    capacitorValues: input.timing.capacitor.values.length,
    pairsExamined: 0,
    exhaustiveTuples: input.hysteresis.networksConsidered * input.timing.resistor.values.length * input.timing.capacitor.values.length,
    closedFormEvaluations: 0,
    fullAnalyses: 0,
  };
  if (rows.length === 0) return { candidates: [], stats };
  const keep = input.screenKeep ?? Math.max(8 * input.count, 48);

  const seen = new Set<string>();
  const analysed: JointCandidate[] = [];
  // Networks merged in the screening (same ratio, other scale) only differ once bias current or
  // output loading count; with neither they are exact ties and need no separate evaluation.
  const expand = input.amplifier.inputBiasCurrentA !== 0 || input.amplifier.outputResistanceOhm > 0;
  // Every exact evaluation, kept across passes (a later pass may rank earlier ones differently).
  const evaluated: Evaluated[] = [];
  const analysedKeys = new Set<string>();
  const evaluate = (pairs: readonly ScreenedPair[], passHz: number): number => {
    let mismatch = 0;
    for (const p of pairs) {
      const nets = expand ? table.realizations(p.option) : [table.parts(p.option)];
      nets.forEach((net, n) => {
        const parts = { ...net, [roles.resistor]: p.resistor, [roles.capacitor]: p.capacitor };
        const key = partsKey(parts);
        if (seen.has(key)) return;
        seen.add(key);
        const circuit = circuitFor(input, parts);
        stats.closedFormEvaluations++;
        let fig;
        try {
          fig = screenTiming(circuit);
        } catch (err) {
          if (err instanceof CoreError && err.code === 'no-oscillation') return;
          throw err;
        }
        mismatch = Math.max(mismatch, Math.abs(fig.frequencyHz / passHz / (1 + p.error) - 1));
        if (!dutyOk(fig.dutyCycle)) return;
        evaluated.push({ key, parts, circuit, frequencyHz: fig.frequencyHz, preference: p.preference + (n > 0 ? ALTERNATE_PREFERENCE : 0) });
      });
    }
    return mismatch;
  };
  /** Closed-form evaluations ranked against a pass target, best first. */
  const rankedFor = (passHz: number) =>
    evaluated
      .map((e) => ({ e, frequencyError: e.frequencyHz / passHz - 1, preference: e.preference }))
      .sort(rankEvaluated);
  const pass = (targetPeriodS: number) => {
    const passHz = 1 / targetPeriodS;
    const screened = screenTimingPairs(table, input.timing, targetPeriodS, keep, rows);
    stats.pairsExamined += screened.examined;
    const mismatch = evaluate(screened.pairs, passHz);
    // The exact optimum's screening error is at most its exact error plus the model mismatch, so
    // every pair screened within bestExact + mismatch (twice, for margin) must be evaluated exactly.
    let ranked = rankedFor(passHz);
    if (ranked.length > 0 && screened.pairs.length === keep) {
      const bound = Math.abs(ranked[0].frequencyError) + 2 * mismatch + 1e-12;
      if (Math.abs(screened.pairs[keep - 1].error) < bound && (input.bandLimit ?? MAX_BAND) > keep) {
        const band = screenTimingPairs(table, input.timing, targetPeriodS, input.bandLimit ?? MAX_BAND, rows);
        stats.pairsExamined += band.examined;
        evaluate(band.pairs.filter((p) => Math.abs(p.error) <= bound), passHz);
        ranked = rankedFor(passHz);
      }
    }
    analyseInRankOrder(
      ranked.map((r) => r.e),
      input.count,
      analysedKeys,
      stats,
      (e, analysis) => {
        if (!dutyOk(analysis.dutyCycle)) return;
        analysed.push({
          topology: input.topology,
          parts: e.parts,
          circuit: e.circuit,
          analysis,
          frequencyError: analysis.frequencyHz / f - 1,
          dutyCycleError: duty === undefined ? null : analysis.dutyCycle - duty,
          preference: e.preference,
        });
      },
    );
    return ranked;
  };

  const first = pass(1 / f);
  // When the full analysis (slew, delays) lengthens the period against the closed form,
  // search once more for the closed-form target that lands the analysed period on the target.
  const dynamic = analysed.filter((c) => c.analysis.model !== 'closed-form');
  if (dynamic.length > 0 && first.length > 0) {
    const ratios = dynamic.map((c) => {
      const cf = first.find((r) => r.e.key === partsKey(c.parts));
      return cf ? (1 + cf.frequencyError) / (1 + c.frequencyError) : 1;
    });
    ratios.sort((a, b) => a - b);
    const ratio = ratios[ratios.length >> 1];
    if (Math.abs(ratio - 1) > 1e-4) pass(1 / (f * ratio));
    repickCapacitors(input, analysed, analysedKeys, stats, dutyOk);
  }
  analysed.sort(rankEvaluated);
  return { candidates: analysed.slice(0, input.count), stats };
}
