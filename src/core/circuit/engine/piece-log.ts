/**
 * A growable flat record of the pieces a walk went through: everything needed
 * to re-evaluate any quantity at any time inside a piece afterwards (figures,
 * crossings, waveform samples) without storing per-piece objects. The walk
 * also records what it already computed at the far end of each piece (the
 * capacitor voltage and ∫v dt, from one evaluation of the φ-functions), so
 * re-reading a piece costs no exponential.
 */
export const LOG = {
  startS: 0,
  durationS: 1,
  v0: 2,
  s0: 3,
  /** Source slope, V/s (0: settled or not driven). */
  rate: 4,
  key: 5,
  /** Comparator decision (1 high, 0 low). */
  logic: 6,
  /** Level the output stage is heading for (the decision delayed by the recovery delay). */
  target: 7,
  /** Capacitor voltage at the end of the piece, V. */
  vEnd: 8,
  /** ∫ v dt over the whole piece, V·s. */
  integralV: 9,
  /** Voltages of the other capacitive nodes at the start of the piece (P, output pin), V (0 when they have none). */
  xP0: 10,
  xO0: 11,
  /** What ended the piece: an EVENT kind (configs.ts) or a time event (walker.ts TIME_EVENT). */
  end: 12,
} as const;
export const LOG_STRIDE = 13;

export class PieceLog {
  data = new Float64Array(16 * LOG_STRIDE);
  count = 0;

  clear(): void {
    this.count = 0;
  }

  /**
   * Room for one more record: returns its offset in `data` (re-read `data` after the call: it may have grown).
   * The walk writes the fields itself, so no ten-number call boundary sits on its hot path.
   */
  append(): number {
    if ((this.count + 1) * LOG_STRIDE > this.data.length) {
      const grown = new Float64Array(this.data.length * 2);
      grown.set(this.data);
      this.data = grown;
    }
    return this.count++ * LOG_STRIDE;
  }

  get(index: number, field: number): number {
    return this.data[index * LOG_STRIDE + field];
  }
}
