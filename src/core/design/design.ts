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
 */
import type { AmplifierModel } from '../amplifiers/model.ts';
import type { Check } from '../circuit/checks.ts';
import { formatPercent, formatSi } from '../circuit/format.ts';
import type { AnalysisResult } from '../circuit/result.ts';
import { TOPOLOGY_IDS } from '../circuit/topologies/index.ts';
import type { Supply } from '../circuit/types.ts';
import { CoreError } from '../errors.ts';
import { parseDielectric } from '../parts/dielectric.ts';
import { decisionResistanceBounds, requireFeasibleRequest, timingResistorBounds } from './bounds.ts';
import { hysteresisNear, joinHysteresis, thresholdTopology, THRESHOLD_TOPOLOGIES, type HysteresisCandidates } from './hysteresis.ts';
import { DEFAULT_DUTY_TOLERANCE, jointSearch, type JointCandidate } from './joint-search.ts';
import { DEFAULT_RANGES, ValueSetCache, type RoleSources } from './role-sources.ts';
import { preferredScaleOhm, scalesWithin } from './scales.ts';
import type { RoleValue } from './snap-value.ts';
import { networkThresholds, placeThresholds, screeningContext, solveDivider, type ScreeningContext, type ThresholdPair } from './thresholds.ts';

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
  /** Topologies to try (default: every one design supports that suits the supply). */
  topologies?: readonly string[];
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
/** Share of the supply-current budget given to the threshold network and to the timing branch (our design split). */
const NETWORK_BUDGET_SHARE = 0.5;
const SCALES_PER_WIDTH = 3;
const DESIGN_BAND_LIMIT = 200;
const SCALES_PER_DECADE = 2;

const DIODE_STEERED_ID = 'diode-steered';

function defaultTopologies(supply: Supply): string[] {
  const ids = TOPOLOGY_IDS.filter((id) => id in THRESHOLD_TOPOLOGIES);
  // The split-supply network needs a rail below ground to return its thresholds around.
  return ids.filter((id) => id !== 'split-supply' || supply.negativeV < 0);
}

function checkRequest(req: DesignRequest): { duty: number; count: number } {
  const f = req.targetFrequencyHz;
  if (!(f > 0) || !Number.isFinite(f)) throw new CoreError('invalid-value', 'targetFrequencyHz must be a finite frequency > 0', '/targetFrequencyHz');
  const duty = req.targetDutyCycle ?? 0.5;
  if (!(duty > 0 && duty < 1)) throw new CoreError('invalid-value', 'targetDutyCycle must lie strictly between 0 and 1', '/targetDutyCycle');
  if (!(req.frequencyTolerance > 0)) throw new CoreError('invalid-value', 'frequencyTolerance must be > 0', '/frequencyTolerance');
  if (duty < PLACEMENT_DUTY_RANGE.min || duty > PLACEMENT_DUTY_RANGE.max) {
    if (!TOPOLOGY_IDS.includes(DIODE_STEERED_ID)) {
      throw new CoreError(
        'infeasible',
        `A duty cycle of ${formatPercent(duty)} is outside the ${PLACEMENT_DUTY_RANGE.min * 100} % to ${PLACEMENT_DUTY_RANGE.max * 100} % that threshold placement reaches, and no diode-steered topology is available`,
        '/targetDutyCycle',
        { targetDutyCycle: duty, placementMin: PLACEMENT_DUTY_RANGE.min, placementMax: PLACEMENT_DUTY_RANGE.max },
      );
    }
    throw new CoreError('infeasible', `Design does not yet size the '${DIODE_STEERED_ID}' topology for a duty cycle of ${formatPercent(duty)}`, '/targetDutyCycle');
  }
  const count = req.count ?? DEFAULT_DESIGN_COUNT;
  if (!(Number.isInteger(count) && count >= 1)) throw new CoreError('invalid-value', 'count must be a positive integer', '/count');
  return { duty, count };
}

function withinCommonMode(t: ThresholdPair, supply: Supply, amp: AmplifierModel): boolean {
  return t.lowerV >= supply.negativeV + amp.inputCommonModeLowMarginV && t.upperV <= supply.positiveV - amp.inputCommonModeHighMarginV;
}

interface WidthPlan {
  hysteresis: HysteresisCandidates;
  thresholds: ThresholdPair;
}

interface Plan {
  ctx: ScreeningContext;
  cache: ValueSetCache;
  rMin: number;
  rMax: number;
  budgetA: number;
}

/** Ideal networks near which to look, for one topology and width; a reason string when there are none. */
function planWidth(topology: string, fraction: number, duty: number, req: DesignRequest, plan: Plan): WidthPlan | string {
  const { ctx } = plan;
  const { levels, supply } = ctx;
  const swingV = levels.highV - levels.lowV;
  const amp = req.amplifier;
  let thresholds: ThresholdPair;
  if (topology === 'single-supply-divider') {
    thresholds = placeThresholds(duty, fraction * swingV, levels);
    try {
      solveDivider(thresholds, { ...ctx, inputBiasCurrentA: 0 }, 1);
    } catch (err) {
      if (err instanceof CoreError) return err.message;
      throw err;
    }
  } else {
    // β = rGround / (rGround + rFeedback) = width / swing.
    thresholds = networkThresholds({ toGroundOhm: fraction, toOutputOhm: 1 - fraction }, { ...ctx, inputBiasCurrentA: 0 });
  }
  if (!withinCommonMode(thresholds, supply, amp)) {
    return `thresholds ${thresholds.lowerV.toPrecision(3)} V / ${thresholds.upperV.toPrecision(3)} V fall outside the input common-mode range`;
  }
  const hysteresisV = thresholds.upperV - thresholds.lowerV;
  const bounds = decisionResistanceBounds(fraction, levels, amp, hysteresisV);
  // Fractions of the total conductance per branch at negligible bias: every resistor is Rp / fraction.
  const fractions: Record<string, number> = {};
  if (topology === 'single-supply-divider') {
    const probe = solveDivider(thresholds, { ...ctx, inputBiasCurrentA: 0 }, 1);
    for (const [role, r] of Object.entries(probe)) fractions[role] = 1 / r;
  } else {
    fractions.rFeedback = 1 - fraction;
    fractions.rGround = fraction;
  }
  const fMax = Math.max(...Object.values(fractions));
  const fMin = Math.min(...Object.values(fractions));
  let pMin = Math.max(bounds.minOhm, plan.rMin * fMax);
  const pMax = Math.min(bounds.maxOhm, plan.rMax * fMin);
  if (Number.isFinite(plan.budgetA)) {
    // Current from V+ through the network: at most supply span over the series path (rTop + rBottom, or rFeedback + rGround).
    const spanV = supply.positiveV - supply.negativeV;
    const pathFractions = topology === 'single-supply-divider' ? 1 / fractions.rTop + 1 / fractions.rBottom : 1 / fractions.rFeedback + 1 / fractions.rGround;
    pMin = Math.max(pMin, spanV / (plan.budgetA * NETWORK_BUDGET_SHARE * pathFractions));
  }
  if (!(pMin <= pMax)) {
    return `no threshold-network scale satisfies ${bounds.minReason} and ${bounds.maxReason} within the resistor range`;
  }
  const roles = thresholdTopology(topology).roles;
  const sets = Object.fromEntries(roles.map((role) => [role, plan.cache.forRole(topology, role, { min: plan.rMin, max: plan.rMax })]));
  const tables = scalesWithin(pMin, pMax, SCALES_PER_WIDTH, SCALES_PER_DECADE).map((scale) => {
    const ideal: Record<string, number> =
      topology === 'single-supply-divider' ? { ...solveDivider(thresholds, ctx, scale) } : { rFeedback: scale / (1 - fraction), rGround: scale / fraction };
    return hysteresisNear({ topology, ideal, sets, ctx, neighbours: 2, basePreference: Math.abs(Math.log10(scale / preferredScaleOhm(pMin, pMax))) });
  });
  return { hysteresis: joinHysteresis(tables), thresholds };
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

function toDesign(c: JointCandidate, fraction: number, duty: number): Design {
  return {
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
  const topologies = req.topologies ?? defaultTopologies(supply);
  for (const t of topologies) thresholdTopology(t); // throws with the supported list
  for (const role of Object.keys(req.values.roles ?? {})) {
    const known = topologies.some((t) => THRESHOLD_TOPOLOGIES[t].roles.includes(role) || role === 'rTiming' || role === 'cTiming');
    if (!known) throw new CoreError('unexpected-part', `No topology being designed has a role '${role}'`, `/values/roles/${role}`);
  }
  const cache = new ValueSetCache(req.values, c.dielectrics);
  const plan: Plan = { ctx, cache, rMin, rMax, budgetA };
  const dutyTolerance = req.dutyTolerance ?? DEFAULT_DUTY_TOLERANCE;
  const notes: string[] = [];
  const designs: Design[] = [];
  let best: Design | undefined;
  for (const topology of topologies) {
    for (const fraction of HYSTERESIS_FRACTIONS) {
      const label = `${topology}, hysteresis ${formatPercent(fraction)} of the swing`;
      const width = planWidth(topology, fraction, duty, req, plan);
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
      const resistor = cache.forRole(topology, 'rTiming', { min: trMin, max: trMax });
      const capacitor = cache.forRole(topology, 'cTiming', { min: cMin, max: cMax });
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
      for (const cand of result.candidates) {
        const d = toDesign(cand, fraction, duty);
        if (!best || Math.abs(d.frequencyError) < Math.abs(best.frequencyError)) best = d;
        const failing = d.checks.find((k) => k.severity === 'error');
        if (Math.abs(d.frequencyError) > req.frequencyTolerance) continue;
        if (failing) continue;
        if (c.maxSupplyCurrentA !== undefined && d.analysis.currents.supplyAverageA > c.maxSupplyCurrentA) continue;
        designs.push(d);
      }
    }
  }
  // Ranked by how much of each tolerance a design uses: frequency and duty together.
  const score = (d: Design) => Math.abs(d.frequencyError) / req.frequencyTolerance + Math.abs(d.dutyCycleError) / dutyTolerance;
  designs.sort((a, b) => score(a) - score(b));
  const unique = dedupe(designs).slice(0, count);
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
