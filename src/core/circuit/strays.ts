/**
 * Strays and leakage (docs/model.md, "strays and leakage"): the board and input
 * capacitances at the oscillator's nodes and the leakage resistances beside
 * them. What the model covers today, exactly:
 * - leakage across the timing capacitor (N to ground: the capacitor's insulation,
 *   the board and the inverting input together) and at the threshold node (P to
 *   ground): plain resistors in the per-piece nodal solve;
 * - capacitance at the timing node N (board stray + the amplifier's input
 *   capacitance): in parallel with the timing capacitor, so it adds to it (to a
 *   C(v) capacitor as a flat part of the node's curve, StrayLoadedShape).
 * - capacitance at the threshold node P (board stray + the amplifier's input
 *   capacitance) and at the output pin: each makes its node a state of the
 *   piece beside N (an RC of its own, e.g. the open-drain rise through the
 *   pull-up), solved exactly by the multi-state form of the walk
 *   (engine/modal.ts; beside a C(V) timing capacitor the collocation pieces of
 *   engine/modal-curved.ts).
 */
import { CoreError } from '../errors.ts';
import { FLAT_SHAPE, newCurveId, REFERENCE_TEMPERATURE_C, type BiasShape } from '../parts/capacitor/index.ts';
import { formatSi } from './format.ts';
import { CHECK_CODES, type Check } from './checks.ts';
import type { Circuit } from './types.ts';

export interface Strays {
  /** Board capacitance from the timing node N (inverting input) to ground, F. */
  timingNodeF: number;
  /** Board capacitance from the threshold node P (non-inverting input) to ground, F. */
  thresholdNodeF: number;
  /** Capacitance from the output pin to ground (board, load, probe), F. */
  outputNodeF: number;
  /** Leakage resistance from N to ground, ohm (Infinity: none). */
  timingLeakageOhm: number;
  /** Leakage resistance from P to ground, ohm (Infinity: none). */
  thresholdLeakageOhm: number;
}

/** The defaults: no stray capacitance, no leakage (a circuit without `strays` is this circuit). */
export const NO_STRAYS: Readonly<Strays> = Object.freeze({
  timingNodeF: 0,
  thresholdNodeF: 0,
  outputNodeF: 0,
  timingLeakageOhm: Infinity,
  thresholdLeakageOhm: Infinity,
});

/** Stray capacitances accepted: 0 to 1 µF (a board stray is picofarads; a microfarad is a part, not a stray). */
export const STRAY_CAPACITANCE_MAX_F = 1e-6;
/** Leakage resistances accepted: 1 kΩ (a contaminated board) to 1 PΩ (PTFE insulation, common practice). */
export const LEAKAGE_RANGE_OHM = Object.freeze({ min: 1e3, max: 1e15 });

/**
 * The timing capacitor should be at least this many times the stray and input
 * capacitance at its node, or the frequency rests on a figure nobody controls
 * (our design margin: 2 % of a ±1 % budget).
 */
export const TIMING_STRAY_RATIO_MIN = 50;

const CAPACITANCE_FIELDS = ['timingNodeF', 'thresholdNodeF', 'outputNodeF'] as const;
const LEAKAGE_FIELDS = ['timingLeakageOhm', 'thresholdLeakageOhm'] as const;

/** Capacitance at the timing node besides the timing capacitor, F: board stray + the amplifier's input capacitance. */
export function timingNodeStrayF(circuit: Circuit): number {
  return (circuit.strays?.timingNodeF ?? 0) + inputCapacitanceOf(circuit);
}

/** The amplifier's input capacitance, F (0 for an amplifier stored before the figure existed). */
function inputCapacitanceOf(circuit: Circuit): number {
  const c = circuit.amplifier.inputCapacitanceF;
  return c > 0 ? c : 0;
}

/** The ranges (invalid-value naming the field). Every combination in range is modelled. */
export function validateStrays(circuit: Circuit): void {
  const strays = circuit.strays;
  if (strays) {
    for (const field of CAPACITANCE_FIELDS) {
      const c = strays[field];
      if (!(c >= 0 && c <= STRAY_CAPACITANCE_MAX_F)) {
        throw new CoreError('invalid-value', `strays.${field} must be between 0 F and ${STRAY_CAPACITANCE_MAX_F} F`, `/strays/${field}`);
      }
    }
    for (const field of LEAKAGE_FIELDS) {
      const r = strays[field];
      if (r !== Infinity && !(r >= LEAKAGE_RANGE_OHM.min && r <= LEAKAGE_RANGE_OHM.max)) {
        throw new CoreError('invalid-value', `strays.${field} must be between ${LEAKAGE_RANGE_OHM.min} Ω and ${LEAKAGE_RANGE_OHM.max} Ω, or absent (no leakage)`, `/strays/${field}`);
      }
    }
  }
}

/**
 * The timing node's C(v) when a linear stray Cs sits beside a C(v) capacitor
 * C0·r(v), per unit of their sum at 0 V: (C0·r(v) + Cs)/(C0 + Cs) = f + (1 − f)·r(v),
 * f = Cs/(C0 + Cs). Even in v like r. One mutable object per configuration
 * cache (f follows the parameter vector), so a stream of evaluations allocates nothing.
 */
export class StrayLoadedShape implements BiasShape {
  kind: BiasShape['kind'] = 'flat';
  kneesV: readonly number[] = [];
  private inner: BiasShape = FLAT_SHAPE;
  private strayFraction = 0;
  /** A new one whenever the inner curve or the stray's share changes (BiasShape.curveId). */
  curveId = 0;
  private innerCurveId = 0;

  set(inner: BiasShape, strayFraction: number): this {
    if (inner.curveId !== this.innerCurveId || strayFraction !== this.strayFraction || this.curveId === 0) {
      this.curveId = newCurveId();
      this.innerCurveId = inner.curveId;
    }
    this.inner = inner;
    this.strayFraction = strayFraction;
    this.kind = inner.kind;
    this.kneesV = inner.kneesV;
    return this;
  }

  /** Identity of the curve (built on request only: evaluations never ask for it). */
  get key(): string {
    return `${this.inner.key}+stray:${this.strayFraction}`;
  }

  ratio(voltageV: number): number {
    return this.strayFraction + (1 - this.strayFraction) * this.inner.ratio(voltageV);
  }

  slope(voltageV: number): number {
    return (1 - this.strayFraction) * this.inner.slope(voltageV);
  }

  /** ∫₀ᵛ ratio(u) du: the stray's share is linear, the capacitor's is its own curve's charge. */
  charge(voltageV: number): number {
    return this.strayFraction * voltageV + (1 - this.strayFraction) * this.inner.charge(voltageV);
  }
}

/** The frequency with the capacitance at P and at the pin, and without it (the same model, the same circuit otherwise). */
export interface NodeStrayShift {
  frequencyHz: number;
  frequencyWithoutHz: number;
}

/** Whether the circuit has capacitance at P (board or input) or at the output pin (multi-state pieces). */
export function hasNodeStrays(circuit: Circuit): boolean {
  return (circuit.strays?.thresholdNodeF ?? 0) > 0 || (circuit.strays?.outputNodeF ?? 0) > 0 || inputCapacitanceOf(circuit) > 0;
}

/**
 * The circuit without capacitance at P and at the pin: the amplifier's input capacitance stays at N
 * (moved into timingNodeF), everything else as given. The baseline of the check below.
 */
export function withoutNodeStrays(circuit: Circuit): Circuit {
  const strays = circuit.strays ?? NO_STRAYS;
  return {
    ...circuit,
    amplifier: { ...circuit.amplifier, inputCapacitanceF: 0 },
    strays: { ...strays, timingNodeF: strays.timingNodeF + inputCapacitanceOf(circuit), thresholdNodeF: 0, outputNodeF: 0 },
  };
}

/**
 * Warning when the strays decide too much of the frequency: the capacitance at the timing node besides
 * the timing capacitor is more than 1/50 of it, or the capacitance at P and at the output pin moves
 * the frequency by more than 1/50 (the same 2 % margin). One check either way (BOM rules report a
 * code once), with the figures of whichever fired.
 */
export function strayCapacitanceCheck(circuit: Circuit, timingCapacitanceF: number, shift?: NodeStrayShift): Check | undefined {
  const strayF = timingNodeStrayF(circuit);
  const timingFires = strayF > 0 && timingCapacitanceF < TIMING_STRAY_RATIO_MIN * strayF;
  const relativeShift = shift ? shift.frequencyHz / shift.frequencyWithoutHz - 1 : 0;
  const nodeFires = shift !== undefined && Math.abs(relativeShift) > 1 / TIMING_STRAY_RATIO_MIN;
  if (!timingFires && !nodeFires) return undefined;
  const parts: string[] = [];
  const check: Check = { code: CHECK_CODES.strayCapacitanceSignificant, severity: 'warning', message: '' };
  if (timingFires) {
    const ratio = timingCapacitanceF / strayF;
    parts.push(
      `The timing capacitor (${formatSi(timingCapacitanceF, 'F')}) is only ${ratio.toFixed(1)}× the stray and input capacitance at its node (${formatSi(strayF, 'F')}); keep it at least ${TIMING_STRAY_RATIO_MIN}× so the frequency does not rest on the board`,
    );
    Object.assign(check, { timingCapacitanceF, strayCapacitanceF: strayF, ratio, minimumRatio: TIMING_STRAY_RATIO_MIN });
  }
  if (nodeFires) {
    const atP = (circuit.strays?.thresholdNodeF ?? 0) + inputCapacitanceOf(circuit);
    const atPin = circuit.strays?.outputNodeF ?? 0;
    parts.push(
      `The capacitance at the threshold node P (${formatSi(atP, 'F')}) and at the output pin (${formatSi(atPin, 'F')}) moves the frequency by ${(relativeShift * 100).toFixed(1)} % (${formatSi(shift.frequencyHz, 'Hz')} against ${formatSi(shift.frequencyWithoutHz, 'Hz')} without it); keep their RCs short against the half period so the frequency does not rest on the board`,
    );
    Object.assign(check, {
      thresholdNodeCapacitanceF: atP,
      outputNodeCapacitanceF: atPin,
      frequencyHz: shift.frequencyHz,
      frequencyWithoutNodeStraysHz: shift.frequencyWithoutHz,
      frequencyShift: relativeShift,
      maximumFrequencyShift: 1 / TIMING_STRAY_RATIO_MIN,
    });
  }
  check.message = parts.join('. ');
  return check;
}

/** A frequency shift from the timing capacitor's class-minimum insulation worth a warning (our margin: a tenth of a 1 % budget). */
export const INSULATION_SHIFT_WARNING = 0.001;
/**
 * The insulation is not run through the model when its conductance is below this share of the timing
 * node's (R/R_ins): the shift is of the order of that ratio times the thresholds' leverage, and this leaves
 * a margin of 100 below the warning (a C0G or film part behind kilohms to megohms is never run).
 */
export const INSULATION_SCREEN_RATIO = INSULATION_SHIFT_WARNING / 100;

export interface InsulationShift {
  insulationResistanceOhm: number;
  /** The board temperature that insulation applies at, °C. */
  temperatureC: number;
  frequencyHz: number;
  /** With the insulation's leakage across the capacitor; null when the circuit then stops oscillating. */
  frequencyWithLeakageHz: number | null;
}

/** The circuit with its timing capacitor's class-minimum insulation across it, beside any leakage it declares. */
export function withInsulationLeakage(circuit: Circuit, insulationOhm: number): Circuit {
  const declared = circuit.strays ?? NO_STRAYS;
  // The strays' range floor (a contaminated board) holds the leakiest real timing part too; a part leakier
  // still is reported with its own figure and run at the floor.
  const ohm = Math.max(insulationOhm, LEAKAGE_RANGE_OHM.min);
  const leakageOhm = Number.isFinite(declared.timingLeakageOhm) ? (declared.timingLeakageOhm * ohm) / (declared.timingLeakageOhm + ohm) : ohm;
  return { ...circuit, strays: { ...declared, timingLeakageOhm: leakageOhm }, capacitorInsulationOhm: undefined, capacitorInsulationTemperatureC: undefined };
}

/**
 * capacitor-leakage-significant (warning): the timing capacitor's insulation resistance at its class's
 * guaranteed minimum (parts/capacitor/insulation.ts, class-typical, from memory) would move the frequency by
 * more than INSULATION_SHIFT_WARNING, or stop the clock. Typical parts leak less, and ceramics lose about a
 * decade of insulation per 100 K of heating: a figure for the designer to weigh, not applied to the answer.
 */
export function capacitorLeakageCheck(shift: InsulationShift | undefined): Check | undefined {
  if (!shift) return undefined;
  const { insulationResistanceOhm, temperatureC, frequencyHz, frequencyWithLeakageHz } = shift;
  const insulation = `${formatSi(insulationResistanceOhm, 'Ω')}, ${Number(temperatureC.toFixed(1))} °C`;
  // Ceramics lose insulation as they heat (insulation.ts): the message says which way the figure moves.
  const margin = temperatureC <= REFERENCE_TEMPERATURE_C ? 'typical parts leak less, hot ceramics more' : 'typical parts, and ceramics running cooler, leak less';
  const advice = 'give strays.timingLeakageOhm to include it in the answers, lower the timing impedance, or choose a part that leaks less (film or class I ceramic)';
  if (frequencyWithLeakageHz === null) {
    return {
      code: CHECK_CODES.capacitorLeakageSignificant,
      severity: 'warning',
      message: `At its class's minimum insulation resistance (${insulation}) the timing capacitor's leakage would stop the oscillation: the capacitor no longer reaches a threshold; ${advice}`,
      insulationResistanceOhm,
      insulationTemperatureC: temperatureC,
      frequencyHz,
      frequencyWithLeakageHz: null,
      maximumFrequencyShift: INSULATION_SHIFT_WARNING,
    };
  }
  const relativeShift = frequencyWithLeakageHz / frequencyHz - 1;
  if (!(Math.abs(relativeShift) > INSULATION_SHIFT_WARNING)) return undefined;
  return {
    code: CHECK_CODES.capacitorLeakageSignificant,
    severity: 'warning',
    message: `At its class's minimum insulation resistance (${insulation}) the timing capacitor's leakage moves the frequency by ${(relativeShift * 100).toFixed(2)} % (${formatSi(frequencyWithLeakageHz, 'Hz')} against ${formatSi(frequencyHz, 'Hz')}); ${margin}; ${advice}`,
    insulationResistanceOhm,
    insulationTemperatureC: temperatureC,
    frequencyHz,
    frequencyWithLeakageHz,
    frequencyShift: relativeShift,
    maximumFrequencyShift: INSULATION_SHIFT_WARNING,
  };
}
