/**
 * The threshold network of a design, for one arrangement and hysteresis width:
 * the threshold pair (placed for the duty cycle, centred, or set by β), the
 * decision-node resistance the output and bias current allow, and the snapped
 * networks near the ideal at a few scales for the joint searches.
 */
import type { AmplifierModel } from '../amplifiers/model.ts';
import type { Supply } from '../circuit/types.ts';
import { CoreError } from '../errors.ts';
import { decisionResistanceBounds } from './bounds.ts';
import { hysteresisNear, joinHysteresis, thresholdTopology, type HysteresisCandidates } from './hysteresis.ts';
import type { ValueSetCache } from './role-sources.ts';
import { preferredScaleOhm, scalesWithin } from './scales.ts';
import { networkThresholds, placeThresholds, solveDivider, type ScreeningContext, type ThresholdPair } from './thresholds.ts';

/** Share of the supply-current budget given to the threshold network and to the timing branch (our design split). */
export const NETWORK_BUDGET_SHARE = 0.5;
const SCALES_PER_WIDTH = 3;
const SCALES_PER_DECADE = 2;

export interface NetworkPlanContext {
  ctx: ScreeningContext;
  amplifier: AmplifierModel;
  cache: ValueSetCache;
  rMin: number;
  rMax: number;
  /** Supply current left after the amplifier's own, A (Infinity: no budget). */
  budgetA: number;
}

export interface NetworkPlanOptions {
  /** Threshold pair to build (single-supply divider); default: placed for the duty cycle. */
  thresholds?: ThresholdPair;
  /** Topology whose value sources the network roles draw from (default: the network's own). */
  valuesTopology?: string;
}

export interface WidthPlan {
  hysteresis: HysteresisCandidates;
  thresholds: ThresholdPair;
}

export function withinCommonMode(t: ThresholdPair, supply: Supply, amp: AmplifierModel): boolean {
  return t.lowerV >= supply.negativeV + amp.inputCommonModeLowMarginV && t.upperV <= supply.positiveV - amp.inputCommonModeHighMarginV;
}

/**
 * Ideal networks near which to look, for one threshold-network topology
 * ('single-supply-divider' or 'split-supply') and width; a reason string when there are none.
 */
export function planWidth(topology: string, fraction: number, duty: number, plan: NetworkPlanContext, options: NetworkPlanOptions = {}): WidthPlan | string {
  const { ctx } = plan;
  const { levels, supply } = ctx;
  const swingV = levels.highV - levels.lowV;
  const amp = plan.amplifier;
  let thresholds: ThresholdPair;
  if (topology === 'single-supply-divider') {
    try {
      thresholds = options.thresholds ?? placeThresholds(duty, fraction * swingV, levels);
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
  const valuesTopology = options.valuesTopology ?? topology;
  const sets = Object.fromEntries(roles.map((role) => [role, plan.cache.forRole(valuesTopology, role, { min: plan.rMin, max: plan.rMax })]));
  const tables = scalesWithin(pMin, pMax, SCALES_PER_WIDTH, SCALES_PER_DECADE).map((scale) => {
    const ideal: Record<string, number> =
      topology === 'single-supply-divider' ? { ...solveDivider(thresholds, ctx, scale) } : { rFeedback: scale / (1 - fraction), rGround: scale / fraction };
    return hysteresisNear({ topology, ideal, sets, ctx, neighbours: 2, basePreference: Math.abs(Math.log10(scale / preferredScaleOhm(pMin, pMax))) });
  });
  return { hysteresis: joinHysteresis(tables), thresholds };
}
