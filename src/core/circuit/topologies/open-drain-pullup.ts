/**
 * Open-drain (open-collector) comparator astable: the output transistor only
 * pulls the pin down; in the high state it is released and rPullup to V+ —
 * together with whatever the pin feeds (the feedback and timing resistors, an
 * external load) — sets the high level. Thresholds come from a single-rail
 * divider (rTop, rBottom, rFeedback) as in three-resistor-divider.
 */
import { NODE } from '../nodes.ts';
import { dividerThresholdBranches, ROLE, timingBranch } from './shared-parts.ts';
import { resistor, type TopologyDefinition } from './topology.ts';

export const openDrainPullup: TopologyDefinition = {
  id: 'open-drain-pullup',
  description:
    'Open-drain comparator output with rPullup (V+ to output) giving the high level; rTop (V+ to P), rBottom (P to ground), rFeedback (output to P) set the thresholds; rTiming (output to N) charges cTiming (N to ground).',
  roles: {
    rPullup: { kind: 'resistor', description: 'pull-up resistor, V+ to the open-drain output', required: true, purpose: 'output-level' },
    rTiming: ROLE.rTiming,
    cTiming: ROLE.cTiming,
    rTop: ROLE.rTop,
    rBottom: ROLE.rBottom,
    rFeedback: ROLE.rFeedback,
  },
  capacitorRole: 'cTiming',
  internalNodeCount: 0,
  diodeCount: 0,
  needsOpenDrain: true,
  branches(parts) {
    return [
      resistor(NODE.positiveRail, NODE.output, parts.rPullup, 'rPullup'),
      ...dividerThresholdBranches(parts),
      timingBranch(parts),
    ];
  },
};
