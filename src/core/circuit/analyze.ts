/**
 * Entry point of the analysis: validate, compile the circuit's shape (once per
 * shape), walk it to its steady cycle, attach checks. One model answers every
 * question (docs/model.md): the walk of exactly solved linear pieces; the
 * 'closed-form' choice is its special case without slew, delay, clamp or
 * current-limit pieces.
 */
import { hasDynamicLimits } from '../amplifiers/model.ts';
import { curvePoints, effectiveCapacitanceF, REFERENCE_TEMPERATURE_C } from '../parts/capacitor/index.ts';
import { CoreError } from '../errors.ts';
import { CHECK_CODES, clampReached, oscillationChecks, supplyChecks, type Check } from './checks.ts';
import { shapeFor, type CompiledShape } from './engine/compiled-network.ts';
import { ConfigCache } from './engine/configs.ts';
import { analyzeTimeDomain } from './engine/index.ts';
import { effectsOf, evaluateOnce, EVALUATION_STATUS, nominalKey, OUTPUT_LENGTH, OUTPUT_SLOT, PreparedModel, walkedStarts, type PrepareModelOptions } from './engine/prepared.ts';
import { checkEdgeFraction, DEFAULT_EDGE_FRACTION, frequencyCeilingHz, nominalEdgeTimes, slewLimitedCheck, slowerEdges } from './frequency-ceiling.ts';
import type { AnalysisResult, ModelEffect, ModelName, OscillationFigures } from './result.ts';
import { stateModelOf, type StateModel } from './state-model.ts';
import {
  capacitorLeakageCheck,
  hasNodeStrays,
  INSULATION_SCREEN_RATIO,
  strayCapacitanceCheck,
  timingNodeStrayF,
  withInsulationLeakage,
  withoutNodeStrays,
  type InsulationShift,
  type NodeStrayShift,
} from './strays.ts';
import { findTopology, TOPOLOGY_IDS } from './topologies/index.ts';
import type { TopologyDefinition } from './topologies/topology.ts';
import type { Circuit } from './types.ts';
import { validateCircuit } from './validate.ts';

export type ModelChoice = 'auto' | ModelName;

export interface AnalyzeOptions {
  /** 'closed-form': leave slew, delay, clamp and current limit out of the model; 'auto'/'time-domain': include them. */
  model?: ModelChoice;
  /** Largest share of the period an edge may take before the design counts as slew-limited (0..0.5, default 0.05). */
  edgeFractionLimit?: number;
}

/** A validated circuit with its compiled shape, its own parameter vector and its two nominal state models. */
export interface PreparedCircuit {
  circuit: Circuit;
  topology: TopologyDefinition;
  shape: CompiledShape;
  values: Float64Array;
  /** False: the closed-form special case. */
  dynamics: boolean;
  effects: ModelEffect[];
  high: StateModel;
  low: StateModel;
}

export function getTopology(id: string): TopologyDefinition {
  const topology = findTopology(id);
  if (!topology) {
    throw new CoreError('unknown-reference', `Unknown topology '${id}'; known: ${TOPOLOGY_IDS.join(', ')}`, '/topology');
  }
  return topology;
}

const nominalCache = new ConfigCache();

/** Validate, compile (once per shape) and solve both nominal output states. */
export function prepareCircuit(circuit: Circuit, model: ModelChoice = 'auto'): PreparedCircuit {
  const topology = getTopology(circuit.topology);
  validateCircuit(circuit, topology);
  const shape = shapeFor(circuit, topology);
  const values = shape.layout.valuesOf(circuit);
  const dynamics = model !== 'closed-form';
  const { high, low } = nominalStateModels(circuit, shape, values, dynamics);
  return { circuit, topology, shape, values, dynamics, effects: effectsOf(values, shape, dynamics), high, low };
}

/** Both nominal output states solved (throws 'no-oscillation' when one has no path or cannot switch). */
function nominalStateModels(circuit: Circuit, shape: CompiledShape, values: Float64Array, dynamics: boolean): { high: StateModel; low: StateModel } {
  nominalCache.reset(shape, values, dynamics);
  const amp = circuit.amplifier;
  const highSourceV = shape.openDrain ? Number.NaN : circuit.supply.positiveV - amp.outputHeadroomHighV;
  const lowSourceV = circuit.supply.negativeV + amp.outputHeadroomLowV;
  return {
    high: stateModelOf(nominalCache.get(nominalKey(shape, 'high')), 'high', highSourceV, amp.inputOffsetV),
    low: stateModelOf(nominalCache.get(nominalKey(shape, 'low')), 'low', lowSourceV, amp.inputOffsetV),
  };
}

/**
 * The circuit prepared for many parameter vectors (Monte Carlo, corners,
 * sensitivities, searches, fitting): validates, then compiles. See engine/prepared.ts.
 */
export function prepareModel(circuit: Circuit, options: PrepareModelOptions & { model?: ModelChoice } = {}): PreparedModel {
  const topology = getTopology(circuit.topology);
  validateCircuit(circuit, topology);
  const shape = shapeFor(circuit, topology);
  const values = shape.layout.valuesOf(circuit);
  const dynamics = options.model !== 'closed-form';
  // The same vector just analysed: its walk's steady start, and prepareCircuit's state models already
  // accepted it (walkedStarts); else those state models are checked here (they throw like an analysis).
  const walked = walkedStarts.take(shape, values, dynamics);
  if (!walked) nominalStateModels(circuit, shape, values, dynamics);
  return new PreparedModel(shape, circuit, { dynamics, transitions: options.transitions }, values, walked);
}

const screenOut = new Float64Array(OUTPUT_LENGTH);

/**
 * Timing of the closed-form special case (no slew, delay, clamp or limit pieces): the cheap screen of
 * design searches, which re-check every answer they return with analyzeCircuit (the full model).
 * Throws 'no-oscillation' when the circuit latches.
 */
export function screenTiming(circuit: Circuit): { frequencyHz: number; periodS: number; dutyCycle: number; timeHighS: number; timeLowS: number } {
  const topology = getTopology(circuit.topology);
  validateCircuit(circuit, topology);
  const shape = shapeFor(circuit, topology);
  const status = evaluateOnce(shape, shape.layout.valuesOf(circuit), false, screenOut);
  if (status === EVALUATION_STATUS.invalidValue) throw new CoreError('invalid-value', 'A part value is not a positive, finite resistance or capacitance');
  if (status !== EVALUATION_STATUS.ok) throw new CoreError('no-oscillation', 'The circuit does not oscillate (closed-form screen)');
  const periodS = screenOut[OUTPUT_SLOT.periodS];
  return { frequencyHz: 1 / periodS, periodS, dutyCycle: screenOut[OUTPUT_SLOT.dutyCycle], timeHighS: screenOut[OUTPUT_SLOT.timeHighS], timeLowS: screenOut[OUTPUT_SLOT.timeLowS] };
}

/** Figures of the closed-form special case, without checks. */
export function closedFormFigures(circuit: Circuit): OscillationFigures {
  return analyzeTimeDomain(prepareCircuit(circuit, 'closed-form'));
}

/** The model an answer for this circuit comes from under `choice`. */
export function chooseModel(circuit: Circuit, choice: ModelChoice = 'auto'): ModelName {
  if (choice !== 'auto') return choice;
  return hasDynamicLimits(circuit.amplifier) ? 'time-domain' : 'closed-form';
}

/** The same circuit and model with the input clamp removed: the clamp check's frequency shift (undefined when it does not oscillate). */
function frequencyWithoutClamp(circuit: Circuit, model: ModelChoice | undefined): number | undefined {
  try {
    return analyzeTimeDomain(prepareCircuit({ ...circuit, amplifier: { ...circuit.amplifier, differentialClampV: Infinity } }, model)).frequencyHz;
  } catch (err) {
    if (err instanceof CoreError) return undefined;
    throw err;
  }
}

/**
 * With capacitance at P or at the pin: the frequency beside the same circuit without it (same model),
 * for the stray check; undefined when there is none or the circuit without it does not oscillate.
 */
function nodeStrayShift(circuit: Circuit, frequencyHz: number, model: ModelChoice | undefined): NodeStrayShift | undefined {
  if (!hasNodeStrays(circuit)) return undefined;
  try {
    return { frequencyHz, frequencyWithoutHz: analyzeTimeDomain(prepareCircuit(withoutNodeStrays(circuit), model)).frequencyHz };
  } catch (err) {
    if (err instanceof CoreError) return undefined;
    throw err;
  }
}

/**
 * The same circuit run by the same model with the timing capacitor's class-minimum insulation across it,
 * when the part states a dielectric and that leakage is not negligible against the timing node (the screen).
 */
function insulationShift(circuit: Circuit, frequencyHz: number, timingResistanceOhm: number, model: ModelChoice | undefined): InsulationShift | undefined {
  const insulationResistanceOhm = circuit.capacitorInsulationOhm;
  if (insulationResistanceOhm === undefined || !(timingResistanceOhm / insulationResistanceOhm > INSULATION_SCREEN_RATIO)) return undefined;
  const temperatureC = circuit.capacitorInsulationTemperatureC ?? REFERENCE_TEMPERATURE_C;
  try {
    const leaky = analyzeTimeDomain(prepareCircuit(withInsulationLeakage(circuit, insulationResistanceOhm), model));
    return { insulationResistanceOhm, temperatureC, frequencyHz, frequencyWithLeakageHz: leaky.frequencyHz };
  } catch (err) {
    if (err instanceof CoreError && err.code === 'no-oscillation') return { insulationResistanceOhm, temperatureC, frequencyHz, frequencyWithLeakageHz: null };
    if (err instanceof CoreError) return undefined;
    throw err;
  }
}

/** Points of the C(v) curve an analysis reports over the capacitor's swing. */
const CURVE_POINTS = 9;

export function analyzeCircuit(circuit: Circuit, options: AnalyzeOptions = {}): AnalysisResult {
  const edgeFraction = options.edgeFractionLimit ?? DEFAULT_EDGE_FRACTION;
  checkEdgeFraction(edgeFraction);
  const prepared = prepareCircuit(circuit, options.model);
  const figures: OscillationFigures = analyzeTimeDomain(prepared);
  // An open-drain stage cannot source: whatever the walk's round-off leaves there is not a current.
  if (prepared.shape.openDrain) figures.currents.outputPeakSourceA = 0;
  const capacitanceF = circuit.parts[prepared.topology.capacitorRole];
  // τ is set by everything at the timing node: the capacitor and the strays beside it.
  const timingResistanceOhm = Math.max(prepared.high.tauS, prepared.low.tauS) / (capacitanceF + timingNodeStrayF(circuit));
  const checks: Check[] = [
    ...supplyChecks(circuit.supply, circuit.amplifier, capacitanceF),
    ...oscillationChecks(figures, {
      supply: circuit.supply,
      amplifier: circuit.amplifier,
      capacitanceF,
      timingResistanceOhm,
      frequencyWithoutClampHz: prepared.dynamics && clampReached(figures, circuit.amplifier) ? frequencyWithoutClamp(circuit, options.model) : undefined,
    }),
  ];
  const strayCheck = strayCapacitanceCheck(circuit, capacitanceF, nodeStrayShift(circuit, figures.frequencyHz, options.model));
  if (strayCheck) checks.push(strayCheck);
  const leakageCheck = capacitorLeakageCheck(insulationShift(circuit, figures.frequencyHz, timingResistanceOhm, options.model));
  if (leakageCheck) checks.push(leakageCheck);
  if (!prepared.dynamics && hasDynamicLimits(circuit.amplifier)) {
    checks.push({
      code: CHECK_CODES.dynamicsApproximated,
      severity: 'info',
      message: 'Answered by the closed form: slew rate, recovery delay, current limit and input clamps are not modelled in this answer',
    });
  }
  // The ceiling is a property of the circuit/amplifier pair (delay + full swing at the slew rate);
  // the check compares the edges of this answer (measured by the engine) with its period.
  // A capacitance on the pin adds its RC behind the stage (an open drain's rise through its pull-up): the
  // walk's own settling times hold it (engine/figures.ts), the amplifier-only estimate does not.
  const pinLoaded = (circuit.strays?.outputNodeF ?? 0) > 0 && figures.edges !== undefined;
  const amplifierEdges = nominalEdgeTimes(prepared);
  const estimated = pinLoaded ? slowerEdges(amplifierEdges, figures.edges!) : amplifierEdges;
  // The closed-form special case has instant edges; its check still reports the edges the amplifier would have.
  const edges = prepared.dynamics && figures.edges ? figures.edges : estimated;
  const ceilingHz = frequencyCeilingHz(estimated, edgeFraction);
  const slewCheck = slewLimitedCheck(edges, figures.periodS, edgeFraction, ceilingHz, pinLoaded);
  if (slewCheck) checks.push(slewCheck);
  const shape = circuit.capacitorShape;
  if (shape && shape.kind !== 'flat') {
    // What the C(v) capacitor amounts to over the swing it actually sees (docs/model.md, non-linear capacitor).
    const { minV, maxV } = figures.capacitor;
    figures.capacitor = {
      minV,
      maxV,
      effectiveCapacitanceF: effectiveCapacitanceF(shape, capacitanceF, minV, maxV),
      capacitanceCurve: curvePoints(shape, capacitanceF, minV, maxV, CURVE_POINTS),
    };
  }
  // The walk's figures are this analysis' own object: completed in place rather than copied field by field
  // (the same fields in the same order: edges keeps its place, the rest follow).
  const result: AnalysisResult = Object.assign(figures, { edges, frequencyCeilingHz: Number.isFinite(ceilingHz) ? ceilingHz : null, edgeFractionLimit: edgeFraction, checks });
  return result;
}
