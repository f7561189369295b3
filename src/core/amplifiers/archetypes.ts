/**
 * Built-in amplifier archetypes: one entry per technology class, with our own ids
 * and figures that are TYPICAL OF THE CLASS, written from memory of the trade —
 * not copied from any vendor's datasheet. Use them for first sizing; register
 * or pass inline the figures of the part you actually fit.
 *
 * Units: V, ohm, A, V/s, s (see AmplifierModel). Infinity = no such limit.
 */
import { IDEAL_FIGURES, type AmplifierModel } from './model.ts';

const MICRO = 1e-6;
const V_PER_US = 1e6; // 1 V/µs in V/s

export const BUILT_IN_AMPLIFIERS: readonly AmplifierModel[] = Object.freeze([
  {
    id: 'ideal',
    name: 'Ideal amplifier',
    technologyClass: 'ideal',
    description: 'Reaches both rails, no output resistance, infinite slew rate, no delay, no input errors. For textbook checks.',
    figuresBasis: 'ideal',
    ...IDEAL_FIGURES,
  },
  {
    id: 'bipolar-single-supply-general',
    name: 'Bipolar single-supply general-purpose op-amp',
    technologyClass: 'bipolar, single supply, general purpose',
    description:
      'PNP-input bipolar op-amp whose inputs and output reach the negative rail but stop well short of the positive one; slow and with several microseconds of saturation recovery.',
    figuresBasis: 'class-typical',
    outputStage: 'push-pull',
    supplyMinV: 3,
    supplyMaxV: 32,
    outputHeadroomHighV: 1.5,
    outputHeadroomLowV: 0.02,
    outputResistanceOhm: 60,
    outputCurrentLimitA: 0.02,
    slewRateVPerS: 0.4 * V_PER_US,
    recoveryDelayS: 4 * MICRO,
    inputCommonModeLowMarginV: -0.2,
    inputCommonModeHighMarginV: 1.5,
    inputBiasCurrentA: -45e-9,
    inputOffsetV: 2e-3,
    differentialClampV: Infinity,
    quiescentCurrentA: 0.35e-3,
    // Drift about 25 °C and comparator specifics: typical of the class, from memory.
    overdriveDelayChargeVS: 0,
    internalHysteresisV: 0,
    // Input capacitance: 0 until the threshold node's capacitance is modelled (docs/model.md, strays and leakage).
    inputCapacitanceF: 0,
    inputOffsetDriftVPerK: 7e-6,
    inputBiasDoublingK: Infinity,
    outputHeadroomDriftVPerK: -2e-3,
    recoveryDelayDriftPerK: 0.003,
  },
  {
    id: 'bipolar-split-supply-general',
    name: 'Bipolar split-supply general-purpose op-amp',
    technologyClass: 'bipolar, split supply, general purpose',
    description:
      'NPN-input bipolar op-amp for ±5 V to ±18 V rails; output and inputs stay one to two volts from each rail; slow slewing.',
    figuresBasis: 'class-typical',
    outputStage: 'push-pull',
    supplyMinV: 10,
    supplyMaxV: 36,
    outputHeadroomHighV: 1.2,
    outputHeadroomLowV: 1.2,
    outputResistanceOhm: 75,
    outputCurrentLimitA: 0.025,
    slewRateVPerS: 0.5 * V_PER_US,
    recoveryDelayS: 5 * MICRO,
    inputCommonModeLowMarginV: 2,
    inputCommonModeHighMarginV: 2,
    inputBiasCurrentA: 80e-9,
    inputOffsetV: 1e-3,
    differentialClampV: Infinity,
    quiescentCurrentA: 1.7e-3,
    // Drift about 25 °C and comparator specifics: typical of the class, from memory.
    overdriveDelayChargeVS: 0,
    internalHysteresisV: 0,
    // Input capacitance: 0 until the threshold node's capacitance is modelled (docs/model.md, strays and leakage).
    inputCapacitanceF: 0,
    inputOffsetDriftVPerK: 5e-6,
    inputBiasDoublingK: Infinity,
    outputHeadroomDriftVPerK: -2e-3,
    recoveryDelayDriftPerK: 0.003,
  },
  {
    id: 'bipolar-low-noise-clamped',
    name: 'Bipolar low-noise fast op-amp with input clamp diodes',
    technologyClass: 'bipolar, low noise, fast, differential-input clamp',
    description:
      'Low-noise bipolar op-amp whose inputs are protected by back-to-back diodes: in open-loop use the clamp conducts whenever the inputs differ by more than a diode drop and loads the hysteresis network.',
    figuresBasis: 'class-typical',
    outputStage: 'push-pull',
    supplyMinV: 8,
    supplyMaxV: 36,
    outputHeadroomHighV: 1.3,
    outputHeadroomLowV: 1.3,
    outputResistanceOhm: 50,
    outputCurrentLimitA: 0.03,
    slewRateVPerS: 9 * V_PER_US,
    recoveryDelayS: 1 * MICRO,
    inputCommonModeLowMarginV: 1.5,
    inputCommonModeHighMarginV: 1.5,
    inputBiasCurrentA: 200e-9,
    inputOffsetV: 0.1e-3,
    differentialClampV: 0.7,
    quiescentCurrentA: 4e-3,
    // Drift about 25 °C and comparator specifics: typical of the class, from memory.
    overdriveDelayChargeVS: 0,
    internalHysteresisV: 0,
    // Input capacitance: 0 until the threshold node's capacitance is modelled (docs/model.md, strays and leakage).
    inputCapacitanceF: 0,
    inputOffsetDriftVPerK: 0.5e-6,
    inputBiasDoublingK: Infinity,
    outputHeadroomDriftVPerK: -2e-3,
    recoveryDelayDriftPerK: 0.003,
  },
  {
    id: 'jfet-input-general',
    name: 'JFET-input general-purpose op-amp',
    technologyClass: 'JFET input, split supply',
    description:
      'JFET-input op-amp: picoampere bias currents allow megohm timing resistors; the common-mode range stops a few volts above the negative rail.',
    figuresBasis: 'class-typical',
    outputStage: 'push-pull',
    supplyMinV: 7,
    supplyMaxV: 36,
    outputHeadroomHighV: 1.5,
    outputHeadroomLowV: 1.5,
    outputResistanceOhm: 100,
    outputCurrentLimitA: 0.025,
    slewRateVPerS: 13 * V_PER_US,
    recoveryDelayS: 1.5 * MICRO,
    inputCommonModeLowMarginV: 3,
    inputCommonModeHighMarginV: 0.5,
    inputBiasCurrentA: 30e-12,
    inputOffsetV: 3e-3,
    differentialClampV: Infinity,
    quiescentCurrentA: 1.4e-3,
    // Drift about 25 °C and comparator specifics: typical of the class, from memory.
    overdriveDelayChargeVS: 0,
    internalHysteresisV: 0,
    // Input capacitance: 0 until the threshold node's capacitance is modelled (docs/model.md, strays and leakage).
    inputCapacitanceF: 0,
    inputOffsetDriftVPerK: 10e-6,
    inputBiasDoublingK: 10,
    outputHeadroomDriftVPerK: -1e-3,
    recoveryDelayDriftPerK: 0.002,
  },
  {
    id: 'cmos-rro-micropower',
    name: 'CMOS rail-to-rail-output micropower op-amp',
    technologyClass: 'CMOS, rail-to-rail output, micropower',
    description:
      'Micropower CMOS op-amp for low-voltage single rails: output swings to within millivolts of the rails at light load but is weak (high output resistance) and slews at tens of millivolts per microsecond.',
    figuresBasis: 'class-typical',
    outputStage: 'push-pull',
    supplyMinV: 1.8,
    supplyMaxV: 5.5,
    outputHeadroomHighV: 0.01,
    outputHeadroomLowV: 0.01,
    outputResistanceOhm: 400,
    outputCurrentLimitA: 0.005,
    slewRateVPerS: 0.03 * V_PER_US,
    recoveryDelayS: 20 * MICRO,
    inputCommonModeLowMarginV: -0.1,
    inputCommonModeHighMarginV: 0.8,
    inputBiasCurrentA: 1e-12,
    inputOffsetV: 1e-3,
    differentialClampV: Infinity,
    quiescentCurrentA: 10e-6,
    // Drift about 25 °C and comparator specifics: typical of the class, from memory.
    overdriveDelayChargeVS: 0,
    internalHysteresisV: 0,
    // Input capacitance: 0 until the threshold node's capacitance is modelled (docs/model.md, strays and leakage).
    inputCapacitanceF: 0,
    inputOffsetDriftVPerK: 2e-6,
    inputBiasDoublingK: 10,
    outputHeadroomDriftVPerK: 1e-4,
    recoveryDelayDriftPerK: 0.003,
  },
  {
    id: 'cmos-rrio-fast',
    name: 'CMOS rail-to-rail input/output fast op-amp',
    technologyClass: 'CMOS, rail-to-rail input and output, fast',
    description:
      'General-purpose fast CMOS op-amp for single rails up to about 5.5 V; inputs and output reach the rails, fast recovery from saturation.',
    figuresBasis: 'class-typical',
    outputStage: 'push-pull',
    supplyMinV: 2.2,
    supplyMaxV: 5.5,
    outputHeadroomHighV: 0.02,
    outputHeadroomLowV: 0.02,
    outputResistanceOhm: 25,
    outputCurrentLimitA: 0.05,
    slewRateVPerS: 8 * V_PER_US,
    recoveryDelayS: 0.3 * MICRO,
    inputCommonModeLowMarginV: -0.1,
    inputCommonModeHighMarginV: -0.1,
    inputBiasCurrentA: 1e-12,
    inputOffsetV: 1e-3,
    differentialClampV: Infinity,
    quiescentCurrentA: 1.2e-3,
    // Drift about 25 °C and comparator specifics: typical of the class, from memory.
    overdriveDelayChargeVS: 0,
    internalHysteresisV: 0,
    // Input capacitance: 0 until the threshold node's capacitance is modelled (docs/model.md, strays and leakage).
    inputCapacitanceF: 0,
    inputOffsetDriftVPerK: 1e-6,
    inputBiasDoublingK: 10,
    outputHeadroomDriftVPerK: 1e-4,
    recoveryDelayDriftPerK: 0.003,
  },
  {
    id: 'comparator-open-drain-bipolar',
    name: 'Bipolar open-drain comparator',
    technologyClass: 'bipolar comparator, open-collector/open-drain output',
    description:
      'General-purpose bipolar comparator with an open output transistor: it only sinks, the high level comes from the pull-up resistor and its loads; inputs reach the negative rail.',
    figuresBasis: 'class-typical',
    outputStage: 'open-drain',
    supplyMinV: 2,
    supplyMaxV: 36,
    outputHeadroomHighV: 0,
    outputHeadroomLowV: 0.15,
    outputResistanceOhm: 15,
    outputCurrentLimitA: 0.016,
    slewRateVPerS: 50 * V_PER_US,
    recoveryDelayS: 1.3 * MICRO,
    inputCommonModeLowMarginV: -0.2,
    inputCommonModeHighMarginV: 1.5,
    inputBiasCurrentA: -25e-9,
    inputOffsetV: 2e-3,
    differentialClampV: Infinity,
    quiescentCurrentA: 0.2e-3,
    // Drift about 25 °C and comparator specifics: typical of the class, from memory.
    overdriveDelayChargeVS: 0,
    internalHysteresisV: 0,
    // Input capacitance: 0 until the threshold node's capacitance is modelled (docs/model.md, strays and leakage).
    inputCapacitanceF: 0,
    inputOffsetDriftVPerK: 5e-6,
    inputBiasDoublingK: Infinity,
    outputHeadroomDriftVPerK: -2e-3,
    recoveryDelayDriftPerK: 0.003,
  },
  {
    id: 'comparator-push-pull-cmos',
    name: 'CMOS push-pull comparator',
    technologyClass: 'CMOS comparator, push-pull rail-to-rail output',
    description:
      'Low-voltage CMOS comparator with a push-pull output that swings to the rails; tens to hundreds of nanoseconds of propagation delay.',
    figuresBasis: 'class-typical',
    outputStage: 'push-pull',
    supplyMinV: 1.8,
    supplyMaxV: 5.5,
    outputHeadroomHighV: 0.05,
    outputHeadroomLowV: 0.05,
    outputResistanceOhm: 30,
    outputCurrentLimitA: 0.03,
    slewRateVPerS: 200 * V_PER_US,
    recoveryDelayS: 0.2 * MICRO,
    inputCommonModeLowMarginV: -0.2,
    inputCommonModeHighMarginV: -0.2,
    inputBiasCurrentA: 1e-12,
    inputOffsetV: 1e-3,
    differentialClampV: Infinity,
    quiescentCurrentA: 50e-6,
    // Drift about 25 °C and comparator specifics: typical of the class, from memory.
    overdriveDelayChargeVS: 0,
    internalHysteresisV: 0,
    // Input capacitance: 0 until the threshold node's capacitance is modelled (docs/model.md, strays and leakage).
    inputCapacitanceF: 0,
    inputOffsetDriftVPerK: 2e-6,
    inputBiasDoublingK: 10,
    outputHeadroomDriftVPerK: 1e-4,
    recoveryDelayDriftPerK: 0.003,
  },
] satisfies AmplifierModel[]);

const BY_ID = new Map(BUILT_IN_AMPLIFIERS.map((a) => [a.id, a]));

export function findBuiltInAmplifier(id: string): AmplifierModel | undefined {
  return BY_ID.get(id);
}

export function isBuiltInAmplifierId(id: string): boolean {
  return BY_ID.has(id);
}
