/**
 * Cost-aware admission of Monte Carlo work. Some valid circuits are slow per evaluation (a C(V) timing
 * capacitor with strays at P or on the pin is solved piece by piece, about 2 ms an evaluation against
 * tens of µs for a linear capacitor), so a default-sized run can outlast the caller's deadline. Rather than
 * let the caller stop it after the fact, the run times its own first samples (the pilot: samples of the
 * run itself, drawn from the same seeded stream, so nothing is wasted and an admitted run is unchanged),
 * projects the whole analysis, and refuses at once when it would not fit, naming how many samples would.
 *
 * The clock is a monotonic millisecond clock handed in by the caller; by default `performance.now`
 * (monotonic, no I/O, the clock Monte Carlo already reads for elapsedS). Tests pass a clock of their own
 * so the projection, and so the verdict, is deterministic.
 */
import { CoreError } from '../errors.ts';
import type { Circuit } from '../circuit/types.ts';

export type MonotonicClockMs = () => number;

/** What the caller allows one analysis: a plain number (its share of its own deadline) and the clock. */
export interface AnalysisTimeBudget {
  /** Longest the whole analysis (nominal, worst case, Monte Carlo, sensitivities) may take, ms. */
  limitMs: number;
  /** Monotonic clock, ms (default performance.now). */
  clock?: MonotonicClockMs;
  /** What the caller offers besides fewer samples, e.g. a worst-case-only mode (ends the refusal's message). */
  alternative?: string;
}

/**
 * The pilot looks at the clock every PILOT_STRIDE samples (a clock reading per sample would cost the
 * closed form, ~2 µs an evaluation, several per cent). Its first PILOT_WARMUP_MS are not measured: the
 * first evaluations of a fresh thread run before the code is compiled and read an order of magnitude
 * above the settled cost (the closed form: ~25 µs against ~1.7 µs, measured here). The cost is then
 * taken over the next PILOT_MEASURE_MS. The slowest circuits (~2 ms an evaluation) decide at the second
 * look, after 128 samples; either way the pilot is a fraction of a second, short beside any deadline.
 */
export const PILOT_STRIDE = 64;
export const PILOT_WARMUP_MS = 100;
export const PILOT_MEASURE_MS = 100;

export const defaultClock: MonotonicClockMs = () => performance.now();

/** Rounds down to two significant figures (4,372 → 4,300), so the figure offered reads as advice, not as a measurement. */
export function readableFloor(n: number): number {
  if (!(n >= 1)) return 0;
  const whole = Math.floor(n);
  if (whole < 100) return whole;
  const unit = 10 ** (Math.floor(Math.log10(whole)) - 1);
  return Math.floor(whole / unit) * unit;
}

/** Why one evaluation of this circuit costs what it does (empty when nothing makes it slow). */
export function evaluationCostReason(circuit: Circuit, timeDomain: boolean): string {
  const curved = circuit.capacitorShape !== undefined && circuit.capacitorShape.kind !== 'flat';
  const atP = (circuit.strays?.thresholdNodeF ?? 0) > 0;
  const atPin = (circuit.strays?.outputNodeF ?? 0) > 0;
  const where = atP && atPin ? 'at P and on the output pin' : atP ? 'at P' : 'on the output pin';
  if (curved && (atP || atPin)) return `a C(V) timing capacitor with strays ${where} is solved piece by piece`;
  if (curved) return 'a C(V) timing capacitor is solved piece by piece';
  if (atP || atPin) return `strays ${where} add states to every piece of the period`;
  if (timeDomain) return 'the time-domain model walks every period piece by piece';
  return '';
}

export interface AdmissionFigures {
  requestedSamples: number;
  /** Samples drawn when the pilot decides. */
  drawnSamples: number;
  /** Measured cost of one sample, ms (after the warm-up). */
  perSampleMs: number;
  /** Time from the start of the analysis to the pilot's decision, ms. */
  elapsedMs: number;
  /** Evaluations the analysis still needs after Monte Carlo (sensitivities, variance budget). */
  laterEvaluations: number;
  limitMs: number;
  /** Why one evaluation costs what it does (evaluationCostReason). */
  costReason: string;
  /** What else the caller can do besides asking for fewer samples (ends the message). */
  alternative?: string;
}

/** Projected time of the whole analysis, ms. */
export function projectedMs(f: AdmissionFigures): number {
  return f.elapsedMs + (f.requestedSamples - f.drawnSamples + f.laterEvaluations) * f.perSampleMs;
}

/**
 * The pilot of one Monte Carlo run (monte-carlo.ts SamplingPilot): `figures` gives everything but the
 * pilot's own readings, `elapsedMs` the time since the analysis started.
 */
export function monteCarloPilot(figures: Omit<AdmissionFigures, 'drawnSamples' | 'perSampleMs' | 'elapsedMs'>, elapsedMs: () => number) {
  let warm: { samples: number; ms: number } | undefined;
  return {
    every: PILOT_STRIDE,
    check(samplesDrawn: number, pilotMs: number): boolean {
      if (!warm) {
        if (pilotMs >= PILOT_WARMUP_MS) warm = { samples: samplesDrawn, ms: pilotMs };
        return false;
      }
      const measuredMs = pilotMs - warm.ms;
      if (measuredMs < PILOT_MEASURE_MS) return false;
      admitMonteCarlo({ ...figures, drawnSamples: samplesDrawn, perSampleMs: measuredMs / (samplesDrawn - warm.samples), elapsedMs: elapsedMs() });
      return true;
    },
  };
}

/** Throws limit-exceeded at /monteCarlo/samples when the projection does not fit in the limit. */
export function admitMonteCarlo(f: AdmissionFigures): void {
  const projected = projectedMs(f);
  if (projected <= f.limitMs) return;
  const perEvaluationMs = f.perSampleMs;
  const fitting = f.drawnSamples + (f.limitMs - f.elapsedMs - f.laterEvaluations * perEvaluationMs) / perEvaluationMs;
  const limit = readableFloor(fitting);
  const cost = `≈${formatMs(perEvaluationMs)} per evaluation${f.costReason ? `: ${f.costReason}` : ''}`;
  const advice = limit >= 1 ? `ask for at most ${limit.toLocaleString('en-US')} samples` : 'the analysis without Monte Carlo already takes most of it';
  throw new CoreError(
    'limit-exceeded',
    `${f.requestedSamples.toLocaleString('en-US')} Monte Carlo samples would take about ${formatS(projected)} (${cost}), ` +
      `more than the ${formatS(f.limitMs)} this service allows one analysis; ${advice}${f.alternative ? `, or ${f.alternative}` : ''}`,
    '/monteCarlo/samples',
    { limit, requested: f.requestedSamples },
  );
}

/** Two significant figures without exponent notation (150, 2.1, 0.52). */
const twoFigures = (x: number) => String(Number(x.toPrecision(2)));

function formatMs(ms: number): string {
  return ms >= 1 ? `${twoFigures(ms)} ms` : `${twoFigures(ms * 1000)} µs`;
}

function formatS(ms: number): string {
  return `${twoFigures(ms / 1000)} s`;
}
