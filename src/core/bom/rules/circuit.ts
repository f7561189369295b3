/**
 * The analysis checks (output drive, common-mode range, amplifier supply
 * range, SELV...) as BOM rules. The circuit is analysed at the nominal supply
 * and at both ends of the supply range, because drive and common-mode limits
 * bite at one end and the amplifier's supply rating at either; each check is
 * reported once, at the first supply corner where it appears, with the
 * analysis code kept in figures.checkCode.
 */
import { analyzeCircuit } from '../../circuit/analyze.ts';
import { CHECK_CODES, type Check } from '../../circuit/checks.ts';
import type { AnalysisResult } from '../../circuit/result.ts';
import type { Circuit, Supply } from '../../circuit/types.ts';
import { CoreError } from '../../errors.ts';
import { BOM_RULES } from '../codes.ts';
import { ruleResult, type RuleDefinition } from '../rule.ts';
import type { BomSupply, BomFigureValue, BomRuleResult } from '../types.ts';

const CHECK_TO_RULE: Readonly<Record<string, RuleDefinition>> = {
  [CHECK_CODES.supplyOutOfRange]: BOM_RULES.supplyOutsideAmplifierRange,
  [CHECK_CODES.outputOverload]: BOM_RULES.outputDriveExceeded,
  [CHECK_CODES.commonModeExceeded]: BOM_RULES.commonModeExceeded,
  [CHECK_CODES.clampConducts]: BOM_RULES.inputClampConducts,
  [CHECK_CODES.biasShift]: BOM_RULES.biasShiftsThresholds,
  [CHECK_CODES.selv]: BOM_RULES.selvCaution,
  [CHECK_CODES.storedEnergy]: BOM_RULES.storedEnergyCaution,
  [CHECK_CODES.dynamicsApproximated]: BOM_RULES.dynamicsApproximated,
  [CHECK_CODES.strayCapacitanceSignificant]: BOM_RULES.strayCapacitanceSignificant,
  [CHECK_CODES.capacitorLeakageSignificant]: BOM_RULES.capacitorLeakageSignificant,
};

export type SupplyCorner = 'nominal' | 'low' | 'high';

/** The rails at a corner of the regulation band: both rails move outward (high) or inward (low) together. */
export function supplyAt(supply: BomSupply, corner: SupplyCorner): Supply {
  const k = corner === 'high' ? 1 + supply.tolerance : corner === 'low' ? 1 - supply.tolerance : 1;
  return { positiveV: supply.positiveV * k, negativeV: supply.negativeV * k };
}

export function supplyCorners(supply: BomSupply): SupplyCorner[] {
  return supply.tolerance > 0 ? ['nominal', 'low', 'high'] : ['nominal'];
}

function checkToRule(check: Check, corner: SupplyCorner, supply: Supply): BomRuleResult {
  const { code, severity, message, ...rest } = check;
  const mapped = CHECK_TO_RULE[code];
  // A check added to the analysis later than this table keeps its own code, prefixed, until it is mapped.
  const def: RuleDefinition = mapped ?? { code: `analysis-${code}`, severity };
  const figures: Record<string, BomFigureValue> = { ...rest, checkCode: code, supplyCorner: corner, supplyPositiveV: supply.positiveV, supplyNegativeV: supply.negativeV };
  return ruleResult(def, corner === 'nominal' ? message : `At the ${corner} end of the supply range: ${message}`, figures);
}

export interface CircuitEvaluation {
  rules: BomRuleResult[];
  /** The nominal analysis, when every corner could be analysed. */
  nominal?: AnalysisResult;
  /** Largest |v(N)| over the analysed corners, V. */
  capacitorPeakV?: number;
  capacitorMinV?: number;
}

/** Analyses the nominal circuit at each supply corner; a core rejection becomes circuit-rejected. */
export function circuitRules(circuit: Circuit, supply: BomSupply): CircuitEvaluation {
  const rules: BomRuleResult[] = [];
  const seen = new Set<string>();
  let nominal: AnalysisResult | undefined;
  let peakV = 0;
  let minV = Infinity;
  for (const corner of supplyCorners(supply)) {
    const rails = supplyAt(supply, corner);
    let analysis: AnalysisResult;
    try {
      analysis = analyzeCircuit({ ...circuit, supply: rails });
    } catch (error) {
      if (!(error instanceof CoreError)) throw error;
      rules.push(
        ruleResult(BOM_RULES.circuitRejected, corner === 'nominal' ? error.message : `At the ${corner} end of the supply range: ${error.message}`, {
          coreCode: error.code,
          pointer: error.pointer ?? null,
          supplyCorner: corner,
        }),
      );
      return { rules };
    }
    if (corner === 'nominal') nominal = analysis;
    peakV = Math.max(peakV, Math.abs(analysis.capacitor.maxV), Math.abs(analysis.capacitor.minV));
    minV = Math.min(minV, analysis.capacitor.minV);
    for (const check of analysis.checks) {
      if (seen.has(check.code)) continue;
      seen.add(check.code);
      rules.push(checkToRule(check, corner, rails));
    }
  }
  return { rules, nominal, capacitorPeakV: peakV, capacitorMinV: minV };
}
