/**
 * The impossible causes the diagnosis used to name (issue reproductions),
 * on scope records made by the odex reference integrator with noise and 8-bit
 * quantisation (diagnosis-boards.ts). Each check is physical, not a figure of
 * ours: an output level cannot leave the rails, an open-drain low level cannot
 * sit below the negative rail, a delay cannot be negative or beyond its class,
 * and a hypothesis that fails its goodness-of-fit test (χ² bound at the 1e-3
 * level, Wilson–Hilferty) must not outrank one that passes.
 */
import { describe, expect, it } from 'vitest';
import { findTopology } from '../../../src/core/circuit/topologies/index.ts';
import type { Circuit } from '../../../src/core/circuit/types.ts';
import { fitCircuit, type FitReport } from '../../../src/core/fit/index.ts';
import { boardCapture, nominalBoard, RESISTOR_TOLERANCE, CAPACITOR_TOLERANCE, type Board, type ChannelSet } from './diagnosis-boards.ts';

function boardWith(topologyId: string, change: Record<string, number>): Board {
  const nominal = nominalBoard(findTopology(topologyId)!);
  const tolerances = Object.fromEntries(Object.keys(nominal.parts).map((r) => [r, r.startsWith('c') ? CAPACITOR_TOLERANCE : RESISTOR_TOLERANCE]));
  return { topology: topologyId, nominal, truth: { ...nominal, parts: { ...nominal.parts, ...change } }, faultRoles: Object.keys(change), fault: 'regression', tolerances };
}

function diagnoseBoard(board: Board, channels: ChannelSet, seed: number): FitReport {
  const capture = boardCapture(board, channels, seed)!;
  return fitCircuit({ circuit: board.nominal, tolerances: board.tolerances, capture });
}

/** Every level estimate inside the rails (open drain: low level at or above the negative rail). */
function expectPhysical(report: FitReport, circuit: Circuit) {
  const { positiveV, negativeV } = circuit.supply;
  const all = [...report.estimation.estimates, ...report.diagnosis.explanations.flatMap((e) => e.causes)];
  for (const e of all) {
    if (e.parameter === 'outputHighV') expect(e.estimate).toBeLessThanOrEqual(positiveV);
    if (e.parameter === 'outputLowV') expect(e.estimate).toBeGreaterThanOrEqual(negativeV);
    if (e.parameter === 'recoveryDelayS') expect(e.estimate).toBeGreaterThanOrEqual(0);
    if (e.kind === 'part') expect(e.estimate).toBeGreaterThan(0);
  }
}

/** No explanation that fails the 1e-3 goodness-of-fit test ranks above one that passes. */
function expectGoodnessOrder(report: FitReport) {
  const passes = report.diagnosis.explanations.map((e) => e.passesGoodnessOfFit);
  const firstFail = passes.indexOf(false);
  if (firstFail >= 0) expect(passes.slice(firstFail).every((p) => !p)).toBe(true);
}

const firstRoles = (r: FitReport) => r.diagnosis.explanations[0].causes.map((c) => c.parameter);

describe('diagnosis regressions: the causes it names are possible, and the true one leads', () => {
  it('feedback resistor +7 %: rFeedback leads and accounts for the record', () => {
    const board = boardWith('three-resistor-divider', { rFeedback: 107e3 });
    const r = diagnoseBoard(board, 'both', 11);
    expect(r.diagnosis.verdict.agreesWithNominal).toBe(false);
    expect(firstRoles(r)).toContain('rFeedback');
    expect(r.diagnosis.explanations[0].passesGoodnessOfFit).toBe(true);
    expectGoodnessOrder(r);
    expectPhysical(r, board.nominal);
  });

  it('top divider resistor +7 %: no output high level above the positive rail, and rTop named', () => {
    const board = boardWith('three-resistor-divider', { rTop: 107e3 });
    const r = diagnoseBoard(board, 'both', 12);
    expectPhysical(r, board.nominal);
    expectGoodnessOrder(r);
    const named = r.diagnosis.explanations.slice(0, 3).some((e) => e.causes.some((c) => c.parameter === 'rTop')) || r.diagnosis.ambiguities.some((a) => a.hypotheses.some((h) => h.includes('rTop')));
    expect(named).toBe(true);
  });

  it('open drain with a 2.2 kΩ pull-up instead of 1 kΩ: low level never below the negative rail, the pull-up leads', () => {
    const board = boardWith('open-drain-pullup', { rPullup: 2.2e3 });
    const r = diagnoseBoard(board, 'both', 13);
    expectPhysical(r, board.nominal);
    expectGoodnessOrder(r);
    expect(firstRoles(r)).toContain('rPullup');
  });

  it('output channel only, timing resistor +7 %: not blamed on the recovery delay', () => {
    const board = boardWith('three-resistor-divider', { rTiming: 10.7e3 });
    const r = diagnoseBoard(board, 'output', 14);
    expectPhysical(r, board.nominal);
    expect(firstRoles(r)).not.toContain('recoveryDelayS');
    // From the output alone τ = R·C is all the record says: rTiming leads, or its indistinguishable twin with it declared.
    const lead = firstRoles(r);
    const declared = r.diagnosis.ambiguities.some((a) => a.hypotheses.some((h) => h.includes('rTiming')));
    expect(lead.includes('rTiming') || declared).toBe(true);
  });

  // A decade slip with the other parts inside their tolerances: the slip moves the figures tenfold, and the same
  // in-tolerance spread of its neighbours moves them tenfold too; weighed around the nominal circuit instead,
  // the slip was outranked by a continuous cause a factor ten off. The other timing part is set 0.8 %–1.5 % off
  // by hand (inside its 1 % / 2 % tolerance), as a board from the reel is.
  it('timing capacitor a decade down (1 nF for 10 nF), timing resistor +0.8 %: a decade slip leads, and a resistor slip only with the pair declared alike and the swap that tells them', () => {
    const slipped = boardWith('three-resistor-divider', { cTiming: 1e-9 });
    const board = { ...slipped, truth: { ...slipped.truth, parts: { ...slipped.truth.parts, rTiming: 10.08e3 } } };
    for (const [channels, seed] of [['both', 15], ['output', 16]] as const) {
      const r = diagnoseBoard(board, channels, seed);
      const lead = r.diagnosis.explanations[0].hypothesis;
      expect(lead).toMatch(/^decade-slip:(cTiming|rTiming)÷10$/);
      if (lead !== 'decade-slip:cTiming÷10') {
        const amb = r.diagnosis.ambiguities.find((a) => a.hypotheses.includes('decade-slip:cTiming÷10'));
        expect(amb?.separatingMeasurement?.figure).toMatch(/^frequencyHz with a known (cTiming|rTiming)$/);
      }
    }
  });

  it('feedback-network ground resistor a decade down (10 kΩ for 100 kΩ), timing capacitor −1.5 %, output channel: rGround leads', () => {
    const slipped = boardWith('two-resistor-feedback', { rGround: 10e3 });
    const board = { ...slipped, truth: { ...slipped.truth, parts: { ...slipped.truth.parts, cTiming: 10e-9 * 0.985 } } };
    const r = diagnoseBoard(board, 'output', 17);
    expect(r.diagnosis.verdict.agreesWithNominal).toBe(false);
    expect(firstRoles(r)).toContain('rGround');
    expectGoodnessOrder(r);
  });
});
