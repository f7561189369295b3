/**
 * One assembly from BOM lines to a verdict. Never throws: every problem of the
 * assembly (unknown topology or amplifier, missing designator, unreadable
 * value, a circuit that cannot oscillate) becomes a rule result, so one bad
 * assembly cannot fail a batch. Rules that need the whole circuit run only
 * when every part value was read.
 */
import type { AmplifierModel } from '../amplifiers/model.ts';
import { resolveAmplifier } from '../amplifiers/resolve.ts';
import { findTopology, TOPOLOGY_IDS } from '../circuit/topologies/index.ts';
import type { TopologyDefinition } from '../circuit/topologies/topology.ts';
import type { Circuit } from '../circuit/types.ts';
import { CoreError } from '../errors.ts';
import type { Catalogue } from '../parts/catalogue.ts';
import { REFERENCE_TEMPERATURE_C } from '../parts/capacitor/index.ts';
import { isSeriesName, SERIES_NAMES, type SeriesName } from '../parts/series.ts';
import { BOM_RULES } from './codes.ts';
import { readBomLine } from './read-line.ts';
import { ruleResult } from './rule.ts';
import { catalogueRules } from './rules/catalogue.ts';
import { analyzeCircuit } from '../circuit/analyze.ts';
import { biasDeratingRule, dielectricRule, timingCapacitorInsulationOhm, timingCapacitorShape, voltageRatingRule } from './rules/capacitor.ts';
import { circuitRules, supplyAt } from './rules/circuit.ts';
import { seriesRule } from './rules/series.ts';
import { dutyRule, frequencyRule, yieldRule, yieldSkippedRule } from './rules/spec.ts';
import { bindRoles } from './rules/structure.ts';
import { assumeToleranceRule, DEFAULT_ASSUMED_TOLERANCES, leftoverTextRule, valueReadRule } from './rules/value-text.ts';
import { assemblySpread } from './spread.ts';
import type { BomAssemblyResult, BomAssembly, BomCheckContext, BomLineReading, BomRuleResult, BomRuleSeverity } from './types.ts';

const SEVERITY_RANK: Record<BomRuleSeverity, number> = { info: 0, caution: 1, warning: 2, error: 3 };

export function summariseAssembly(id: string, index: number, rules: BomRuleResult[], failOn: BomCheckContext['options']['failOn']): BomAssemblyResult {
  const counts: Record<BomRuleSeverity, number> = { error: 0, warning: 0, caution: 0, info: 0 };
  for (const r of rules) counts[r.severity]++;
  const bar = SEVERITY_RANK[failOn];
  const pass = !rules.some((r) => SEVERITY_RANK[r.severity] >= bar);
  return { id, index, pass, counts, rules };
}

/** The series declared for a role: one name for all roles, or a per-role map. */
function seriesFor(assembly: BomAssembly, role: string): SeriesName | undefined {
  const s = assembly.series;
  if (s === undefined) return undefined;
  return typeof s === 'string' ? s : s[role];
}

function seriesDeclarationRules(assembly: BomAssembly, topology: TopologyDefinition): BomRuleResult[] {
  const s = assembly.series;
  if (s === undefined) return [];
  const entries: [string | undefined, string][] = typeof s === 'string' ? [[undefined, s]] : Object.entries(s);
  const rules: BomRuleResult[] = [];
  for (const [role, name] of entries) {
    if (!isSeriesName(name)) {
      rules.push(ruleResult(BOM_RULES.seriesUnknown, `Unknown series '${name}'; known: ${SERIES_NAMES.join(', ')}`, { series: name }, role ? { role } : undefined));
    } else if (role !== undefined && !(role in topology.roles)) {
      rules.push(ruleResult(BOM_RULES.roleUnknown, `The series map names role '${role}', which topology '${topology.id}' does not have`, {}, { role }));
    }
  }
  return rules;
}

/** Ranges the schema cannot order: a minimum above its maximum makes every verdict meaningless. */
function inconsistencyRules(assembly: BomAssembly): BomRuleResult[] {
  const rules: BomRuleResult[] = [];
  const { spec, temperature } = assembly;
  if (spec.dutyMin !== undefined && spec.dutyMax !== undefined && spec.dutyMin > spec.dutyMax) {
    rules.push(ruleResult(BOM_RULES.specInconsistent, `spec.dutyMin (${spec.dutyMin}) is above spec.dutyMax (${spec.dutyMax})`, { dutyMin: spec.dutyMin, dutyMax: spec.dutyMax }));
  }
  if (temperature && temperature.minC > temperature.maxC) {
    rules.push(
      ruleResult(BOM_RULES.specInconsistent, `temperature.minC (${temperature.minC} °C) is above temperature.maxC (${temperature.maxC} °C)`, {
        minC: temperature.minC,
        maxC: temperature.maxC,
      }),
    );
  }
  return rules;
}

function resolveCatalogue(assembly: BomAssembly, ctx: BomCheckContext, rules: BomRuleResult[]): Catalogue | undefined {
  if (assembly.catalogue === undefined) return undefined;
  if (!ctx.lookupCatalogue) {
    rules.push(ruleResult(BOM_RULES.catalogueUnavailable, `Catalogue '${assembly.catalogue}' cannot be consulted here`, { catalogue: assembly.catalogue }));
    return undefined;
  }
  try {
    return ctx.lookupCatalogue(assembly.catalogue);
  } catch (error) {
    if (!(error instanceof CoreError)) throw error;
    rules.push(ruleResult(BOM_RULES.catalogueUnavailable, error.message, { catalogue: assembly.catalogue, coreCode: error.code }));
    return undefined;
  }
}

function resolveAssemblyAmplifier(assembly: BomAssembly, ctx: BomCheckContext, rules: BomRuleResult[]): AmplifierModel | undefined {
  try {
    return resolveAmplifier(assembly.amplifier, ctx.lookupAmplifier, '/amplifier');
  } catch (error) {
    if (!(error instanceof CoreError)) throw error;
    rules.push(ruleResult(BOM_RULES.amplifierUnresolved, error.message, { coreCode: error.code, pointer: error.pointer ?? null }));
    return undefined;
  }
}

/** Per-line rules; also completes each reading (catalogue attributes, assumed tolerance). */
function lineRules(lines: BomLineReading[], assembly: BomAssembly, catalogue: Catalogue | undefined): BomRuleResult[] {
  const assumed = { ...DEFAULT_ASSUMED_TOLERANCES, ...assembly.assumedTolerance };
  const rules: BomRuleResult[] = [];
  const push = (r: BomRuleResult | undefined) => {
    if (r) rules.push(r);
  };
  for (const line of lines) {
    if (catalogue) rules.push(...catalogueRules(line, catalogue));
    push(valueReadRule(line));
    push(leftoverTextRule(line));
    const series = seriesFor(assembly, line.role);
    if (series !== undefined && isSeriesName(series)) push(seriesRule(line, series));
    push(assumeToleranceRule(line, assumed));
  }
  return rules;
}

function evaluate(assembly: BomAssembly, index: number, ctx: BomCheckContext): BomAssemblyResult {
  const rules: BomRuleResult[] = [];
  const done = () => summariseAssembly(assembly.id, index, rules, ctx.options.failOn);

  const topology = findTopology(assembly.topology);
  if (!topology) {
    rules.push(ruleResult(BOM_RULES.topologyUnknown, `Unknown topology '${assembly.topology}'; known: ${TOPOLOGY_IDS.join(', ')}`, { topology: assembly.topology }));
    return done();
  }
  const inconsistent = inconsistencyRules(assembly);
  rules.push(...inconsistent);
  const binding = bindRoles(topology, assembly.roles, assembly.lines);
  rules.push(...binding.rules, ...seriesDeclarationRules(assembly, topology));
  const catalogue = resolveCatalogue(assembly, ctx, rules);
  const readings = binding.bound.map((b) => readBomLine({ ...b.line, refdes: b.refdes }, b.role, topology.roles[b.role].kind));
  rules.push(...lineRules(readings, assembly, catalogue));
  const amplifier = resolveAssemblyAmplifier(assembly, ctx, rules);

  const boundRoles = new Set(readings.map((l) => l.role));
  const complete =
    Object.entries(topology.roles).every(([role, spec]) => !spec.required || boundRoles.has(role)) && readings.every((l) => l.value !== undefined);
  let circuit: Circuit | undefined;
  let capacitorPeakV: number | undefined;
  let capacitorMinV: number | undefined;
  let nominalAnalysis: ReturnType<typeof circuitRules>['nominal'];
  const capacitorLine = readings.find((l) => l.role === topology.capacitorRole);
  const capacitorShape = capacitorLine ? timingCapacitorShape(capacitorLine) : undefined;
  if (complete && amplifier) {
    const parts: Record<string, number> = {};
    for (const l of readings) parts[l.role] = l.value as number;
    circuit = { topology: topology.id, supply: supplyAt(assembly.supply, 'nominal'), amplifier, parts };
    // A class II/III timing capacitor: every analysis of the assembly runs its C(V) (one model).
    if (capacitorShape) circuit.capacitorShape = capacitorShape;
    // The insulation at the board's hottest (catalogues state it at 25 °C; ceramics lose it as they heat).
    const insulationTemperatureC = assembly.temperature?.maxC ?? REFERENCE_TEMPERATURE_C;
    const insulationOhm = capacitorLine ? timingCapacitorInsulationOhm(capacitorLine, insulationTemperatureC) : undefined;
    if (insulationOhm !== undefined) {
      circuit.capacitorInsulationOhm = insulationOhm;
      circuit.capacitorInsulationTemperatureC = insulationTemperatureC;
    }
    if (assembly.strays) circuit.strays = assembly.strays;
    const evaluation = circuitRules(circuit, assembly.supply);
    rules.push(...evaluation.rules);
    if (!evaluation.nominal) circuit = undefined;
    nominalAnalysis = evaluation.nominal;
    capacitorPeakV = evaluation.capacitorPeakV;
    capacitorMinV = evaluation.capacitorMinV;
  }

  const high = supplyAt(assembly.supply, 'high');
  const highestRailV = Math.max(Math.abs(high.positiveV), Math.abs(high.negativeV));
  for (const line of readings) {
    const d = dielectricRule(line, capacitorMinV);
    if (d) rules.push(d);
    const v = voltageRatingRule(line, { highestRailV, operatingPeakV: capacitorPeakV });
    if (v) rules.push(v);
    if (line.role === topology.capacitorRole && circuit && nominalAnalysis && capacitorShape) {
      const b = biasDeratingRule(line, nominalAnalysis, markedFrequencyHz(circuit), assembly.spec);
      if (b) rules.push(b);
    }
  }

  if (!circuit || inconsistent.length > 0) {
    const y = yieldSkippedRule(assembly.spec, circuit ? 'the spec or temperature range is inconsistent' : 'the circuit could not be analysed');
    if (y) rules.push(y);
    return done();
  }
  const spread = assemblySpread(circuit, readings, assembly, ctx.options, ctx.spreadCache, ctx.clock);
  if (spread.worstCase) {
    rules.push(frequencyRule(assembly.spec, spread.worstCase));
    const duty = dutyRule(assembly.spec, spread.worstCase);
    if (duty) rules.push(duty);
  }
  rules.push(...spread.rules);
  const y = spread.yield ? yieldRule(assembly.spec, spread.yield) : yieldSkippedRule(assembly.spec, spread.yieldSkippedBecause ?? 'not requested');
  if (y) rules.push(y);
  return done();
}

/** The frequency the marked value would give: the same circuit with a flat capacitor (undefined when it does not oscillate). */
function markedFrequencyHz(circuit: Circuit): number | undefined {
  try {
    return analyzeCircuit({ ...circuit, capacitorShape: undefined }).frequencyHz;
  } catch (error) {
    if (error instanceof CoreError) return undefined;
    throw error;
  }
}

/** Checks one assembly. An unexpected internal error is reported on this assembly alone. */
export function evaluateAssembly(assembly: BomAssembly, index: number, ctx: BomCheckContext): BomAssemblyResult {
  try {
    return evaluate(assembly, index, ctx);
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    const rule = ruleResult(BOM_RULES.evaluationFailed, `The checks could not finish for this assembly: ${message}`, {
      coreCode: error instanceof CoreError ? error.code : null,
    });
    return summariseAssembly(typeof assembly?.id === 'string' ? assembly.id : String(index), index, [rule], ctx.options.failOn);
  }
}
