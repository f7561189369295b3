/**
 * Seeded, reproducible random numbers for Monte Carlo.
 *
 * Generator: xoshiro128** 1.1 (Blackman & Vigna, "Scrambled linear
 * pseudorandom number generators", 2018/2021), 128-bit state, period 2^128 − 1,
 * built from 32-bit operations so it runs fast on JavaScript numbers. The state
 * is seeded by SplitMix32 (the 32-bit variant of Steele, Lea & Flood's SplitMix)
 * from one integer seed, as the xoshiro authors recommend, so that nearby seeds
 * give unrelated streams.
 */

/** SplitMix32 step: returns the next seed word and advances the closure state. */
function splitMix32(seed: number): () => number {
  let x = seed >>> 0;
  return () => {
    x = (x + 0x9e3779b9) | 0;
    let z = x;
    z = Math.imul(z ^ (z >>> 16), 0x21f0aaad);
    z = Math.imul(z ^ (z >>> 15), 0x735a2d97);
    return (z ^ (z >>> 15)) >>> 0;
  };
}

const TWO_POW_MINUS_53 = 2 ** -53;

export class Xoshiro128 {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;

  /** Seed: any integer (only its low 32 bits and, for large seeds, a fold of the high bits are used). */
  constructor(seed: number) {
    const folded = Number.isSafeInteger(seed) ? (seed >>> 0) ^ Math.floor(seed / 2 ** 32) : 0;
    const next = splitMix32(folded);
    this.s0 = next();
    this.s1 = next();
    this.s2 = next();
    this.s3 = next();
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1; // the all-zero state is a fixed point
  }

  /** A generator started from an explicit 128-bit state (four 32-bit words, not all zero): for reference checks. */
  static fromState(words: readonly [number, number, number, number]): Xoshiro128 {
    const g = new Xoshiro128(0);
    [g.s0, g.s1, g.s2, g.s3] = words.map((w) => w | 0) as [number, number, number, number];
    return g;
  }

  /** Next 32-bit output as an unsigned integer. */
  nextUint32(): number {
    const s1 = this.s1;
    const x = Math.imul(s1, 5);
    const result = Math.imul((x << 7) | (x >>> 25), 9);
    const t = s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = (this.s3 << 11) | (this.s3 >>> 21);
    return result >>> 0;
  }

  /** Uniform double in [0, 1) with 53 random bits (two outputs). */
  nextFloat(): number {
    const hi = this.nextUint32() >>> 6; // 26 bits
    const lo = this.nextUint32() >>> 5; // 27 bits
    return (hi * 2 ** 27 + lo) * TWO_POW_MINUS_53;
  }

  /**
   * Standard normal deviate: the ziggurat method of Marsaglia & Tsang ("The
   * Ziggurat Method for Generating Random Variables", J. Statistical Software
   * 5(8), 2000) with 128 layers. The layer index comes from a separate 32-bit
   * draw, not from the low bits of the value word, which avoids the layer/value
   * correlation Doornik (2005) found in the original.
   */
  nextNormal(): number {
    for (;;) {
      const hz = this.nextUint32() | 0;
      const iz = this.nextUint32() & 127;
      if (Math.abs(hz) < ZIG_K[iz]) return hz * ZIG_W[iz];
      const x = hz * ZIG_W[iz];
      if (iz === 0) {
        // Base strip: sample the tail beyond r (Marsaglia's exponential rejection).
        let tx: number;
        let ty: number;
        do {
          tx = -Math.log(1 - this.nextFloat()) / ZIG_R;
          ty = -Math.log(1 - this.nextFloat());
        } while (ty + ty < tx * tx);
        return hz > 0 ? ZIG_R + tx : -ZIG_R - tx;
      }
      // Wedge: accept under the density.
      if (ZIG_F[iz] + this.nextFloat() * (ZIG_F[iz - 1] - ZIG_F[iz]) < Math.exp(-0.5 * x * x)) return x;
    }
  }
}

/** Ziggurat tables for 128 layers (Marsaglia & Tsang 2000: r = 3.442619855899, layer area v = 9.91256303526217e-3). */
const ZIG_R = 3.442619855899;
const ZIG_K = new Float64Array(128);
const ZIG_W = new Float64Array(128);
const ZIG_F = new Float64Array(128);
(function buildZigguratTables() {
  const m1 = 2147483648;
  const v = 9.91256303526217e-3;
  let dn = ZIG_R;
  let tn = dn;
  const q = v / Math.exp(-0.5 * dn * dn);
  ZIG_K[0] = (dn / q) * m1;
  ZIG_K[1] = 0;
  ZIG_W[0] = q / m1;
  ZIG_W[127] = dn / m1;
  ZIG_F[0] = 1;
  ZIG_F[127] = Math.exp(-0.5 * dn * dn);
  for (let i = 126; i >= 1; i--) {
    dn = Math.sqrt(-2 * Math.log(v / dn + Math.exp(-0.5 * dn * dn)));
    ZIG_K[i + 1] = (dn / tn) * m1;
    tn = dn;
    ZIG_F[i] = Math.exp(-0.5 * dn * dn);
    ZIG_W[i] = dn / m1;
  }
})();
