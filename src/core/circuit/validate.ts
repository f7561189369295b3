/** Physical validation of a circuit before any solve: every failure names its field. */
import { CoreError } from '../errors.ts';
import type { TopologyDefinition } from './topologies/topology.ts';
import type { Circuit } from './types.ts';
import { validateStrays } from './strays.ts';

/** Plausible ranges for real parts (one definition for every route): outside them the input is a mistake, not a design. */
import { CAPACITANCE_RANGE_F, RESISTANCE_RANGE_OHM } from '../value-ranges.ts';
export { CAPACITANCE_RANGE_F, RESISTANCE_RANGE_OHM };
export const SUPPLY_LIMIT_V = 2000;

export function validateCircuit(circuit: Circuit, topology: TopologyDefinition): void {
  const { supply } = circuit;
  for (const key of ['positiveV', 'negativeV'] as const) {
    const v = supply[key];
    if (!Number.isFinite(v) || Math.abs(v) > SUPPLY_LIMIT_V) {
      throw new CoreError('invalid-value', `supply.${key} must be a finite voltage within ±${SUPPLY_LIMIT_V} V`, `/supply/${key}`);
    }
  }
  if (!(supply.positiveV > supply.negativeV)) {
    throw new CoreError('invalid-value', 'supply.positiveV must be above supply.negativeV', '/supply/positiveV');
  }
  if (supply.negativeV > 0 || supply.positiveV < 0) {
    throw new CoreError('invalid-value', 'ground (0 V) must lie between the rails: negativeV <= 0 <= positiveV', '/supply');
  }
  for (const [role, spec] of Object.entries(topology.roles)) {
    const value = circuit.parts[role];
    if (value === undefined) {
      if (spec.required) throw new CoreError('missing-part', `Topology '${topology.id}' needs part '${role}' (${spec.description})`, `/parts/${role}`);
      continue;
    }
    const range = spec.kind === 'capacitor' ? CAPACITANCE_RANGE_F : RESISTANCE_RANGE_OHM;
    const unit = spec.kind === 'capacitor' ? 'F' : 'Ω';
    if (!Number.isFinite(value) || value < range.min || value > range.max) {
      throw new CoreError('invalid-value', `${role} must be between ${range.min} ${unit} and ${range.max} ${unit}`, `/parts/${role}`);
    }
  }
  for (const role of Object.keys(circuit.parts)) {
    if (!(role in topology.roles)) {
      throw new CoreError(
        'unexpected-part',
        `Topology '${topology.id}' has no part '${role}'; its roles are ${Object.keys(topology.roles).join(', ')}`,
        `/parts/${role}`,
      );
    }
  }
  if (circuit.load) {
    const r = circuit.load.resistanceOhm;
    if (!Number.isFinite(r) || r < RESISTANCE_RANGE_OHM.min || r > RESISTANCE_RANGE_OHM.max) {
      throw new CoreError('invalid-value', 'load.resistanceOhm is out of range', '/load/resistanceOhm');
    }
  }
  if (topology.needsOpenDrain && circuit.amplifier.outputStage !== 'open-drain') {
    throw new CoreError('invalid-value', `Topology '${topology.id}' needs an open-drain output stage`, '/amplifier');
  }
  if (!topology.needsOpenDrain && circuit.amplifier.outputStage === 'open-drain') {
    throw new CoreError(
      'invalid-value',
      `An open-drain output cannot drive the high state of '${topology.id}': use the open-drain-pullup topology`,
      '/amplifier',
    );
  }
  validateStrays(circuit);
}
