/**
 * Rules on the timing capacitor: its dielectric and its voltage rating.
 *
 * Voltage: the capacitor sits between the inverting input N and ground, so the
 * voltage across it is v(N). In steady state that stays between the
 * thresholds, but at power-up, with the output stuck (latched comparator,
 * missing feedback part) or while the circuit fails to switch, N charges
 * toward the output level, which can reach either rail. The rule therefore
 * compares the rating with the larger rail magnitude at the top of the supply
 * range — not the span V+ − V−, which never appears across a capacitor to
 * ground — and reports the steady-state peak beside it.
 */
import { formatSi } from '../../circuit/format.ts';
import type { AnalysisResult } from '../../circuit/result.ts';
import {
  CASE_SIZES,
  DEFAULT_CASE_SIZE,
  DEFAULT_RATED_VOLTAGE_V,
  insulationResistanceOhm,
  isBiasDependent,
  typicalBiasShape,
  type BiasShape,
  type CaseSize,
} from '../../parts/capacitor/index.ts';
import { parseDielectric, timingDielectricVerdict, type Dielectric } from '../../parts/dielectric.ts';
import { BOM_RULES } from '../codes.ts';
import { at, ruleResult } from '../rule.ts';
import type { BomLineReading, BomRuleResult, BomSpec } from '../types.ts';

function dielectricOf(line: BomLineReading): Dielectric | undefined {
  if (line.dielectricCode === undefined) return undefined;
  try {
    return parseDielectric(line.dielectricCode);
  } catch {
    return undefined;
  }
}

/** dielectric-unfit-for-timing (class II/III ceramics), electrolytic-in-timing-path, or dielectric-unstated. */
export function dielectricRule(line: BomLineReading, capacitorMinV?: number): BomRuleResult | undefined {
  if (line.kind !== 'capacitor' || line.value === undefined) return undefined;
  const d = dielectricOf(line);
  if (!d) {
    // An old class I tempco code ("N750") names the ceramic's behaviour without a dielectric code.
    if (line.tempcoPpmPerK !== undefined) return undefined;
    return ruleResult(
      BOM_RULES.dielectricUnstated,
      `Neither the value text nor the description of ${line.refdes} names a dielectric: whether it can time a clock is unknown`,
      {},
      at(line),
    );
  }
  // The one timing-dielectric verdict (parts/dielectric.ts), shared with design and analyze.
  const verdict = timingDielectricVerdict(d);
  if (verdict?.code === 'dielectric-unfit-for-timing') {
    return ruleResult(BOM_RULES.dielectricUnfitForTiming, `${d.code} in the timing path: ${d.reason}`, {
      dielectric: d.code,
      family: d.family,
      changeMinFraction: d.changeMinFraction,
      changeMaxFraction: d.changeMaxFraction,
    }, at(line));
  }
  if (verdict?.code === 'electrolytic-in-timing-path') {
    const reversed = capacitorMinV !== undefined && capacitorMinV < 0;
    return ruleResult(
      BOM_RULES.electrolyticInTimingPath,
      `${d.code.toLowerCase()} capacitor in the timing path: ${d.reason}` +
        (reversed ? `; this circuit also drives it to ${Number(capacitorMinV.toPrecision(3))} V, reverse-biasing a polarised part` : ''),
      { dielectric: d.code, family: d.family, reverseBiased: reversed, capacitorMinV },
      at(line),
    );
  }
  return undefined;
}

export interface CapacitorVoltages {
  /** Larger rail magnitude at the top of the supply range, V. */
  highestRailV: number;
  /** Largest |v(N)| in steady state at that supply, V (when the circuit could be analysed). */
  operatingPeakV?: number;
}

/** voltage-rating-below-supply (error) or voltage-rating-unstated (info). */
export function voltageRatingRule(line: BomLineReading, v: CapacitorVoltages): BomRuleResult | undefined {
  if (line.kind !== 'capacitor' || line.value === undefined) return undefined;
  if (line.ratedVoltageV === undefined) {
    return ruleResult(
      BOM_RULES.voltageRatingUnstated,
      `No voltage rating is stated for ${line.refdes}; it must withstand ${Number(v.highestRailV.toPrecision(4))} V`,
      { highestRailV: v.highestRailV, operatingPeakV: v.operatingPeakV },
      at(line),
    );
  }
  if (line.ratedVoltageV >= v.highestRailV) return undefined;
  return ruleResult(
    BOM_RULES.voltageRatingBelowSupply,
    `${line.refdes} is rated ${line.ratedVoltageV} V, below the ${Number(v.highestRailV.toPrecision(4))} V rail it can charge toward (power-up, latched output)`,
    { ratedVoltageV: line.ratedVoltageV, highestRailV: v.highestRailV, operatingPeakV: v.operatingPeakV },
    at(line),
  );
}

/** The class-typical C(V) basis of a class II/III line: its dielectric, its rating and case, or the stated defaults. */
function biasBasis(line: BomLineReading): { dielectric: Dielectric; ratedVoltageV: number; caseSize: CaseSize; shape: BiasShape } | undefined {
  if (line.kind !== 'capacitor' || line.value === undefined) return undefined;
  const d = dielectricOf(line);
  if (!isBiasDependent(d)) return undefined;
  const caseSize: CaseSize = (CASE_SIZES as readonly string[]).includes(line.packageCode ?? '') ? (line.packageCode as CaseSize) : DEFAULT_CASE_SIZE;
  const ratedVoltageV = line.ratedVoltageV ?? DEFAULT_RATED_VOLTAGE_V;
  return { dielectric: d!, ratedVoltageV, caseSize, shape: typicalBiasShape(d, ratedVoltageV, caseSize) };
}

/**
 * The C(V) curve the assembly's circuit carries for its timing capacitor line (class II/III:
 * the class-typical curve for its dielectric, rating and case; undefined for a flat part), so that
 * every analysis of the assembly — the nominal, the worst case, the Monte Carlo — runs the
 * non-linear capacitor through the one model.
 */
export function timingCapacitorShape(line: BomLineReading): BiasShape | undefined {
  return biasBasis(line)?.shape;
}

/**
 * The timing capacitor line's insulation resistance at its class's guaranteed minimum at temperatureC (the
 * assembly's hottest: insulation falls as a part heats), when the line states a dielectric: the assembly's
 * analysis checks what that leakage would do (capacitor-leakage-significant).
 */
export function timingCapacitorInsulationOhm(line: BomLineReading, temperatureC: number): number | undefined {
  if (line.kind !== 'capacitor' || line.value === undefined) return undefined;
  const d = dielectricOf(line);
  if (!d) return undefined;
  const ohm = insulationResistanceOhm(d, line.value, temperatureC);
  return Number.isFinite(ohm) ? ohm : undefined;
}

/**
 * bias-derating (warning) or bias-derating-leaves-spec (error): a class II/III
 * timing capacitor loses capacitance with the DC bias it actually sees. The
 * nominal analysis of the assembly runs the class-typical C(V) curve for its
 * dielectric, rating and case (docs/model.md; typical of the class, from
 * memory); the rule reports the swing it sees, the effective capacitance over
 * it and the frequency the board runs at — against the spec band and against
 * the frequency the marked value would give (markedFrequencyHz, the same
 * circuit with a flat capacitor).
 */
export function biasDeratingRule(
  line: BomLineReading,
  nominal: AnalysisResult | undefined,
  markedFrequencyHz: number | undefined,
  spec: BomSpec,
): BomRuleResult | undefined {
  const basis = biasBasis(line);
  if (!basis || !nominal || markedFrequencyHz === undefined || line.value === undefined) return undefined;
  const { dielectric: d, ratedVoltageV, caseSize } = basis;
  const effectiveCapacitanceF = nominal.capacitor.effectiveCapacitanceF;
  if (effectiveCapacitanceF === undefined) return undefined;
  const deratedFrequencyHz = nominal.frequencyHz;
  const effectiveFraction = effectiveCapacitanceF / line.value;
  const lowHz = spec.frequencyHz * (1 - spec.frequencyTolerance);
  const highHz = spec.frequencyHz * (1 + spec.frequencyTolerance);
  const inside = deratedFrequencyHz >= lowHz && deratedFrequencyHz <= highHz;
  const swingLowV = nominal.capacitor.minV;
  const swingHighV = nominal.capacitor.maxV;
  const peakV = Math.max(Math.abs(swingLowV), Math.abs(swingHighV));
  const assumed = [
    line.ratedVoltageV === undefined ? `a ${DEFAULT_RATED_VOLTAGE_V} V rating` : '',
    caseSize !== line.packageCode ? `a ${DEFAULT_CASE_SIZE} case` : '',
  ].filter(Boolean);
  const figures = {
    dielectric: d.code,
    ratedVoltageV,
    caseSize,
    curveBasis: 'class-typical',
    swingLowV,
    swingHighV,
    peakOverRatedFraction: peakV / ratedVoltageV,
    markedCapacitanceF: line.value,
    effectiveCapacitanceF,
    effectiveFraction,
    nominalFrequencyHz: markedFrequencyHz,
    deratedFrequencyHz,
    specLowHz: lowHz,
    specHighHz: highHz,
  };
  const pct = (x: number) => `${Number((x * 100).toPrecision(3))} %`;
  const message =
    `${line.refdes} (${d.code}, ${ratedVoltageV} V, ${caseSize}) sees ${Number(swingLowV.toPrecision(3))}…${Number(swingHighV.toPrecision(3))} V ` +
    `(${pct(peakV / ratedVoltageV)} of its rating): over that swing a class-typical part keeps about ${pct(effectiveFraction)} of its marked ` +
    `${formatSi(line.value, 'F')} (${formatSi(effectiveCapacitanceF, 'F')}), so the clock runs near ${formatSi(deratedFrequencyHz, 'Hz')} ` +
    `instead of ${formatSi(markedFrequencyHz, 'Hz')}` +
    (inside ? `, still inside the spec ${formatSi(lowHz, 'Hz')} to ${formatSi(highHz, 'Hz')}` : `, outside the spec ${formatSi(lowHz, 'Hz')} to ${formatSi(highHz, 'Hz')}`) +
    (assumed.length ? ` (assuming ${assumed.join(' and ')}: none stated)` : '');
  return ruleResult(inside ? BOM_RULES.biasDerating : BOM_RULES.biasDeratingLeavesSpec, message, figures, at(line));
}
