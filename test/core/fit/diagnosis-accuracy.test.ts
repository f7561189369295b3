/**
 * A CI slice of bench/diagnosis.bench.ts: per registered topology, two boards
 * with one part clearly off (±10–20 %), both channels, plus one in-tolerance
 * board, all recorded by the odex reference integrator with noise and 8-bit
 * quantisation. Lower bar than the benchmark (which prints the full table):
 * the fault named within the first three explanations on at least 80 % of
 * the faulty boards, and at most one false alarm.
 */
import { describe, expect, it } from 'vitest';
import { TOPOLOGIES } from '../../../src/core/circuit/topologies/index.ts';
import { fitCircuit } from '../../../src/core/fit/index.ts';
import { seededRandom } from './capture-synth.ts';
import { boardCapture, nominalBoard, RESISTOR_TOLERANCE, CAPACITOR_TOLERANCE, score, type Board } from './diagnosis-boards.ts';

function sliceBoards(): Board[] {
  const rand = seededRandom(4242);
  const out: Board[] = [];
  for (const topology of TOPOLOGIES) {
    const nominal = nominalBoard(topology);
    const roles = Object.keys(nominal.parts);
    const tolerances = Object.fromEntries(roles.map((r) => [r, topology.roles[r].kind === 'capacitor' ? CAPACITOR_TOLERANCE : RESISTOR_TOLERANCE]));
    for (let k = 0; k < 2; k++) {
      const role = roles[Math.floor(rand() * roles.length)];
      const d = (rand() < 0.5 ? -1 : 1) * (0.1 + 0.1 * rand());
      out.push({ topology: topology.id, nominal, truth: { ...nominal, parts: { ...nominal.parts, [role]: nominal.parts[role] * (1 + d) } }, faultRoles: [role], fault: `${role} ${d}`, tolerances });
    }
    out.push({ topology: topology.id, nominal, truth: nominal, faultRoles: [], fault: 'in tolerance', tolerances });
  }
  return out;
}

describe('diagnosis accuracy, CI slice (odex-made records)', () => {
  it('names the fault within three explanations on most boards, with few false alarms', () => {
    let faulty = 0;
    let found = 0;
    let alarms = 0;
    const misses: string[] = [];
    for (const [k, board] of sliceBoards().entries()) {
      const capture = boardCapture(board, 'both', 100 + k);
      if (!capture) continue;
      const report = fitCircuit({ circuit: board.nominal, tolerances: board.tolerances, capture });
      const s = score(board, report);
      if (!s.faulty) {
        if (s.falseAlarm) alarms++;
        continue;
      }
      faulty++;
      if (s.top3) found++;
      else misses.push(`${board.topology} ${board.fault}: ${report.diagnosis.explanations.slice(0, 3).map((e) => e.hypothesis).join(', ')}`);
    }
    expect(faulty).toBeGreaterThanOrEqual(6);
    expect(found / faulty, misses.join('; ')).toBeGreaterThanOrEqual(0.8);
    expect(alarms).toBeLessThanOrEqual(1);
  }, 120_000);
});
