/**
 * Joint snap for a circuit: topology, frequency target (and duty) and a value
 * source per role -> the best combinations of timing resistor, timing capacitor
 * and threshold-network resistors, with their errors.
 *
 * The threshold network is taken near given ideal values when the caller gives
 * them; otherwise it is free: every feedback/ground pair in a feedback-fraction
 * window (two-resistor feedback), or divider networks at scales across the range
 * placed for the duty target (three-resistor divider).
 */
import type { AmplifierModel } from '../amplifiers/model.ts';
import { canonicalTopologyId, findTopology, type ThresholdNetworkSpec } from '../circuit/topologies/index.ts';
import type { Supply } from '../circuit/types.ts';
import { CoreError } from '../errors.ts';
import { hysteresisFreeRatio, hysteresisNear, joinHysteresis, thresholdTopology, type HysteresisCandidates } from './hysteresis.ts';
import { jointSearch, type JointSearchResult } from './joint-search.ts';
import { DEFAULT_RANGES, ValueSetCache, type PartRanges, type RoleSources } from './role-sources.ts';
import { preferredScaleOhm, scalesWithin } from './scales.ts';
import { screeningContext } from './thresholds.ts';

export interface JointSnapRequest {
  topology: string;
  supply: Supply;
  amplifier: AmplifierModel;
  targetFrequencyHz: number;
  targetDutyCycle?: number;
  dutyTolerance?: number;
  values: RoleSources;
  ranges?: Partial<PartRanges>;
  dielectrics?: readonly string[];
  hysteresis?: {
    /** Ideal threshold-network values to snap near (all roles of the network). */
    ideal?: Readonly<Record<string, number>>;
    /** Two-resistor feedback, free ratio: window for β = rGround/(rGround + rFeedback) (default 0.1..0.9). */
    feedbackFractionMin?: number;
    feedbackFractionMax?: number;
    /** Three-resistor divider without ideal values: hysteresis as a fraction of the swing (default 1/3). */
    hysteresisFraction?: number;
  };
  /** Role that may be a two-part series/parallel combination. */
  combine?: 'rTiming' | 'cTiming';
  count?: number;
}

export const DEFAULT_FEEDBACK_FRACTION = { min: 0.1, max: 0.9 } as const;
export const DEFAULT_SNAP_COUNT = 5;
export const MAX_SNAP_COUNT = 50;
/** Divider scales tried across the range without ideal values: four per decade, at most this many. */
const FREE_DIVIDER_SCALES = 24;

function freeHysteresis(req: JointSnapRequest, network: ThresholdNetworkSpec, cache: ValueSetCache, rRange: { min: number; max: number }): HysteresisCandidates {
  const ctx = screeningContext(req.supply, req.amplifier);
  const h = req.hysteresis ?? {};
  if (network.freeRatio) {
    return hysteresisFreeRatio({
      feedback: cache.forRole(req.topology, network.freeRatio.feedback, rRange),
      ground: cache.forRole(req.topology, network.freeRatio.ground, rRange),
      feedbackFractionMin: h.feedbackFractionMin ?? DEFAULT_FEEDBACK_FRACTION.min,
      feedbackFractionMax: h.feedbackFractionMax ?? DEFAULT_FEEDBACK_FRACTION.max,
      preferredParallelOhm: preferredScaleOhm(rRange.min, rRange.max),
      ctx,
    });
  }
  // A placed network: thresholds from the duty target and width, then networks at many scales.
  const fraction = h.hysteresisFraction ?? 1 / 3;
  if (!(fraction > 0 && fraction < 1)) throw new CoreError('invalid-value', 'hysteresisFraction must lie between 0 and 1', '/hysteresis/hysteresisFraction');
  const t = network.thresholds(fraction, req.targetDutyCycle ?? 0.5, ctx);
  const probe = network.solve(t, { ...ctx, inputBiasCurrentA: 0 }, 1);
  const conductanceFractions = Object.values(probe).map((r) => 1 / r);
  const pMin = rRange.min * Math.max(...conductanceFractions);
  const pMax = rRange.max * Math.min(...conductanceFractions);
  if (!(pMin <= pMax)) throw new CoreError('infeasible', `No ${network.name} scale keeps all its threshold resistors inside the resistor range`, '/ranges');
  const sets = Object.fromEntries(network.roles.map((role) => [role, cache.forRole(req.topology, role, rRange)]));
  return joinHysteresis(
    scalesWithin(pMin, pMax, FREE_DIVIDER_SCALES, 4).map((scale) => hysteresisNear({ network, ideal: network.solve(t, ctx, scale), sets, ctx, neighbours: 1 })),
  );
}

export function jointSnap(request: JointSnapRequest): JointSearchResult {
  const topo = thresholdTopology(request.topology);
  // Answers carry the current id even when the request named a deprecated alias.
  const req: JointSnapRequest = { ...request, topology: canonicalTopologyId(request.topology) };
  const timing = findTopology(req.topology)!.design!.timing as { resistor: string; capacitor: string };
  const count = req.count ?? DEFAULT_SNAP_COUNT;
  if (!(Number.isInteger(count) && count >= 1 && count <= MAX_SNAP_COUNT)) {
    throw new CoreError('invalid-value', `count must be an integer from 1 to ${MAX_SNAP_COUNT}`, '/count');
  }
  const rRange = { ...DEFAULT_RANGES.resistor, ...req.ranges?.resistor };
  const cRange = { ...DEFAULT_RANGES.capacitor, ...req.ranges?.capacitor };
  const cache = new ValueSetCache(req.values, req.dielectrics);
  let hysteresis: HysteresisCandidates;
  const ideal = req.hysteresis?.ideal;
  if (ideal) {
    for (const role of topo.roles) {
      if (!(ideal[role] > 0)) throw new CoreError('missing-part', `hysteresis.ideal needs '${role}' (${topo.roles.join(', ')})`, `/hysteresis/ideal/${role}`);
    }
    const sets = Object.fromEntries(topo.roles.map((role) => [role, cache.forRole(req.topology, role, rRange)]));
    hysteresis = hysteresisNear({ network: topo, ideal, sets, ctx: screeningContext(req.supply, req.amplifier), neighbours: 2 });
  } else {
    hysteresis = freeHysteresis(req, topo, cache, rRange);
  }
  const resistor = cache.forRole(req.topology, timing.resistor, rRange);
  const capacitor = cache.forRole(req.topology, timing.capacitor, cRange);
  return jointSearch({
    topology: req.topology,
    supply: req.supply,
    amplifier: req.amplifier,
    targetFrequencyHz: req.targetFrequencyHz,
    targetDutyCycle: req.targetDutyCycle,
    dutyTolerance: req.dutyTolerance,
    hysteresis,
    timing: {
      resistor,
      capacitor,
      combine: req.combine === timing.resistor ? 'resistor' : req.combine === timing.capacitor ? 'capacitor' : undefined,
      seriesResistanceOhm: req.amplifier.outputResistanceOhm,
      preferredResistanceOhm: preferredScaleOhm(rRange.min, rRange.max),
    },
    count,
  });
}
