/**
 * The timing pair as a product. On a push-pull board the timing resistor R and
 * capacitor C enter every charging curve only as τ = R·C (the RC charging law;
 * Sedra & Smith's op-amp astable, T = 2RC·ln((1 + β)/(1 − β)) for the split
 * supply): no waveform figure separates R + x % from C + x %. On a record made
 * by the odex reference integrator with noise and 8-bit quantisation, the
 * diagnosis must declare the two indistinguishable, say why, and name a part
 * swap that separates them — a resistor or capacitor of known value in the
 * timing role restores the frequency only under the hypothesis that blamed it.
 */
import { describe, expect, it } from 'vitest';
import { findTopology } from '../../../src/core/circuit/topologies/index.ts';
import { fitCircuit } from '../../../src/core/fit/index.ts';
import { boardCapture, nominalBoard, type Board } from './diagnosis-boards.ts';

const topology = findTopology('three-resistor-divider')!;
const nominal = nominalBoard(topology);
// Both timing parts at 1 %: neither prior can decide which one is off.
const tolerances = { rTop: 0.01, rBottom: 0.01, rFeedback: 0.01, rTiming: 0.01, cTiming: 0.01 };

describe('diagnosis: the timing resistor and capacitor meet only as their product', () => {
  it('rTiming +6 %: declared indistinguishable from cTiming +6 %, with the swap that tells them apart', () => {
    const board: Board = { topology: topology.id, nominal, truth: { ...nominal, parts: { ...nominal.parts, rTiming: 10.6e3 } }, faultRoles: ['rTiming'], fault: 'product', tolerances };
    const d = fitCircuit({ circuit: nominal, tolerances, capture: boardCapture(board, 'both', 3)! }).diagnosis;
    expect(d.verdict.agreesWithNominal).toBe(false);
    expect(d.explanations.slice(0, 2).map((e) => e.hypothesis).sort()).toEqual(['off:cTiming', 'off:rTiming']);
    const pair = d.ambiguities.find((a) => a.hypotheses.includes('off:rTiming') && a.hypotheses.includes('off:cTiming'));
    expect(pair, JSON.stringify(d.ambiguities)).toBeDefined();
    expect(pair!.statement).toMatch(/product rTiming·cTiming/);
    const m = pair!.separatingMeasurement!;
    expect(m.action).toMatch(/of known value .* as (rTiming|cTiming) and measure the frequency/);
    // Under the hypothesis that blamed the swapped part the frequency returns to nominal; under the other it stays about 6 % low.
    const [a, b] = m.predictions.map((p) => p.value).sort((x, y) => x - y);
    expect(b / a - 1).toBeGreaterThan(0.04);
  }, 60_000);
});
