/**
 * Steady-state figures from a walk's repeating cycle, in the same shape the
 * closed form produces. Definitions (chosen so both models agree where both
 * apply, and so they mean what a bench measurement would):
 * - output high/low level: time-mean of the pin while the output stage heads for
 *   that level (the delayed decision), slews included;
 * - duty cycle and timeHigh/timeLow: between 50 % crossings of the pin, the 50 %
 *   level being the midpoint of those two levels;
 * - thresholds: the capacitor voltage at the decisions;
 * - firstEdgeS: first 50 % crossing of the pin after power-up;
 * - peaks and extremes: exact over every piece (interior extrema included).
 */
import type { PreparedCircuit } from '../analyze.ts';
import { powerUpState } from '../closed-form.ts';
import { nominalEdgeTimes, type EdgeTimes } from '../frequency-ceiling.ts';
import type { OscillationFigures, StateSummary } from '../result.ts';
import { configKey, STAGE, type ConfigCache, type ConfigModel } from './configs.ts';
import type { PieceEvaluator } from './piece-evaluator.ts';
import { LOG } from './piece-log.ts';
import type { OscillatorWalk, SteadyCycle } from './walker.ts';

export interface TimeDomainFigures extends OscillationFigures {
  edges: EdgeTimes;
}

/** Figures the analysis result has no field for, handed back on request. */
export interface WalkExtras {
  /** Output 50 % level used for the duty cycle and edges, V. */
  outputMidV: number;
}

let pinEndsBuffer = new Float64Array(32);
let crossingMemoBuffer = new Float64Array(16);

/** Pin voltage at both ends of each cycle piece (reused buffer). */
function pinEndsScratch(pieces: number): Float64Array {
  if (pinEndsBuffer.length < 2 * pieces) pinEndsBuffer = new Float64Array(4 * pieces);
  return pinEndsBuffer;
}

/** Marks a cycle piece whose 50 % crossings have not been searched (any found time is >= 0). */
const NOT_SEARCHED = -1;

/**
 * First 50 % crossing inside each cycle piece, as searched by the duty-cycle
 * pass (NaN: none; NOT_SEARCHED), so that the first-edge search from power-up,
 * which usually ends inside the first cycle, does not solve the same crossing
 * twice. Reused buffer.
 */
function crossingMemoScratch(pieces: number): Float64Array {
  if (crossingMemoBuffer.length < pieces) crossingMemoBuffer = new Float64Array(2 * pieces);
  for (let k = 0; k < pieces; k++) crossingMemoBuffer[k] = NOT_SEARCHED;
  return crossingMemoBuffer;
}
const scratchT = new Float64Array(2);
const scratchDir = new Int8Array(2);

/**
 * ((x % m) + m) % m, the phase of x in [0, m), without the floating-point
 * remainder where it is not needed: |x| < m leaves x % m = x exactly, and for
 * m <= y < 2m the remainder is y − m, which is exact (Sterbenz). Same bits as
 * the remainder form; the remainder is slow in V8.
 */
function phaseIn(x: number, m: number): number {
  const r = x > -m && x < m ? x : x % m;
  const y = r + m;
  if (y < m) return y;
  return y < 2 * m ? y - m : y % m;
}

/**
 * Sums and extremes over the cycle pieces, one piece at a time (a reusable
 * accumulator: figuresFromWalk is synchronous and never re-entered).
 */
class CycleTotals {
  pinHighInt = 0;
  pinHighS = 0;
  pinLowInt = 0;
  pinLowS = 0;
  railCharge = 0;
  sourcedCharge = 0;
  capMin = Infinity;
  capMax = -Infinity;
  pMin = Infinity;
  pMax = -Infinity;
  diffMin = Infinity;
  diffMax = -Infinity;
  iMin = Infinity;
  iMax = -Infinity;
  supplyMax = -Infinity;
  highPiece: ConfigModel | undefined;
  lowPiece: ConfigModel | undefined;
  limitedS = 0;
  demandPeakA = 0;

  clear(): void {
    this.pinHighInt = this.pinHighS = this.pinLowInt = this.pinLowS = 0;
    this.railCharge = this.sourcedCharge = 0;
    this.capMin = this.pMin = this.diffMin = this.iMin = Infinity;
    this.capMax = this.pMax = this.diffMax = this.iMax = this.supplyMax = -Infinity;
    this.highPiece = this.lowPiece = undefined;
    this.limitedS = this.demandPeakA = 0;
  }

  /** Adds the loaded piece; its pin voltage at both ends goes to pinEnds[j], pinEnds[j + 1]. */
  add(ev: PieceEvaluator, cache: ConfigCache, pinEnds: Float64Array, j: number): void {
    const cfg = ev.config;
    const T = ev.durationS;
    pinEnds[j] = ev.atStart(cfg.oC, cfg.oV, cfg.oS);
    pinEnds[j + 1] = ev.atEnd(cfg.oC, cfg.oV, cfg.oS);
    const pin = ev.integralFull(cfg.oC, cfg.oV, cfg.oS);
    if (ev.target) {
      this.pinHighInt += pin;
      this.pinHighS += T;
    } else {
      this.pinLowInt += pin;
      this.pinLowS += T;
    }
    if (ev.logic) this.highPiece = cfg;
    else this.lowPiece = cfg;
    this.railCharge += ev.integralFull(cfg.railC, cfg.railV, cfg.railS);
    this.sourcedCharge += ev.positiveIntegral(cfg.iC, cfg.iV, cfg.iS, scratchT, scratchDir);
    this.addRanges(ev, cfg, cache);
  }

  /**
   * The extremes of the loaded piece. Kept apart from add, which is already
   * large, so that the optimizing compiler can inline every range call here
   * (measured a few per cent faster than one method).
   */
  private addRanges(ev: PieceEvaluator, cfg: ConfigModel, cache: ConfigCache): void {
    const T = ev.durationS;
    ev.range(0, 1, 0);
    this.capMin = Math.min(this.capMin, ev.rangeMin);
    this.capMax = Math.max(this.capMax, ev.rangeMax);
    ev.range(cfg.pC, cfg.pV, cfg.pS);
    this.pMin = Math.min(this.pMin, ev.rangeMin);
    this.pMax = Math.max(this.pMax, ev.rangeMax);
    ev.range(cfg.pC, cfg.pV - 1, cfg.pS);
    this.diffMin = Math.min(this.diffMin, ev.rangeMin);
    this.diffMax = Math.max(this.diffMax, ev.rangeMax);
    if (cfg.iV !== 0 || cfg.iS !== 0) {
      ev.range(cfg.iC, cfg.iV, cfg.iS);
      this.iMin = Math.min(this.iMin, ev.rangeMin);
      this.iMax = Math.max(this.iMax, ev.rangeMax);
    } else {
      this.iMin = Math.min(this.iMin, cfg.iC);
      this.iMax = Math.max(this.iMax, cfg.iC);
    }
    if (cfg.stage === STAGE.limitedSource || cfg.stage === STAGE.limitedSink) {
      // What the voltage drive would have delivered here (the same network with the stage driving).
      this.limitedS += T;
      const drive = cache.get(configKey(STAGE.driven, cfg.clamp, cfg.diodes));
      ev.range(drive.iC, drive.iV, drive.iS);
      this.demandPeakA = Math.max(this.demandPeakA, Math.abs(ev.rangeMin), Math.abs(ev.rangeMax));
    }
    // Peak draw from V+: the network's share plus whatever the output sources (max(rail, rail + iOut)).
    ev.range(cfg.railC, cfg.railV, cfg.railS);
    this.supplyMax = Math.max(this.supplyMax, ev.rangeMax);
    ev.range(cfg.railC + cfg.iC, cfg.railV + cfg.iV, cfg.railS + cfg.iS);
    this.supplyMax = Math.max(this.supplyMax, ev.rangeMax);
  }
}
const totals = new CycleTotals();

/**
 * `fallbackEdges` stands in for an edge the cycle did not complete; undefined:
 * the circuit's nominal edge times, worked out only when one is needed.
 */
export function figuresFromWalk(walk: OscillatorWalk, cycle: SteadyCycle, fallbackEdges: EdgeTimes | undefined, extras?: WalkExtras): TimeDomainFigures {
  const prepared = walk.prepared;
  const { circuit } = prepared;
  const ev = walk.evaluator;
  const periodS = cycle.periodS;

  const pinEnds = pinEndsScratch(cycle.endIndex - cycle.startIndex);
  const sums = totals;
  sums.clear();
  for (let i = cycle.startIndex; i < cycle.endIndex; i++) {
    ev.load(i);
    sums.add(ev, walk.cache, pinEnds, 2 * (i - cycle.startIndex));
  }
  const { pinHighInt, pinHighS, pinLowInt, pinLowS, railCharge, sourcedCharge, capMin, capMax, pMin, pMax, diffMin, diffMax, iMin, iMax, supplyMax, highPiece, lowPiece, limitedS, demandPeakA } = sums;
  // The accumulator is reused: drop its references to this circuit's configurations.
  sums.highPiece = sums.lowPiece = undefined;
  const highV = pinHighS > 0 ? pinHighInt / pinHighS : Number.NaN;
  const lowV = pinLowS > 0 ? pinLowInt / pinLowS : Number.NaN;
  const midV = 0.5 * (highV + lowV);
  if (extras) extras.outputMidV = midV;

  // 50 % crossings of the pin over the cycle (a jump between pieces counts at the boundary).
  let riseAt = Number.NaN;
  let fallAt = Number.NaN;
  const pieces = cycle.endIndex - cycle.startIndex;
  let prevEnd = pinEnds[2 * pieces - 1] - midV;
  const memo = crossingMemoScratch(pieces);
  for (let i = cycle.startIndex; i < cycle.endIndex && (Number.isNaN(riseAt) || Number.isNaN(fallAt)); i++) {
    const j = 2 * (i - cycle.startIndex);
    const start = pinEnds[j] - midV;
    const end = pinEnds[j + 1] - midV;
    const startS = walk.log.get(i, LOG.startS);
    if (prevEnd < 0 && start >= 0 && Number.isNaN(riseAt)) riseAt = startS;
    else if (prevEnd >= 0 && start < 0 && Number.isNaN(fallAt)) fallAt = startS;
    prevEnd = end;
    // A plain exponential piece is monotone: a crossing inside shows as a sign change of its ends.
    if (walk.log.get(i, LOG.rate) === 0 && start < 0 === end < 0) continue;
    ev.load(i);
    const cfg = ev.config;
    const n = ev.crossings(cfg.oC - midV, cfg.oV, cfg.oS, scratchT, scratchDir);
    memo[i - cycle.startIndex] = n > 0 ? scratchT[0] : Number.NaN;
    for (let k = 0; k < n; k++) {
      if (scratchDir[k] > 0 && Number.isNaN(riseAt)) riseAt = startS + scratchT[k];
      if (scratchDir[k] < 0 && Number.isNaN(fallAt)) fallAt = startS + scratchT[k];
    }
  }
  let timeHighS: number;
  if (!Number.isNaN(riseAt) && !Number.isNaN(fallAt)) {
    timeHighS = phaseIn(fallAt - riseAt, periodS);
  } else {
    timeHighS = pinHighS; // the pin never crosses its midpoint: fall back to the drive intervals
  }
  const timeLowS = periodS - timeHighS;

  const firstEdgeS = firstCrossing(ev, walk.log.count, midV, cycle.startIndex, cycle.endIndex, memo);
  let rise = cycle.riseS;
  let fall = cycle.fallS;
  if (Number.isNaN(rise) || Number.isNaN(fall)) {
    const fallback = fallbackEdges ?? nominalEdgeTimes(prepared);
    if (Number.isNaN(rise)) rise = fallback.riseSettleS;
    if (Number.isNaN(fall)) fall = fallback.fallSettleS;
  }

  const figures: TimeDomainFigures = {
    model: 'time-domain',
    frequencyHz: 1 / periodS,
    periodS,
    dutyCycle: timeHighS / periodS,
    timeHighS,
    timeLowS,
    firstEdgeS,
    thresholds: { upperV: cycle.upperV, lowerV: cycle.lowerV, hysteresisV: cycle.upperV - cycle.lowerV },
    output: { highV, lowV, swingV: highV - lowV },
    capacitor: { minV: capMin, maxV: capMax },
    states: {
      high: stateSummary(prepared, 'high', highPiece, walk.highV, cycle.upperV, cycle.decisionHighS),
      low: stateSummary(prepared, 'low', lowPiece, walk.lowV, cycle.lowerV, periodS - cycle.decisionHighS),
    },
    powerUp: powerUpState(prepared.high, prepared.low),
    currents: {
      outputPeakSourceA: Math.max(0, iMax),
      outputPeakSinkA: Math.max(0, -iMin),
      supplyAverageA: circuit.amplifier.quiescentCurrentA + (railCharge + sourcedCharge) / periodS,
      supplyPeakA: circuit.amplifier.quiescentCurrentA + supplyMax,
    },
    inputs: {
      nonInvertingMinV: pMin,
      nonInvertingMaxV: pMax,
      invertingMinV: capMin,
      invertingMaxV: capMax,
      differentialMaxV: Math.max(Math.abs(diffMin), Math.abs(diffMax)),
    },
    biasThresholdShiftV: Math.abs(circuit.amplifier.inputBiasCurrentA) * Math.max(prepared.high.decisionResistanceOhm, prepared.low.decisionResistanceOhm),
    edges: { riseSettleS: rise, fallSettleS: fall },
  };
  // Added last, as the spread form did (same key order), without building a throwaway object.
  if (limitedS > 0) figures.currentLimit = { limitedFraction: limitedS / periodS, demandPeakA };
  return figures;
}

/**
 * First 50 % crossing of the pin from power-up (the log starts at t = 0). Cycle
 * pieces [memoStart, memoEnd) reuse the crossing the duty-cycle pass found
 * (same function, same piece: the same search).
 */
function firstCrossing(ev: PieceEvaluator, count: number, midV: number, memoStart: number, memoEnd: number, memo: Float64Array): number {
  let prevEnd = Number.NaN;
  for (let i = 0; i < count; i++) {
    ev.load(i);
    const cfg = ev.config;
    const c0 = cfg.oC - midV;
    const start = ev.atStart(c0, cfg.oV, cfg.oS);
    if (!Number.isNaN(prevEnd) && prevEnd < 0 !== start < 0) return ev.startS;
    const known = i >= memoStart && i < memoEnd ? memo[i - memoStart] : NOT_SEARCHED;
    if (known !== NOT_SEARCHED) {
      if (!Number.isNaN(known)) return ev.startS + known;
    } else {
      const n = ev.crossings(c0, cfg.oV, cfg.oS, scratchT, scratchDir);
      if (n > 0) return ev.startS + scratchT[0];
    }
    prevEnd = ev.atEnd(c0, cfg.oV, cfg.oS);
  }
  return Number.NaN;
}

/** Per-state summary from the piece in force when the state's decision ends (its settled piece). */
function stateSummary(prepared: PreparedCircuit, state: 'high' | 'low', cfg: ConfigModel | undefined, levelV: number, switchingV: number, dwellS: number): StateSummary {
  const nominal = state === 'high' ? prepared.high : prepared.low;
  const released = cfg ? cfg.stage === STAGE.released : Number.isNaN(nominal.sourceV);
  const sourceV = released ? null : levelV;
  if (!cfg || !(cfg.a > 0)) {
    return { tauS: nominal.tauS, asymptoteV: nominal.asymptoteV, switchingV, sourceV, dwellS };
  }
  return { tauS: 1 / cfg.a, asymptoteV: (cfg.b0 + cfg.bS * levelV) / cfg.a, switchingV, sourceV, dwellS };
}
