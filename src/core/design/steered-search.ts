/**
 * Joint search of the diode-steered astable: threshold network × capacitor ×
 * charge resistor × discharge resistor, ranked the way designs are ranked
 * (share of the frequency tolerance used plus share of the duty tolerance used).
 *
 * Screening: for each network and capacitor the two ideal path resistances follow
 * from the two target dwell times (each dwell depends on one resistor). With the
 * relative dwell errors eH, eL of a pair, the frequency and duty errors are
 *   S = d·(1+eH) + (1−d)·(1+eL),  fe = 1/S − 1,  de = d·(1+eH)/S − d.
 * The resistor of the longer half is walked outward from its ideal; the score
 * cannot fall below 0.5·m·|e| with m = min(1/ftol, share/dtol) (a linearisation
 * halved for margin), so the walk stops once that exceeds the N-th best. For each
 * such value both error terms only grow outside the interval between the other
 * half's two zeros (fe = 0 and de = 0), so every value of the other resistor in
 * that interval, plus one either side, is screened. The best screened tuples are
 * evaluated by the closed form and the best of those by analyzeCircuit.
 */
import type { AmplifierModel } from '../amplifiers/model.ts';
import { screenTiming } from '../circuit/analyze.ts';
import type { AnalysisResult } from '../circuit/result.ts';
import type { Circuit, DiodeModel, Supply } from '../circuit/types.ts';
import { CoreError } from '../errors.ts';
import { analyseInRankOrder } from './full-analysis.ts';
import type { HysteresisCandidates } from './hysteresis.ts';
import type { RoleValue } from './snap-value.ts';
import { steeredDwellFactors, type SteeredFactors } from './steered-timing.ts';
import type { OutputLevels } from './thresholds.ts';
import { TopN } from './top-n.ts';
import { lowerBound, type ValueSet } from './value-set.ts';


export interface SteeredSearchInput {
  /** The steered topology's id and its timing roles (registry). */
  topology: string;
  roles: { charge: string; discharge: string; capacitor: string };
  supply: Supply;
  amplifier: AmplifierModel;
  diode: DiodeModel;
  /** Light-load output levels the screening uses. */
  levels: OutputLevels;
  targetFrequencyHz: number;
  targetDutyCycle: number;
  frequencyTolerance: number;
  dutyTolerance: number;
  /** Threshold networks (rTop/rBottom/rFeedback or rFeedback/rGround) with their screening thresholds. */
  hysteresis: HysteresisCandidates;
  charge: ValueSet;
  discharge: ValueSet;
  capacitor: ValueSet;
  /** Resistance in each path besides its resistor and diode (the output resistance), ohm. */
  seriesResistanceOhm: number;
  /** Candidates to return. */
  count: number;
  /** Screened tuples evaluated by the closed form (default max(8·count, 48)). */
  screenKeep?: number;
}

export interface SteeredCandidate {
  topology: string;
  parts: Record<string, RoleValue>;
  circuit: Circuit;
  analysis: AnalysisResult;
  frequencyError: number;
  dutyCycleError: number;
  preference: number;
}

export interface SteeredSearchStats {
  thresholdNetworks: number;
  /** Tuples scored by the screening model. */
  tuplesScreened: number;
  closedFormEvaluations: number;
  fullAnalyses: number;
}

export interface SteeredSearchResult {
  candidates: SteeredCandidate[];
  stats: SteeredSearchStats;
}

interface Screened {
  row: number;
  capacitor: number;
  charge: number;
  discharge: number;
  score: number;
  preference: number;
}

interface Evaluated {
  key: string;
  parts: Record<string, RoleValue>;
  circuit: Circuit;
  timeHighS: number;
  timeLowS: number;
  preference: number;
}

/** Cap on the other half's values screened per value of the longer half (a wide interval means a poor tuple anyway). */
const MAX_INTERVAL_VALUES = 64;
/** Cap on the steps walked each side of the longer half's ideal. */
const MAX_WALK_STEPS = 48;
/** Re-aimed passes for the time-domain stretch of each half. */
const CORRECTION_PASSES = 2;

/** Share of each tolerance used: the ranking designs share (design.ts). */
export function toleranceScore(frequencyError: number, dutyCycleError: number, frequencyTolerance: number, dutyTolerance: number): number {
  return Math.abs(frequencyError) / frequencyTolerance + Math.abs(dutyCycleError) / dutyTolerance;
}

function single(set: ValueSet, i: number): RoleValue {
  return { value: set.values[i], arrangement: 'single', parts: [set.options[i]] };
}

function partsKey(parts: Record<string, RoleValue>): string {
  return Object.keys(parts)
    .sort()
    .map((r) => `${r}=${parts[r].value}`)
    .join(',');
}

function worseScreened(a: Screened, b: Screened): boolean {
  return a.score > b.score || (a.score === b.score && a.preference > b.preference);
}

interface PassTargets {
  timeHighS: number;
  timeLowS: number;
}

/** Screening of every network × capacitor for one pair of target dwell times. */
function screen(input: SteeredSearchInput, factors: (SteeredFactors | null)[], targets: PassTargets, keep: number, stats: SteeredSearchStats): Screened[] {
  const { charge, discharge, capacitor, frequencyTolerance: ft, dutyTolerance: dt } = input;
  const table = input.hysteresis.table;
  const extra = input.diode.resistanceOhm + input.seriesResistanceOhm;
  const d = targets.timeHighS / (targets.timeHighS + targets.timeLowS);
  const highIsLonger = d >= 0.5;
  const share = highIsLonger ? d : 1 - d;
  const slope = 0.5 * Math.min(1 / ft, share / dt);
  const longSet = highIsLonger ? charge : discharge;
  const shortSet = highIsLonger ? discharge : charge;
  const heap = new TopN<Screened>(keep, worseScreened);
  const bound = () => (heap.full ? heap.peekWorst()!.score : Infinity);

  for (let row = 0; row < table.count; row++) {
    const f = factors[row];
    if (!f) continue;
    const pref = table.preference[row];
    for (let ci = 0; ci < capacitor.values.length; ci++) {
      const c = capacitor.values[ci];
      const highPathOhm = targets.timeHighS / (c * f.highTau);
      const lowPathOhm = targets.timeLowS / (c * f.lowTau);
      const longPath = highIsLonger ? highPathOhm : lowPathOhm;
      const shortPath = highIsLonger ? lowPathOhm : highPathOhm;
      const offer = (li: number, si: number, eLong: number) => {
        const eShort = (shortSet.values[si] + extra) / shortPath - 1;
        const eH = highIsLonger ? eLong : eShort;
        const eL = highIsLonger ? eShort : eLong;
        const s = d * (1 + eH) + (1 - d) * (1 + eL);
        const score = Math.abs(1 / s - 1) / ft + Math.abs((d * (1 + eH)) / s - d) / dt;
        stats.tuplesScreened++;
        if (score >= bound()) return;
        heap.offer({
          row,
          capacitor: ci,
          charge: highIsLonger ? li : si,
          discharge: highIsLonger ? si : li,
          score,
          preference: pref,
        });
      };
      const visitLong = (li: number): boolean => {
        const eLong = (longSet.values[li] + extra) / longPath - 1;
        if (slope * Math.abs(eLong) > bound()) return false;
        // Zeros of the two error terms in the short half's relative error.
        const dutyZero = eLong;
        const rest = 1 - share * (1 + eLong);
        const freqZero = rest > 0 ? rest / (1 - share) - 1 : -1;
        const eLo = Math.min(dutyZero, freqZero);
        const eHi = Math.max(dutyZero, freqZero);
        const from = Math.max(0, lowerBound(shortSet.values, shortPath * (1 + eLo) - extra) - 1);
        const to = Math.min(shortSet.values.length - 1, lowerBound(shortSet.values, shortPath * (1 + eHi) - extra));
        // Widest intervals come with large errors; centre a capped window on the duty zero then.
        let a = from;
        let b = to;
        if (b - a + 1 > MAX_INTERVAL_VALUES) {
          const centre = lowerBound(shortSet.values, shortPath * (1 + dutyZero) - extra);
          a = Math.max(from, centre - MAX_INTERVAL_VALUES / 2);
          b = Math.min(to, a + MAX_INTERVAL_VALUES - 1);
        }
        for (let si = a; si <= b; si++) offer(li, si, eLong);
        return true;
      };
      const start = lowerBound(longSet.values, longPath - extra);
      for (let li = start, k = 0; li < longSet.values.length && k < MAX_WALK_STEPS; li++, k++) if (!visitLong(li)) break;
      for (let li = start - 1, k = 0; li >= 0 && k < MAX_WALK_STEPS; li--, k++) if (!visitLong(li)) break;
    }
  }
  return heap.sorted();
}

export function steeredSearch(input: SteeredSearchInput): SteeredSearchResult {
  const f = input.targetFrequencyHz;
  const duty = input.targetDutyCycle;
  if (!(f > 0) || !Number.isFinite(f)) throw new CoreError('invalid-value', 'targetFrequencyHz must be a finite frequency > 0', '/targetFrequencyHz');
  if (!(duty > 0 && duty < 1)) throw new CoreError('invalid-value', 'targetDutyCycle must lie strictly between 0 and 1', '/targetDutyCycle');
  const table = input.hysteresis.table;
  const stats: SteeredSearchStats = { thresholdNetworks: table.count, tuplesScreened: 0, closedFormEvaluations: 0, fullAnalyses: 0 };
  const factors: (SteeredFactors | null)[] = [];
  for (let i = 0; i < table.count; i++) {
    factors.push(steeredDwellFactors({ upperV: table.upperV[i], lowerV: table.lowerV[i] }, input.levels, input.diode.forwardDropV));
  }
  const keep = input.screenKeep ?? Math.max(8 * input.count, 48);
  const seen = new Set<string>();
  const evaluated: Evaluated[] = [];
  const analysedKeys = new Set<string>();
  const analysed: (SteeredCandidate & { closedForm: Evaluated })[] = [];
  const score = (fe: number, de: number) => toleranceScore(fe, de, input.frequencyTolerance, input.dutyTolerance);

  const evaluate = (list: readonly Screened[]) => {
    for (const s of list) {
      const parts: Record<string, RoleValue> = {
        ...table.parts(s.row),
        [input.roles.charge]: single(input.charge, s.charge),
        [input.roles.discharge]: single(input.discharge, s.discharge),
        [input.roles.capacitor]: single(input.capacitor, s.capacitor),
      };
      const key = partsKey(parts);
      if (seen.has(key)) continue;
      seen.add(key);
      const values: Record<string, number> = {};
      for (const [role, v] of Object.entries(parts)) values[role] = v.value;
      const circuit: Circuit = { topology: input.topology, supply: input.supply, amplifier: input.amplifier, parts: values, diode: input.diode };
      stats.closedFormEvaluations++;
      try {
        const fig = screenTiming(circuit);
        evaluated.push({ key, parts, circuit, timeHighS: fig.timeHighS, timeLowS: fig.timeLowS, preference: s.preference });
      } catch (err) {
        if (err instanceof CoreError && err.code === 'no-oscillation') continue;
        throw err;
      }
    }
  };

  const pass = (targets: PassTargets) => {
    evaluate(screen(input, factors, targets, keep, stats));
    const periodS = targets.timeHighS + targets.timeLowS;
    const passDuty = targets.timeHighS / periodS;
    // Closed-form evaluations ranked against this pass's targets (a corrected pass aims off the request on purpose).
    const ranked = evaluated
      .map((e) => {
        const p = e.timeHighS + e.timeLowS;
        return { e, s: score(periodS / p - 1, e.timeHighS / p - passDuty) };
      })
      .sort((a, b) => a.s - b.s || a.e.preference - b.e.preference);
    analyseInRankOrder(
      ranked.map((r) => r.e),
      input.count,
      analysedKeys,
      stats,
      (e, analysis) => {
        const dutyCycleError = analysis.dutyCycle - duty;
        if (Math.abs(dutyCycleError) > input.dutyTolerance) return;
        analysed.push({
          topology: input.topology,
          parts: e.parts,
          circuit: e.circuit,
          analysis,
          frequencyError: analysis.frequencyHz / f - 1,
          dutyCycleError,
          preference: e.preference,
          closedForm: e,
        });
      },
    );
  };

  const target: PassTargets = { timeHighS: duty / f, timeLowS: (1 - duty) / f };
  pass(target);
  // Slewing and recovery delays lengthen each half against the closed form by their own amount:
  // aim further passes so the analysed halves land on the targets (median stretch of each half
  // over the designs analysed in the latest pass; the edges are nearly fixed times, so the
  // stretch changes with the aim and a second correction settles it).
  let from = 0;
  let aim = target;
  for (let k = 0; k < CORRECTION_PASSES; k++) {
    const dynamic = analysed.slice(from).filter((c) => c.analysis.model !== 'closed-form');
    if (dynamic.length === 0) break;
    const median = (xs: number[]) => xs.sort((a, b) => a - b)[xs.length >> 1];
    const stretchHigh = median(dynamic.map((c) => c.analysis.timeHighS / c.closedForm.timeHighS));
    const stretchLow = median(dynamic.map((c) => c.analysis.timeLowS / c.closedForm.timeLowS));
    const next = { timeHighS: target.timeHighS / stretchHigh, timeLowS: target.timeLowS / stretchLow };
    if (Math.abs(next.timeHighS / aim.timeHighS - 1) <= 1e-4 && Math.abs(next.timeLowS / aim.timeLowS - 1) <= 1e-4) break;
    from = analysed.length;
    aim = next;
    pass(aim);
  }
  analysed.sort((a, b) => score(a.frequencyError, a.dutyCycleError) - score(b.frequencyError, b.dutyCycleError) || a.preference - b.preference);
  return { candidates: analysed.slice(0, input.count).map(({ closedForm, ...c }) => (void closedForm, c)), stats };
}
