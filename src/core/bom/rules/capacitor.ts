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
import { parseDielectric, type Dielectric } from '../../parts/dielectric.ts';
import { BOM_RULES } from '../codes.ts';
import { at, ruleResult } from '../rule.ts';
import type { BomLineReading, BomRuleResult } from '../types.ts';

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
  if (d.family === 'ceramic-class-2' || d.family === 'ceramic-class-3') {
    return ruleResult(BOM_RULES.dielectricUnfitForTiming, `${d.code} in the timing path: ${d.reason}`, {
      dielectric: d.code,
      family: d.family,
      changeMinFraction: d.changeMinFraction,
      changeMaxFraction: d.changeMaxFraction,
    }, at(line));
  }
  if (d.family === 'electrolytic' || d.family === 'tantalum') {
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
