/**
 * Registry of supported topologies. Add a topology: write its definition file and list it here;
 * schemas, design, snap, tolerance and fit derive what they need from the definitions.
 */
import { diodeSteered } from './diode-steered.ts';
import { openDrainPullup } from './open-drain-pullup.ts';
import { threeResistorDivider } from './three-resistor-divider.ts';
import { twoResistorFeedback } from './two-resistor-feedback.ts';
import type { TopologyDefinition } from './topology.ts';

export type { TopologyDefinition, RoleSpec, PartKind, RolePurpose, TimingPaths, DesignKnowledge } from './topology.ts';
export type { ThresholdNetworkSpec } from './threshold-networks.ts';
export { DIVIDER_NETWORK, FEEDBACK_NETWORK } from './threshold-networks.ts';

export const TOPOLOGIES: readonly TopologyDefinition[] = [threeResistorDivider, twoResistorFeedback, diodeSteered, openDrainPullup];

const BY_ID = new Map(TOPOLOGIES.map((t) => [t.id, t]));
/** Deprecated input ids -> current ids (accepted for one release; answers carry the current id). */
export const TOPOLOGY_ALIASES: Readonly<Record<string, string>> = Object.freeze(
  Object.fromEntries(TOPOLOGIES.flatMap((t) => (t.aliases ?? []).map((a) => [a, t.id]))),
);

/** The topology by its id or a deprecated alias. */
export function findTopology(id: string): TopologyDefinition | undefined {
  return BY_ID.get(id) ?? BY_ID.get(TOPOLOGY_ALIASES[id]);
}

/** The current id for an id or deprecated alias (unknown ids come back unchanged for the caller to refuse). */
export function canonicalTopologyId(id: string): string {
  return findTopology(id)?.id ?? id;
}

export const TOPOLOGY_IDS: readonly string[] = TOPOLOGIES.map((t) => t.id);

/** Ids a request may name: current ids, then the deprecated aliases. */
export function acceptedTopologyIds(filter: (t: TopologyDefinition) => boolean = () => true): string[] {
  const chosen = TOPOLOGIES.filter(filter);
  return [...chosen.map((t) => t.id), ...chosen.flatMap((t) => t.aliases ?? [])];
}

/** Topologies forward design sizes. */
export const designable = (t: TopologyDefinition): boolean => t.design !== undefined;
/** Topologies joint snap sizes: one shared timing resistor and a single threshold network. */
export const snappable = (t: TopologyDefinition): boolean => t.design?.timing.kind === 'shared' && t.design.thresholdNetworks.length === 1;

/** One sentence on the deprecated aliases, for schema descriptions. */
export function aliasNote(ids: readonly string[] = TOPOLOGY_IDS): string {
  const pairs = Object.entries(TOPOLOGY_ALIASES).filter(([, id]) => ids.includes(id));
  return pairs.length ? `Deprecated aliases, accepted for one release (answers use the current id): ${pairs.map(([a, id]) => `${a} → ${id}`).join(', ')}.` : '';
}
