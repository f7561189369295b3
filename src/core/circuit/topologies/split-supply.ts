/**
 * Split-supply astable: P is fed back from the output through rFeedback and
 * returned to ground (mid rail) through rGround, so the thresholds are ±β times
 * the output levels.
 */
import { ROLE, splitThresholdBranches, timingBranch } from './shared-parts.ts';
import type { TopologyDefinition } from './topology.ts';

export const splitSupply: TopologyDefinition = {
  id: 'split-supply',
  description:
    'Split rails: rFeedback (output to P) and rGround (P to ground) set the thresholds; rTiming (output to N) charges cTiming (N to ground).',
  roles: { rTiming: ROLE.rTiming, cTiming: ROLE.cTiming, rFeedback: ROLE.rFeedback, rGround: ROLE.rGround },
  capacitorRole: 'cTiming',
  internalNodeCount: 0,
  diodeCount: 0,
  needsOpenDrain: false,
  branches(parts) {
    return [...splitThresholdBranches(parts), timingBranch(parts)];
  },
};
