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
import { OUTPUT_RESISTANCE_WARNING_FRACTION, type Check } from '../circuit/checks.ts';
import { TIMING_STRAY_RATIO_MIN } from '../circuit/strays.ts';
import { formatPercent, formatSi } from '../circuit/format.ts';
import type { AnalysisResult } from '../circuit/result.ts';
import { canonicalTopologyId, findTopology, TOPOLOGIES } from '../circuit/topologies/index.ts';
import type { DiodeModel, Supply } from '../circuit/types.ts';
import { CoreError } from '../errors.ts';
import { parseDielectric, timingDielectricVerdict } from '../parts/dielectric.ts';
import { highKBudgetShortfall, highKShift } from './high-k-budget.ts';
import { checkRobustnessOptions, designRobustness, type DesignRobustness, type RobustnessOptions } from './robustness.ts';
import { requireFeasibleRequest, timingResistorBounds } from './bounds.ts';
import { DEFAULT_DUTY_TOLERANCE, jointSearch, type JointCandidate } from './joint-search.ts';
import { NETWORK_BUDGET_SHARE, planWidth, type NetworkPlanContext } from './network-plan.ts';
import { ValueSetCache, type RoleSources } from './role-sources.ts';
import { preferredScaleOhm } from './scales.ts';
import type { RoleValue } from './snap-value.ts';
import { designSteeredWidth, type RatioShortfall } from './steered-design.ts';
import type { SteeredCandidate } from './steered-search.ts';
import { screeningContext, timingFactors } from './thresholds.ts';

export interface DesignConstraints {
  rMinOhm?: number;
  rMaxOhm?: number;
  cMinF?: number;
  cMaxF?: number;
  /** Allowed dielectric codes for catalogue capacitors. */
  dielectrics?: readonly string[];
  /** Mean supply current budget including the amplifier's own, A. */
  maxSupplyCurrentA?: number;
  /** Stray plus input capacitance at the timing capacitor's node, F (default DEFAULT_NODE_CAPACITANCE_F). */
  nodeCapacitanceF?: number;
  /** Offer class II/III ceramic timing capacitors (default false: refused, as everywhere else). */
  allowHighKDielectric?: boolean;
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
  /** Tolerances, temperature, supply and Monte Carlo settings for each design's worst case and yield. */
  robustness?: RobustnessOptions;
}

/** One role's allowed range and what sets each end. */
export interface ValueLimit {
  role: string;
  min: number;
  max: number;
  minReason: string;
  maxReason: string;
  /** Which end the chosen value sits on (the first or last value the range allows), null when inside. */
  atLimit: 'min' | 'max' | null;
}

export interface Practicality {
  /** 0 when every value sits at the geometric middle of its window, 1 when at an edge (mean over roles). */
  edgeProximity: number;
  supplyCurrentA: number;
  partCount: number;
  /** Smaller is more practical: edgeProximity + 0.05·partCount + 0.2·log10(1 + supply current / 1 mA) + 1 for a class II/III timing capacitor (our weighting). */
  score: number;
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
  /** Worst case and yield against the requested tolerances (absent only while ranking). */
  robustness?: DesignRobustness;
  practicality?: Practicality;
  /** What bounds each role's value. */
  limits: ValueLimit[];
}

export interface DesignResult {
  designs: Design[];
  /** Why topologies or widths gave nothing, for callers tuning their request. */
  notes: string[];
}

export const DEFAULT_DESIGN_COUNT = 5;
/**
 * Default design windows (overridable through constraints): resistors 1 kΩ–1 MΩ (below, output drive and
 * supply current grow; above, leakage, pickup and bias current matter — common practice), timing capacitor
 * 100 pF–10 µF and at least NODE_CAPACITANCE_FACTOR × the stray and input capacitance at its node.
 */
export const DESIGN_WINDOWS = { resistor: { min: 1e3, max: 1e6 }, capacitor: { min: 100e-12, max: 10e-6 } } as const;
/** Input plus board stray capacitance at the inverting input, F (from memory, typical of the class: a few pF each). */
export const DEFAULT_NODE_CAPACITANCE_F = 5e-12;
/** The same window analyze checks (stray-capacitance-significant): one definition, circuit/strays.ts. */
export const NODE_CAPACITANCE_FACTOR = TIMING_STRAY_RATIO_MIN;
/** Request ranges that keep the search cost bounded by construction. */
export const DESIGN_REQUEST_RANGES = {
  targetFrequencyHz: { min: 1e-3, max: 1e8 },
  targetDutyCycle: { min: 0.01, max: 0.99 },
  dutyTolerance: { min: 1e-3, max: 0.25 },
  frequencyTolerance: { min: 1e-4, max: 0.5 },
  count: { min: 1, max: 20 },
} as const;
/** Designs whose worst case and yield are computed before the final ranking (the best by nominal error). */
const ROBUSTNESS_POOL = 16;
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

function inRange(value: number, field: keyof typeof DESIGN_REQUEST_RANGES, unit = ''): void {
  const r = DESIGN_REQUEST_RANGES[field];
  if (!(value >= r.min && value <= r.max)) throw new CoreError('invalid-value', `${field} must lie within ${r.min}${unit} to ${r.max}${unit}`, `/${field}`);
}

function checkRequest(req: DesignRequest): { duty: number; count: number } {
  inRange(req.targetFrequencyHz, 'targetFrequencyHz', ' Hz');
  const duty = req.targetDutyCycle ?? 0.5;
  inRange(duty, 'targetDutyCycle');
  inRange(req.frequencyTolerance, 'frequencyTolerance');
  if (req.dutyTolerance !== undefined) inRange(req.dutyTolerance, 'dutyTolerance');
  const count = req.count ?? DEFAULT_DESIGN_COUNT;
  if (!Number.isInteger(count)) throw new CoreError('invalid-value', 'count must be an integer', '/count');
  inRange(count, 'count');
  return { duty, count };
}

/** The shared timing-dielectric verdict (dielectric.ts) on each part of the capacitor: design, analyze and BOM judge alike. */
function dielectricChecks(capacitor: RoleValue, allowHighK: boolean): Check[] {
  const out: Check[] = [];
  for (const part of capacitor.parts) {
    if (!part.dielectric) continue;
    const v = timingDielectricVerdict(parseDielectric(part.dielectric), { allowHighK });
    if (v) {
      out.push({
        code: v.code,
        severity: v.severity,
        message: `Timing capacitor ${part.partNumber ?? ''} uses ${v.dielectric}: ${v.reason}`.replace('  ', ' '),
        dielectric: v.dielectric,
        hint: v.hint,
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
  // On split rails a divider returned to ground cannot place the pair off centre: steering sets such duties.
  const offCentreSplit = req.supply.negativeV < 0 && Math.abs(duty - 0.5) > (req.dutyTolerance ?? DEFAULT_DUTY_TOLERANCE);
  const defaults = steering ? STEERED_IDS : [...defaultTopologies(req.supply), ...(offCentreSplit ? STEERED_IDS : [])];
  const asked = [...new Set((req.topologies ?? defaults).map(canonicalTopologyId))];
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

function toDesign(c: JointCandidate | SteeredCandidate, fraction: number, duty: number, windows: Record<string, Omit<ValueLimit, 'role' | 'atLimit'>>, allowHighK: boolean): Design {
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
    checks: [...c.analysis.checks, ...dielectricChecks(c.parts[findTopology(c.topology)!.capacitorRole], allowHighK)],
    limits: Object.entries(windows).map(([role, w]) => {
      const v = c.parts[role]?.value;
      const atLimit = v === undefined ? null : v <= w.min * (1 + 1e-9) ? 'min' : v >= w.max * (1 - 1e-9) ? 'max' : null;
      return { role, ...w, atLimit };
    }),
  };
}

export function designOscillator(req: DesignRequest): DesignResult {
  const { duty, count } = checkRequest(req);
  const { supply, amplifier: amp } = req;
  const ctx = screeningContext(supply, amp);
  requireFeasibleRequest(supply, amp, ctx.levels, req.targetFrequencyHz);
  const c = req.constraints ?? {};
  const robust = checkRobustnessOptions(req.robustness ?? {});
  const rMin = c.rMinOhm ?? DESIGN_WINDOWS.resistor.min;
  const rMax = c.rMaxOhm ?? DESIGN_WINDOWS.resistor.max;
  const nodeF = c.nodeCapacitanceF ?? DEFAULT_NODE_CAPACITANCE_F;
  if (!(nodeF >= 0 && nodeF <= 1e-9)) throw new CoreError('invalid-value', 'constraints.nodeCapacitanceF must lie within 0 to 1 nF', '/constraints/nodeCapacitanceF');
  const strayFloorF = NODE_CAPACITANCE_FACTOR * nodeF;
  const cWindowMin = c.cMinF ?? DESIGN_WINDOWS.capacitor.min;
  const cMin = Math.max(cWindowMin, strayFloorF);
  const cMax = c.cMaxF ?? DESIGN_WINDOWS.capacitor.max;
  if (!(rMin >= 1 && rMax >= rMin && rMax <= 1e9)) throw new CoreError('invalid-value', 'constraints.rMinOhm/rMaxOhm must lie within 1 Ω to 1 GΩ with min <= max', '/constraints/rMinOhm');
  if (!(cMin >= 1e-12 && cMax >= cMin && cMax <= 1)) throw new CoreError('invalid-value', 'constraints.cMinF/cMaxF must lie within 1 pF to 1 F with min <= max (the minimum also covers 50× the node capacitance)', '/constraints/cMinF');
  const allowHighK = c.allowHighKDielectric === true;
  const rWindow = { min: rMin, max: rMax, minReason: c.rMinOhm !== undefined ? 'constraints.rMinOhm' : 'resistor window 1 kΩ', maxReason: c.rMaxOhm !== undefined ? 'constraints.rMaxOhm' : 'resistor window 1 MΩ' };
  const cWindow = {
    min: cMin,
    max: cMax,
    minReason: cMin === strayFloorF ? `${NODE_CAPACITANCE_FACTOR}× the ${formatSi(nodeF, 'F')} stray and input capacitance at the inverting input` : c.cMinF !== undefined ? 'constraints.cMinF' : 'capacitor window 100 pF',
    maxReason: c.cMaxF !== undefined ? 'constraints.cMaxF' : 'capacitor window 10 µF',
  };
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
  const cache = new ValueSetCache(req.values, c.dielectrics, allowHighK);
  const plan: NetworkPlanContext = { ctx, amplifier: amp, cache, rMin, rMax, budgetA };
  const dutyTolerance = req.dutyTolerance ?? DEFAULT_DUTY_TOLERANCE;
  const designs: Design[] = [];
  let best: Design | undefined;
  const ratioShortfalls: RatioShortfall[] = [];
  const reach = new ReachTracker();
  const highKNotes = new Map<string, string>();
  const keep = (d: Design) => {
    if (!best || Math.abs(d.frequencyError) < Math.abs(best.frequencyError)) best = d;
    const failing = d.checks.find((k) => k.severity === 'error');
    if (Math.abs(d.frequencyError) > req.frequencyTolerance) return;
    if (failing) return;
    if (c.maxSupplyCurrentA !== undefined && d.analysis.currents.supplyAverageA > c.maxSupplyCurrentA) return;
    if (!highKFits(d, req.frequencyTolerance, highKNotes)) return;
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
        const windows = Object.fromEntries([
          ...def.design!.thresholdNetworks.flatMap((n) => n.roles).map((role) => [role, rWindow] as const),
          [paths.charge, outcome.limits.charge],
          [paths.discharge, outcome.limits.discharge],
          [paths.capacitor, cWindow],
        ]);
        for (const cand of outcome.candidates) keep(toDesign(cand, fraction, duty, windows, allowHighK));
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
      let trMinReason = tb.minOhm > rMin ? tb.minReason : rWindow.minReason;
      // Keep the output resistance under the analysis's warning share of the timing resistance (checks.ts).
      const r0FloorOhm = amp.outputResistanceOhm / OUTPUT_RESISTANCE_WARNING_FRACTION;
      if (r0FloorOhm > trMin) {
        trMin = r0FloorOhm;
        trMinReason = `the ${formatSi(amp.outputResistanceOhm, 'Ω')} output resistance must stay below ${formatPercent(OUTPUT_RESISTANCE_WARNING_FRACTION)} of the timing resistance`;
      }
      const trMaxReason = tb.maxOhm < rMax ? tb.maxReason : rWindow.maxReason;
      if (Number.isFinite(budgetA)) {
        const budgetMin = (ctx.levels.highV - width.thresholds.lowerV) / (budgetA * (1 - NETWORK_BUDGET_SHARE));
        if (budgetMin > trMin) {
          trMin = budgetMin;
          trMinReason = 'constraints.maxSupplyCurrentA (half of what the amplifier leaves goes to the timing branch)';
        }
      }
      if (!(trMin <= trMax)) {
        notes.push(`${label}: no timing resistance satisfies ${tb.minReason} and ${tb.maxReason} within the resistor range`);
        continue;
      }
      const resistor = cache.forRole(topology, paths.resistor, { min: trMin, max: trMax });
      const capacitor = cache.forRole(topology, paths.capacitor, { min: cMin, max: cMax });
      const factors = timingFactors(width.thresholds, ctx.levels);
      if (factors) {
        const rLo = resistor.values[0];
        const rHi = resistor.values[resistor.values.length - 1];
        const cLo = capacitor.values[0];
        const cHi = capacitor.values[capacitor.values.length - 1];
        const r0 = amp.outputResistanceOhm;
        reach.offer(
          1 / (factors.periodTau * (rHi + r0) * cHi),
          `C ≤ ${formatSi(cHi, 'F')} (${cWindow.maxReason}) and ${paths.resistor} ≤ ${formatSi(rHi, 'Ω')} (${trMaxReason}) on ${topology}`,
          1 / (factors.periodTau * (rLo + r0) * cLo),
          `C ≥ ${formatSi(cLo, 'F')} (${cWindow.minReason}) and ${paths.resistor} ≥ ${formatSi(rLo, 'Ω')} (${trMinReason}) on ${topology}`,
        );
      }
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
      const windows = Object.fromEntries([
        ...def.design!.thresholdNetworks[0].roles.map((role) => [role, rWindow] as const),
        [paths.resistor, { min: trMin, max: trMax, minReason: trMinReason, maxReason: trMaxReason }],
        [paths.capacitor, cWindow],
      ]);
      for (const cand of result.candidates) keep(toDesign(cand, fraction, duty, windows, allowHighK));
    }
  }
  notes.push(...highKNotes.values());
  // Ranked by how much of each tolerance a design uses: frequency and duty together.
  const score = (d: Design) => Math.abs(d.frequencyError) / req.frequencyTolerance + Math.abs(d.dutyCycleError) / dutyTolerance;
  designs.sort((a, b) => score(a) - score(b));
  const pool = dedupe(designs).slice(0, Math.max(count, ROBUSTNESS_POOL));
  const unique = rankRobust(pool, req, duty, dutyTolerance, robust, notes).slice(0, count);
  if (unique.length === 0 && pool.length > 0 && robust.minYield !== undefined) {
    const top = pool.reduce((a, b) => ((b.robustness?.yield ?? 0) > (a.robustness?.yield ?? 0) ? b : a));
    throw new CoreError(
      'infeasible',
      `No design reaches the minimum yield of ${formatPercent(robust.minYield ?? 0)}: the best found yields ${formatPercent(top.robustness?.yield ?? 0)} ` +
        `against ±${formatPercent(req.frequencyTolerance)} over part tolerances ${Object.entries(top.robustness?.partTolerances ?? {}).map(([r, t]) => `${r} ${formatPercent(t)}`).join(', ')}, ` +
        `${robust.temperature.minC}..${robust.temperature.maxC} °C and a ±${formatPercent(robust.supplyTolerance)} supply; use tighter-tolerance parts (values.resistor/capacitor tolerance or a finer series), ` +
        'a narrower temperature range, or widen frequencyTolerance',
      '/robustness/minYield',
      { minYield: robust.minYield ?? 0, bestYield: top.robustness?.yield ?? 0, bestTopology: top.topology },
    );
  }
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
  if (unique.length === 0) reach.explain(req.targetFrequencyHz, req.frequencyTolerance);
  if (unique.length === 0 && designs.length === 0 && highKNotes.size > 0) {
    // Designs on target existed, but only with class II/III capacitors that drift out of the tolerance.
    throw new CoreError(
      'infeasible',
      `Every design found times with a class II/III ceramic capacitor whose DC-bias and ageing shifts leave the ±${formatPercent(req.frequencyTolerance)} tolerance: ` +
        `${[...highKNotes.values()].join('; ')}. Offer class I (C0G), film or mica capacitors, higher-rated or larger-case parts, or widen frequencyTolerance`,
      '/values/capacitor',
      { reasons: [...highKNotes.values()].join('; ') },
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

/**
 * The frequencies the value ranges can reach at all (screening model, per topology and width), so a
 * target outside them is refused with the limits that bind and the nearest target that is feasible.
 */
class ReachTracker {
  lowHz = Infinity;
  lowReason = '';
  highHz = 0;
  highReason = '';

  offer(lowHz: number, lowReason: string, highHz: number, highReason: string): void {
    if (lowHz < this.lowHz) Object.assign(this, { lowHz, lowReason });
    if (highHz > this.highHz) Object.assign(this, { highHz, highReason });
  }

  explain(targetHz: number, tolerance: number): void {
    if (Number.isFinite(this.lowHz) && targetHz * (1 + tolerance) < this.lowHz) {
      throw new CoreError(
        'infeasible',
        `${formatSi(targetHz, 'Hz')} is below the lowest frequency reachable with ${this.lowReason}: ${formatSi(this.lowHz, 'Hz')}. ` +
          'Allow a larger capacitor (constraints.cMaxF), a larger timing resistor (constraints.rMaxOhm, or a lower-bias amplifier when bias current sets it), or aim at or above that frequency',
        '/targetFrequencyHz',
        { lowestReachableHz: this.lowHz, nearestFeasibleFrequencyHz: this.lowHz, binding: this.lowReason },
      );
    }
    if (this.highHz > 0 && targetHz * (1 - tolerance) > this.highHz) {
      throw new CoreError(
        'infeasible',
        `${formatSi(targetHz, 'Hz')} is above the highest frequency reachable with ${this.highReason}: ${formatSi(this.highHz, 'Hz')}. ` +
          'Allow a smaller capacitor (constraints.cMinF, nodeCapacitanceF), a smaller timing resistor (constraints.rMinOhm, or an amplifier that drives more current), or aim at or below that frequency',
        '/targetFrequencyHz',
        { highestReachableHz: this.highHz, nearestFeasibleFrequencyHz: this.highHz, binding: this.highReason },
      );
    }
  }
}

/**
 * A class II/III timing capacitor stays only when its DC-bias and ageing shifts leave the frequency inside the
 * tolerance (high-k-budget.ts); otherwise the design is dropped and the reason noted once per part kind.
 */
function highKFits(d: Design, frequencyTolerance: number, notes: Map<string, string>): boolean {
  const capacitor = d.parts[findTopology(d.topology)!.capacitorRole];
  const { minV, maxV } = d.analysis.capacitor;
  for (const part of capacitor?.parts ?? []) {
    const shift = highKShift(part, minV, maxV);
    if (!shift) continue;
    const why = highKBudgetShortfall(shift, d.frequencyError, frequencyTolerance, minV, maxV);
    if (why) {
      const kind = `${d.topology}|${shift.dielectric}|${shift.ratedVoltageV}|${shift.caseSize}`;
      if (!notes.has(kind)) notes.set(kind, `${d.topology}: ${why}`);
      return false;
    }
  }
  return true;
}

/** Whether a design's timing capacitor is a class II/III ceramic (ranked after class I, film and mica). */
function usesHighK(d: Design): boolean {
  const capacitor = d.parts[findTopology(d.topology)!.capacitorRole];
  return (capacitor?.parts ?? []).some((p) => p.dielectric !== undefined && isHighK(p.dielectric));
}

function isHighK(code: string): boolean {
  try {
    const family = parseDielectric(code).family;
    return family === 'ceramic-class-2' || family === 'ceramic-class-3';
  } catch {
    return false;
  }
}

/** Practicality cost of a class II/III timing capacitor (our weighting: as much as a value at the edge of its window). */
const HIGH_K_PRACTICALITY_COST = 1;

/** Edge proximity of each value inside its window, in decades relative to the half-width (0 middle, 1 edge). */
function practicality(d: Design): Practicality {
  const proximities = d.limits
    .filter((l) => d.parts[l.role] && l.max > l.min)
    .map((l) => {
      const half = Math.log(l.max / l.min) / 2;
      return Math.min(1, Math.abs(Math.log(d.parts[l.role].value / Math.sqrt(l.min * l.max))) / half);
    });
  const edgeProximity = proximities.length ? proximities.reduce((a, b) => a + b, 0) / proximities.length : 0;
  const partCount = Object.values(d.parts).reduce((n, v) => n + v.parts.length, 0) + (d.diode ? 2 : 0);
  const supplyCurrentA = d.analysis.currents.supplyAverageA;
  const highK = usesHighK(d) ? HIGH_K_PRACTICALITY_COST : 0;
  return { edgeProximity, supplyCurrentA, partCount, score: edgeProximity + 0.05 * partCount + 0.2 * Math.log10(1 + supplyCurrentA / 1e-3) + highK };
}

/**
 * Worst case and yield for every pooled design, then the ranking: yield (in whole percent, finer
 * differences are within the sampling error), then the margin left at the worst corner, then practicality.
 */
function rankRobust(pool: Design[], req: DesignRequest, duty: number, dutyTolerance: number, robust: ReturnType<typeof checkRobustnessOptions>, notes: string[]): Design[] {
  const target = { frequencyHz: req.targetFrequencyHz, frequencyTolerance: req.frequencyTolerance, dutyCycle: duty, dutyTolerance };
  const kept: Design[] = [];
  for (const d of pool) {
    const def = findTopology(d.topology)!;
    const kinds = Object.fromEntries(Object.entries(def.roles).map(([role, spec]) => [role, spec.kind]));
    const values: Record<string, number> = Object.fromEntries(Object.entries(d.parts).map(([r, v]) => [r, v.value]));
    const circuit = { topology: d.topology, supply: req.supply, amplifier: req.amplifier, parts: values, ...(d.diode ? { diode: d.diode } : {}) };
    try {
      d.robustness = designRobustness(circuit, d.parts, kinds, target, robust);
    } catch (err) {
      if (err instanceof CoreError) {
        notes.push(`${d.topology} ${Object.entries(values).map(([r, v]) => `${r}=${formatSi(v, kinds[r] === 'capacitor' ? 'F' : 'Ω')}`).join(' ')}: no worst case (${err.message})`);
        continue;
      }
      throw err;
    }
    const wc = d.robustness.worstCase;
    if (![wc.frequencyMinHz, wc.frequencyMaxHz, wc.dutyMin, wc.dutyMax].every(Number.isFinite)) continue;
    d.practicality = practicality(d);
    kept.push(d);
  }
  const passing = robust.minYield === undefined ? kept : kept.filter((d) => d.robustness!.yield >= robust.minYield!);
  if (passing.length === 0) pool.splice(0, pool.length, ...kept);
  const yieldKey = (d: Design) => Math.floor(d.robustness!.yield * 100 + 1e-9);
  // Margin in steps of 5 % of the tolerance: finer differences do not make one board better than another.
  const marginKey = (d: Design) => Math.round(d.robustness!.marginFraction * 20);
  return passing.sort((a, b) => yieldKey(b) - yieldKey(a) || marginKey(b) - marginKey(a) || a.practicality!.score - b.practicality!.score);
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
