/**
 * A topology names its part roles and lists the passive branches it adds
 * between the standard nodes (see nodes.ts). Everything else — rails, output
 * stage, loads, bias currents — is common and added by the network builder.
 */
import type { Branch } from '../network.ts';
import type { DiodeModel, PieceConfig } from '../types.ts';
import type { ThresholdNetworkSpec } from './threshold-networks.ts';

export type PartKind = 'resistor' | 'capacitor';

/** What a role sets: the dwell times (timing), the switching thresholds, or the output's high level (a pull-up). */
export type RolePurpose = 'timing' | 'thresholds' | 'output-level';

export interface RoleSpec {
  kind: PartKind;
  description: string;
  required: boolean;
  purpose: RolePurpose;
}

/**
 * The timing paths design sizes: one resistor for both dwells (`shared`), or one
 * resistor per output state behind a steering diode (`steered`, the duty cycle
 * then set by their ratio).
 */
export type TimingPaths =
  | { kind: 'shared'; resistor: string; capacitor: string }
  | { kind: 'steered'; charge: string; discharge: string; capacitor: string; defaultDiode: Readonly<DiodeModel> };

/** What forward design and joint snap need to size a topology. */
export interface DesignKnowledge {
  timing: TimingPaths;
  /**
   * Threshold networks it can be built with, in order of preference: design takes the first whose
   * supply condition holds (a feedback network needs a rail below ground).
   */
  thresholdNetworks: readonly ThresholdNetworkSpec[];
}

export interface TopologyDefinition {
  /** Names the network (the supply is its own field). */
  id: string;
  /** Earlier ids still accepted as input for one release (deprecated; answers use `id`). */
  aliases?: readonly string[];
  description: string;
  roles: Readonly<Record<string, RoleSpec>>;
  /** The timing capacitor's role (its value is the network's one capacitance). */
  capacitorRole: string;
  /** Topology-internal nodes beyond the standard ones. */
  internalNodeCount: number;
  /** Number of diodes whose conduction the piece configuration sets. */
  diodeCount: number;
  /** True when the output stage must be open drain (the pull-up supplies the high level). */
  needsOpenDrain: boolean;
  /** Passive branches for one linear piece (`diode`: the circuit's steering-diode model, when it gives one). */
  branches(parts: Readonly<Record<string, number>>, piece: PieceConfig, diode?: DiodeModel): Branch[];
  /** Labels of the branches that model each steering diode while it conducts, in diode order: each such
   *  branch carries the forward drop as its EMF and its current must stay >= 0 (the engine watches it). */
  diodeLabels?: readonly string[];
  /** The diode conduction that the closed-form (one piece per state) model assumes. */
  nominalDiodes?(state: PieceConfig['state']): boolean[];
  /** How design and snap size it; absent when they do not (yet). */
  design?: DesignKnowledge;
}

export function resistor(from: number, to: number, resistanceOhm: number, label: string): Branch {
  return { from, to, resistanceOhm, emfV: 0, label };
}
