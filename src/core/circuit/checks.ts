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
  outputCurrentHigh: 'output-current-near-limit',
  outputResistanceSetsTiming: 'output-resistance-sets-timing',
  commonModeExceeded: 'common-mode-exceeded',
  clampConducts: 'input-clamp-conducts',
  biasShift: 'bias-shifts-thresholds',
  selv: 'selv-exceeded',
  storedEnergy: 'stored-energy',
  dynamicsApproximated: 'dynamics-approximated',
  slewLimited: 'slew-limited',
  strayCapacitanceSignificant: 'stray-capacitance-significant',
  capacitorLeakageSignificant: 'capacitor-leakage-significant',
} as const;

/** SELV limit for ripple-free DC in dry conditions (IEC 61140 / IEC 60364-4-41): 60 V. */
export const SELV_LIMIT_DC_V = 60;
/** Our own conservative flag for energy stored in the timing capacitor (not a limit from a standard). */
export const STORED_ENERGY_CAUTION_J = 1;
/** Threshold shift from bias current worth a warning, as a fraction of the hysteresis (our design margin). */
export const BIAS_SHIFT_WARNING_FRACTION = 0.01;
/** Share of the output current limit above which a warning fires, before the limit is reached (our margin). */
export const OUTPUT_CURRENT_WARNING_FRACTION = 0.5;
/** Output resistance above this share of the timing resistance makes the frequency rest on an uncontrolled figure. */
export const OUTPUT_RESISTANCE_WARNING_FRACTION = 0.01;
/** A clamp is reported as conducting once the inputs reach this share of its voltage (it is then at the knee). */
const CLAMP_REACH_FRACTION = 0.999;
/** Frequency shift from clamp conduction below which the check is only informative, fraction. */
const CLAMP_SHIFT_WARNING = 0.001;

export const SAFETY_DEFERRAL =
  'Follow local electrical codes and qualified practice (insulation, creepage and clearance, enclosure, discharge paths); this service does not assess electrical safety.';

export interface CheckContext {
  supply: Supply;
  amplifier: AmplifierModel;
  capacitanceF: number;
  /** Thevenin resistance the capacitor node sees (τ/C), ohm. */
  timingResistanceOhm: number;
  /**
   * The same circuit run by the same model with the input clamp removed, when the clamp reaches conduction:
   * the clamp's frequency shift is the difference (the caller runs it: checks stay free of the solver).
   */
  frequencyWithoutClampHz?: number;
}

/** Whether the inputs reach the clamp, so the caller should run the model without it for the shift. */
export function clampReached(fig: OscillationFigures, amplifier: AmplifierModel): boolean {
  return Number.isFinite(amplifier.differentialClampV) && fig.inputs.differentialMaxV >= CLAMP_REACH_FRACTION * amplifier.differentialClampV;
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
    // The timing capacitor is ground-referenced: the most it can hold is the larger rail magnitude (reached at
    // power-up or when the output stops switching), never the span between the rails.
    const reachV = Math.max(Math.abs(supply.positiveV), Math.abs(supply.negativeV));
    const energyJ = 0.5 * capacitanceF * reachV * reachV;
    if (energyJ > STORED_ENERGY_CAUTION_J) {
      checks.push({
        code: CHECK_CODES.storedEnergy,
        severity: 'caution',
        message: `The timing capacitor can store up to ${formatSi(energyJ, 'J')} charged to ${formatVolts(reachV)} (a rail, its largest possible voltage to ground); provide a discharge path and handle with care. ${SAFETY_DEFERRAL}`,
        energyJ,
        capacitorReachV: reachV,
        flagAboveJ: STORED_ENERGY_CAUTION_J,
        hint: 'add a bleed path across the capacitor, or a smaller capacitor with a larger timing resistor',
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
      fractionOfLimit: peakA / amplifier.outputCurrentLimitA,
      hint: 'raise the timing and feedback resistances (and lower the capacitor to keep the frequency)',
    });
  } else if (peakA > OUTPUT_CURRENT_WARNING_FRACTION * amplifier.outputCurrentLimitA) {
    checks.push({
      code: CHECK_CODES.outputCurrentHigh,
      severity: 'warning',
      message: `The output is asked for ${formatAmps(peakA)} at the switching instant, ${formatPercent(peakA / amplifier.outputCurrentLimitA)} of its ${formatAmps(amplifier.outputCurrentLimitA)} limit (warning above ${formatPercent(OUTPUT_CURRENT_WARNING_FRACTION)}): its level sags and a part from the low end of the spread may limit`,
      peakCurrentA: peakA,
      limitA: amplifier.outputCurrentLimitA,
      fractionOfLimit: peakA / amplifier.outputCurrentLimitA,
      hint: 'raise the timing and feedback resistances (and lower the capacitor to keep the frequency)',
    });
  }
  const r0 = amplifier.outputResistanceOhm;
  if (r0 > 0 && ctx.timingResistanceOhm > 0 && r0 > OUTPUT_RESISTANCE_WARNING_FRACTION * ctx.timingResistanceOhm) {
    const share = r0 / ctx.timingResistanceOhm;
    checks.push({
      code: CHECK_CODES.outputResistanceSetsTiming,
      severity: 'warning',
      message: `The amplifier's output resistance ${formatSi(r0, 'Ω')} is ${formatPercent(share)} of the ${formatSi(ctx.timingResistanceOhm, 'Ω')} timing resistance (warning above ${formatPercent(OUTPUT_RESISTANCE_WARNING_FRACTION)}): the frequency rests on a figure no datasheet controls`,
      outputResistanceOhm: r0,
      timingResistanceOhm: ctx.timingResistanceOhm,
      fractionOfTimingResistance: share,
      hint: `raise the timing resistance above ${formatSi(r0 / OUTPUT_RESISTANCE_WARNING_FRACTION, 'Ω')} and lower the capacitor in proportion`,
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
      message: `The inputs swing over ${formatVolts(inMinV)} to ${formatVolts(inMaxV)}, outside the common-mode range ${Number.isFinite(cmLowV) ? formatVolts(cmLowV) : 'no lower limit'} to ${Number.isFinite(cmHighV) ? formatVolts(cmHighV) : 'no upper limit'}: the comparator may misjudge or reverse phase there`,
      inputMinV: inMinV,
      inputMaxV: inMaxV,
      // A side without a limit (margin unlimited) is null, as "no limit" is everywhere on the wire.
      commonModeLowV: Number.isFinite(cmLowV) ? cmLowV : null,
      commonModeHighV: Number.isFinite(cmHighV) ? cmHighV : null,
    });
  }
  if (clampReached(fig, amplifier)) {
    const withoutHz = ctx.frequencyWithoutClampHz;
    const shift = withoutHz !== undefined && withoutHz > 0 ? fig.frequencyHz / withoutHz - 1 : null;
    const shiftText = shift === null ? '' : `; it moves the frequency by ${shift >= 0 ? '+' : ''}${formatPercent(shift)} (${formatSi(fig.frequencyHz, 'Hz')} against ${formatSi(withoutHz!, 'Hz')} without it)`;
    checks.push({
      code: CHECK_CODES.clampConducts,
      severity: shift !== null && Math.abs(shift) < CLAMP_SHIFT_WARNING ? 'info' : 'warning',
      message: `The input clamp conducts every cycle: the inputs reach ${formatVolts(fig.inputs.differentialMaxV)} against its ${formatVolts(amplifier.differentialClampV)}, so its diodes load the threshold network${shiftText}`,
      differentialMaxV: fig.inputs.differentialMaxV,
      clampV: amplifier.differentialClampV,
      frequencyShift: shift,
      frequencyWithoutClampHz: withoutHz ?? null,
      hint: 'narrow the hysteresis so the inputs stay inside the clamp, add series resistance at the inputs, or use an amplifier without a differential clamp (a comparator)',
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
      biasCurrentA: Math.abs(amplifier.inputBiasCurrentA),
      hint: 'lower the network and timing resistances (raise the capacitor to keep the frequency), or use a lower-bias input stage',
    });
  }
  return checks;
}
