/**
 * Synthetic scope records for the capture tests: a seeded PRNG, Gaussian
 * noise, ADC quantisation, a trapezoidal pulse train and the two channels of
 * an ideal split-supply astable. All written here; nothing is taken from a
 * measured record.
 */

/** mulberry32: a small, well-known 32-bit seeded generator (public domain). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviates by the Box-Muller transform. */
export function gaussian(rand: () => number): () => number {
  let spare: number | undefined;
  return () => {
    if (spare !== undefined) {
      const s = spare;
      spare = undefined;
      return s;
    }
    let u = 0;
    while (u === 0) u = rand();
    const v = rand();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
}

export function addNoise(values: Float64Array, sigmaV: number, seed: number): Float64Array {
  const g = gaussian(seededRandom(seed));
  for (let i = 0; i < values.length; i++) values[i] += sigmaV * g();
  return values;
}

/** Round to an N-bit ADC spanning [fullScaleMinV, fullScaleMaxV]; out-of-range values stick at the end codes. */
export function quantise(values: Float64Array, bits: number, fullScaleMinV: number, fullScaleMaxV: number): Float64Array {
  const codes = 2 ** bits - 1;
  const lsbV = (fullScaleMaxV - fullScaleMinV) / codes;
  for (let i = 0; i < values.length; i++) {
    const code = Math.min(codes, Math.max(0, Math.round((values[i] - fullScaleMinV) / lsbV)));
    values[i] = fullScaleMinV + code * lsbV;
  }
  return values;
}

export interface PulseTrain {
  lowV: number;
  highV: number;
  periodS: number;
  /** High time between the 50 % instants over the period. */
  dutyCycle: number;
  /** Linear ramp duration of each edge, 0 % to 100 %. */
  rampS: number;
  /** Instant the first rising ramp starts. */
  firstEdgeS: number;
}

/** Ideal trapezoidal pulse train: rising ramp [0, D], falling ramp [duty*T, duty*T + D] within each period. */
export function trapezoid(p: PulseTrain, sampleIntervalS: number, count: number): Float64Array {
  const out = new Float64Array(count);
  const amp = p.highV - p.lowV;
  const fallStart = p.dutyCycle * p.periodS;
  for (let i = 0; i < count; i++) {
    const t = i * sampleIntervalS - p.firstEdgeS;
    const ph = ((t % p.periodS) + p.periodS) % p.periodS;
    let frac: number;
    if (ph < p.rampS) frac = ph / p.rampS;
    else if (ph < fallStart) frac = 1;
    else if (ph < fallStart + p.rampS) frac = 1 - (ph - fallStart) / p.rampS;
    else frac = 0;
    out[i] = p.lowV + frac * amp;
  }
  return out;
}

export interface Astable {
  /** Output saturation levels, V. */
  outputHighV: number;
  outputLowV: number;
  /** Switching levels seen by the capacitor, V. */
  upperSwitchV: number;
  lowerSwitchV: number;
  tauS: number;
}

/**
 * Ideal astable: the capacitor charges towards the output level with time
 * constant tau and the output flips when it reaches a switching level; the
 * output edges are instantaneous. Starts at the lower switching level just
 * after a rising output edge at t = 0. Returns the switching instants too.
 */
export function astable(a: Astable, sampleIntervalS: number, count: number): { output: Float64Array; capacitor: Float64Array; edgesS: number[] } {
  const tHigh = a.tauS * Math.log((a.outputHighV - a.lowerSwitchV) / (a.outputHighV - a.upperSwitchV));
  const tLow = a.tauS * Math.log((a.outputLowV - a.upperSwitchV) / (a.outputLowV - a.lowerSwitchV));
  const output = new Float64Array(count);
  const capacitor = new Float64Array(count);
  const edgesS: number[] = [0];
  let segStart = 0;
  let high = true;
  for (let i = 0; i < count; i++) {
    const t = i * sampleIntervalS;
    while (t >= segStart + (high ? tHigh : tLow)) {
      segStart += high ? tHigh : tLow;
      high = !high;
      edgesS.push(segStart);
    }
    const target = high ? a.outputHighV : a.outputLowV;
    const from = high ? a.lowerSwitchV : a.upperSwitchV;
    output[i] = target;
    capacitor[i] = target + (from - target) * Math.exp(-(t - segStart) / a.tauS);
  }
  return { output, capacitor, edgesS };
}

/**
 * What a bench scope does to a clean two-channel record (our own demo settings): Gaussian noise (20 mV on
 * the output, 5 mV on the capacitor), channel offsets (+30 mV, −10 mV) and 8-bit ADCs over ±3 V / ±1.5 V.
 * Shared by the fit tests whatever made the clean record (closed-form synthesis or the engine).
 */
export function benchScopeRecord(clean: { output: Float64Array; capacitor: Float64Array }, sampleIntervalS: number, seed: number) {
  addNoise(clean.output, 0.02, seed);
  addNoise(clean.capacitor, 0.005, seed + 1);
  for (let i = 0; i < clean.output.length; i++) clean.output[i] += 0.03;
  for (let i = 0; i < clean.capacitor.length; i++) clean.capacitor[i] -= 0.01;
  quantise(clean.output, 8, -3, 3);
  quantise(clean.capacitor, 8, -1.5, 1.5);
  return { sampleIntervalS, output: clean.output, capacitor: clean.capacitor };
}
