/**
 * Role descriptions and branch groups several topologies share, so a role means
 * the same thing (and is wired the same way) wherever it appears.
 */
import type { Branch } from '../network.ts';
import { NODE } from '../nodes.ts';
import { resistor, type RoleSpec } from './topology.ts';

export const ROLE = {
  rTiming: { kind: 'resistor', description: 'timing resistor, output to inverting input', required: true, purpose: 'timing' },
  cTiming: { kind: 'capacitor', description: 'timing capacitor, inverting input to ground', required: true, purpose: 'timing' },
  rTop: { kind: 'resistor', description: 'divider resistor, V+ to non-inverting input', required: true, purpose: 'thresholds' },
  rBottom: { kind: 'resistor', description: 'divider resistor, non-inverting input to ground', required: true, purpose: 'thresholds' },
  rFeedback: { kind: 'resistor', description: 'positive-feedback resistor, output to non-inverting input', required: true, purpose: 'thresholds' },
  rGround: { kind: 'resistor', description: 'non-inverting input to ground (mid rail)', required: true, purpose: 'thresholds' },
} as const satisfies Record<string, RoleSpec>;

/** One timing resistor for both dwells, the usual plain astable. */
export const SHARED_TIMING = { kind: 'shared', resistor: 'rTiming', capacitor: 'cTiming' } as const;

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
