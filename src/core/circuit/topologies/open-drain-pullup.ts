/**
 * Open-drain (open-collector) comparator astable: the output transistor only
 * pulls the pin down; in the high state it is released and rPullup to V+ —
 * together with whatever the pin feeds (the feedback and timing resistors, an
 * external load) — sets the high level. Thresholds come from a single-rail
 * divider (rTop, rBottom, rFeedback) as in single-supply-divider.
 */
import { NODE } from '../nodes.ts';
import { resistor, type TopologyDefinition } from './topology.ts';

export const openDrainPullup: TopologyDefinition = {
  id: 'open-drain-pullup',
  description:
    'Open-drain comparator output with rPullup (V+ to output) giving the high level; rTop (V+ to P), rBottom (P to ground), rFeedback (output to P) set the thresholds; rTiming (output to N) charges cTiming (N to ground).',
  roles: {
    rPullup: { kind: 'resistor', description: 'pull-up resistor, V+ to the open-drain output', required: true },
    rTiming: { kind: 'resistor', description: 'timing resistor, output to inverting input', required: true },
    cTiming: { kind: 'capacitor', description: 'timing capacitor, inverting input to ground', required: true },
    rTop: { kind: 'resistor', description: 'divider resistor, V+ to non-inverting input', required: true },
    rBottom: { kind: 'resistor', description: 'divider resistor, non-inverting input to ground', required: true },
    rFeedback: { kind: 'resistor', description: 'positive-feedback resistor, output to non-inverting input', required: true },
  },
  capacitorRole: 'cTiming',
  internalNodeCount: 0,
  diodeCount: 0,
  needsOpenDrain: true,
  branches(parts) {
    return [
      resistor(NODE.positiveRail, NODE.output, parts.rPullup, 'rPullup'),
      resistor(NODE.positiveRail, NODE.decision, parts.rTop, 'rTop'),
      resistor(NODE.decision, NODE.ground, parts.rBottom, 'rBottom'),
      resistor(NODE.output, NODE.decision, parts.rFeedback, 'rFeedback'),
      resistor(NODE.output, NODE.capacitor, parts.rTiming, 'rTiming'),
    ];
  },
};
