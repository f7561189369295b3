/**
 * An open-drain output whose top tilts: the pull-up feeds the timing resistor,
 * so the high level climbs as the capacitor charges (about 0.17 V over the
 * high state on this board). The shared definition of a state level is the
 * pin at the instant the output starts to leave the state
 * (src/core/scope/ieee181.ts); the record is made by the odex reference
 * integrator (test/core/circuit/engine-odex-reference.ts), and its own
 * noiseless samples just before each falling edge are the reference here.
 * The capture (noise and 8-bit quantisation) must read that level, not a
 * histogram window leaning into the tilt (which read it three ADC codes low).
 */
import { describe, expect, it } from 'vitest';
import { findTopology } from '../../../src/core/circuit/topologies/index.ts';
import { analyzeCapture } from '../../../src/core/fit/capture/analyze-capture.ts';
import { boardRecord, captureOf, nominalBoard, type Board } from './diagnosis-boards.ts';

const topology = findTopology('open-drain-pullup')!;
const circuit = nominalBoard(topology);
const board: Board = { topology: topology.id, nominal: circuit, truth: circuit, faultRoles: [], fault: 'tilted top', tolerances: {} };
const record = boardRecord(board)!;

/** The noiseless record's pin just before each edge leaving the high (falling) and the low (rising) state. */
function levelsBeforeEdges(v: Float64Array): { highV: number; lowV: number; tiltV: number } {
  const mid = (Math.max(...v) + Math.min(...v)) / 2;
  const highs: number[] = [];
  const lows: number[] = [];
  let tiltV = 0;
  let stateStart = -1;
  for (let i = 1; i < v.length; i++) {
    if (v[i - 1] >= mid && v[i] < mid) {
      // Last sample before the edge starts: step back while the pin is still falling steeply.
      let j = i - 1;
      while (j > 0 && v[j - 1] - v[j] > 0.05) j--;
      highs.push(v[j]);
      if (stateStart >= 0) tiltV = Math.max(tiltV, v[j] - v[stateStart]);
    }
    if (v[i - 1] < mid && v[i] >= mid) {
      let j = i - 1;
      while (j > 0 && v[j] - v[j - 1] > 0.05) j--;
      lows.push(v[j]);
      stateStart = Math.min(v.length - 1, i + 5);
    }
  }
  const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
  return { highV: mean(highs), lowV: mean(lows), tiltV };
}

describe('capture analysis: an open-drain top that tilts', () => {
  const reference = levelsBeforeEdges(record.outputV);

  it('the reference top tilts by several ADC codes (the case under test)', () => {
    // 8-bit over 5.5 V: a code is 21.5 mV.
    expect(reference.tiltV).toBeGreaterThan(0.1);
  });

  for (const seed of [1, 2, 3]) {
    it(`seed ${seed}: the high and low levels are the pin where the output leaves the state, within half a code`, () => {
      const f = analyzeCapture(captureOf(board, record, 'both', seed));
      expect(Math.abs(f.outputHighV! - reference.highV)).toBeLessThan(0.011);
      expect(Math.abs(f.outputLowV! - reference.lowV)).toBeLessThan(0.011);
    });
  }
});
