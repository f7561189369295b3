/**
 * Two-resistor feedback astable: P is fed back from the output through rFeedback
 * and returned to ground through rGround, so the thresholds are ±β times the
 * output levels (around ground: it needs a rail below ground to oscillate
 * symmetrically). Formerly `split-supply`.
 */
import { ROLE, SHARED_TIMING, splitThresholdBranches, timingBranch } from './shared-parts.ts';
import { FEEDBACK_NETWORK } from './threshold-networks.ts';
import type { TopologyDefinition } from './topology.ts';

export const twoResistorFeedback: TopologyDefinition = {
  id: 'two-resistor-feedback',
  aliases: ['split-supply'],
  description:
    'rFeedback (output to P) and rGround (P to ground) set the thresholds at ±β of the output levels; rTiming (output to N) charges cTiming (N to ground). Needs a rail below ground.',
  roles: { rTiming: ROLE.rTiming, cTiming: ROLE.cTiming, rFeedback: ROLE.rFeedback, rGround: ROLE.rGround },
  capacitorRole: 'cTiming',
  internalNodeCount: 0,
  diodeCount: 0,
  needsOpenDrain: false,
  branches(parts) {
    return [...splitThresholdBranches(parts), timingBranch(parts)];
  },
  design: { timing: SHARED_TIMING, thresholdNetworks: [FEEDBACK_NETWORK] },
};
