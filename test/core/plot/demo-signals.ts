/**
 * Invented demo signals for the plot tests: an ideal RC relaxation oscillator
 * whose capacitor charges exponentially toward the output level and switches at
 * one third and two thirds of the supply. The exponential charge
 * v(t) = v∞ + (v0 − v∞)·e^(−t/τ) is the textbook RC step response
 * (Horowitz & Hill, The Art of Electronics, 3rd ed., §1.4); the values are our own.
 */
export interface DemoWaveform {
  timeS: Float64Array;
  capacitorV: Float64Array;
  outputV: Float64Array;
  decisionV: Float64Array;
  upperV: number;
  lowerV: number;
}

export function demoOscillator(sampleCount: number, durationS: number, supplyV = 5, tauS = 12e-6): DemoWaveform {
  const upperV = (2 / 3) * supplyV;
  const lowerV = (1 / 3) * supplyV;
  const timeS = new Float64Array(sampleCount);
  const capacitorV = new Float64Array(sampleCount);
  const outputV = new Float64Array(sampleCount);
  const decisionV = new Float64Array(sampleCount);
  const dtS = durationS / (sampleCount - 1);
  let pieceStartS = 0;
  let pieceStartV = 0;
  let high = true;
  for (let i = 0; i < sampleCount; i++) {
    const t = i * dtS;
    const target = high ? supplyV : 0;
    let v = target + (pieceStartV - target) * Math.exp(-(t - pieceStartS) / tauS);
    if ((high && v >= upperV) || (!high && v <= lowerV)) {
      high = !high;
      pieceStartS = t;
      pieceStartV = v;
      v = Math.min(Math.max(v, lowerV), upperV);
    }
    timeS[i] = t;
    capacitorV[i] = v;
    outputV[i] = high ? supplyV : 0;
    decisionV[i] = high ? upperV : lowerV;
  }
  return { timeS, capacitorV, outputV, decisionV, upperV, lowerV };
}

/** Deterministic pseudo-random numbers (Park–Miller minimal standard generator, CACM 1988). */
export function parkMiller(seed: number): () => number {
  let state = seed;
  return () => {
    state = (state * 16807) % 2147483647;
    return state / 2147483647;
  };
}

/** Roughly normal samples by summing twelve uniforms (Irwin–Hall, common practice for test data). */
export function demoFrequencies(count: number, meanHz: number, sigmaHz: number, seed = 2024): Float64Array {
  const random = parkMiller(seed);
  return Float64Array.from({ length: count }, () => {
    let s = 0;
    for (let k = 0; k < 12; k++) s += random();
    return meanHz + (s - 6) * sigmaHz;
  });
}
