/**
 * How fast a circuit/amplifier pair can run before its edges stop being small
 * against the period. An edge takes the recovery (propagation) delay plus the
 * time to slew across the output swing; the ceiling is the highest frequency at
 * which the longer of the two edges stays within a stated fraction of the period:
 *
 *   edge ≤ fraction · T   ⇔   f ≤ fraction / edge
 *
 * The edge time depends on the amplifier and the output levels, not on R·C, so
 * the ceiling holds for any timing values with the same amplifier and swing.
 * A capacitance on the output pin adds the pin's RC behind the stage (an open
 * drain's rise through its pull-up, docs/model.md strays and leakage): the
 * analysis then takes the walk's own edge times where they are longer (the
 * pin's RC moves little with the timing values: the timing resistor is one of
 * the loads it sees).
 * The default fraction, 5 %, is our design margin (edges short enough that the
 * period is set by the timing network), not a figure from a standard.
 */
import type { AmplifierModel } from '../amplifiers/model.ts';
import { CoreError } from '../errors.ts';
import type { PreparedCircuit } from './analyze.ts';
import { CHECK_CODES, type Check } from './checks.ts';
import { formatPercent, formatSeconds, formatSi } from './format.ts';
import { evalAffine } from './state-model.ts';

export const DEFAULT_EDGE_FRACTION = 0.05;
/** Above half the period an "edge" is the whole half cycle: no meaningful ceiling. */
export const MAX_EDGE_FRACTION = 0.5;

export interface EdgeTimes {
  /** From the decision to the output settled high (delay + slew), s. */
  riseSettleS: number;
  /** From the decision to the output settled low, s. */
  fallSettleS: number;
}

export function checkEdgeFraction(fraction: number, pointer = '/edgeFractionLimit'): void {
  if (!(fraction > 0 && fraction <= MAX_EDGE_FRACTION)) {
    throw new CoreError('invalid-value', `edgeFractionLimit must be above 0 and at most ${MAX_EDGE_FRACTION}`, pointer);
  }
}

/**
 * Edge times from the amplifier figures and the state levels: delay + swing/SR.
 * An open-drain stage is done as soon as it releases the pin, so its rise is
 * the delay alone (a capacitance on the pin then charges through the pull-up:
 * the walk's settling times hold that, see slowerEdges); its fall slews from
 * the released pin level (taken where the fall starts, at the upper threshold)
 * to the low level.
 */
export function nominalEdgeTimes(prepared: PreparedCircuit): EdgeTimes {
  const { amplifier } = prepared.circuit;
  const { high, low } = prepared;
  if (prepared.topology.needsOpenDrain) {
    const releasedV = evalAffine(high.outputPin, high.switchingV);
    return { riseSettleS: amplifier.recoveryDelayS, fallSettleS: stageEdgeTimeS(releasedV - low.sourceV, amplifier) };
  }
  const edgeS = stageEdgeTimeS(high.sourceV - low.sourceV, amplifier);
  return { riseSettleS: edgeS, fallSettleS: edgeS };
}

/**
 * The stage's own edge across `swingV`: its recovery delay, then slewing the
 * swing (instant without a slew limit). The one edge-time formula behind the
 * analysis's nominal edges and the design's frequency ceiling.
 */
export function stageEdgeTimeS(swingV: number, amplifier: Pick<AmplifierModel, 'recoveryDelayS' | 'slewRateVPerS'>): number {
  return amplifier.recoveryDelayS + slewTimeS(swingV, amplifier.slewRateVPerS);
}

/** The longer of two estimates of each edge. */
export function slowerEdges(a: EdgeTimes, b: EdgeTimes): EdgeTimes {
  return { riseSettleS: Math.max(a.riseSettleS, b.riseSettleS), fallSettleS: Math.max(a.fallSettleS, b.fallSettleS) };
}

function slewTimeS(swingV: number, slewVPerS: number): number {
  return Number.isFinite(slewVPerS) ? Math.abs(swingV) / slewVPerS : 0;
}

/** Highest frequency with both edges within `fraction` of the period, Hz (Infinity: instant edges). */
export function frequencyCeilingHz(edges: EdgeTimes, fraction = DEFAULT_EDGE_FRACTION): number {
  const edgeS = Math.max(edges.riseSettleS, edges.fallSettleS);
  return edgeS > 0 ? fraction / edgeS : Infinity;
}

/** A warning when the edges already take more than `fraction` of the period. */
export function slewLimitedCheck(edges: EdgeTimes, periodS: number, fraction: number, ceilingHz: number, pinLoaded = false): Check | undefined {
  const edgeS = Math.max(edges.riseSettleS, edges.fallSettleS);
  const share = edgeS / periodS;
  if (!(share > fraction)) return undefined;
  return {
    code: CHECK_CODES.slewLimited,
    severity: 'warning',
    message: pinLoaded
      ? `Each edge takes up to ${formatSeconds(edgeS)} (recovery delay + slew, then the output pin's RC with its capacitance), ${formatPercent(share)} of the period, beyond the ${formatPercent(fraction)} allowed: the edges, not the timing network, set part of the frequency. This circuit stays within the limit up to ${formatSi(ceilingHz, 'Hz')}`
      : `Each edge takes up to ${formatSeconds(edgeS)} (recovery delay + slew), ${formatPercent(share)} of the period, beyond the ${formatPercent(fraction)} allowed: the amplifier's speed, not the timing network, sets part of the frequency. This pair stays within the limit up to ${formatSi(ceilingHz, 'Hz')}`,
    edgeTimeS: edgeS,
    riseSettleS: edges.riseSettleS,
    fallSettleS: edges.fallSettleS,
    periodS,
    fractionOfPeriod: share,
    edgeFractionLimit: fraction,
    frequencyCeilingHz: Number.isFinite(ceilingHz) ? ceilingHz : null,
  };
}
