/**
 * Batches of assemblies. The core stays synchronous and allocation-light: a
 * generator hands out one result at a time, so a caller that streams can
 * write each result and drop it (memory bounded by one result, not the batch)
 * and can pause between results to keep its event loop responsive.
 */
import { evaluateAssembly } from './evaluate-assembly.ts';
import type { BomAssemblyResult, BomAssembly, BomCheckContext, BomCheckOptions } from './types.ts';

/** Most assemblies one batch may carry (the HTTP schema enforces the same figure). */
export const MAX_ASSEMBLIES_PER_BATCH = 5000;

export const DEFAULT_BOM_OPTIONS: Readonly<BomCheckOptions> = Object.freeze({
  mode: 'full',
  failOn: 'error',
  monteCarloSamples: 500,
  seed: 1,
});

/** Results in request order, computed lazily; assemblies of one circuit shape share one compiled evaluator. */
export function* evaluateAssemblies(assemblies: readonly BomAssembly[], ctx: BomCheckContext): Generator<BomAssemblyResult> {
  // Assemblies of one circuit shape share its compiled form (compiled once per shape and thread).
  for (let i = 0; i < assemblies.length; i++) yield evaluateAssembly(assemblies[i], i, ctx);
}

export interface BomBatchSummary {
  assemblies: number;
  passed: number;
  failed: number;
}

/** Running pass/fail tallyBomResult, for the summary line of a stream or the end of a JSON answer. */
export function tallyBomResult(summary: BomBatchSummary, result: BomAssemblyResult): BomBatchSummary {
  summary.assemblies++;
  if (result.pass) summary.passed++;
  else summary.failed++;
  return summary;
}
