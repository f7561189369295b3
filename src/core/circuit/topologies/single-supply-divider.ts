/**
 * Single-supply divider astable: the decision node P sits on a three-resistor
 * network (rTop to V+, rBottom to ground, rFeedback from the output), so the
 * two thresholds straddle mid-supply and can be placed anywhere in the swing.
 */
import { dividerThresholdBranches, ROLE, timingBranch } from './shared-parts.ts';
import type { TopologyDefinition } from './topology.ts';

export const singleSupplyDivider: TopologyDefinition = {
  id: 'single-supply-divider',
  description:
    'Single rail: rTop (V+ to P), rBottom (P to ground), rFeedback (output to P) set the thresholds; rTiming (output to N) charges cTiming (N to ground).',
  roles: { rTiming: ROLE.rTiming, cTiming: ROLE.cTiming, rTop: ROLE.rTop, rBottom: ROLE.rBottom, rFeedback: ROLE.rFeedback },
  capacitorRole: 'cTiming',
  internalNodeCount: 0,
  diodeCount: 0,
  needsOpenDrain: false,
  branches(parts) {
    return [...dividerThresholdBranches(parts), timingBranch(parts)];
  },
};
