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
import type { ThresholdNetworkSpec } from '../circuit/topologies/index.ts';
import { hysteresisNear, joinHysteresis, type HysteresisCandidates } from './hysteresis.ts';
import type { ValueSetCache } from './role-sources.ts';
import { preferredScaleOhm, scalesWithin } from './scales.ts';
import type { ScreeningContext, ThresholdPair } from './thresholds.ts';

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
  /** Centre the pair on the swing instead of placing it for the duty cycle (diode steering sets the duty). */
  centred?: boolean;
}

export interface WidthPlan {
  hysteresis: HysteresisCandidates;
  thresholds: ThresholdPair;
}

export function withinCommonMode(t: ThresholdPair, supply: Supply, amp: AmplifierModel): boolean {
  return t.lowerV >= supply.negativeV + amp.inputCommonModeLowMarginV && t.upperV <= supply.positiveV - amp.inputCommonModeHighMarginV;
}

/**
 * Ideal networks near which to look, for one threshold network (`network`, of topology
 * `valuesTopology`, whose value sources its roles draw from) and width; a reason string when there are none.
 */
export function planWidth(
  network: ThresholdNetworkSpec,
  valuesTopology: string,
  fraction: number,
  duty: number,
  plan: NetworkPlanContext,
  options: NetworkPlanOptions = {},
): WidthPlan | string {
  const { ctx } = plan;
  const { levels, supply } = ctx;
  const amp = plan.amplifier;
  const noBias = { ...ctx, inputBiasCurrentA: 0 };
  let thresholds: ThresholdPair;
  let fractions: Record<string, number>;
  try {
    thresholds = options.centred ? network.centred(fraction, ctx) : network.thresholds(fraction, duty, ctx);
    // Fractions of the total conductance per branch at negligible bias: every resistor is Rp / fraction.
    fractions = Object.fromEntries(Object.entries(network.solve(thresholds, noBias, 1)).map(([role, r]) => [role, 1 / r]));
  } catch (err) {
    if (err instanceof CoreError) return err.message;
    throw err;
  }
  if (!withinCommonMode(thresholds, supply, amp)) {
    return `thresholds ${thresholds.lowerV.toPrecision(3)} V / ${thresholds.upperV.toPrecision(3)} V fall outside the input common-mode range`;
  }
  const hysteresisV = thresholds.upperV - thresholds.lowerV;
  const bounds = decisionResistanceBounds(fraction, levels, amp, hysteresisV);
  const fMax = Math.max(...Object.values(fractions));
  const fMin = Math.min(...Object.values(fractions));
  let pMin = Math.max(bounds.minOhm, plan.rMin * fMax);
  const pMax = Math.min(bounds.maxOhm, plan.rMax * fMin);
  if (Number.isFinite(plan.budgetA)) {
    // Current through the network's rail path: at most the supply span over its series resistance.
    const spanV = supply.positiveV - supply.negativeV;
    const pathFractions = network.railPathRoles.reduce((sum, role) => sum + 1 / fractions[role], 0);
    pMin = Math.max(pMin, spanV / (plan.budgetA * NETWORK_BUDGET_SHARE * pathFractions));
  }
  if (!(pMin <= pMax)) {
    return `no threshold-network scale satisfies ${bounds.minReason} and ${bounds.maxReason} within the resistor range`;
  }
  const sets = Object.fromEntries(network.roles.map((role) => [role, plan.cache.forRole(valuesTopology, role, { min: plan.rMin, max: plan.rMax })]));
  const tables = scalesWithin(pMin, pMax, SCALES_PER_WIDTH, SCALES_PER_DECADE).map((scale) => {
    const ideal = network.solve(thresholds, ctx, scale);
    return hysteresisNear({ network, ideal, sets, ctx, neighbours: 2, basePreference: Math.abs(Math.log10(scale / preferredScaleOhm(pMin, pMax))) });
  });
  return { hysteresis: joinHysteresis(tables), thresholds };
}
