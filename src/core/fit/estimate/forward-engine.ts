/**
 * The fit's figures read off the exact time-domain engine, defined the way the
 * capture analysis measures them (not the way the analysis route reports them):
 * - output levels: time-mean of the pin over the pieces where the output stage
 *   sits at a level (slews left out: a histogram's state level ignores them);
 * - duty cycle and transition durations: 50 % and 10/90 % crossings of the pin
 *   between those levels (IEEE Std 181 reference levels);
 * - capacitor "extremes": the capacitor voltage at the output's 50 % crossings
 *   as a segment fit sees it, i.e. the settled exponential of the state before
 *   the edge extrapolated forward to the crossing, and that of the state after
 *   it extrapolated back, averaged (the capture pools both estimates);
 * - time constants: of the settled pieces.
 * Used where the effective-edge-delay closed form is not accurate enough (slow
 * slew against τ, ramps that do not finish, ...); see forward.ts.
 */
import type { PreparedCircuit } from '../../circuit/analyze.ts';
import { powerUpState } from '../../circuit/closed-form.ts';
import { LOG } from '../../circuit/engine/piece-log.ts';
import { OscillatorWalk, type SteadyCycle } from '../../circuit/engine/walker.ts';
import type { PredictedFigures } from './forward.ts';

/** One walk reused by every evaluation: the fit calls this thousands of times, synchronously. */
const walk = new OscillatorWalk();
const crossT = new Float64Array(2);
const crossDir = new Int8Array(2);

/** First rising and first falling crossing of the pin through levelV within the cycle, absolute times. */
function pinCrossings(cycle: SteadyCycle, levelV: number): { riseS: number; fallS: number } {
  const ev = walk.evaluator;
  let riseS = Number.NaN;
  let fallS = Number.NaN;
  ev.load(cycle.endIndex - 1);
  let prevEnd = ev.atEnd(ev.config.oC - levelV, ev.config.oV, ev.config.oS);
  for (let i = cycle.startIndex; i < cycle.endIndex; i++) {
    ev.load(i);
    const cfg = ev.config;
    const c0 = cfg.oC - levelV;
    const start = ev.atStart(c0, cfg.oV, cfg.oS);
    // A jump of the pin between pieces (instant edge) crosses at the boundary.
    if (prevEnd < 0 && start >= 0 && Number.isNaN(riseS)) riseS = ev.startS;
    if (prevEnd >= 0 && start < 0 && Number.isNaN(fallS)) fallS = ev.startS;
    const n = ev.crossings(c0, cfg.oV, cfg.oS, crossT, crossDir);
    for (let k = 0; k < n; k++) {
      if (crossDir[k] > 0 && Number.isNaN(riseS)) riseS = ev.startS + crossT[k];
      if (crossDir[k] < 0 && Number.isNaN(fallS)) fallS = ev.startS + crossT[k];
    }
    prevEnd = ev.atEnd(c0, cfg.oV, cfg.oS);
  }
  return { riseS, fallS };
}

/** Settled piece (output stage at a level, not slewing) of one target state, as an exponential. */
interface SettledExponential {
  startS: number;
  v0: number;
  asymptoteV: number;
  tauS: number;
}

function settledPieces(cycle: SteadyCycle, target: number): SettledExponential[] {
  const ev = walk.evaluator;
  const out: SettledExponential[] = [];
  for (let i = cycle.startIndex; i < cycle.endIndex; i++) {
    if (walk.log.get(i, LOG.rate) !== 0 || walk.log.get(i, LOG.target) !== target) continue;
    ev.load(i);
    const cfg = ev.config;
    if (!(cfg.a > 0)) continue;
    const s0 = walk.log.get(i, LOG.s0);
    out.push({ startS: ev.startS, v0: walk.log.get(i, LOG.v0), asymptoteV: (cfg.b0 + cfg.bS * s0) / cfg.a, tauS: 1 / cfg.a });
  }
  return out;
}

function valueAt(e: SettledExponential, tS: number): number {
  return e.asymptoteV + (e.v0 - e.asymptoteV) * Math.exp(-(tS - e.startS) / e.tauS);
}

/** The piece of `list` starting latest before tS (cyclically, shifting by the period), as [piece, time shift]. */
function latestBefore(list: SettledExponential[], tS: number, periodS: number): { e: SettledExponential; shiftS: number } | undefined {
  let best: { e: SettledExponential; shiftS: number } | undefined;
  for (const e of list) {
    const shiftS = e.startS <= tS ? 0 : -periodS;
    if (!best || e.startS + shiftS > best.e.startS + best.shiftS) best = { e, shiftS };
  }
  return best;
}

/** The piece of `list` starting first after tS (cyclically). */
function earliestAfter(list: SettledExponential[], tS: number, periodS: number): { e: SettledExponential; shiftS: number } | undefined {
  let best: { e: SettledExponential; shiftS: number } | undefined;
  for (const e of list) {
    const shiftS = e.startS >= tS ? 0 : periodS;
    if (!best || e.startS + shiftS < best.e.startS + best.shiftS) best = { e, shiftS };
  }
  return best;
}

/** Capacitor at an edge as the capture's segment fits see it: mean of the two extrapolations. */
function capacitorAtEdge(before: SettledExponential[], after: SettledExponential[], edgeS: number, periodS: number, fallbackV: number): number {
  const b = latestBefore(before, edgeS, periodS);
  const a = earliestAfter(after, edgeS, periodS);
  const values: number[] = [];
  if (b) values.push(valueAt(b.e, edgeS - b.shiftS));
  if (a) values.push(valueAt(a.e, edgeS - a.shiftS));
  return values.length === 0 ? fallbackV : values.reduce((s, x) => s + x, 0) / values.length;
}

const mod = (x: number, m: number) => ((x % m) + m) % m;

export function engineFigures(prepared: PreparedCircuit): PredictedFigures {
  walk.reset(prepared);
  walk.powerUp(powerUpState(prepared.high, prepared.low).initialState);
  const cycle = walk.runToSteadyState();
  const ev = walk.evaluator;
  const periodS = cycle.periodS;

  // Pin levels: mean over the pieces where the stage is not slewing, per target level.
  let highInt = 0;
  let highS = 0;
  let lowInt = 0;
  let lowS = 0;
  for (let i = cycle.startIndex; i < cycle.endIndex; i++) {
    if (walk.log.get(i, LOG.rate) !== 0) continue;
    ev.load(i);
    const cfg = ev.config;
    const pin = ev.integralFull(cfg.oC, cfg.oV, cfg.oS);
    if (ev.target) {
      highInt += pin;
      highS += ev.durationS;
    } else {
      lowInt += pin;
      lowS += ev.durationS;
    }
  }
  const outputHighV = highInt / highS;
  const outputLowV = lowInt / lowS;
  const swingV = outputHighV - outputLowV;
  const mid = pinCrossings(cycle, outputLowV + 0.5 * swingV);
  const ten = pinCrossings(cycle, outputLowV + 0.1 * swingV);
  const ninety = pinCrossings(cycle, outputLowV + 0.9 * swingV);
  const timeHighS = mod(mid.fallS - mid.riseS, periodS);

  const high = settledPieces(cycle, 1);
  const low = settledPieces(cycle, 0);
  const capacitorMaxV = capacitorAtEdge(high, low, mid.fallS, periodS, cycle.upperV);
  const capacitorMinV = capacitorAtEdge(low, high, mid.riseS, periodS, cycle.lowerV);
  const fallDecisionS = cycle.risingS + cycle.decisionHighS;
  const edgeDelayS = 0.5 * (mod(mid.riseS - cycle.risingS, periodS) + mod(mid.fallS - fallDecisionS, periodS));
  const tauOf = (list: SettledExponential[], fallback: number) => (list.length > 0 ? list[list.length - 1].tauS : fallback);
  return {
    frequencyHz: 1 / periodS,
    periodS,
    dutyCycle: timeHighS / periodS,
    capacitorMinV,
    capacitorMaxV,
    outputHighV,
    outputLowV,
    riseTimeS: mod(ninety.riseS - ten.riseS, periodS),
    fallTimeS: mod(ten.fallS - ninety.fallS, periodS),
    capacitorRisingTauS: tauOf(high, prepared.high.tauS),
    capacitorFallingTauS: tauOf(low, prepared.low.tauS),
    upperThresholdV: cycle.upperV,
    lowerThresholdV: cycle.lowerV,
    hysteresisRatio: (cycle.upperV - cycle.lowerV) / swingV,
    effectiveEdgeDelayS: edgeDelayS,
  };
}
