/** The threshold arithmetic lives with the topologies (their threshold solvers); design reads it from there. */
export * from '../circuit/topologies/threshold-solver.ts';
