/**
 * A timing capacitor of another dielectric class as a wrong-part fault, on
 * records made by the odex reference integrator (its own integration of the
 * C(V) charging ODE, test/core/circuit/engine-odex-reference.ts) with noise and
 * 8-bit quantisation: the class-typical C(V) of the capacitor model (from
 * memory, typical of the class) is the truth, and the diagnosis must name the
 * dielectric swap, not a part off by some per cent.
 */
import { describe, expect, it } from 'vitest';
import { fitCircuit } from '../../../src/core/fit/index.ts';
import { resolveCapacitor } from '../../../src/core/parts/capacitor/index.ts';
import { findTopology } from '../../../src/core/circuit/topologies/index.ts';
import { boardRecord, captureOf, nominalBoard, type Board } from './diagnosis-boards.ts';

const topology = findTopology('three-resistor-divider')!;
const flat = nominalBoard(topology);
const tolerances = { rTop: 0.01, rBottom: 0.01, rFeedback: 0.01, rTiming: 0.01, cTiming: 0.02 };

function diagnoseBoard(nominal: Board['nominal'], truth: Board['truth']) {
  const board: Board = { topology: topology.id, nominal, truth, faultRoles: ['cTiming'], fault: 'other dielectric', tolerances };
  const record = boardRecord(board)!;
  return fitCircuit({ circuit: nominal, tolerances, capture: captureOf(board, record, 'both', 11) }).diagnosis;
}

describe('diagnosis: a timing capacitor of another dielectric class', () => {
  it('a small-case X7R part (0603, 6.3 V, marked 5 % high) where a flat one was designed: the dielectric swap leads', () => {
    const x7r = resolveCapacitor({ value: 10.5e-9, dielectric: 'X7R', caseSize: '0603', ratedVoltageV: 6.3 });
    const d = diagnoseBoard(flat, { ...flat, parts: { ...flat.parts, cTiming: x7r.capacitanceF }, capacitorShape: x7r.shape });
    expect(d.verdict.agreesWithNominal).toBe(false);
    expect(d.explanations[0].hypothesis).toBe('other-dielectric:cTiming=class-II');
    expect(d.explanations[0].causes[0].fault).toBe('other-dielectric');
    expect(d.verdict.statement).toMatch(/class II ceramic that loses capacitance with DC bias/);
  }, 60_000);

  it('a split-supply board (±6 V, swing ±2.3 V about 0 V) with an X7R 0603 6.3 V part: the fitted curve leads, between the catalogued ones', () => {
    const split = findTopology('two-resistor-feedback')!;
    const nominal = nominalBoard(split);
    const splitTolerances = { rTiming: 0.01, cTiming: 0.02, rFeedback: 0.01, rGround: 0.01 };
    const x7r = resolveCapacitor({ value: 10e-9, dielectric: 'X7R', caseSize: '0603', ratedVoltageV: 6.3 });
    const truth = { ...nominal, parts: { ...nominal.parts, cTiming: x7r.capacitanceF }, capacitorShape: x7r.shape };
    const board: Board = { topology: split.id, nominal, truth, faultRoles: ['cTiming'], fault: 'other dielectric', tolerances: splitTolerances };
    const d = fitCircuit({ circuit: nominal, tolerances: splitTolerances, capture: captureOf(board, boardRecord(board)!, 'both', 13) }).diagnosis;
    expect(d.verdict.agreesWithNominal).toBe(false);
    expect(d.explanations[0].hypothesis).toBe('other-dielectric:cTiming=class-II');
    expect(d.explanations[0].passesGoodnessOfFit).toBe(true);
    // The curve fitted keeps what the part keeps at the largest bias the supply can give (6 V), within 3 points.
    const kept = Number(/keeps (\d+) % at 6 V/.exec(d.explanations[0].causes[0].text)?.[1]);
    expect(Math.abs(kept - 100 * x7r.shape.ratio(6))).toBeLessThanOrEqual(3);
  }, 60_000);

  it('a flat part where the design declares an X7R one: the flat dielectric leads', () => {
    const declared = resolveCapacitor({ value: '10n', dielectric: 'X7R', caseSize: '0805', ratedVoltageV: 16 });
    const nominal = { ...flat, parts: { ...flat.parts, cTiming: declared.capacitanceF }, capacitorShape: declared.shape };
    const d = diagnoseBoard(nominal, { ...flat, parts: { ...flat.parts, cTiming: 10e-9 } });
    expect(d.verdict.agreesWithNominal).toBe(false);
    expect(d.explanations[0].hypothesis).toBe('other-dielectric:cTiming=flat');
  }, 60_000);
});
