/**
 * Split-supply astable: P is fed back from the output through rFeedback and
 * returned to ground (mid rail) through rGround, so the thresholds are ±β times
 * the output levels.
 */
import { NODE } from '../nodes.ts';
import { resistor, type TopologyDefinition } from './topology.ts';

export const splitSupply: TopologyDefinition = {
  id: 'split-supply',
  description:
    'Split rails: rFeedback (output to P) and rGround (P to ground) set the thresholds; rTiming (output to N) charges cTiming (N to ground).',
  roles: {
    rTiming: { kind: 'resistor', description: 'timing resistor, output to inverting input', required: true },
    cTiming: { kind: 'capacitor', description: 'timing capacitor, inverting input to ground', required: true },
    rFeedback: { kind: 'resistor', description: 'positive-feedback resistor, output to non-inverting input', required: true },
    rGround: { kind: 'resistor', description: 'non-inverting input to ground (mid rail)', required: true },
  },
  capacitorRole: 'cTiming',
  internalNodeCount: 0,
  diodeCount: 0,
  needsOpenDrain: false,
  branches(parts) {
    return [
      resistor(NODE.output, NODE.decision, parts.rFeedback, 'rFeedback'),
      resistor(NODE.decision, NODE.ground, parts.rGround, 'rGround'),
      resistor(NODE.output, NODE.capacitor, parts.rTiming, 'rTiming'),
    ];
  },
};
