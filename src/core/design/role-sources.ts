/**
 * Which value source each role draws from: a default per kind, overridden per
 * role. Value sets are built once per (source, range) and shared between roles.
 */
import { findTopology } from '../circuit/topologies/index.ts';
import { CoreError } from '../errors.ts';
import { buildValueSet, type ValueKind, type ValueRange, type ValueSet, type ValueSource } from './value-set.ts';

export interface RoleSources {
  resistor?: ValueSource;
  capacitor?: ValueSource;
  roles?: Readonly<Record<string, ValueSource>>;
}

export interface PartRanges {
  resistor: ValueRange;
  capacitor: ValueRange;
}

/** Usual bounds when the caller gives none (common practice: below ~100 Ω outputs load down, above ~10 MΩ leakage and pickup matter; below ~100 pF strays matter). */
export const DEFAULT_RANGES: PartRanges = {
  resistor: { min: 100, max: 10e6 },
  capacitor: { min: 100e-12, max: 10e-6 },
};

export function roleKind(topologyId: string, role: string): ValueKind {
  const spec = findTopology(topologyId)?.roles[role];
  if (!spec) throw new CoreError('unexpected-part', `Topology '${topologyId}' has no role '${role}'`, `/values/roles/${role}`);
  return spec.kind;
}

export function sourceFor(sources: RoleSources, role: string, kind: ValueKind): { source: ValueSource; pointer: string } {
  const own = sources.roles?.[role];
  if (own) return { source: own, pointer: `/values/roles/${role}` };
  const byKind = sources[kind];
  if (byKind) return { source: byKind, pointer: `/values/${kind}` };
  throw new CoreError('missing-part', `No value source for role '${role}': give values.${kind} or values.roles.${role}`, `/values/${kind}`);
}

/** Memoised value-set builder keyed by source object identity and range. */
export class ValueSetCache {
  private readonly cache = new Map<ValueSource, Map<string, ValueSet>>();

  constructor(
    private readonly sources: RoleSources,
    private readonly dielectrics?: readonly string[],
    /** Offer class II/III ceramic capacitors (the shared dielectric verdict refuses them otherwise). */
    private readonly allowHighK = false,
  ) {}

  forRole(topologyId: string, role: string, range: ValueRange): ValueSet {
    const kind = roleKind(topologyId, role);
    const { source, pointer } = sourceFor(this.sources, role, kind);
    let byRange = this.cache.get(source);
    if (!byRange) {
      byRange = new Map();
      this.cache.set(source, byRange);
    }
    const key = `${kind}:${range.min}:${range.max}`;
    let set = byRange.get(key);
    if (!set) {
      set = buildValueSet(source, kind, range, { pointer, dielectrics: kind === 'capacitor' ? this.dielectrics : undefined, timingCapacitor: kind === 'capacitor' ? { allowHighK: this.allowHighK } : undefined });
      byRange.set(key, set);
    }
    return set;
  }
}

/** Every role of the request's value sources must exist in the topology. */
export function checkSourceRoles(topologyId: string, sources: RoleSources): void {
  for (const role of Object.keys(sources.roles ?? {})) roleKind(topologyId, role);
}
