/**
 * The whole inverse problem in one call: read the capture (arrays or scope
 * CSV), turn it and any scalar figures into measurements, fit the effective
 * parameters (MAP) and rank the explanations.
 */
import type { Circuit } from '../../circuit/types.ts';
import { CoreError } from '../../errors.ts';
import { analyzeCapture, type CaptureFeatures, type CaptureInput, type CaptureAnalysisOptions } from '../capture/analyze-capture.ts';
import { mapChannels, type ChannelChoice } from '../capture/channel-map.ts';
import { parseCaptureCsv } from '../capture/csv.ts';
import { estimateParameters, type EstimationResult } from '../estimate/estimate.ts';
import { FORWARD_MODEL_DESCRIPTION, type PredictedFigures } from '../estimate/forward.ts';
import {
  captureMeasurements,
  scalarMeasurements,
  type CaptureUncertaintyOptions,
  type Measurement,
  type ScalarMeasurements,
} from '../estimate/measurements.ts';
import { createFitSetup, requireMeasurements } from '../estimate/setup.ts';
import { diagnoseWithLeader, type Diagnosis, type DiagnoseOptions } from './explain.ts';

export interface CaptureSpec extends CaptureInput, CaptureUncertaintyOptions {
  /** Scope CSV export instead of arrays. */
  csv?: string;
  /** Channel names in the CSV (otherwise chosen by name hints, then CH1 = output, CH2 = capacitor). */
  outputChannel?: string;
  capacitorChannel?: string;
}

export interface FitInput {
  circuit: Circuit;
  /** Part tolerances by role, fractions. */
  tolerances?: Readonly<Record<string, number>>;
  measurements?: ScalarMeasurements;
  capture?: CaptureSpec;
  diagnosis?: DiagnoseOptions;
  captureOptions?: CaptureAnalysisOptions;
}

export interface MeasurementReport extends Measurement {
  nominal: number;
  fitted: number;
  /** (model − measured)/uncertainty at nominal and at the estimate. */
  nominalResidual: number;
  fittedResidual: number;
}

export interface CaptureReport {
  features: Omit<CaptureFeatures, 'warnings' | 'spreads' | 'sampleSteps'>;
  /** How the capture was read (CSV layout, channel choice, uncertainty choices). */
  notes: string[];
  warnings: string[];
}

export interface FitReport {
  forwardModel: string;
  nominal: PredictedFigures;
  measurements: MeasurementReport[];
  capture?: CaptureReport;
  estimation: Omit<EstimationResult, 'x' | 'covariance'>;
  diagnosis: Diagnosis;
  warnings: string[];
}

function prefixed(prefix: string, err: unknown): never {
  if (err instanceof CoreError) {
    const pointer = err.pointer === undefined ? prefix : err.pointer.startsWith(prefix) ? err.pointer : prefix + err.pointer;
    throw new CoreError(err.code, err.message, pointer, err.details);
  }
  throw err;
}

/** Capture arrays from a CSV export, with the notes on how it was read. */
function captureFromCsv(spec: CaptureSpec, notes: string[]): CaptureInput {
  let parsed;
  try {
    parsed = parseCaptureCsv(spec.csv!);
  } catch (err) {
    prefixed('/capture/csv', err);
  }
  notes.push(...parsed.notes.map((n) => `csv: ${n}`));
  const choice: ChannelChoice = {};
  if (spec.outputChannel !== undefined) choice.output = spec.outputChannel;
  if (spec.capacitorChannel !== undefined) choice.capacitor = spec.capacitorChannel;
  let mapped;
  try {
    mapped = mapChannels(parsed.channels, choice);
  } catch (err) {
    prefixed('/capture', err);
  }
  notes.push(...mapped.notes);
  for (const ch of [mapped.output, mapped.capacitor]) {
    if (ch?.unit !== undefined && ch.unit !== 'V') notes.push(`channel "${ch.name}" is in ${ch.unit}, not volts: its levels are used as written`);
  }
  const input: CaptureInput = {};
  if (parsed.timeS !== undefined) input.timeS = parsed.timeS;
  const dt = spec.sampleIntervalS ?? parsed.sampleIntervalS;
  if (dt !== undefined) input.sampleIntervalS = dt;
  if (mapped.output) input.output = mapped.output.values;
  if (mapped.capacitor) input.capacitor = mapped.capacitor.values;
  return input;
}

export function readCapture(spec: CaptureSpec, options: CaptureAnalysisOptions = {}): { features: CaptureFeatures; measurements: Measurement[]; notes: string[] } {
  const notes: string[] = [];
  if (spec.csv !== undefined && (spec.output !== undefined || spec.capacitor !== undefined || spec.timeS !== undefined)) {
    throw new CoreError('invalid-value', 'give the capture either as csv or as arrays, not both', '/capture/csv');
  }
  const input: CaptureInput =
    spec.csv !== undefined
      ? captureFromCsv(spec, notes)
      : {
          ...(spec.sampleIntervalS !== undefined ? { sampleIntervalS: spec.sampleIntervalS } : {}),
          ...(spec.timeS !== undefined ? { timeS: spec.timeS } : {}),
          ...(spec.output !== undefined ? { output: spec.output } : {}),
          ...(spec.capacitor !== undefined ? { capacitor: spec.capacitor } : {}),
        };
  let features: CaptureFeatures;
  try {
    features = analyzeCapture(input, options);
  } catch (err) {
    prefixed('/capture', err);
  }
  const uncertainty: CaptureUncertaintyOptions = { ...spec };
  // The ADC steps the capture analysis found in its first pass over each channel (CaptureFeatures.sampleSteps).
  if (uncertainty.outputStepV === undefined && features.sampleSteps.outputV !== undefined) uncertainty.outputStepV = features.sampleSteps.outputV;
  if (uncertainty.capacitorStepV === undefined && features.sampleSteps.capacitorV !== undefined) uncertainty.capacitorStepV = features.sampleSteps.capacitorV;
  const read = captureMeasurements(features, uncertainty);
  notes.push(...read.notes);
  return { features, measurements: read.measurements, notes };
}

/** Scalars win over the same figure read from a capture: the caller measured it on purpose. */
function merge(scalars: Measurement[], fromCapture: Measurement[], warnings: string[]): Measurement[] {
  const named = new Set(scalars.map((m) => m.name));
  const overridden = fromCapture.filter((m) => named.has(m.name)).map((m) => m.name);
  if (overridden.length > 0) warnings.push(`scalar measurements replace the capture's ${overridden.join(', ')}`);
  return [...scalars, ...fromCapture.filter((m) => !named.has(m.name))];
}

export function fitCircuit(input: FitInput): FitReport {
  const warnings: string[] = [];
  const scalars = input.measurements === undefined ? [] : scalarMeasurements(input.measurements);
  let captureReport: CaptureReport | undefined;
  let fromCapture: Measurement[] = [];
  if (input.capture !== undefined) {
    const read = readCapture(input.capture, input.captureOptions);
    const { warnings: captureWarnings, spreads: _spreads, sampleSteps: _steps, ...features } = read.features;
    void _spreads;
    captureReport = { features, notes: read.notes, warnings: captureWarnings };
    fromCapture = read.measurements;
  }
  const merged = merge(scalars, fromCapture, warnings);
  const probe = createFitSetup(input.circuit, [], input.tolerances);
  // A figure the model cannot form for this circuit (e.g. settled levels when the edges fill the states) is left out, not fitted.
  const measurements = merged.filter((m) => Number.isFinite(probe.nominalFigures[m.name]));
  const dropped = merged.filter((m) => !measurements.includes(m)).map((m) => m.name);
  if (dropped.length > 0) warnings.push(`the model cannot form ${dropped.join(', ')} for this circuit (the edges take up the states): left out of the fit`);
  const setup = createFitSetup(input.circuit, measurements, input.tolerances);
  requireMeasurements(setup);
  // The diagnosis first: its leading explanation already fits the measurements, so the full estimate starts next to its optimum.
  const { diagnosis, leaderX } = diagnoseWithLeader(setup, input.diagnosis);
  const { x: _x, covariance: _cov, ...estimation } = estimateParameters(setup, leaderX);
  void _x;
  void _cov;
  if (!estimation.converged) warnings.push(`the full fit stopped after ${estimation.iterations} iterations without meeting its convergence test`);
  const fitted = estimation.fitted;
  const report: FitReport = {
    forwardModel: FORWARD_MODEL_DESCRIPTION,
    nominal: setup.nominalFigures,
    measurements: measurements.map((m) => ({
      ...m,
      nominal: setup.nominalFigures[m.name],
      fitted: fitted[m.name],
      nominalResidual: (setup.nominalFigures[m.name] - m.value) / m.uncertainty,
      fittedResidual: (fitted[m.name] - m.value) / m.uncertainty,
    })),
    estimation,
    diagnosis,
    warnings,
  };
  if (captureReport !== undefined) report.capture = captureReport;
  return report;
}
