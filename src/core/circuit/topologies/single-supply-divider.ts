/**
 * Single-supply divider astable: the decision node P sits on a three-resistor
 * network (rTop to V+, rBottom to ground, rFeedback from the output), so the
 * two thresholds straddle mid-supply and can be placed anywhere in the swing.
 */
import { NODE } from '../nodes.ts';
import { resistor, type TopologyDefinition } from './topology.ts';

export const singleSupplyDivider: TopologyDefinition = {
  id: 'single-supply-divider',
  description:
    'Single rail: rTop (V+ to P), rBottom (P to ground), rFeedback (output to P) set the thresholds; rTiming (output to N) charges cTiming (N to ground).',
  roles: {
    rTiming: { kind: 'resistor', description: 'timing resistor, output to inverting input', required: true },
    cTiming: { kind: 'capacitor', description: 'timing capacitor, inverting input to ground', required: true },
    rTop: { kind: 'resistor', description: 'divider resistor, V+ to non-inverting input', required: true },
    rBottom: { kind: 'resistor', description: 'divider resistor, non-inverting input to ground', required: true },
    rFeedback: { kind: 'resistor', description: 'positive-feedback resistor, output to non-inverting input', required: true },
  },
  capacitorRole: 'cTiming',
  internalNodeCount: 0,
  diodeCount: 0,
  needsOpenDrain: false,
  branches(parts) {
    return [
      resistor(NODE.positiveRail, NODE.decision, parts.rTop, 'rTop'),
      resistor(NODE.decision, NODE.ground, parts.rBottom, 'rBottom'),
      resistor(NODE.output, NODE.decision, parts.rFeedback, 'rFeedback'),
      resistor(NODE.output, NODE.capacitor, parts.rTiming, 'rTiming'),
    ];
  },
};
