/**
 * The registry is the one place topology knowledge lives: what design and snap use is declared on each
 * definition and must agree with the roles the definition wires. The threshold solvers are checked
 * against the superposition they invert (Millman's theorem at the decision node).
 */
import { describe, expect, it } from 'vitest';
import { canonicalTopologyId, findTopology, TOPOLOGIES, TOPOLOGY_ALIASES } from '../../../src/core/circuit/topologies/index.ts';
import { networkThresholds, screeningContext } from '../../../src/core/circuit/topologies/threshold-solver.ts';
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';

describe('topology registry', () => {
  it('every designable topology declares timing and threshold roles it actually has, with matching purposes', () => {
    for (const t of TOPOLOGIES) {
      if (!t.design) continue;
      const timing = t.design.timing.kind === 'shared' ? [t.design.timing.resistor, t.design.timing.capacitor] : [t.design.timing.charge, t.design.timing.discharge, t.design.timing.capacitor];
      for (const role of timing) expect(t.roles[role]?.purpose, `${t.id}.${role}`).toBe('timing');
      for (const n of t.design.thresholdNetworks) for (const role of n.roles) expect(t.roles[role]?.purpose, `${t.id}.${role}`).toBe('thresholds');
      expect(t.roles[t.capacitorRole].kind).toBe('capacitor');
    }
  });

  it('resolves the deprecated ids to the current ones and nothing else', () => {
    expect(TOPOLOGY_ALIASES).toEqual({ 'single-supply-divider': 'three-resistor-divider', 'split-supply': 'two-resistor-feedback' });
    expect(findTopology('split-supply')?.id).toBe('two-resistor-feedback');
    expect(canonicalTopologyId('single-supply-divider')).toBe('three-resistor-divider');
    expect(findTopology('no-such-network')).toBeUndefined();
  });

  it("each threshold solver's resistors give back the requested thresholds (Millman's theorem at P)", () => {
    const amp = { ...findBuiltInAmplifier('ideal')!, inputBiasCurrentA: 20e-9, inputOffsetV: 1e-3 };
    for (const t of TOPOLOGIES) {
      for (const n of t.design?.thresholdNetworks ?? []) {
        const supply = n.needsNegativeRail ? { positiveV: 6, negativeV: -6 } : { positiveV: 10, negativeV: 0 };
        const ctx = screeningContext(supply, amp);
        const pair = n.thresholds(0.25, 0.4, ctx);
        const values = n.solve(pair, n.placesDuty ? ctx : { ...ctx, inputBiasCurrentA: 0 }, 20e3);
        const back = networkThresholds(n.network(values), n.placesDuty ? ctx : { ...ctx, inputBiasCurrentA: 0 });
        expect(back.upperV, `${t.id} ${n.name}`).toBeCloseTo(pair.upperV, 9);
        expect(back.lowerV, `${t.id} ${n.name}`).toBeCloseTo(pair.lowerV, 9);
        // Width is the requested quarter of the swing.
        expect((pair.upperV - pair.lowerV) / (ctx.levels.highV - ctx.levels.lowV)).toBeCloseTo(0.25, 9);
      }
    }
  });
});
