/**
 * Whether a class II/III ceramic timing capacitor may stay in a design: only
 * when the request allows such dielectrics (design.ts) and when what the body
 * loses on the board — DC bias over the voltage range it actually sees, and
 * ageing over the service life — leaves the frequency inside the requested
 * tolerance. Class I ceramics, film and mica lose neither and always pass.
 *
 * The figures come from the one capacitor model (src/core/parts/capacitor):
 * the class-typical C(V) curve for the part's dielectric, rated voltage and
 * case, averaged over the capacitor's swing (ΔQ/ΔV), and the log-decade ageing
 * law from the reference age at which the marked value applies.
 */
import { formatPercent } from '../circuit/format.ts';
import { parseDielectric } from '../parts/dielectric.ts';
import {
  AGEING_REFERENCE_HOURS,
  ageingFactor,
  ageingRatePerDecade,
  CASE_SIZES,
  DEFAULT_CASE_SIZE,
  DEFAULT_RATED_VOLTAGE_V,
  effectiveCapacitanceF,
  HOURS_PER_YEAR,
  isBiasDependent,
  typicalBiasShape,
  type CaseSize,
} from '../parts/capacitor/index.ts';
import type { PartOption } from './value-set.ts';

/** Service life over which a design's class II capacitor must keep its frequency, years (our default, stated). */
export const DESIGN_SERVICE_LIFE_YEARS = 10;

export interface HighKShift {
  dielectric: string;
  /** C_eff/C(0) − 1 over the swing (≤ 0), fraction. */
  biasShift: number;
  /** C(service life)/C(reference age) − 1 (≤ 0), fraction. */
  ageingShift: number;
  /** Frequency moves as 1/C: (1 + bias)(1 + ageing) − 1 of C gives this of f, fraction (≥ 0). */
  frequencyShift: number;
  ratedVoltageV: number;
  caseSize: CaseSize;
}

function caseOf(p: PartOption): CaseSize {
  const pkg = p.caseSize?.trim();
  return pkg && (CASE_SIZES as readonly string[]).includes(pkg) ? (pkg as CaseSize) : DEFAULT_CASE_SIZE;
}

/**
 * The shifts of a high-k part over the capacitor's swing [minV, maxV] and the
 * service life; undefined for a body without bias dependence (or an unknown code,
 * which the dielectric checks report).
 */
export function highKShift(part: PartOption, minV: number, maxV: number, serviceLifeYears = DESIGN_SERVICE_LIFE_YEARS): HighKShift | undefined {
  if (!part.dielectric) return undefined;
  let d;
  try {
    d = parseDielectric(part.dielectric);
  } catch {
    return undefined;
  }
  if (!isBiasDependent(d)) return undefined;
  const ratedVoltageV = part.ratedVoltageV ?? DEFAULT_RATED_VOLTAGE_V;
  const caseSize = caseOf(part);
  const shape = typicalBiasShape(d, ratedVoltageV, caseSize);
  const biasShift = effectiveCapacitanceF(shape, 1, minV, maxV) - 1;
  const ageingShift = ageingFactor(ageingRatePerDecade(d), serviceLifeYears * HOURS_PER_YEAR, AGEING_REFERENCE_HOURS) - 1;
  const frequencyShift = 1 / ((1 + biasShift) * (1 + ageingShift)) - 1;
  return { dielectric: d.code, biasShift, ageingShift, frequencyShift, ratedVoltageV, caseSize };
}

/** Why a high-k part does not fit the frequency budget, in words (undefined when it fits). */
export function highKBudgetShortfall(shift: HighKShift, frequencyError: number, frequencyTolerance: number, minV: number, maxV: number): string | undefined {
  // The shift only lowers C, so it only raises f: the design's own error is spent in that direction.
  if (frequencyError + shift.frequencyShift <= frequencyTolerance) return undefined;
  return (
    `${shift.dielectric} timing capacitor (${shift.ratedVoltageV} V, ${shift.caseSize}, class-typical figures): DC bias over its ` +
    `${minV.toFixed(2)}..${maxV.toFixed(2)} V swing ${formatPercent(shift.biasShift)} and ageing over ${DESIGN_SERVICE_LIFE_YEARS} years ` +
    `${formatPercent(shift.ageingShift)} raise the frequency by ${formatPercent(shift.frequencyShift)}, beyond the ±${formatPercent(frequencyTolerance)} tolerance`
  );
}
