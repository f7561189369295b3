/** Public surface of the calculation core. */
export * from './errors.ts';
export * from './amplifiers/model.ts';
export * from './amplifiers/archetypes.ts';
export * from './amplifiers/resolve.ts';
export * from './circuit/types.ts';
export * from './circuit/result.ts';
export * from './circuit/checks.ts';
export * from './circuit/analyze.ts';
export { TOPOLOGIES, TOPOLOGY_IDS, findTopology } from './circuit/topologies/index.ts';
