/**
 * Synthetic faulty boards for the diagnosis benchmark and its CI slice. The
 * scope records are made by the odex reference integrator
 * (test/core/circuit/engine-odex-reference.ts, Gragg–Bulirsch–Stoer
 * extrapolation from the npm registry, its own nodal solve and event
 * handling), never by the engine, so the engine's own assumptions are not
 * rewarded. Boards are built from the topology registry (roles by purpose, the
 * design knowledge's threshold network) and the archetype table — no hand
 * list of roles or topologies. Values are scenarios of our own.
 */
import { BUILT_IN_AMPLIFIERS } from '../../../src/core/amplifiers/archetypes.ts';
import type { AmplifierModel } from '../../../src/core/amplifiers/model.ts';
import { TOPOLOGIES, type TopologyDefinition } from '../../../src/core/circuit/topologies/index.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import { resolveCapacitor } from '../../../src/core/parts/capacitor/index.ts';
import { nearestInSeries } from '../../../src/core/parts/series.ts';
import type { FitInput, FitReport } from '../../../src/core/fit/index.ts';
import { referenceOscillation } from '../circuit/engine-odex-reference.ts';
import { addNoise, gaussian, quantise, seededRandom } from './capture-synth.ts';

export type ChannelSet = 'output' | 'capacitor' | 'both';
export const CHANNEL_SETS: readonly ChannelSet[] = ['output', 'capacitor', 'both'];

/** Bench tolerances: 1 % resistors, a 2 % film/C0G timing capacitor (common practice for timing parts). */
export const RESISTOR_TOLERANCE = 0.01;
export const CAPACITOR_TOLERANCE = 0.02;

/** Class II parts swapped in for the flat timing capacitor on the "other dielectric" boards. */
const OTHER_DIELECTRICS = [
  { dielectric: 'X7R', caseSize: '0603', ratedVoltageV: 6.3 },
  { dielectric: 'X5R', caseSize: '0402', ratedVoltageV: 10 },
] as const;

export interface Board {
  topology: string;
  nominal: Circuit;
  truth: Circuit;
  /** Role(s) at fault (empty: an in-tolerance board). */
  faultRoles: string[];
  fault: string;
  tolerances: Record<string, number>;
}

/** The push-pull (or open-drain) class archetype with the fastest slew whose supply range takes the span. */
function amplifierFor(topology: TopologyDefinition, spanV: number): AmplifierModel {
  const stage = topology.needsOpenDrain ? 'open-drain' : 'push-pull';
  const fits = BUILT_IN_AMPLIFIERS.filter((a) => a.figuresBasis === 'class-typical' && a.outputStage === stage && a.supplyMinV <= spanV && a.supplyMaxV >= spanV && !Number.isFinite(a.differentialClampV));
  return fits.reduce((x, y) => (y.slewRateVPerS > x.slewRateVPerS ? y : x));
}

/** A nominal board per registered topology: timing 10 kΩ / 10 nF, threshold resistors 100 kΩ, a 1 kΩ pull-up. */
export function nominalBoard(topology: TopologyDefinition): Circuit {
  const network = topology.design?.thresholdNetworks[0];
  const split = network?.needsNegativeRail ?? false;
  const supply = split ? { positiveV: 6, negativeV: -6 } : { positiveV: 5, negativeV: 0 };
  const parts: Record<string, number> = {};
  for (const [role, spec] of Object.entries(topology.roles)) {
    if (spec.kind === 'capacitor') parts[role] = 10e-9;
    else if (spec.purpose === 'timing') parts[role] = 10e3;
    else if (spec.purpose === 'output-level') parts[role] = 1e3;
    else if (!network || network.roles.includes(role)) parts[role] = 100e3;
  }
  const timing = topology.design?.timing;
  if (timing?.kind === 'steered') parts[timing.discharge] = 22e3; // duty away from 50 %
  return { topology: topology.id, supply, amplifier: amplifierFor(topology, supply.positiveV - supply.negativeV), parts };
}

function tolerancesOf(c: Circuit, topology: TopologyDefinition): Record<string, number> {
  return Object.fromEntries(Object.keys(c.parts).map((r) => [r, topology.roles[r].kind === 'capacitor' ? CAPACITOR_TOLERANCE : RESISTOR_TOLERANCE]));
}

/** Every part within its tolerance (uniform), the board in order. */
function scatter(c: Circuit, tol: Record<string, number>, rand: () => number): Record<string, number> {
  return Object.fromEntries(Object.entries(c.parts).map(([r, v]) => [r, v * (1 + (2 * rand() - 1) * tol[r])]));
}

/**
 * Boards for one topology: each role off by ±3–20 % (the rest scattered within
 * tolerance), the wrong-part faults (decade slip, neighbouring E24 value, a
 * swap of two same-kind roles of different value, a class II timing capacitor
 * in place of the flat one), and in-tolerance boards.
 */
export function boardsFor(topology: TopologyDefinition, seed: number, options: { deviationsPerRole: number; wrongParts: boolean; inTolerance: number }): Board[] {
  const rand = seededRandom(seed);
  const nominal = nominalBoard(topology);
  const tol = tolerancesOf(nominal, topology);
  const out: Board[] = [];
  const make = (parts: Record<string, number>, faultRoles: string[], fault: string) =>
    out.push({ topology: topology.id, nominal, truth: { ...nominal, parts }, faultRoles, fault, tolerances: tol });
  for (const role of Object.keys(nominal.parts)) {
    for (let k = 0; k < options.deviationsPerRole; k++) {
      const magnitude = 0.03 + 0.17 * rand();
      const d = (rand() < 0.5 ? -1 : 1) * magnitude;
      make({ ...scatter(nominal, tol, rand), [role]: nominal.parts[role] * (1 + d) }, [role], `${role} ${d > 0 ? '+' : ''}${(d * 100).toFixed(1)} %`);
    }
    if (options.wrongParts) {
      const v = nominal.parts[role];
      const slip = rand() < 0.5 ? 10 : 0.1;
      make({ ...scatter(nominal, tol, rand), [role]: v * slip }, [role], `${role} decade slip ×${slip}`);
      const n = nearestInSeries('E24', v * (1 + 1e-6));
      make({ ...scatter(nominal, tol, rand), [role]: rand() < 0.5 ? nearestInSeries('E24', v * (1 - 1e-6)).lower : n.higher }, [role], `${role} neighbouring E24 value`);
    }
  }
  if (options.wrongParts) {
    const roles = Object.keys(nominal.parts);
    for (let a = 0; a < roles.length; a++) {
      for (let b = a + 1; b < roles.length; b++) {
        const [ra, rb] = [roles[a], roles[b]];
        if (topology.roles[ra].kind !== topology.roles[rb].kind || nominal.parts[ra] === nominal.parts[rb]) continue;
        make({ ...scatter(nominal, tol, rand), [ra]: nominal.parts[rb], [rb]: nominal.parts[ra] }, [ra, rb], `${ra} and ${rb} swapped`);
      }
    }
    // Another dielectric: small-case class II ceramics of the same marked value (within their ±10 %) in place of the
    // flat timing capacitor; their class-typical C(V) from the capacitor model (cases and ratings of our choosing).
    const role = topology.capacitorRole;
    for (const part of OTHER_DIELECTRICS) {
      const marked = nominal.parts[role] * (1 + 0.1 * (2 * rand() - 1));
      const c = resolveCapacitor({ value: marked, ...part });
      out.push({
        topology: topology.id,
        nominal,
        truth: { ...nominal, parts: { ...scatter(nominal, tol, rand), [role]: c.capacitanceF }, capacitorShape: c.shape },
        faultRoles: [role],
        fault: `${role} other dielectric (${part.dielectric} ${part.caseSize} ${part.ratedVoltageV} V)`,
        tolerances: tol,
      });
    }
  }
  for (let k = 0; k < options.inTolerance; k++) make(scatter(nominal, tol, rand), [], 'in tolerance');
  return out;
}

export function allBoards(seed: number, options: { deviationsPerRole: number; wrongParts: boolean; inTolerance: number }): Board[] {
  return TOPOLOGIES.flatMap((t, k) => boardsFor(t, seed + 1000 * k, options));
}

/** Periods per record and samples per period of the synthetic scope records. */
const PERIODS = 8;
const SAMPLES_PER_PERIOD = 2000;

/** A board's steady-state record from the reference integrator, before noise and quantisation. */
export interface BoardRecord {
  intervalS: number;
  outputV: Float64Array;
  capacitorV: Float64Array;
}

/**
 * The board's scope record by the odex reference, made once per board (every
 * channel set is cut from it): SAMPLES_PER_PERIOD samples per period over
 * PERIODS periods from the steady state on. Undefined when the faulty board
 * does not oscillate (nothing to capture).
 */
export function boardRecord(board: Board): BoardRecord | undefined {
  let run;
  try {
    // 1e-8 of the span: far below the added noise (1e-3) and the 8-bit step.
    run = referenceOscillation(board.truth, { tolerance: 1e-8, maxCycles: 400, sample: { perPeriod: SAMPLES_PER_PERIOD, periods: PERIODS } });
  } catch {
    return undefined; // latched: nothing to capture
  }
  if (!(run.periodS > 0)) return undefined;
  return { intervalS: run.samples!.intervalS, outputV: run.samples!.outputV, capacitorV: run.samples!.capacitorV };
}

/**
 * A channel set of a board's record as a bench scope gives it: noise (0.2 % of
 * the span on the output, 0.1 % on the capacitor, 1σ) and 8-bit quantisation
 * over the rails plus 5 %, starting at a random phase.
 */
export function captureOf(board: Board, record: BoardRecord, channels: ChannelSet, seed: number): NonNullable<FitInput['capture']> {
  const { positiveV, negativeV } = board.truth.supply;
  const span = positiveV - negativeV;
  const lo = negativeV - 0.05 * span;
  const hi = positiveV + 0.05 * span;
  // Start the grid at a random phase: the reference samples from its steady-state instant on.
  const skip = Math.floor(gaussian(seededRandom(seed))() ** 2 * 100) % SAMPLES_PER_PERIOD;
  const output = quantise(addNoise(record.outputV.slice(skip), 2e-3 * span, seed + 1), 8, lo, hi);
  const capacitor = quantise(addNoise(record.capacitorV.slice(skip), 1e-3 * span, seed + 2), 8, lo, hi);
  return {
    sampleIntervalS: record.intervalS,
    ...(channels !== 'capacitor' ? { output } : {}),
    ...(channels !== 'output' ? { capacitor } : {}),
  };
}

/** One channel set of a board's record (undefined when the board does not oscillate). */
export function boardCapture(board: Board, channels: ChannelSet, seed: number): FitInput['capture'] | undefined {
  const record = boardRecord(board);
  return record && captureOf(board, record, channels, seed);
}

/** The roles a report's explanation names (a swap names both). */
const rolesOf = (e: FitReport['diagnosis']['explanations'][number]) => e.causes.map((c) => c.parameter);

export interface Verdict {
  faulty: boolean;
  /** A faulty board whose record departs from the nominal circuit allowing every tolerance (the service's verdict). */
  detected: boolean;
  top1: boolean;
  top3: boolean;
  /** top-1 / top-3 under the earlier, looser rule: any declared look-alike naming the fault counts, whatever the measurement it suggests. */
  looseTop1: boolean;
  looseTop3: boolean;
  falseAlarm: boolean;
}

/** Whether an explanation id blames a role at fault (a swap names both). */
const blamesFault = (board: Board, id: string) => board.faultRoles.some((r) => new RegExp(`\\b${r}\\b`).test(id));

/**
 * Whether the measurement an ambiguity suggests tells the fault from its
 * look-alike on the board itself: it must weigh a hypothesis that blames the
 * fault against one that does not, and where it is a swap experiment ("a part
 * of known value in role r, then the frequency") the board with that swap,
 * run by the odex reference, must land nearer the fault's prediction. Other
 * experiments (a figure not measured) are taken at their word.
 */
function separatesOnBoard(board: Board, ambiguity: FitReport['diagnosis']['ambiguities'][number]): boolean {
  const best = ambiguity.separatingMeasurement;
  if (!best || best.predictions.length !== 2) return false;
  const [a, b] = best.predictions;
  if (blamesFault(board, a.hypothesis) === blamesFault(board, b.hypothesis)) return false;
  const swap = /^frequencyHz with a known (\w+)$/.exec(best.figure);
  if (!swap) return true;
  const role = swap[1];
  const topology = TOPOLOGIES.find((t) => t.id === board.topology)!;
  const swapped: Circuit = { ...board.truth, parts: { ...board.truth.parts, [role]: board.nominal.parts[role] } };
  // A known capacitor is the part as declared, its own C(V) with it.
  if (role === topology.capacitorRole) {
    if (board.nominal.capacitorShape) swapped.capacitorShape = board.nominal.capacitorShape;
    else delete swapped.capacitorShape;
  }
  let frequencyHz: number;
  try {
    frequencyHz = 1 / referenceOscillation(swapped, { tolerance: 1e-8, maxCycles: 400 }).periodS;
  } catch {
    return false;
  }
  const [fault, other] = blamesFault(board, a.hypothesis) ? [a, b] : [b, a];
  return Math.abs(frequencyHz - fault.value) < Math.abs(frequencyHz - other.value);
}

/**
 * Scoring: a faulty board counts as found at rank k when one of the first k
 * explanations names a role at fault; when the service declares the leading
 * hypotheses indistinguishable, it counts when one of them blames the fault
 * and the measurement it suggests tells the fault apart on the board itself
 * (separatesOnBoard).
 * An in-tolerance board is a false alarm when the verdict says it departs.
 * A faulty board whose record the verdict finds within the tolerance spread is
 * not detected: its channels cannot tell the fault from parts in tolerance.
 */
export function score(board: Board, report: FitReport): Verdict {
  const faulty = board.faultRoles.length > 0;
  if (!faulty) return { faulty, detected: false, top1: false, top3: false, looseTop1: false, looseTop3: false, falseAlarm: !report.diagnosis.verdict.agreesWithNominal };
  const names = (k: number) => report.diagnosis.explanations.slice(0, k).some((e) => rolesOf(e).some((r) => board.faultRoles.includes(r)));
  const namedLookAlike = report.diagnosis.ambiguities.filter((a) => a.hypotheses.some((h) => blamesFault(board, h)));
  const ambiguous = namedLookAlike.some((a) => separatesOnBoard(board, a));
  const loose = namedLookAlike.length > 0;
  const leaderIsFault = !report.diagnosis.verdict.agreesWithNominal;
  return {
    faulty,
    detected: leaderIsFault,
    top1: leaderIsFault && (names(1) || ambiguous),
    top3: names(3) || ambiguous,
    looseTop1: leaderIsFault && (names(1) || loose),
    looseTop3: names(3) || loose,
    falseAlarm: false,
  };
}
