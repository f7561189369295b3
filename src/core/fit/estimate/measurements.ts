/**
 * What the fit compares the model with: named figures, each with a standard
 * uncertainty (1σ, same unit). They come from the caller as scalars or are
 * read off a capture by the capture analysis.
 */
import { CoreError } from '../../errors.ts';
import type { CaptureFeatures } from '../capture/analyze-capture.ts';
import type { PredictedFigures } from './forward.ts';

export const OBSERVABLES = [
  'frequencyHz',
  'dutyCycle',
  'capacitorMinV',
  'capacitorMaxV',
  'outputHighV',
  'outputLowV',
  'riseTimeS',
  'fallTimeS',
  'capacitorRisingTauS',
  'capacitorFallingTauS',
] as const satisfies readonly (keyof PredictedFigures)[];
export type ObservableName = (typeof OBSERVABLES)[number];

export interface Measurement {
  name: ObservableName;
  value: number;
  /** Standard uncertainty (1σ), same unit as the value. */
  uncertainty: number;
  source: 'scalar' | 'capture';
}

/** A scalar figure: a number (default uncertainty) or a value with its standard uncertainty. */
export type ScalarMeasurement = number | { value: number; uncertainty?: number };
export type ScalarMeasurements = Partial<Record<ObservableName, ScalarMeasurement>>;

/**
 * Default standard uncertainties for bare numbers, our defaults typical of
 * cursor and measurement readouts on a bench oscilloscope (common practice):
 * frequency 0.1 %, duty 0.5 percentage points, levels 1 % of the reading plus
 * 20 mV, transition durations and time constants 5 %.
 */
export function defaultUncertainty(name: ObservableName, value: number): number {
  switch (name) {
    case 'frequencyHz':
      return 1e-3 * Math.abs(value);
    case 'dutyCycle':
      return 5e-3;
    case 'riseTimeS':
    case 'fallTimeS':
    case 'capacitorRisingTauS':
    case 'capacitorFallingTauS':
      return 0.05 * Math.abs(value);
    default:
      return 0.01 * Math.abs(value) + 0.02;
  }
}

const POSITIVE: ReadonlySet<ObservableName> = new Set(['frequencyHz', 'capacitorRisingTauS', 'capacitorFallingTauS']);

export function scalarMeasurements(input: ScalarMeasurements, pointer = '/measurements'): Measurement[] {
  const out: Measurement[] = [];
  for (const [key, raw] of Object.entries(input)) {
    if (raw === undefined) continue;
    if (!(OBSERVABLES as readonly string[]).includes(key)) {
      throw new CoreError('invalid-value', `unknown measurement '${key}'; known: ${OBSERVABLES.join(', ')}`, `${pointer}/${key}`);
    }
    const name = key as ObservableName;
    const value = typeof raw === 'number' ? raw : raw.value;
    const at = typeof raw === 'number' ? `${pointer}/${key}` : `${pointer}/${key}/value`;
    if (!Number.isFinite(value)) throw new CoreError('invalid-value', `${key} must be a finite number`, at);
    if (POSITIVE.has(name) && !(value > 0)) throw new CoreError('invalid-value', `${key} must be > 0`, at);
    if (name === 'dutyCycle' && !(value > 0 && value < 1)) throw new CoreError('invalid-value', 'dutyCycle is a fraction between 0 and 1', at);
    if ((name === 'riseTimeS' || name === 'fallTimeS') && !(value >= 0)) throw new CoreError('invalid-value', `${key} must be >= 0`, at);
    const given = typeof raw === 'number' ? undefined : raw.uncertainty;
    if (given !== undefined && !(given > 0 && Number.isFinite(given))) {
      throw new CoreError('invalid-value', `the uncertainty of ${key} must be a finite number > 0`, `${pointer}/${key}/uncertainty`);
    }
    const uncertainty = given ?? defaultUncertainty(name, value);
    if (!(uncertainty > 0)) {
      throw new CoreError('invalid-value', `${key} = 0 needs an explicit uncertainty`, `${pointer}/${key}`);
    }
    out.push({ name, value, uncertainty, source: 'scalar' });
  }
  const lo = out.find((m) => m.name === 'capacitorMinV');
  const hi = out.find((m) => m.name === 'capacitorMaxV');
  if (lo && hi && !(hi.value > lo.value)) throw new CoreError('invalid-value', 'capacitorMaxV must be above capacitorMinV', `${pointer}/capacitorMaxV`);
  return out;
}

export interface CaptureUncertaintyOptions {
  /** Vertical accuracy as a fraction: σ = f·|reading| ⊕ f·channel swing ⊕ half an ADC step (default 0.005, common practice for a bench scope). */
  verticalUncertainty?: number;
  /** Time-base accuracy as a fraction (default 5e-5: tens of ppm, common practice). */
  timebaseUncertainty?: number;
  /** ADC step per channel, V, when known (estimated from the samples otherwise). */
  outputStepV?: number;
  capacitorStepV?: number;
}

/** Relative uncertainty of a segment-fitted time constant (our default, beside the time base). */
const TAU_RELATIVE_UNCERTAINTY = 5e-3;
/** Floor for the duty cycle from crossings (our default). */
const DUTY_FLOOR = 2e-4;
/** Transition durations: 2 % of the reading and one sample interval (interpolation between samples). */
const EDGE_RELATIVE_UNCERTAINTY = 0.02;

/**
 * Measurements from capture features. Frequency: the mean of N periods has
 * the period jitter over √N, the end-point crossing quantisation
 * Δt/(√6·N) and the time base. Switching levels: the segment fits'
 * capacitor voltage at the output edges (less noise-biased than the raw extremes).
 */
export function captureMeasurements(f: CaptureFeatures, options: CaptureUncertaintyOptions = {}): { measurements: Measurement[]; notes: string[] } {
  const vertical = options.verticalUncertainty ?? 5e-3;
  const timebase = options.timebaseUncertainty ?? 5e-5;
  const notes: string[] = [];
  const out: Measurement[] = [];
  const push = (name: ObservableName, value: number | undefined, uncertainty: number) => {
    if (value === undefined || !Number.isFinite(value) || !(uncertainty > 0)) return;
    out.push({ name, value, uncertainty, source: 'capture' });
  };
  const n = Math.max(1, f.periodCount);
  const dt = f.sampleIntervalS;
  const jitterRel = f.periodJitterS / f.periodS;
  const quantRel = dt / (Math.sqrt(6) * n * f.periodS);
  const freqRel = Math.hypot(jitterRel / Math.sqrt(n), quantRel, timebase);
  push('frequencyHz', f.frequencyHz, f.frequencyHz * freqRel);
  const dutyFloor = f.timingSource === 'capacitor' ? 10 * DUTY_FLOOR : DUTY_FLOOR;
  push('dutyCycle', f.dutyCycle, Math.hypot(jitterRel / Math.sqrt(n), dt / (f.periodS * Math.sqrt(6 * n)), dutyFloor));
  if (f.timingSource === 'capacitor') notes.push('duty cycle from the capacitor turning points: given ten times the usual uncertainty floor');

  const level = (value: number, swingV: number, stepV: number | undefined) =>
    Math.hypot(vertical * value, vertical * swingV, (stepV ?? 0) / 2);
  if (f.outputHighV !== undefined && f.outputLowV !== undefined) {
    const swing = Math.abs(f.outputHighV - f.outputLowV);
    push('outputHighV', f.outputHighV, level(f.outputHighV, swing, options.outputStepV));
    push('outputLowV', f.outputLowV, level(f.outputLowV, swing, options.outputStepV));
    const edge = (t: number) => Math.hypot(EDGE_RELATIVE_UNCERTAINTY * t, dt);
    if (f.riseTimeS !== undefined) push('riseTimeS', f.riseTimeS, edge(f.riseTimeS));
    if (f.fallTimeS !== undefined) push('fallTimeS', f.fallTimeS, edge(f.fallTimeS));
  }
  const capHigh = f.upperSwitchV ?? f.capacitorMaxV;
  const capLow = f.lowerSwitchV ?? f.capacitorMinV;
  if (capHigh !== undefined && capLow !== undefined) {
    if (f.upperSwitchV === undefined || f.lowerSwitchV === undefined) notes.push('capacitor extremes taken from the raw samples (no segment fit): noise biases them outward');
    const swing = Math.abs(capHigh - capLow);
    push('capacitorMaxV', capHigh, level(capHigh, swing, options.capacitorStepV));
    push('capacitorMinV', capLow, level(capLow, swing, options.capacitorStepV));
  }
  const tauRel = Math.hypot(TAU_RELATIVE_UNCERTAINTY, timebase);
  if (f.risingTauS !== undefined) push('capacitorRisingTauS', f.risingTauS, tauRel * f.risingTauS);
  if (f.fallingTauS !== undefined) push('capacitorFallingTauS', f.fallingTauS, tauRel * f.fallingTauS);
  return { measurements: out, notes };
}

/**
 * ADC step of a quantised channel: the smallest non-zero difference between
 * neighbouring samples (noise makes a quantised record toggle between
 * adjacent codes). On an unquantised record this is tiny and harmless.
 */
export function estimateStepV(values: ArrayLike<number>): number {
  let step = Infinity;
  for (let i = 1; i < values.length; i++) {
    const d = Math.abs(values[i] - values[i - 1]);
    if (d > 0 && d < step) step = d;
  }
  return Number.isFinite(step) ? step : 0;
}
