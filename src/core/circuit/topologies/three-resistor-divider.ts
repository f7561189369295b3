/**
 * Three-resistor divider astable: the decision node P sits on a three-resistor
 * network (rTop to V+, rBottom to ground, rFeedback from the output), so the two
 * thresholds can be placed anywhere in the swing — around mid-supply on a single
 * rail, or anywhere between split rails. Formerly `single-supply-divider`.
 */
import { dividerThresholdBranches, ROLE, SHARED_TIMING, timingBranch } from './shared-parts.ts';
import { DIVIDER_NETWORK } from './threshold-networks.ts';
import type { TopologyDefinition } from './topology.ts';

export const threeResistorDivider: TopologyDefinition = {
  id: 'three-resistor-divider',
  aliases: ['single-supply-divider'],
  description:
    'rTop (V+ to P), rBottom (P to ground), rFeedback (output to P) set the thresholds anywhere in the swing; rTiming (output to N) charges cTiming (N to ground). Any supply.',
  roles: { rTiming: ROLE.rTiming, cTiming: ROLE.cTiming, rTop: ROLE.rTop, rBottom: ROLE.rBottom, rFeedback: ROLE.rFeedback },
  capacitorRole: 'cTiming',
  internalNodeCount: 0,
  diodeCount: 0,
  needsOpenDrain: false,
  branches(parts) {
    return [...dividerThresholdBranches(parts), timingBranch(parts)];
  },
  design: { timing: SHARED_TIMING, thresholdNetworks: [DIVIDER_NETWORK] },
};
