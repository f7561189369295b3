/**
 * One hysteresis width of a diode-steered design: the threshold network (the
 * single-rail divider centred on the swing, or rFeedback + rGround on split
 * rails), the range each steering resistor may take, whether the duty cycle's
 * resistor ratio fits in those ranges at all, then the joint search.
 */
import type { ThresholdNetworkSpec, TopologyDefinition } from '../circuit/topologies/index.ts';
import type { DiodeModel } from '../circuit/types.ts';
import { CoreError } from '../errors.ts';
import { formatPercent, formatSi } from '../circuit/format.ts';
import { NETWORK_BUDGET_SHARE, planWidth, type NetworkPlanContext } from './network-plan.ts';
import { steeredSearch, type SteeredCandidate } from './steered-search.ts';
import { steeredDwellFactors, steeringResistorBounds } from './steered-timing.ts';
import type { ThresholdPair } from './thresholds.ts';
import type { ValueRange } from './value-set.ts';

export interface SteeredWidthRequest {
  fraction: number;
  targetFrequencyHz: number;
  targetDutyCycle: number;
  frequencyTolerance: number;
  dutyTolerance: number;
  diode: DiodeModel;
  capacitorRange: ValueRange;
  count: number;
}

/** The path-resistance ratio the duty cycle needs against what the bounds allow. */
export interface RatioShortfall {
  /** (rCharge + rD + r0) / (rDischarge + rD + r0) the target duty needs. */
  requiredRatio: number;
  smallestRatio: number;
  largestRatio: number;
}

/** A steering resistor's allowed range and what sets each end. */
export interface PathLimit {
  min: number;
  max: number;
  minReason: string;
  maxReason: string;
}

export type SteeredWidthOutcome =
  | { candidates: SteeredCandidate[]; thresholds: ThresholdPair; limits: { charge: PathLimit; discharge: PathLimit } }
  | { reason: string; ratio?: RatioShortfall };

/** The steered topology's threshold network for this supply: its first arrangement the supply suits (registry order). */
export function steeredArrangement(topology: TopologyDefinition, negativeV: number): ThresholdNetworkSpec {
  const networks = topology.design?.thresholdNetworks ?? [];
  const fits = networks.find((n) => !n.needsNegativeRail || negativeV < 0);
  if (!fits) throw new CoreError('infeasible', `Topology '${topology.id}' has no threshold network for this supply`, '/supply');
  return fits;
}

/** The steered topology's timing roles (registry). */
function steeredRoles(topology: TopologyDefinition): { charge: string; discharge: string; capacitor: string } {
  const t = topology.design?.timing;
  if (t?.kind !== 'steered') throw new CoreError('infeasible', `Topology '${topology.id}' has no steered timing paths`, '/topologies');
  return t;
}

export function designSteeredWidth(topology: TopologyDefinition, req: SteeredWidthRequest, plan: NetworkPlanContext): SteeredWidthOutcome {
  const { ctx, amplifier: amp } = plan;
  const { levels, supply } = ctx;
  const { diode, fraction } = req;
  const roles = steeredRoles(topology);
  const arrangement = steeredArrangement(topology, supply.negativeV);
  const width = planWidth(arrangement, topology.id, fraction, req.targetDutyCycle, plan, { centred: true });
  if (typeof width === 'string') return { reason: width };
  const t = width.thresholds;
  const factors = steeredDwellFactors(t, levels, diode.forwardDropV);
  if (!factors) {
    return {
      reason: `thresholds ${t.lowerV.toPrecision(3)} V / ${t.upperV.toPrecision(3)} V do not lie inside the asymptotes ${formatSi(levels.lowV + diode.forwardDropV, 'V')} / ${formatSi(levels.highV - diode.forwardDropV, 'V')} the ${formatSi(diode.forwardDropV, 'V')} diode drop leaves`,
    };
  }
  const b = steeringResistorBounds(t, levels, amp, diode);
  let chargeMin = Math.max(plan.rMin, b.charge.minOhm);
  const chargeMax = Math.min(plan.rMax, b.charge.maxOhm);
  const dischargeMin = Math.max(plan.rMin, b.discharge.minOhm);
  const dischargeMax = Math.min(plan.rMax, b.discharge.maxOhm);
  if (Number.isFinite(plan.budgetA)) {
    // The charge path draws from V+ through the output's high side (the discharge path returns to the low side).
    chargeMin = Math.max(chargeMin, (levels.highV - diode.forwardDropV - t.lowerV) / (plan.budgetA * (1 - NETWORK_BUDGET_SHARE)) - diode.resistanceOhm);
  }
  if (!(chargeMin <= chargeMax)) return { reason: `no rCharge satisfies ${b.charge.minReason} and ${b.charge.maxReason} within the resistor range` };
  if (!(dischargeMin <= dischargeMax)) return { reason: `no rDischarge satisfies ${b.discharge.minReason} and ${b.discharge.maxReason} within the resistor range` };
  const charge = plan.cache.forRole(topology.id, roles.charge, { min: chargeMin, max: chargeMax });
  const discharge = plan.cache.forRole(topology.id, roles.discharge, { min: dischargeMin, max: dischargeMax });

  // Duty fixes the ratio of the two path resistances; the duty tolerance widens it a little.
  const extraOhm = diode.resistanceOhm + amp.outputResistanceOhm;
  const ratioFor = (d: number) => (d / (1 - d)) * (factors.lowTau / factors.highTau);
  const duty = req.targetDutyCycle;
  const dLo = Math.max(duty - req.dutyTolerance, Number.EPSILON);
  const dHi = Math.min(duty + req.dutyTolerance, 1 - Number.EPSILON);
  const smallestRatio = (charge.values[0] + extraOhm) / (discharge.values[discharge.values.length - 1] + extraOhm);
  const largestRatio = (charge.values[charge.values.length - 1] + extraOhm) / (discharge.values[0] + extraOhm);
  if (ratioFor(dHi) < smallestRatio || ratioFor(dLo) > largestRatio) {
    const requiredRatio = ratioFor(duty);
    const ohm = (x: number) => formatSi(x, 'Ω');
    const cap = (bound: number, reason: string) => (bound < plan.rMax ? reason : 'the resistor range');
    const floor = (bound: number, reason: string) => (bound > plan.rMin ? reason : 'the resistor range');
    const limits =
      requiredRatio > largestRatio
        ? `rCharge stops at ${ohm(chargeMax)} (${cap(b.charge.maxOhm, b.charge.maxReason)}) and rDischarge at ${ohm(dischargeMin)} (${floor(dischargeMin, b.discharge.minReason)})`
        : `rCharge stops at ${ohm(chargeMin)} (${floor(chargeMin, b.charge.minReason)}) and rDischarge at ${ohm(dischargeMax)} (${cap(b.discharge.maxOhm, b.discharge.maxReason)})`;
    return {
      reason:
        `a duty cycle of ${formatPercent(duty)} needs the charge and discharge paths in the ratio ${requiredRatio.toPrecision(3)}, ` +
        `but the values allowed give ${smallestRatio.toPrecision(3)} to ${largestRatio.toPrecision(3)}: ${limits}`,
      ratio: { requiredRatio, smallestRatio, largestRatio },
    };
  }
  const capacitor = plan.cache.forRole(topology.id, roles.capacitor, req.capacitorRange);
  const result = steeredSearch({
    topology: topology.id,
    roles,
    supply,
    amplifier: amp,
    diode,
    levels,
    targetFrequencyHz: req.targetFrequencyHz,
    targetDutyCycle: duty,
    frequencyTolerance: req.frequencyTolerance,
    dutyTolerance: req.dutyTolerance,
    hysteresis: width.hysteresis,
    charge,
    discharge,
    capacitor,
    seriesResistanceOhm: amp.outputResistanceOhm,
    count: req.count,
  });
  const windowMin = 'the resistor window (constraints.rMinOhm)';
  const windowMax = 'the resistor window (constraints.rMaxOhm)';
  const limits = {
    charge: {
      min: chargeMin,
      max: chargeMax,
      minReason: chargeMin > Math.max(plan.rMin, b.charge.minOhm) ? 'constraints.maxSupplyCurrentA' : b.charge.minOhm > plan.rMin ? b.charge.minReason : windowMin,
      maxReason: b.charge.maxOhm < plan.rMax ? b.charge.maxReason : windowMax,
    },
    discharge: {
      min: dischargeMin,
      max: dischargeMax,
      minReason: b.discharge.minOhm > plan.rMin ? b.discharge.minReason : windowMin,
      maxReason: b.discharge.maxOhm < plan.rMax ? b.discharge.maxReason : windowMax,
    },
  };
  return { candidates: result.candidates, thresholds: t, limits };
}
