/**
 * Role descriptions and branch groups several topologies share, so a role means
 * the same thing (and is wired the same way) wherever it appears.
 */
import type { Branch } from '../network.ts';
import { NODE } from '../nodes.ts';
import { resistor, type RoleSpec } from './topology.ts';

export const ROLE = {
  rTiming: { kind: 'resistor', description: 'timing resistor, output to inverting input', required: true },
  cTiming: { kind: 'capacitor', description: 'timing capacitor, inverting input to ground', required: true },
  rTop: { kind: 'resistor', description: 'divider resistor, V+ to non-inverting input', required: true },
  rBottom: { kind: 'resistor', description: 'divider resistor, non-inverting input to ground', required: true },
  rFeedback: { kind: 'resistor', description: 'positive-feedback resistor, output to non-inverting input', required: true },
  rGround: { kind: 'resistor', description: 'non-inverting input to ground (mid rail)', required: true },
} as const satisfies Record<string, RoleSpec>;

/** Single-rail threshold network: rTop to V+, rBottom to ground, rFeedback from the output. */
export function dividerThresholdBranches(parts: Readonly<Record<string, number>>): Branch[] {
  return [
    resistor(NODE.positiveRail, NODE.decision, parts.rTop, 'rTop'),
    resistor(NODE.decision, NODE.ground, parts.rBottom, 'rBottom'),
    resistor(NODE.output, NODE.decision, parts.rFeedback, 'rFeedback'),
  ];
}

/** Split-rail threshold network: rFeedback from the output, rGround to mid rail. */
export function splitThresholdBranches(parts: Readonly<Record<string, number>>): Branch[] {
  return [resistor(NODE.output, NODE.decision, parts.rFeedback, 'rFeedback'), resistor(NODE.decision, NODE.ground, parts.rGround, 'rGround')];
}

/** The single timing resistor from the output to the capacitor node. */
export function timingBranch(parts: Readonly<Record<string, number>>): Branch {
  return resistor(NODE.output, NODE.capacitor, parts.rTiming, 'rTiming');
}
