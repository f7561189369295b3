/** Registry of supported topologies. Add a topology: write its definition file and list it here. */
import { diodeSteered } from './diode-steered.ts';
import { openDrainPullup } from './open-drain-pullup.ts';
import { singleSupplyDivider } from './single-supply-divider.ts';
import { splitSupply } from './split-supply.ts';
import type { TopologyDefinition } from './topology.ts';

export type { TopologyDefinition, RoleSpec, PartKind } from './topology.ts';

export const TOPOLOGIES: readonly TopologyDefinition[] = [singleSupplyDivider, splitSupply, diodeSteered, openDrainPullup];

const BY_ID = new Map(TOPOLOGIES.map((t) => [t.id, t]));

export function findTopology(id: string): TopologyDefinition | undefined {
  return BY_ID.get(id);
}

export const TOPOLOGY_IDS: readonly string[] = TOPOLOGIES.map((t) => t.id);
