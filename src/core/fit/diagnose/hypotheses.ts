/**
 * The hypotheses the diagnosis weighs, built from the topology registry's roles
 * and the fit parameters (never from a hand list of roles):
 * - `nominal`: nothing is off (every effect within its tolerance or class spread);
 * - `off`: one effect (a part role, an amplifier effect, the supply) is off,
 *   free within its physical range with the `off` prior of parameters.ts;
 * - `wrong-part`: a part of another value was fitted — the neighbouring value
 *   of its preferred-number series, a decade slip (×10, ÷10), or two roles of
 *   the same kind swapped — or a timing capacitor of another dielectric class
 *   (its C(V) from the capacitor model, src/core/parts/capacitor): a class II
 *   ceramic whose DC-bias derating makes the charging curve non-exponential in
 *   place of a flat part, a flat part in place of a class II one, or a class II
 *   part that derates more or less than the one declared. Its marked value is
 *   a nuisance within a class II tolerance (one evaluation per curve: a C(V)
 *   walk costs far more than a linear one).
 * - `stray`: a capacitance or a leakage at the timing node N, or a capacitance
 *   at the threshold node P or at the output pin, that the circuit does not
 *   declare, fitted within a physical window (stray-hypotheses.ts).
 * DC-bias derating of the timing capacitor is weighed through the dielectric:
 * a declared class II part already derates in the nominal model (its C(V)), and
 * `other-dielectric` covers a part that derates more or less than declared, a
 * class II part where a flat one was designed, and the reverse.
 * Prior probabilities, our assumptions (orders of magnitude from assembly
 * practice, not measured): a given effect off 2 %; a specific wrong part 0.2 %
 * (shared among the class-typical curves of a dielectric swap); nothing off is
 * the rest.
 */
import { findTopology } from '../../circuit/topologies/index.ts';
import type { Circuit } from '../../circuit/types.ts';
import { CASE_SIZES, FLAT_SHAPE, JohnsonShape, typicalRetentionAtRated, type CaseSize } from '../../parts/capacitor/dc-bias.ts';
import { parseDielectric } from '../../parts/dielectric.ts';
import { isInSeries, nearestInSeries, type SeriesName } from '../../parts/series.ts';
import { TOLERANCE_SIGMAS, type FitParameter } from '../estimate/parameters.ts';
import type { CircuitVariant } from '../estimate/setup.ts';
import { strayEffects, type StrayEffect } from './stray-hypotheses.ts';

export type HypothesisKind = 'nominal' | 'off' | 'wrong-part' | 'stray';
export type WrongPartKind = 'neighbouring-value' | 'decade-slip' | 'swapped' | 'other-dielectric';

export interface Hypothesis {
  /** Stable id, e.g. "off:rTiming", "off:rTiming+recoveryDelayS", "decade-slip:rTiming×10", "swapped:rTop/rBottom". */
  id: string;
  kind: HypothesisKind;
  /** Parameters freed (indices into the setup's parameters), with their `off` prior unless activePriorSd says otherwise. */
  active: number[];
  /**
   * Nuisance prior σ (fitted space) by parameter index where the hypothesis widens it: a capacitor of another
   * dielectric has its own marked-value tolerance, marginalised like every other in-tolerance spread.
   */
  nuisanceSd?: Readonly<Record<number, number>>;
  /** What the hypothesis replaces in the circuit (wrong-part hypotheses): part values (natural units), the capacitor's C(V). */
  variant?: CircuitVariant;
  wrongPart?: { kind: WrongPartKind; roles: string[]; words: string };
  /** The stray a `stray` hypothesis fits (one scalar in its window). */
  stray?: StrayEffect;
  /** One scalar the hypothesis fits in its window (a stray's amount, a dielectric's C(V) scale), and what it makes of the circuit. */
  scalar?: ScalarFit;
  logPrior: number;
}

/** A scalar fitted within a window by a hypothesis of its own (not one of the setup's parameters). */
export interface ScalarFit {
  /** Kind 'stray' or 'part'-like, log-logit over its window; its prior is the hypothesis' own. */
  parameter: FitParameter;
  /** The circuit variant at a natural value of the scalar. */
  variantAt(value: number): CircuitVariant;
  /** Words for the cause at the fitted value. */
  words(value: number): string;
  /** Starting points tried across the window (fitted space) when the default few are too coarse for its response. */
  starts?: readonly number[];
  /** Search steps from the best start, when more than the default few are needed. */
  iterations?: number;
}

export const PRIOR_EFFECT_OFF = 0.02;
export const PRIOR_WRONG_PART = 0.002;
export const PRIOR_NOMINAL = 0.7;

/**
 * Series a value is checked against for its neighbours, coarsest stocked series first (common practice:
 * resistors are stocked in E24 and E96, capacitors in E12 and E6).
 */
const NEIGHBOUR_SERIES: Record<'resistor' | 'capacitor', readonly SeriesName[]> = { resistor: ['E24', 'E96', 'E192'], capacitor: ['E12', 'E24'] };

function neighbours(value: number, kind: 'resistor' | 'capacitor'): { series: SeriesName; lower: number; higher: number } | undefined {
  for (const series of NEIGHBOUR_SERIES[kind]) {
    if (!isInSeries(series, value, 1e-6)) continue;
    return { series, lower: nearestInSeries(series, value * (1 - 1e-6)).lower, higher: nearestInSeries(series, value * (1 + 1e-6)).higher };
  }
  return undefined;
}

/** A hook per source of wrong-part alternatives. */
type WrongPartSource = (circuit: Circuit, role: string, parameters: readonly FitParameter[]) => Hypothesis[];

const seriesNeighbour: WrongPartSource = (circuit, role) => {
  const value = circuit.parts[role];
  const n = neighbours(value, findTopology(circuit.topology)!.roles[role].kind);
  if (!n) return [];
  return [n.lower, n.higher].map((v) => ({
    id: `neighbouring-value:${role}=${Number(v.toPrecision(3))}`,
    kind: 'wrong-part' as const,
    active: [],
    variant: { parts: { [role]: v } },
    wrongPart: { kind: 'neighbouring-value' as const, roles: [role], words: `${role} is the neighbouring ${n.series} value` },
    logPrior: Math.log(PRIOR_WRONG_PART),
  }));
};

const decadeSlip: WrongPartSource = (circuit, role) =>
  [10, 0.1].map((factor) => ({
    id: `decade-slip:${role}${factor > 1 ? '×10' : '÷10'}`,
    kind: 'wrong-part' as const,
    active: [],
    variant: { parts: { [role]: circuit.parts[role] * factor } },
    wrongPart: { kind: 'decade-slip' as const, roles: [role], words: `${role} is a decade ${factor > 1 ? 'up (×10)' : 'down (÷10)'}` },
    logPrior: Math.log(PRIOR_WRONG_PART),
  }));

/**
 * Class II parts a timing capacitor may have been swapped for: class II and
 * III bodies (X7R, X5R, Y5V) in every case size and the common ratings, each
 * with its class-typical C(V) from the capacitor model (dc-bias.ts, Johnson's
 * law through the retention at the rated voltage). The hypothesis fits the
 * law's scale voltage within the span these parts cover (a curve between two
 * catalogued ones is as plausible as either: real parts scatter around the
 * class-typical figure), and names the nearest of them as an example.
 */
const CLASS_II_BODIES = ['X7R', 'X5R', 'Y5V'] as const;
const CLASS_II_RATINGS_V = [4, 6.3, 10, 16, 25, 50, 100] as const;

interface ClassTypicalPart {
  dielectric: string;
  caseSize: CaseSize;
  ratedVoltageV: number;
  retention: number;
  scaleV: number;
}

const CLASS_TYPICAL_PARTS: readonly ClassTypicalPart[] = CLASS_II_BODIES.flatMap((code) => {
  const d = parseDielectric(code);
  return CASE_SIZES.flatMap((caseSize) =>
    CLASS_II_RATINGS_V.map((ratedVoltageV) => {
      const retention = typicalRetentionAtRated(d, ratedVoltageV, caseSize);
      return { dielectric: code, caseSize, ratedVoltageV, retention, scaleV: JohnsonShape.throughRetention(ratedVoltageV, retention).scaleV };
    }),
  );
});

/** A curve that keeps this share of its capacitance at the largest bias the supply can put on it is flat for this circuit. */
const FLAT_ENOUGH = 0.97;
/** Marked-value tolerance of a class II timing capacitor: ±10 % (K, the usual class II grade; common practice). */
const CLASS_II_TOLERANCE = 0.1;
/** Prior σ of the scale voltage in its window (log-logit space): nearly flat across it, as for an effect that is off. */
const SCALE_PRIOR_SD = 1.8;

/** The class-typical part whose curve is nearest (log of the scale) to a fitted scale voltage. */
function nearestClassTypical(scaleV: number, maxBiasV: number): ClassTypicalPart {
  let best = CLASS_TYPICAL_PARTS[0];
  for (const p of CLASS_TYPICAL_PARTS) {
    // Only a part that could sit on this supply (rated at or above the bias it sees), when one is near.
    const fits = p.ratedVoltageV >= 0.5 * maxBiasV;
    const bestFits = best.ratedVoltageV >= 0.5 * maxBiasV;
    const closer = Math.abs(Math.log(p.scaleV / scaleV)) < Math.abs(Math.log(best.scaleV / scaleV));
    if ((fits && !bestFits) || (fits === bestFits && closer)) best = p;
  }
  return best;
}

/** The timing capacitor of another dielectric class (only the capacitor role; its marked value spreads within a class II tolerance). */
const otherDielectric: WrongPartSource = (circuit, role, parameters) => {
  const topology = findTopology(circuit.topology)!;
  if (role !== topology.capacitorRole) return [];
  const j = parameters.findIndex((p) => p.name === role);
  if (j < 0) return [];
  const declared = circuit.capacitorShape;
  const nuisanceSd = { [j]: Math.max(parameters[j].priorSd, Math.log(1 + CLASS_II_TOLERANCE) / TOLERANCE_SIGMAS) };
  const maxBiasV = Math.max(Math.abs(circuit.supply.positiveV), Math.abs(circuit.supply.negativeV));
  // The window: the strongest class-typical derating to the weakest one that still moves this circuit (FLAT_ENOUGH at the largest bias).
  const flatScaleV = maxBiasV / Math.sqrt(FLAT_ENOUGH ** -3 - 1);
  const scales = CLASS_TYPICAL_PARTS.map((p) => p.scaleV);
  const lo = Math.min(...scales);
  const hi = Math.min(Math.max(...scales), flatScaleV);
  const out: Hypothesis[] = [];
  if (hi > lo * 1.01) {
    const parameter: FitParameter = { name: 'capacitorScaleV', kind: 'part', unit: 'V', space: 'log-logit', nominal: declared instanceof JohnsonShape ? declared.scaleV : Infinity, lo, hi, priorMean: 0, priorSd: SCALE_PRIOR_SD, offSd: SCALE_PRIOR_SD, label: `${role} C(V) scale voltage` };
    const words = (scaleV: number) => {
      const shape = new JohnsonShape(scaleV);
      const example = nearestClassTypical(scaleV, maxBiasV);
      return (
        `${role} is a class II ceramic that loses capacitance with DC bias (fitted: keeps ${Math.round(100 * shape.ratio(maxBiasV))} % at ${Number(maxBiasV.toPrecision(3))} V), ` +
        `e.g. an ${example.dielectric}-like ${example.caseSize} ${example.ratedVoltageV} V part (class-typical C(V): ${Math.round(example.retention * 100)} % kept at ${example.ratedVoltageV} V)` +
        (declared && declared.kind !== 'flat' ? ', not the part declared' : ', not a flat dielectric')
      );
    };
    out.push({
      id: `other-dielectric:${role}=class-II`,
      kind: 'wrong-part',
      active: [],
      nuisanceSd,
      scalar: { parameter, variantAt: (scaleV) => ({ capacitorScaleV: scaleV }), words },
      wrongPart: { kind: 'other-dielectric', roles: [role], words: `${role} is a class II ceramic that loses capacitance with DC bias` },
      logPrior: Math.log(PRIOR_WRONG_PART),
    });
  }
  if (declared && declared.kind !== 'flat') {
    out.push({
      id: `other-dielectric:${role}=flat`,
      kind: 'wrong-part',
      active: [],
      nuisanceSd,
      variant: { capacitorShape: FLAT_SHAPE },
      wrongPart: { kind: 'other-dielectric', roles: [role], words: `${role} is a flat part (class I ceramic or film), not the class II part declared` },
      logPrior: Math.log(PRIOR_WRONG_PART),
    });
  }
  return out;
};

export const WRONG_PART_SOURCES: readonly WrongPartSource[] = [seriesNeighbour, decadeSlip, otherDielectric];

export function buildHypotheses(circuit: Circuit, parameters: readonly FitParameter[]): Hypothesis[] {
  const out: Hypothesis[] = [{ id: 'nominal', kind: 'nominal', active: [], logPrior: Math.log(PRIOR_NOMINAL) }];
  parameters.forEach((p, j) => out.push({ id: `off:${p.name}`, kind: 'off', active: [j], logPrior: Math.log(PRIOR_EFFECT_OFF) }));
  const topology = findTopology(circuit.topology)!;
  const roles = Object.keys(topology.roles).filter((r) => circuit.parts[r] !== undefined);
  for (const role of roles) for (const source of WRONG_PART_SOURCES) out.push(...source(circuit, role, parameters));
  for (let a = 0; a < roles.length; a++) {
    for (let b = a + 1; b < roles.length; b++) {
      const [ra, rb] = [roles[a], roles[b]];
      if (topology.roles[ra].kind !== topology.roles[rb].kind) continue;
      const [va, vb] = [circuit.parts[ra], circuit.parts[rb]];
      if (Math.abs(va / vb - 1) < 1e-6) continue; // swapping equal values changes nothing
      out.push({
        id: `swapped:${ra}/${rb}`,
        kind: 'wrong-part',
        active: [],
        variant: { parts: { [ra]: vb, [rb]: va } },
        wrongPart: { kind: 'swapped', roles: [ra, rb], words: `${ra} and ${rb} are swapped` },
        logPrior: Math.log(PRIOR_WRONG_PART),
      });
    }
  }
  for (const stray of strayEffects(circuit)) {
    out.push({
      id: `stray:${stray.field}`,
      kind: 'stray',
      active: [],
      stray,
      scalar: {
        parameter: stray.parameter,
        variantAt: (value) => ({ strays: stray.strays(circuit, value) }),
        words: (value) => stray.words(value),
        ...(stray.starts ? { starts: stray.starts } : {}),
        ...(stray.iterations ? { iterations: stray.iterations } : {}),
      },
      logPrior: Math.log(stray.prior),
    });
  }
  return out;
}

/** The two-cause hypothesis of two single `off` hypotheses. */
export function pairHypothesis(a: Hypothesis, b: Hypothesis, parameters: readonly FitParameter[]): Hypothesis {
  const active = [...a.active, ...b.active].sort((p, q) => p - q);
  return { id: `off:${active.map((j) => parameters[j].name).join('+')}`, kind: 'off', active, logPrior: a.logPrior + b.logPrior };
}
