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
  'capacitorAboveMidShare',
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
    case 'capacitorAboveMidShare':
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

/** Smallest relative standard uncertainty accepted (our bound). */
export const MIN_RELATIVE_UNCERTAINTY = 1e-9;
/** Scale for the relative floor when a value is near zero (a level of 0 V still has volts of scale). */
const UNCERTAINTY_SCALE: Record<ObservableName, number> = {
  frequencyHz: 0,
  dutyCycle: 1,
  capacitorMinV: 1,
  capacitorMaxV: 1,
  outputHighV: 1,
  outputLowV: 1,
  riseTimeS: 1e-12,
  fallTimeS: 1e-12,
  capacitorRisingTauS: 0,
  capacitorFallingTauS: 0,
  capacitorAboveMidShare: 1,
};

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
    if (name === 'capacitorAboveMidShare' && !(value > 0 && value < 1)) throw new CoreError('invalid-value', 'capacitorAboveMidShare is a fraction between 0 and 1', at);
    const given = typeof raw === 'number' ? undefined : raw.uncertainty;
    if (given !== undefined && !(given > 0 && Number.isFinite(given))) {
      throw new CoreError('invalid-value', `the uncertainty of ${key} must be a finite number > 0`, `${pointer}/${key}/uncertainty`);
    }
    // No instrument resolves a figure to better than a part in 1e9 (our bound): a tighter
    // uncertainty is a typing slip, and would overflow the fit's normalised residuals.
    const floor = MIN_RELATIVE_UNCERTAINTY * Math.max(Math.abs(value), UNCERTAINTY_SCALE[name]);
    if (given !== undefined && given < floor) {
      throw new CoreError('invalid-value', `the uncertainty of ${key} must be at least ${floor.toPrecision(3)} (a part in 1e9 of the value)`, `${pointer}/${key}/uncertainty`);
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
  /** ADC step per channel, V, when known (otherwise the capture analysis reads it: CaptureFeatures.sampleSteps). */
  outputStepV?: number;
  capacitorStepV?: number;
}

/** Relative uncertainty floor of a windowed time constant (our default, beside the time base). */
const TAU_RELATIVE_UNCERTAINTY = 5e-3;
/** Floor for duty cycle and rising share (our default). */
const DUTY_FLOOR = 2e-4;
/** Transition durations: 2 % of the reading and one sample interval (interpolation between samples). */
const EDGE_RELATIVE_UNCERTAINTY = 0.02;

/**
 * Measurements from capture features. Frequency: the mean of N periods has
 * the period jitter over √N, the end-point crossing quantisation
 * Δt/(√6·N) and the time base. Duty and shares: the crossing quantisation
 * Δt/√6 of the period, not averaged (see below). Per-cycle readings (duty, edges, turning
 * points, time constants) add the standard error of their mean; levels add
 * the vertical accuracy and half an ADC step.
 */
export function captureMeasurements(f: CaptureFeatures, options: CaptureUncertaintyOptions = {}): { measurements: Measurement[]; notes: string[] } {
  const vertical = options.verticalUncertainty ?? 5e-3;
  const timebase = options.timebaseUncertainty ?? 5e-5;
  const notes: string[] = [];
  const out: Measurement[] = [];
  const push = (name: ObservableName, value: number | undefined, uncertainty: number) => {
    if (value === undefined || !Number.isFinite(value) || !(uncertainty > 0) || !Number.isFinite(uncertainty)) return;
    out.push({ name, value, uncertainty, source: 'capture' });
  };
  const sem = (key: keyof CaptureFeatures['spreads']) => {
    const s = f.spreads[key];
    return s && s.count > 1 ? s.sd / Math.sqrt(s.count) : 0;
  };
  const n = Math.max(1, f.periodCount);
  const dt = f.sampleIntervalS;
  const jitterRel = f.periodJitterS / f.periodS;
  const quantRel = dt / (Math.sqrt(6) * n * f.periodS);
  const freqRel = Math.hypot(jitterRel / Math.sqrt(n), quantRel, timebase);
  push('frequencyHz', f.frequencyHz, f.frequencyHz * freqRel);
  // A crossing read between two samples is off by up to half a sample (σ = Δt/√12 per instant, two per
  // reading). That error averages over the cycles only when the sampling phase moves from cycle to cycle;
  // a record whose period is close to a whole number of samples keeps it in every cycle, so it is not
  // divided by √N (the correlated case, which a scope's free-running clock can hit).
  const timing = Math.hypot(dt / (f.periodS * Math.sqrt(6)), DUTY_FLOOR);
  push('dutyCycle', f.dutyCycle, Math.hypot(sem('dutyCycle'), timing));
  push('capacitorAboveMidShare', f.capacitorAboveMidShare, Math.hypot(sem('capacitorAboveMidShare'), timing));

  const level = (value: number, swingV: number, stepV: number | undefined, semV: number) => Math.hypot(vertical * value, vertical * swingV, (stepV ?? 0) / 2, semV);
  if (f.outputHighV !== undefined && f.outputLowV !== undefined) {
    const swing = Math.abs(f.outputHighV - f.outputLowV);
    push('outputHighV', f.outputHighV, level(f.outputHighV, swing, options.outputStepV, 0));
    push('outputLowV', f.outputLowV, level(f.outputLowV, swing, options.outputStepV, 0));
    const edge = (t: number, semS: number) => Math.hypot(EDGE_RELATIVE_UNCERTAINTY * t, dt, semS);
    if (f.riseTimeS !== undefined) push('riseTimeS', f.riseTimeS, edge(f.riseTimeS, sem('riseTimeS')));
    if (f.fallTimeS !== undefined) push('fallTimeS', f.fallTimeS, edge(f.fallTimeS, sem('fallTimeS')));
  }
  if (f.capacitorMaxV !== undefined && f.capacitorMinV !== undefined) {
    const swing = Math.abs(f.capacitorMaxV - f.capacitorMinV);
    push('capacitorMaxV', f.capacitorMaxV, level(f.capacitorMaxV, swing, options.capacitorStepV, sem('capacitorMaxV')));
    push('capacitorMinV', f.capacitorMinV, level(f.capacitorMinV, swing, options.capacitorStepV, sem('capacitorMinV')));
  }
  const tau = (value: number | undefined, semS: number) => (value === undefined ? 0 : Math.hypot(TAU_RELATIVE_UNCERTAINTY * value, timebase * value, semS));
  push('capacitorRisingTauS', f.risingTauS, tau(f.risingTauS, sem('risingTauS')));
  push('capacitorFallingTauS', f.fallingTauS, tau(f.fallingTauS, sem('fallingTauS')));
  return { measurements: out, notes };
}
