/** Public surface of the calculation core. */
export * from './errors.ts';
export * from './amplifiers/figures-table.ts';
export * from './amplifiers/model.ts';
export * from './amplifiers/archetypes.ts';
export * from './amplifiers/resolve.ts';
export * from './circuit/types.ts';
export * from './circuit/result.ts';
export * from './circuit/checks.ts';
export * from './circuit/analyze.ts';
export { TOPOLOGIES, TOPOLOGY_IDS, TOPOLOGY_ALIASES, findTopology, canonicalTopologyId, acceptedTopologyIds, designable, snappable, aliasNote } from './circuit/topologies/index.ts';
export * from './bom/index.ts';
export * from './design/index.ts';
export {
  analyzeTimeDomain,
  simulateTimeDomain,
  waveformOfPrepared,
  checkWaveformOptions,
  MAX_WAVEFORM_SAMPLES,
  MAX_WAVEFORM_PERIODS,
  CLAMP_RESISTANCE_OHM,
  type WaveformOptions,
  type WaveformSamples,
  type WaveformResult,
  type TimeDomainFigures,
  type TimeDomainRun,
} from './circuit/engine/index.ts';
export { DEFAULT_EDGE_FRACTION, MAX_EDGE_FRACTION, frequencyCeilingHz, nominalEdgeTimes, type EdgeTimes } from './circuit/frequency-ceiling.ts';
export { DEFAULT_STEERING_DIODE } from './circuit/topologies/diode-steered.ts';
export { EVALUATION_STATUS, OUTPUT_SLOT, OUTPUT_LENGTH, PreparedModel, type EvaluationStatus } from './circuit/engine/prepared.ts';
export { AMPLIFIER_PARAMETERS, type ParameterInfo, type ParameterKind } from './circuit/engine/compiled-network.ts';
export {
  runToleranceAnalysis,
  MONTE_CARLO_SAMPLE_CAP,
  type ToleranceRequest,
  type ToleranceResult,
} from './tolerance/index.ts';
