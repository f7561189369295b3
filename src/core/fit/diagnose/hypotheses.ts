/**
 * The hypotheses the diagnosis weighs, built from the topology registry's roles
 * and the fit parameters (never from a hand list of roles):
 * - `nominal`: nothing is off (every effect within its tolerance or class spread);
 * - `off`: one effect (a part role, an amplifier effect, the supply) is off,
 *   free within its physical range with the `off` prior of parameters.ts;
 * - `wrong-part`: a part of another value was fitted — the neighbouring value
 *   of its preferred-number series, a decade slip (×10, ÷10), or two roles of
 *   the same kind swapped. A capacitor of another dielectric class joins here
 *   once the capacitor model carries one (see WRONG_PART_SOURCES).
 * Prior probabilities, our assumptions (orders of magnitude from assembly
 * practice, not measured): a given effect off 2 %; a specific wrong part 0.2 %;
 * nothing off is the rest.
 */
import { findTopology } from '../../circuit/topologies/index.ts';
import type { Circuit } from '../../circuit/types.ts';
import { isInSeries, nearestInSeries, type SeriesName } from '../../parts/series.ts';
import type { FitParameter } from '../estimate/parameters.ts';

export type HypothesisKind = 'nominal' | 'off' | 'wrong-part';
export type WrongPartKind = 'neighbouring-value' | 'decade-slip' | 'swapped';

export interface Hypothesis {
  /** Stable id, e.g. "off:rTiming", "off:rTiming+recoveryDelayS", "decade-slip:rTiming×10", "swapped:rTop/rBottom". */
  id: string;
  kind: HypothesisKind;
  /** Parameters freed with their `off` prior (indices into the setup's parameters). */
  active: number[];
  /** Part values replaced (wrong-part hypotheses), natural units. */
  parts?: Record<string, number>;
  wrongPart?: { kind: WrongPartKind; roles: string[]; words: string };
  logPrior: number;
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

/** A hook per source of wrong-part alternatives; the dielectric-class source joins when the capacitor model has classes. */
type WrongPartSource = (circuit: Circuit, role: string) => Hypothesis[];

const seriesNeighbour: WrongPartSource = (circuit, role) => {
  const value = circuit.parts[role];
  const n = neighbours(value, findTopology(circuit.topology)!.roles[role].kind);
  if (!n) return [];
  return [n.lower, n.higher].map((v) => ({
    id: `neighbouring-value:${role}=${Number(v.toPrecision(3))}`,
    kind: 'wrong-part' as const,
    active: [],
    parts: { [role]: v },
    wrongPart: { kind: 'neighbouring-value' as const, roles: [role], words: `${role} is the neighbouring ${n.series} value` },
    logPrior: Math.log(PRIOR_WRONG_PART),
  }));
};

const decadeSlip: WrongPartSource = (circuit, role) =>
  [10, 0.1].map((factor) => ({
    id: `decade-slip:${role}${factor > 1 ? '×10' : '÷10'}`,
    kind: 'wrong-part' as const,
    active: [],
    parts: { [role]: circuit.parts[role] * factor },
    wrongPart: { kind: 'decade-slip' as const, roles: [role], words: `${role} is a decade ${factor > 1 ? 'up (×10)' : 'down (÷10)'}` },
    logPrior: Math.log(PRIOR_WRONG_PART),
  }));

export const WRONG_PART_SOURCES: readonly WrongPartSource[] = [seriesNeighbour, decadeSlip];

export function buildHypotheses(circuit: Circuit, parameters: readonly FitParameter[]): Hypothesis[] {
  const out: Hypothesis[] = [{ id: 'nominal', kind: 'nominal', active: [], logPrior: Math.log(PRIOR_NOMINAL) }];
  parameters.forEach((p, j) => out.push({ id: `off:${p.name}`, kind: 'off', active: [j], logPrior: Math.log(PRIOR_EFFECT_OFF) }));
  const topology = findTopology(circuit.topology)!;
  const roles = Object.keys(topology.roles).filter((r) => circuit.parts[r] !== undefined);
  for (const role of roles) for (const source of WRONG_PART_SOURCES) out.push(...source(circuit, role));
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
        parts: { [ra]: vb, [rb]: va },
        wrongPart: { kind: 'swapped', roles: [ra, rb], words: `${ra} and ${rb} are swapped` },
        logPrior: Math.log(PRIOR_WRONG_PART),
      });
    }
  }
  return out;
}

/** The two-cause hypothesis of two single `off` hypotheses. */
export function pairHypothesis(a: Hypothesis, b: Hypothesis, parameters: readonly FitParameter[]): Hypothesis {
  const active = [...a.active, ...b.active].sort((p, q) => p - q);
  return { id: `off:${active.map((j) => parameters[j].name).join('+')}`, kind: 'off', active, logPrior: a.logPrior + b.logPrior };
}
