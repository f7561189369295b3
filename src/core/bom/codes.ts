/**
 * Stable rule codes of the BOM checks (names of our own). PLM integrations
 * switch on these strings: never rename one; add new codes instead. Each code
 * has one fixed severity so that pass/fail is predictable from the code alone.
 */
import type { BomRuleSeverity } from './types.ts';

export const BOM_RULES = {
  // --- assembly structure ---
  roleUnassigned: { code: 'role-unassigned', severity: 'error' },
  roleUnknown: { code: 'role-unknown', severity: 'error' },
  refdesMissing: { code: 'refdes-missing', severity: 'error' },
  refdesDuplicated: { code: 'refdes-duplicated', severity: 'error' },
  topologyUnknown: { code: 'topology-unknown', severity: 'error' },
  amplifierUnresolved: { code: 'amplifier-unresolved', severity: 'error' },
  catalogueUnavailable: { code: 'catalogue-unavailable', severity: 'error' },
  seriesUnknown: { code: 'series-unknown', severity: 'error' },
  specInconsistent: { code: 'spec-inconsistent', severity: 'error' },
  // --- value text ---
  valueRead: { code: 'value-read', severity: 'info' },
  valueUnreadable: { code: 'value-unreadable', severity: 'error' },
  valueTextLeftover: { code: 'value-text-leftover', severity: 'warning' },
  toleranceAssumed: { code: 'tolerance-assumed', severity: 'warning' },
  tempcoAssumed: { code: 'tempco-assumed', severity: 'info' },
  // --- preferred values and catalogue ---
  valueOffSeries: { code: 'value-off-series', severity: 'error' },
  partNumberUnlisted: { code: 'part-number-unlisted', severity: 'error' },
  valueDisagreesWithCatalogue: { code: 'value-disagrees-with-catalogue', severity: 'error' },
  valueNotInCatalogue: { code: 'value-not-in-catalogue', severity: 'error' },
  partNotForNewDesigns: { code: 'part-not-for-new-designs', severity: 'warning' },
  // --- timing capacitor ---
  dielectricUnfitForTiming: { code: 'dielectric-unfit-for-timing', severity: 'error' },
  electrolyticInTimingPath: { code: 'electrolytic-in-timing-path', severity: 'error' },
  dielectricUnstated: { code: 'dielectric-unstated', severity: 'warning' },
  voltageRatingBelowSupply: { code: 'voltage-rating-below-supply', severity: 'error' },
  voltageRatingUnstated: { code: 'voltage-rating-unstated', severity: 'info' },
  temperatureBeyondPartRating: { code: 'temperature-beyond-part-rating', severity: 'warning' },
  biasDerating: { code: 'bias-derating', severity: 'warning' },
  biasDeratingLeavesSpec: { code: 'bias-derating-leaves-spec', severity: 'error' },
  // --- circuit behaviour (from the analysis checks) ---
  circuitRejected: { code: 'circuit-rejected', severity: 'error' },
  supplyOutsideAmplifierRange: { code: 'supply-outside-amplifier-range', severity: 'error' },
  outputDriveExceeded: { code: 'output-drive-exceeded', severity: 'error' },
  commonModeExceeded: { code: 'inputs-outside-common-mode', severity: 'error' },
  inputClampConducts: { code: 'input-clamp-conducts', severity: 'warning' },
  biasShiftsThresholds: { code: 'bias-shifts-thresholds', severity: 'warning' },
  selvCaution: { code: 'selv-caution', severity: 'caution' },
  storedEnergyCaution: { code: 'stored-energy-caution', severity: 'caution' },
  dynamicsApproximated: { code: 'dynamics-approximated', severity: 'info' },
  strayCapacitanceSignificant: { code: 'stray-capacitance-significant', severity: 'warning' },
  capacitorLeakageSignificant: { code: 'capacitor-leakage-significant', severity: 'warning' },
  // --- against the spec ---
  frequencyWithinSpec: { code: 'frequency-within-spec', severity: 'info' },
  frequencyOutsideSpec: { code: 'frequency-outside-spec', severity: 'error' },
  dutyWithinSpec: { code: 'duty-within-spec', severity: 'info' },
  dutyOutsideSpec: { code: 'duty-outside-spec', severity: 'error' },
  yieldMet: { code: 'yield-met', severity: 'info' },
  yieldBelowMinimum: { code: 'yield-below-minimum', severity: 'error' },
  yieldNotEvaluated: { code: 'yield-not-evaluated', severity: 'info' },
  // --- last resort: a bug of ours, reported on the one assembly, never the batch ---
  evaluationFailed: { code: 'evaluation-failed', severity: 'error' },
} as const satisfies Record<string, { code: string; severity: BomRuleSeverity }>;

export type BomRuleKey = keyof typeof BOM_RULES;
export type BomRuleCode = (typeof BOM_RULES)[BomRuleKey]['code'];

export const BOM_RULE_CODES: readonly BomRuleCode[] = Object.values(BOM_RULES).map((r) => r.code);
