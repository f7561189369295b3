/**
 * Request bodies -> core inputs: value strings to numbers, null limits to
 * Infinity, amplifier references resolved. Keeps the routes thin and the core
 * free of wire formats.
 */
import { canonicalTopologyId, findTopology, resolveAmplifier, type AmplifierModel, type Circuit, type InlineAmplifier } from '../core/index.ts';
import { CoreError } from '../core/errors.ts';
import { UNLIMITED_FIGURES } from '../core/amplifiers/figures-table.ts';
import { parseComponentValue } from '../core/parts/value-parse.ts';
import { NO_STRAYS, type Strays } from '../core/circuit/strays.ts';
import { resolveCapacitor, type CapacitorModel, type CapacitorSpec } from '../core/parts/capacitor/index.ts';
import type { AmplifierLookup } from './amplifier-directory.ts';
import type { CircuitBody, StraysBody } from './schemas/circuit.ts';

/** Default diode for steered topologies: small-signal silicon, common practice. */
export const DEFAULT_DIODE = { forwardDropV: 0.6, resistanceOhm: 10 } as const;

/** JSON null ("no limit") -> the figure table's unlimited value (Infinity, or -Infinity for the common-mode margins). */
export function inlineAmplifierFromBody(body: Record<string, unknown>): InlineAmplifier {
  const out: Record<string, unknown> = { ...body };
  for (const { name, value } of UNLIMITED_FIGURES) {
    if (out[name] === null) out[name] = value;
  }
  return out as InlineAmplifier;
}

export function resolveAmplifierSpec(spec: string | Record<string, unknown>, directory: AmplifierLookup, pointer = '/amplifier'): AmplifierModel {
  return resolveAmplifier(typeof spec === 'string' ? spec : inlineAmplifierFromBody(spec), directory.lookup, pointer);
}

type PartValue = string | number | CapacitorSpec | undefined;

/** Part values in SI units; a capacitor given as a part object counts with its capacitance at 0 V (age included). */
export function parseParts(topologyId: string, parts: Record<string, PartValue>, pointer = '/parts'): Record<string, number> {
  const topology = findTopology(topologyId);
  const out: Record<string, number> = {};
  for (const [role, value] of Object.entries(parts)) {
    if (value === undefined) continue;
    const kind = topology?.roles[role]?.kind ?? (role.startsWith('c') ? 'capacitor' : 'resistor');
    out[role] = typeof value === 'object' ? resolveCapacitor(value, `${pointer}/${role}`).capacitanceF : parseComponentValue(value, kind, `${pointer}/${role}`);
  }
  return out;
}

/** The timing capacitor when the body gives it as a part object. */
export function timingCapacitorFromParts(topologyId: string, parts: Record<string, PartValue>, pointer = '/parts'): CapacitorModel | undefined {
  const role = findTopology(topologyId)?.capacitorRole;
  const value = role === undefined ? undefined : parts[role];
  return value !== undefined && typeof value === 'object' ? resolveCapacitor(value, `${pointer}/${role}`) : undefined;
}

export function circuitFromBody(body: CircuitBody, directory: AmplifierLookup, pointer = ''): Circuit {
  const amplifier = resolveAmplifierSpec(body.amplifier as string | Record<string, unknown>, directory, `${pointer}/amplifier`);
  const circuit: Circuit = {
    // A deprecated alias names the same topology; answers carry the current id.
    topology: canonicalTopologyId(body.topology),
    supply: { positiveV: body.supply.positiveV, negativeV: body.supply.negativeV ?? 0 },
    amplifier,
    parts: parseParts(body.topology, body.parts as Record<string, PartValue>, `${pointer}/parts`),
  };
  const capacitor = timingCapacitorFromParts(body.topology, body.parts as Record<string, PartValue>, `${pointer}/parts`);
  if (capacitor && capacitor.shape.kind !== 'flat') circuit.capacitorShape = capacitor.shape;
  // Its class-minimum insulation is checked (capacitor-leakage-significant), not applied.
  if (capacitor?.dielectric && Number.isFinite(capacitor.insulationResistanceOhm)) circuit.capacitorInsulationOhm = capacitor.insulationResistanceOhm;
  if (body.load) circuit.load = { resistanceOhm: body.load.resistanceOhm, returnV: body.load.returnV ?? 0 };
  if (body.strays) circuit.strays = straysFromBody(body.strays);
  if (body.diode) {
    circuit.diode = {
      forwardDropV: body.diode.forwardDropV ?? DEFAULT_DIODE.forwardDropV,
      resistanceOhm: body.diode.resistanceOhm ?? DEFAULT_DIODE.resistanceOhm,
    };
  }
  return circuit;
}

/** Strays as sent (absent fields: none) -> the core's complete Strays (no leakage = Infinity). */
export function straysFromBody(s: StraysBody): Strays {
  return {
    timingNodeF: s.timingNodeF ?? NO_STRAYS.timingNodeF,
    thresholdNodeF: s.thresholdNodeF ?? NO_STRAYS.thresholdNodeF,
    outputNodeF: s.outputNodeF ?? NO_STRAYS.outputNodeF,
    timingLeakageOhm: s.timingLeakageOhm ?? NO_STRAYS.timingLeakageOhm,
    thresholdLeakageOhm: s.thresholdLeakageOhm ?? NO_STRAYS.thresholdLeakageOhm,
  };
}

/** Prefix a core error's pointer when the circuit sits inside a larger body (e.g. /circuit). */
export function withPointerPrefix<T>(prefix: string, fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    if (err instanceof CoreError && err.pointer !== undefined && prefix && !err.pointer.startsWith(prefix)) {
      throw new CoreError(err.code, err.message, prefix + err.pointer, err.details);
    }
    throw err;
  }
}

/**
 * JSON cannot carry Infinity: a figure at its table's unlimited value goes out
 * as null. Nothing else does: any other non-finite number is a defect upstream,
 * and the answer guard (finite-answer.ts) refuses it rather than send a null
 * whose meaning nobody defined.
 */
export function amplifierToJson(a: AmplifierModel): Record<string, unknown> {
  const out: Record<string, unknown> = { ...a };
  for (const { name, value } of UNLIMITED_FIGURES) {
    if (out[name] === value) out[name] = null;
  }
  return out;
}
