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
import type { EdgeTimes } from '../frequency-ceiling.ts';
import type { OscillationFigures, StateSummary } from '../result.ts';
import { configKey, STAGE, type ConfigModel } from './configs.ts';
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

const scratch2 = new Float64Array(2);
let pinEndsBuffer = new Float64Array(32);

/** Pin voltage at both ends of each cycle piece (reused buffer). */
function pinEndsScratch(pieces: number): Float64Array {
  if (pinEndsBuffer.length < 2 * pieces) pinEndsBuffer = new Float64Array(4 * pieces);
  return pinEndsBuffer;
}
const scratchT = new Float64Array(2);
const scratchDir = new Int8Array(2);

export function figuresFromWalk(walk: OscillatorWalk, cycle: SteadyCycle, fallbackEdges: EdgeTimes, extras?: WalkExtras): TimeDomainFigures {
  const prepared = walk.prepared;
  const { circuit } = prepared;
  const ev = walk.evaluator;
  const periodS = cycle.periodS;

  let pinHighInt = 0;
  let pinHighS = 0;
  let pinLowInt = 0;
  let pinLowS = 0;
  let railCharge = 0;
  let sourcedCharge = 0;
  let capMin = Infinity;
  let capMax = -Infinity;
  let pMin = Infinity;
  let pMax = -Infinity;
  let diffMin = Infinity;
  let diffMax = -Infinity;
  let iMin = Infinity;
  let iMax = -Infinity;
  let supplyMax = -Infinity;
  let highPiece: ConfigModel | undefined;
  let lowPiece: ConfigModel | undefined;

  let limitedS = 0;
  let demandPeakA = 0;
  const pinEnds = pinEndsScratch(cycle.endIndex - cycle.startIndex);
  for (let i = cycle.startIndex; i < cycle.endIndex; i++) {
    ev.load(i);
    const cfg = ev.config;
    const T = ev.durationS;
    const j = 2 * (i - cycle.startIndex);
    pinEnds[j] = ev.atStart(cfg.oC, cfg.oV, cfg.oS);
    pinEnds[j + 1] = ev.atEnd(cfg.oC, cfg.oV, cfg.oS);
    const pin = ev.integralFull(cfg.oC, cfg.oV, cfg.oS);
    if (ev.target) {
      pinHighInt += pin;
      pinHighS += T;
    } else {
      pinLowInt += pin;
      pinLowS += T;
    }
    if (ev.logic) highPiece = cfg;
    else lowPiece = cfg;
    railCharge += ev.integralFull(cfg.railC, cfg.railV, cfg.railS);
    sourcedCharge += ev.positiveIntegral(cfg.iC, cfg.iV, cfg.iS, scratchT, scratchDir);
    ev.extremes(0, 1, 0, scratch2);
    capMin = Math.min(capMin, scratch2[0]);
    capMax = Math.max(capMax, scratch2[1]);
    ev.extremes(cfg.pC, cfg.pV, cfg.pS, scratch2);
    pMin = Math.min(pMin, scratch2[0]);
    pMax = Math.max(pMax, scratch2[1]);
    ev.extremes(cfg.pC, cfg.pV - 1, cfg.pS, scratch2);
    diffMin = Math.min(diffMin, scratch2[0]);
    diffMax = Math.max(diffMax, scratch2[1]);
    if (cfg.iV !== 0 || cfg.iS !== 0) {
      ev.extremes(cfg.iC, cfg.iV, cfg.iS, scratch2);
      iMin = Math.min(iMin, scratch2[0]);
      iMax = Math.max(iMax, scratch2[1]);
    } else {
      iMin = Math.min(iMin, cfg.iC);
      iMax = Math.max(iMax, cfg.iC);
    }
    if (cfg.stage === STAGE.limitedSource || cfg.stage === STAGE.limitedSink) {
      // What the voltage drive would have delivered here (the same network with the stage driving).
      limitedS += T;
      const drive = walk.cache.get(configKey(STAGE.driven, cfg.clamp, cfg.diodes));
      ev.extremes(drive.iC, drive.iV, drive.iS, scratch2);
      demandPeakA = Math.max(demandPeakA, Math.abs(scratch2[0]), Math.abs(scratch2[1]));
    }
    // Peak draw from V+: the network's share plus whatever the output sources (max(rail, rail + iOut)).
    ev.extremes(cfg.railC, cfg.railV, cfg.railS, scratch2);
    supplyMax = Math.max(supplyMax, scratch2[1]);
    ev.extremes(cfg.railC + cfg.iC, cfg.railV + cfg.iV, cfg.railS + cfg.iS, scratch2);
    supplyMax = Math.max(supplyMax, scratch2[1]);
  }
  const highV = pinHighS > 0 ? pinHighInt / pinHighS : Number.NaN;
  const lowV = pinLowS > 0 ? pinLowInt / pinLowS : Number.NaN;
  const midV = 0.5 * (highV + lowV);
  if (extras) extras.outputMidV = midV;

  // 50 % crossings of the pin over the cycle (a jump between pieces counts at the boundary).
  let riseAt = Number.NaN;
  let fallAt = Number.NaN;
  const pieces = cycle.endIndex - cycle.startIndex;
  let prevEnd = pinEnds[2 * pieces - 1] - midV;
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
    for (let k = 0; k < n; k++) {
      if (scratchDir[k] > 0 && Number.isNaN(riseAt)) riseAt = startS + scratchT[k];
      if (scratchDir[k] < 0 && Number.isNaN(fallAt)) fallAt = startS + scratchT[k];
    }
  }
  let timeHighS: number;
  if (!Number.isNaN(riseAt) && !Number.isNaN(fallAt)) {
    timeHighS = (((fallAt - riseAt) % periodS) + periodS) % periodS;
  } else {
    timeHighS = pinHighS; // the pin never crosses its midpoint: fall back to the drive intervals
  }
  const timeLowS = periodS - timeHighS;

  const firstEdgeS = firstCrossing(ev, walk.log.count, midV);
  const rise = Number.isNaN(cycle.riseS) ? fallbackEdges.riseTimeS : cycle.riseS;
  const fall = Number.isNaN(cycle.fallS) ? fallbackEdges.fallTimeS : cycle.fallS;

  return {
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
    edges: { riseTimeS: rise, fallTimeS: fall },
    ...(limitedS > 0 ? { currentLimit: { limitedFraction: limitedS / periodS, demandPeakA } } : {}),
  };
}

/** First 50 % crossing of the pin from power-up (the log starts at t = 0). */
function firstCrossing(ev: PieceEvaluator, count: number, midV: number): number {
  let prevEnd = Number.NaN;
  for (let i = 0; i < count; i++) {
    ev.load(i);
    const cfg = ev.config;
    const c0 = cfg.oC - midV;
    const start = ev.atStart(c0, cfg.oV, cfg.oS);
    if (!Number.isNaN(prevEnd) && prevEnd < 0 !== start < 0) return ev.startS;
    const n = ev.crossings(c0, cfg.oV, cfg.oS, scratchT, scratchDir);
    if (n > 0) return ev.startS + scratchT[0];
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
