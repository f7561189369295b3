/**
 * Forward design: target frequency and duty cycle, supply, amplifier and value
 * sources -> ranked complete designs whose every part exists in the chosen
 * series or catalogue.
 *
 * Per topology and hysteresis width: place the threshold pair for the duty
 * cycle (single-supply divider) or take β = width (split supply), bound the
 * resistances by what the output can drive and what bias current tolerates,
 * solve the ideal threshold network at a few scales, then hand the networks
 * near those ideals and the timing value sets to the joint search. Designs
 * outside the frequency or duty tolerance, with error-severity checks or above
 * the supply-current budget are dropped; none left -> 'infeasible' with the reasons.
 * Duty cycles beyond what placement reaches go to the diode-steered topology
 * (steered-design.ts), which sets them by the ratio of its two path resistors.
 */
import type { AmplifierModel } from '../amplifiers/model.ts';
import type { Check } from '../circuit/checks.ts';
import { formatPercent, formatSi } from '../circuit/format.ts';
import type { AnalysisResult } from '../circuit/result.ts';
import { canonicalTopologyId, findTopology, TOPOLOGIES } from '../circuit/topologies/index.ts';
import type { DiodeModel, Supply } from '../circuit/types.ts';
import { CoreError } from '../errors.ts';
import { parseDielectric } from '../parts/dielectric.ts';
import { requireFeasibleRequest, timingResistorBounds } from './bounds.ts';
import { DEFAULT_DUTY_TOLERANCE, jointSearch, type JointCandidate } from './joint-search.ts';
import { NETWORK_BUDGET_SHARE, planWidth, type NetworkPlanContext } from './network-plan.ts';
import { DEFAULT_RANGES, ValueSetCache, type RoleSources } from './role-sources.ts';
import { preferredScaleOhm } from './scales.ts';
import type { RoleValue } from './snap-value.ts';
import { designSteeredWidth, type RatioShortfall } from './steered-design.ts';
import type { SteeredCandidate } from './steered-search.ts';
import { screeningContext } from './thresholds.ts';

export interface DesignConstraints {
  rMinOhm?: number;
  rMaxOhm?: number;
  cMinF?: number;
  cMaxF?: number;
  /** Allowed dielectric codes for catalogue capacitors. */
  dielectrics?: readonly string[];
  /** Mean supply current budget including the amplifier's own, A. */
  maxSupplyCurrentA?: number;
}

export interface DesignRequest {
  targetFrequencyHz: number;
  /** Fraction of the period the output is high, default 0.5. */
  targetDutyCycle?: number;
  /** Absolute duty-cycle tolerance, default 0.02. */
  dutyTolerance?: number;
  /** Largest |frequencyError| accepted, fraction. */
  frequencyTolerance: number;
  supply: Supply;
  amplifier: AmplifierModel;
  values: RoleSources;
  constraints?: DesignConstraints;
  /**
   * Topologies to try. Default: inside PLACEMENT_DUTY_RANGE every threshold-placement
   * topology that suits the supply; outside it the diode-steered topology.
   */
  topologies?: readonly string[];
  /** Steering diodes of diode-steered designs (default DEFAULT_STEERING_DIODE). */
  diode?: DiodeModel;
  /** Designs to return, default 5. */
  count?: number;
}

export interface Design {
  topology: string;
  parts: Record<string, RoleValue>;
  predicted: { frequencyHz: number; dutyCycle: number };
  frequencyError: number;
  dutyCycleError: number;
  /** Hysteresis as a fraction of the output swing the design was built around. */
  hysteresisFraction: number;
  analysis: AnalysisResult;
  checks: Check[];
  /** The diode model the design was analysed with (diode-steered designs). */
  diode?: DiodeModel;
}

export interface DesignResult {
  designs: Design[];
  /** Why topologies or widths gave nothing, for callers tuning their request. */
  notes: string[];
}

export const DEFAULT_DESIGN_COUNT = 5;
/** Hysteresis widths tried, as fractions of the swing: the three-equal-resistor third first (textbook), then narrower. */
export const HYSTERESIS_FRACTIONS: readonly number[] = [1 / 3, 1 / 5, 1 / 8];
/** Duty cycles reachable by threshold placement alone (wider needs diode steering). */
export const PLACEMENT_DUTY_RANGE = { min: 0.1, max: 0.9 } as const;
const DESIGN_BAND_LIMIT = 200;

/** Threshold-placement topologies (one shared timing resistor) whose network suits the supply. */
function defaultTopologies(supply: Supply): string[] {
  // A feedback network needs a rail below ground to return its thresholds around.
  return TOPOLOGIES.filter((t) => t.design?.timing.kind === 'shared' && t.design.thresholdNetworks.some((n) => !n.needsNegativeRail || supply.negativeV < 0)).map((t) => t.id);
}

const isSteered = (id: string): boolean => findTopology(id)?.design?.timing.kind === 'steered';
const STEERED_IDS = TOPOLOGIES.filter((t) => t.design?.timing.kind === 'steered').map((t) => t.id);

function checkRequest(req: DesignRequest): { duty: number; count: number } {
  const f = req.targetFrequencyHz;
  if (!(f > 0) || !Number.isFinite(f)) throw new CoreError('invalid-value', 'targetFrequencyHz must be a finite frequency > 0', '/targetFrequencyHz');
  const duty = req.targetDutyCycle ?? 0.5;
  if (!(duty > 0 && duty < 1)) throw new CoreError('invalid-value', 'targetDutyCycle must lie strictly between 0 and 1', '/targetDutyCycle');
  if (!(req.frequencyTolerance > 0)) throw new CoreError('invalid-value', 'frequencyTolerance must be > 0', '/frequencyTolerance');
  const count = req.count ?? DEFAULT_DESIGN_COUNT;
  if (!(Number.isInteger(count) && count >= 1)) throw new CoreError('invalid-value', 'count must be a positive integer', '/count');
  return { duty, count };
}

function dielectricChecks(capacitor: RoleValue): Check[] {
  const out: Check[] = [];
  for (const part of capacitor.parts) {
    if (!part.dielectric) continue;
    const d = parseDielectric(part.dielectric);
    if (!d.fitForTiming) {
      out.push({
        code: 'timing-dielectric-unfit',
        severity: 'warning',
        message: `Timing capacitor ${part.partNumber ?? ''} uses ${d.code}: ${d.reason}`.replace('  ', ' '),
        dielectric: d.code,
      });
    }
  }
  return out;
}

function needsSteering(duty: number): boolean {
  return duty < PLACEMENT_DUTY_RANGE.min || duty > PLACEMENT_DUTY_RANGE.max;
}

/** The topologies to design, with notes for those the duty cycle rules out. */
function chooseTopologies(req: DesignRequest, duty: number, notes: string[]): string[] {
  const steering = needsSteering(duty);
  // Deprecated aliases name the same topologies; designs carry the current ids.
  const asked = [...new Set((req.topologies ?? (steering ? STEERED_IDS : defaultTopologies(req.supply))).map(canonicalTopologyId))];
  for (const t of asked) {
    const def = findTopology(t);
    if (!def?.design) {
      const supported = TOPOLOGIES.filter((d) => d.design).map((d) => d.id);
      throw new CoreError('infeasible', `Design does not size topology '${t}' (supported: ${supported.join(', ')})`, '/topologies');
    }
  }
  if (!steering) return asked;
  const range = `${PLACEMENT_DUTY_RANGE.min * 100} % to ${PLACEMENT_DUTY_RANGE.max * 100} %`;
  const kept = asked.filter(isSteered);
  for (const t of asked) if (!isSteered(t)) notes.push(`${t}: a duty cycle of ${formatPercent(duty)} is outside the ${range} that threshold placement reaches`);
  if (kept.length === 0) {
    const available = STEERED_IDS.length > 0;
    throw new CoreError(
      'infeasible',
      `A duty cycle of ${formatPercent(duty)} is outside the ${range} that threshold placement reaches` +
        (available ? `; include '${STEERED_IDS[0]}' in topologies (or leave topologies out) to steer it with diodes` : ', and no diode-steered topology is available'),
      '/targetDutyCycle',
      { targetDutyCycle: duty, placementMin: PLACEMENT_DUTY_RANGE.min, placementMax: PLACEMENT_DUTY_RANGE.max },
    );
  }
  return kept;
}

/** Roles a topology's design fills (its threshold networks plus timing parts), from the registry. */
function designRoles(topology: string): readonly string[] {
  const d = findTopology(topology)!.design!;
  const timing = d.timing.kind === 'shared' ? [d.timing.resistor, d.timing.capacitor] : [d.timing.charge, d.timing.discharge, d.timing.capacitor];
  return [...new Set([...d.thresholdNetworks.flatMap((n) => n.roles), ...timing])];
}

function toDesign(c: JointCandidate | SteeredCandidate, fraction: number, duty: number): Design {
  const timing = findTopology(c.topology)!.design!.timing;
  const diode = timing.kind === 'steered' ? (c.circuit.diode ?? timing.defaultDiode) : undefined;
  return {
    ...(diode ? { diode: { ...diode } } : {}),
    topology: c.topology,
    parts: c.parts,
    predicted: { frequencyHz: c.analysis.frequencyHz, dutyCycle: c.analysis.dutyCycle },
    frequencyError: c.frequencyError,
    dutyCycleError: c.analysis.dutyCycle - duty,
    hysteresisFraction: fraction,
    analysis: c.analysis,
    checks: [...c.analysis.checks, ...dielectricChecks(c.parts.cTiming)],
  };
}

export function designOscillator(req: DesignRequest): DesignResult {
  const { duty, count } = checkRequest(req);
  const { supply, amplifier: amp } = req;
  const ctx = screeningContext(supply, amp);
  requireFeasibleRequest(supply, amp, ctx.levels, req.targetFrequencyHz);
  const c = req.constraints ?? {};
  const rMin = c.rMinOhm ?? DEFAULT_RANGES.resistor.min;
  const rMax = c.rMaxOhm ?? DEFAULT_RANGES.resistor.max;
  const cMin = c.cMinF ?? DEFAULT_RANGES.capacitor.min;
  const cMax = c.cMaxF ?? DEFAULT_RANGES.capacitor.max;
  if (!(rMin > 0 && rMax >= rMin)) throw new CoreError('invalid-value', 'constraints.rMinOhm must be > 0 and not above rMaxOhm', '/constraints/rMinOhm');
  if (!(cMin > 0 && cMax >= cMin)) throw new CoreError('invalid-value', 'constraints.cMinF must be > 0 and not above cMaxF', '/constraints/cMinF');
  let budgetA = Infinity;
  if (c.maxSupplyCurrentA !== undefined) {
    budgetA = c.maxSupplyCurrentA - amp.quiescentCurrentA;
    if (!(budgetA > 0)) {
      throw new CoreError(
        'infeasible',
        `The amplifier alone draws ${formatSi(amp.quiescentCurrentA, 'A')}, leaving nothing of the ${formatSi(c.maxSupplyCurrentA, 'A')} supply-current budget`,
        '/constraints/maxSupplyCurrentA',
      );
    }
  }
  const notes: string[] = [];
  const topologies = chooseTopologies(req, duty, notes);
  for (const role of Object.keys(req.values.roles ?? {})) {
    const known = topologies.some((t) => designRoles(t).includes(role));
    if (!known) throw new CoreError('unexpected-part', `No topology being designed has a role '${role}'`, `/values/roles/${role}`);
  }
  const cache = new ValueSetCache(req.values, c.dielectrics);
  const plan: NetworkPlanContext = { ctx, amplifier: amp, cache, rMin, rMax, budgetA };
  const dutyTolerance = req.dutyTolerance ?? DEFAULT_DUTY_TOLERANCE;
  const designs: Design[] = [];
  let best: Design | undefined;
  const ratioShortfalls: RatioShortfall[] = [];
  const keep = (d: Design) => {
    if (!best || Math.abs(d.frequencyError) < Math.abs(best.frequencyError)) best = d;
    const failing = d.checks.find((k) => k.severity === 'error');
    if (Math.abs(d.frequencyError) > req.frequencyTolerance) return;
    if (failing) return;
    if (c.maxSupplyCurrentA !== undefined && d.analysis.currents.supplyAverageA > c.maxSupplyCurrentA) return;
    designs.push(d);
  };
  for (const topology of topologies) {
    for (const fraction of HYSTERESIS_FRACTIONS) {
      const label = `${topology}, hysteresis ${formatPercent(fraction)} of the swing`;
      const def = findTopology(topology)!;
      const paths = def.design!.timing;
      if (paths.kind === 'steered') {
        const outcome = designSteeredWidth(
          def,
          {
            fraction,
            targetFrequencyHz: req.targetFrequencyHz,
            targetDutyCycle: duty,
            frequencyTolerance: req.frequencyTolerance,
            dutyTolerance,
            diode: req.diode ?? paths.defaultDiode,
            capacitorRange: { min: cMin, max: cMax },
            count: count + 2,
          },
          plan,
        );
        if ('reason' in outcome) {
          notes.push(`${label}: ${outcome.reason}`);
          if (outcome.ratio) ratioShortfalls.push(outcome.ratio);
          continue;
        }
        if (outcome.candidates.length === 0) notes.push(`${label}: no combination reaches the duty-cycle tolerance`);
        for (const cand of outcome.candidates) keep(toDesign(cand, fraction, duty));
        continue;
      }
      const width = planWidth(def.design!.thresholdNetworks[0], topology, fraction, duty, plan);
      if (typeof width === 'string') {
        notes.push(`${label}: ${width}`);
        continue;
      }
      const tb = timingResistorBounds(width.thresholds, ctx.levels, amp);
      let trMin = Math.max(rMin, tb.minOhm);
      const trMax = Math.min(rMax, tb.maxOhm);
      if (Number.isFinite(budgetA)) trMin = Math.max(trMin, (ctx.levels.highV - width.thresholds.lowerV) / (budgetA * (1 - NETWORK_BUDGET_SHARE)));
      if (!(trMin <= trMax)) {
        notes.push(`${label}: no timing resistance satisfies ${tb.minReason} and ${tb.maxReason} within the resistor range`);
        continue;
      }
      const resistor = cache.forRole(topology, paths.resistor, { min: trMin, max: trMax });
      const capacitor = cache.forRole(topology, paths.capacitor, { min: cMin, max: cMax });
      const result = jointSearch({
        topology,
        supply,
        amplifier: amp,
        targetFrequencyHz: req.targetFrequencyHz,
        targetDutyCycle: duty,
        dutyTolerance,
        hysteresis: width.hysteresis,
        timing: { resistor, capacitor, seriesResistanceOhm: amp.outputResistanceOhm, preferredResistanceOhm: preferredScaleOhm(trMin, trMax) },
        count: count + 2,
        // Designs need a good answer inside the tolerance, not the last 1e-6 of the optimum.
        bandLimit: DESIGN_BAND_LIMIT,
      });
      if (result.candidates.length === 0) {
        notes.push(`${label}: no combination reaches the duty-cycle tolerance`);
        continue;
      }
      for (const cand of result.candidates) keep(toDesign(cand, fraction, duty));
    }
  }
  // Ranked by how much of each tolerance a design uses: frequency and duty together.
  const score = (d: Design) => Math.abs(d.frequencyError) / req.frequencyTolerance + Math.abs(d.dutyCycleError) / dutyTolerance;
  designs.sort((a, b) => score(a) - score(b));
  const unique = dedupe(designs).slice(0, count);
  if (unique.length === 0 && topologies.length === 1 && ratioShortfalls.length === HYSTERESIS_FRACTIONS.length) {
    // Every width failed on the resistor ratio alone: the duty cycle itself is out of reach.
    const r = ratioShortfalls[0];
    throw new CoreError(
      'infeasible',
      `No ${topologies[0]} design reaches a duty cycle of ${formatPercent(duty)}. ${notes.join('; ')}`,
      '/targetDutyCycle',
      { targetDutyCycle: duty, requiredResistanceRatio: r.requiredRatio, smallestResistanceRatio: r.smallestRatio, largestResistanceRatio: r.largestRatio },
    );
  }
  if (unique.length === 0) {
    const bestNote = best
      ? `; the closest found is ${formatPercent(best.frequencyError)} off (${best.topology})`
      : '';
    throw new CoreError(
      'infeasible',
      `No design meets the request within a frequency tolerance of ${formatPercent(req.frequencyTolerance)}${bestNote}${notes.length ? `. ${notes.join('; ')}` : ''}`,
      undefined,
      best
        ? { bestFrequencyError: best.frequencyError, bestFrequencyHz: best.predicted.frequencyHz, bestDutyCycle: best.predicted.dutyCycle, bestTopology: best.topology }
        : { reasons: notes.join('; ') },
    );
  }
  return { designs: unique, notes };
}

function dedupe(designs: Design[]): Design[] {
  const seen = new Set<string>();
  return designs.filter((d) => {
    const key = `${d.topology}|${Object.entries(d.parts)
      .sort(([a], [b]) => a.localeCompare(b))
      .map(([r, v]) => `${r}=${v.value}`)
      .join(',')}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}
