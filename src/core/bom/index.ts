/** BOM checks: read BOM lines per role, judge them against rules with stable codes, assembly by assembly. */
export * from './types.ts';
export { BOM_RULES, BOM_RULE_CODES } from './codes.ts';
export type { BomRuleCode, BomRuleKey } from './codes.ts';
export { readBomLine, EIA96_IMPLIED_TOLERANCE } from './read-line.ts';
export { evaluateAssembly, summariseAssembly } from './evaluate-assembly.ts';
export { evaluateAssemblies, tallyBomResult, MAX_ASSEMBLIES_PER_BATCH, DEFAULT_BOM_OPTIONS } from './batch.ts';
export type { BomBatchSummary } from './batch.ts';
export { DEFAULT_ASSUMED_TOLERANCES } from './rules/value-text.ts';
export { lineDesignators } from './rules/structure.ts';
