/**
 * Entry point of the analysis: validate, solve each output state, pick the
 * model that answers, attach checks. The closed form answers when the amplifier
 * is linear within each state; the time-domain engine (when registered) answers
 * whenever slew, delay, limits or clamps can change the result.
 */
import { hasDynamicLimits } from '../amplifiers/model.ts';
import { CoreError } from '../errors.ts';
import { CHECK_CODES, oscillationChecks, supplyChecks, type Check } from './checks.ts';
import { closedFormOscillation } from './closed-form.ts';
import { analyzeTimeDomain } from './engine/index.ts';
import { checkEdgeFraction, DEFAULT_EDGE_FRACTION, frequencyCeilingHz, nominalEdgeTimes, slewLimitedCheck } from './frequency-ceiling.ts';
import type { AnalysisResult, ModelName, OscillationFigures } from './result.ts';
import { solveState, type StateModel } from './state-model.ts';
import { findTopology, TOPOLOGY_IDS } from './topologies/index.ts';
import type { TopologyDefinition } from './topologies/topology.ts';
import type { Circuit, OutputState } from './types.ts';
import { validateCircuit } from './validate.ts';

export type ModelChoice = 'auto' | ModelName;

export interface AnalyzeOptions {
  model?: ModelChoice;
  /** Largest share of the period an edge may take before the design counts as slew-limited (0..0.5, default 0.05). */
  edgeFractionLimit?: number;
}

/** The time-domain model: the event-driven engine unless a caller registers another (tests, experiments). */
export type TimeDomainAnalyzer = (prepared: PreparedCircuit) => OscillationFigures;
let timeDomainAnalyzer: TimeDomainAnalyzer | undefined = analyzeTimeDomain;

export function registerTimeDomainAnalyzer(fn: TimeDomainAnalyzer): void {
  timeDomainAnalyzer = fn;
}

export interface PreparedCircuit {
  circuit: Circuit;
  topology: TopologyDefinition;
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

function nominalPiece(topology: TopologyDefinition, state: OutputState) {
  return {
    state,
    outputDriven: !(topology.needsOpenDrain && state === 'high'),
    diodesOn: topology.nominalDiodes?.(state),
  };
}

/** Validate and solve both output states (the expensive part is tiny: two small nodal solves). */
export function prepareCircuit(circuit: Circuit): PreparedCircuit {
  const topology = getTopology(circuit.topology);
  validateCircuit(circuit, topology);
  return {
    circuit,
    topology,
    high: solveState(topology, circuit, nominalPiece(topology, 'high')),
    low: solveState(topology, circuit, nominalPiece(topology, 'low')),
  };
}

/** Closed-form figures only, without checks: the fast path for Monte Carlo and searches. */
export function closedFormFigures(circuit: Circuit): OscillationFigures {
  const p = prepareCircuit(circuit);
  return closedFormOscillation(p.high, p.low, circuit.amplifier.quiescentCurrentA, circuit.amplifier.inputBiasCurrentA);
}

export function chooseModel(circuit: Circuit, choice: ModelChoice = 'auto'): ModelName {
  if (choice !== 'auto') return choice;
  return hasDynamicLimits(circuit.amplifier) && timeDomainAnalyzer ? 'time-domain' : 'closed-form';
}

export function analyzeCircuit(circuit: Circuit, options: AnalyzeOptions = {}): AnalysisResult {
  const edgeFraction = options.edgeFractionLimit ?? DEFAULT_EDGE_FRACTION;
  checkEdgeFraction(edgeFraction);
  const prepared = prepareCircuit(circuit);
  const model = chooseModel(circuit, options.model);
  let figures: OscillationFigures;
  if (model === 'time-domain') {
    if (!timeDomainAnalyzer) throw new CoreError('invalid-value', 'The time-domain model is not available', '/model');
    figures = timeDomainAnalyzer(prepared);
  } else {
    figures = closedFormOscillation(prepared.high, prepared.low, circuit.amplifier.quiescentCurrentA, circuit.amplifier.inputBiasCurrentA);
  }
  const capacitanceF = circuit.parts[prepared.topology.capacitorRole];
  const checks: Check[] = [
    ...supplyChecks(circuit.supply, circuit.amplifier, capacitanceF),
    ...oscillationChecks(figures, {
      supply: circuit.supply,
      amplifier: circuit.amplifier,
      capacitanceF,
      timingResistanceOhm: Math.max(prepared.high.tauS, prepared.low.tauS) / capacitanceF,
    }),
  ];
  if (model === 'closed-form' && hasDynamicLimits(circuit.amplifier)) {
    checks.push({
      code: CHECK_CODES.dynamicsApproximated,
      severity: 'info',
      message: 'Answered by the closed form: slew rate, recovery delay, current limit and input clamps are not modelled in this answer',
    });
  }
  // The ceiling is a property of the circuit/amplifier pair (delay + full swing at the slew rate);
  // the check compares the edges of this answer (measured by the engine) with its period.
  const estimated = nominalEdgeTimes(prepared);
  const edges = figures.edges ?? estimated;
  const ceilingHz = frequencyCeilingHz(estimated, edgeFraction);
  const slewCheck = slewLimitedCheck(edges, figures.periodS, edgeFraction, ceilingHz);
  if (slewCheck) checks.push(slewCheck);
  return {
    ...figures,
    edges,
    frequencyCeilingHz: Number.isFinite(ceilingHz) ? ceilingHz : null,
    edgeFractionLimit: edgeFraction,
    checks,
  };
}
