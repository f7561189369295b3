/**
 * Design checks every analysis reports (DESIGN §3.5). Codes are ours and
 * stable: callers (portals, PLM rules) switch on them. Each check carries the
 * figures behind it, in SI units, beside the message.
 */
import type { AmplifierModel } from '../amplifiers/model.ts';
import { formatAmps, formatPercent, formatSi, formatVolts } from './format.ts';
import type { OscillationFigures } from './result.ts';
import type { Supply } from './types.ts';

export type CheckSeverity = 'info' | 'warning' | 'error' | 'caution';

export interface Check {
  code: string;
  severity: CheckSeverity;
  message: string;
  [figure: string]: string | number | boolean | null;
}

export const CHECK_CODES = {
  supplyOutOfRange: 'supply-out-of-range',
  outputOverload: 'output-current-over-limit',
  commonModeExceeded: 'common-mode-exceeded',
  clampConducts: 'input-clamp-conducts',
  biasShift: 'bias-shifts-thresholds',
  selv: 'selv-exceeded',
  storedEnergy: 'stored-energy',
  dynamicsApproximated: 'dynamics-approximated',
  slewLimited: 'slew-limited',
} as const;

/** SELV limit for ripple-free DC in dry conditions (IEC 61140 / IEC 60364-4-41): 60 V. */
export const SELV_LIMIT_DC_V = 60;
/** Our own conservative flag for energy stored in the timing capacitor (not a limit from a standard). */
export const STORED_ENERGY_CAUTION_J = 1;
/** Threshold shift from bias current worth a warning, as a fraction of the hysteresis (our design margin). */
export const BIAS_SHIFT_WARNING_FRACTION = 0.01;

export const SAFETY_DEFERRAL =
  'Follow local electrical codes and qualified practice (insulation, creepage and clearance, enclosure, discharge paths); this service does not assess electrical safety.';

export interface CheckContext {
  supply: Supply;
  amplifier: AmplifierModel;
  capacitanceF: number;
  /** Thevenin resistance the capacitor node sees (τ/C), ohm. */
  timingResistanceOhm: number;
}

export function supplyChecks(supply: Supply, amplifier: AmplifierModel, capacitanceF?: number): Check[] {
  const checks: Check[] = [];
  const spanV = supply.positiveV - supply.negativeV;
  if (spanV < amplifier.supplyMinV || spanV > amplifier.supplyMaxV) {
    checks.push({
      code: CHECK_CODES.supplyOutOfRange,
      severity: 'error',
      message: `Supply span ${formatVolts(spanV)} is outside the amplifier's rated ${formatVolts(amplifier.supplyMinV)} to ${formatVolts(amplifier.supplyMaxV)}`,
      supplySpanV: spanV,
      supplyMinV: amplifier.supplyMinV,
      supplyMaxV: Number.isFinite(amplifier.supplyMaxV) ? amplifier.supplyMaxV : null,
    });
  }
  const highestV = Math.max(Math.abs(supply.positiveV), Math.abs(supply.negativeV), spanV);
  if (highestV > SELV_LIMIT_DC_V) {
    checks.push({
      code: CHECK_CODES.selv,
      severity: 'caution',
      message: `A voltage of ${formatVolts(highestV)} is present, above the ${SELV_LIMIT_DC_V} V DC SELV limit (IEC 61140). ${SAFETY_DEFERRAL}`,
      highestVoltageV: highestV,
      limitV: SELV_LIMIT_DC_V,
    });
  }
  if (capacitanceF !== undefined) {
    const energyJ = 0.5 * capacitanceF * highestV * highestV;
    if (energyJ > STORED_ENERGY_CAUTION_J) {
      checks.push({
        code: CHECK_CODES.storedEnergy,
        severity: 'caution',
        message: `The timing capacitor can store up to ${formatSi(energyJ, 'J')} at ${formatVolts(highestV)}; provide a discharge path and handle with care. ${SAFETY_DEFERRAL}`,
        energyJ,
        flagAboveJ: STORED_ENERGY_CAUTION_J,
      });
    }
  }
  return checks;
}

export function oscillationChecks(fig: OscillationFigures, ctx: CheckContext): Check[] {
  const checks: Check[] = [];
  const { amplifier, supply } = ctx;
  // When the engine models the limit, the output never exceeds it: judge what the network asked for.
  const peakA = Math.max(fig.currents.outputPeakSourceA, fig.currents.outputPeakSinkA, fig.currentLimit?.demandPeakA ?? 0);
  if (peakA > amplifier.outputCurrentLimitA) {
    checks.push({
      code: CHECK_CODES.outputOverload,
      severity: 'warning',
      message: `The output is asked for ${formatAmps(peakA)} at the switching instant, beyond its ${formatAmps(amplifier.outputCurrentLimitA)} limit: raise the timing and feedback resistances`,
      peakCurrentA: peakA,
      limitA: amplifier.outputCurrentLimitA,
    });
  }
  const cmLowV = supply.negativeV + amplifier.inputCommonModeLowMarginV;
  const cmHighV = supply.positiveV - amplifier.inputCommonModeHighMarginV;
  const inMinV = Math.min(fig.inputs.nonInvertingMinV, fig.inputs.invertingMinV);
  const inMaxV = Math.max(fig.inputs.nonInvertingMaxV, fig.inputs.invertingMaxV);
  if (inMinV < cmLowV || inMaxV > cmHighV) {
    checks.push({
      code: CHECK_CODES.commonModeExceeded,
      severity: 'warning',
      message: `The inputs swing over ${formatVolts(inMinV)} to ${formatVolts(inMaxV)}, outside the common-mode range ${formatVolts(cmLowV)} to ${formatVolts(cmHighV)}: the comparator may misjudge or reverse phase there`,
      inputMinV: inMinV,
      inputMaxV: inMaxV,
      commonModeLowV: cmLowV,
      commonModeHighV: cmHighV,
    });
  }
  if (fig.inputs.differentialMaxV > amplifier.differentialClampV) {
    checks.push({
      code: CHECK_CODES.clampConducts,
      severity: 'warning',
      message: `The inputs differ by up to ${formatVolts(fig.inputs.differentialMaxV)}, beyond the ${formatVolts(amplifier.differentialClampV)} input clamp: the clamp diodes conduct and load the threshold network`,
      differentialMaxV: fig.inputs.differentialMaxV,
      clampV: amplifier.differentialClampV,
    });
  }
  const timingShiftV = Math.abs(amplifier.inputBiasCurrentA) * ctx.timingResistanceOhm;
  const worstShiftV = Math.max(fig.biasThresholdShiftV, timingShiftV);
  const fraction = worstShiftV / fig.thresholds.hysteresisV;
  if (fraction > BIAS_SHIFT_WARNING_FRACTION) {
    checks.push({
      code: CHECK_CODES.biasShift,
      severity: 'warning',
      message: `Input bias current shifts the switching levels by up to ${formatVolts(worstShiftV)} (${formatPercent(fraction)} of the hysteresis): lower the resistances or use a lower-bias input stage`,
      thresholdShiftV: fig.biasThresholdShiftV,
      asymptoteShiftV: timingShiftV,
      fractionOfHysteresis: fraction,
    });
  }
  return checks;
}
