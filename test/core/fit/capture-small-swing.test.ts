/**
 * A capacitor-only capture of a board with a tiny hysteresis: the capacitor
 * swings a triangle about 80 mV high, a few 8-bit codes of a 5 V range, under
 * 5 mV of noise. The record is made by the odex reference integrator
 * (test/core/circuit/engine-odex-reference.ts), whose own period is the
 * reference. A crossing window sized from the period alone saw one flat code
 * and no crossing, and periods merged across the crossings not read: such a
 * record read 16.5 kHz for a 50 kHz board. The capture analysis must read the
 * reference's frequency within a few parts in a thousand.
 */
import { describe, expect, it } from 'vitest';
import { findTopology } from '../../../src/core/circuit/topologies/index.ts';
import { analyzeCapture } from '../../../src/core/fit/capture/analyze-capture.ts';
import { referenceOscillation } from '../circuit/engine-odex-reference.ts';
import { captureOf, nominalBoard, type Board } from './diagnosis-boards.ts';

const topology = findTopology('three-resistor-divider')!;
const drawn = nominalBoard(topology);
// 100 kΩ : 100 kΩ divider with 3 MΩ feedback: hysteresis ≈ 5 V · 50 kΩ / 3.05 MΩ ≈ 82 mV; 10 kΩ / 33 nF ≈ 46 kHz.
const circuit = { ...drawn, parts: { ...drawn.parts, rFeedback: 3e6, rTiming: 10e3, cTiming: 33e-9 } };
const board: Board = { topology: topology.id, nominal: circuit, truth: circuit, faultRoles: [], fault: 'small swing', tolerances: {} };

describe('capture analysis: a small-swing capacitor record (tiny hysteresis)', () => {
  const run = referenceOscillation(circuit, { tolerance: 1e-8, maxCycles: 400, sample: { perPeriod: 2000, periods: 8 } });
  const record = { intervalS: run.samples!.intervalS, outputV: run.samples!.outputV, capacitorV: run.samples!.capacitorV };

  it('the reference swings a small triangle (the case under test)', () => {
    let lo = Infinity;
    let hi = -Infinity;
    for (const v of record.capacitorV) {
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
    }
    expect(hi - lo).toBeLessThan(0.1);
    expect(hi - lo).toBeGreaterThan(0.06);
  });

  for (const seed of [1, 2, 3, 4]) {
    it(`capacitor only, seed ${seed}: the reference's frequency within 0.3 %, every full period counted`, () => {
      const f = analyzeCapture(captureOf(board, record, 'capacitor', seed));
      expect(f.timingSource).toBe('capacitor');
      expect(Math.abs(f.frequencyHz * run.periodS - 1)).toBeLessThan(3e-3);
      // 8 periods recorded from a random phase: at least 6 full periods between mid-level crossings.
      expect(f.periodCount).toBeGreaterThanOrEqual(6);
      expect(Math.abs(f.capacitorAboveMidShare! - 0.5)).toBeLessThan(0.05);
    });
  }
});
