/** Plain circuit description the core works on: SI base units throughout. */
import type { AmplifierModel } from '../amplifiers/model.ts';
import type { BiasShape } from '../parts/capacitor/dc-bias.ts';
import type { Strays } from './strays.ts';

export type OutputState = 'high' | 'low';

export interface Supply {
  /** Positive rail relative to ground, V. */
  positiveV: number;
  /** Negative rail relative to ground, V (0 for a single supply). */
  negativeV: number;
}

/** A resistive load on the output pin returned to a fixed voltage. */
export interface OutputLoad {
  resistanceOhm: number;
  /** Voltage the load returns to, V (0 = ground). */
  returnV: number;
}

/** Piecewise-linear diode: forward drop plus series resistance while conducting. */
export interface DiodeModel {
  forwardDropV: number;
  resistanceOhm: number;
}

export interface Circuit {
  topology: string;
  supply: Supply;
  amplifier: AmplifierModel;
  /** Part values by role, in ohm or farad. */
  parts: Readonly<Record<string, number>>;
  load?: OutputLoad;
  diode?: DiodeModel;
  /**
   * C(v)/C(0) of the timing capacitor when it depends on voltage (class II/III
   * ceramics); parts[capacitor role] is then its capacitance at 0 V. Absent or
   * flat: a linear capacitor.
   */
  capacitorShape?: BiasShape;
  /** Board capacitances and leakage at the nodes (circuit/strays.ts); absent: none. */
  strays?: Strays;
  /**
   * The timing capacitor's insulation resistance as its dielectric's class guarantees it (the minimum at
   * capacitorInsulationTemperatureC, parts/capacitor/insulation.ts), when its part names a dielectric.
   * Checked, not applied: the analysis reports what that leakage across the capacitor would do (check
   * capacitor-leakage-significant); a leakage to include in the answers goes in strays.timingLeakageOhm.
   */
  capacitorInsulationOhm?: number;
  /**
   * The board temperature capacitorInsulationOhm applies at, °C (absent: 25 °C, where catalogues state it).
   * A BOM check with a temperature range takes its hottest end: insulation falls as a part heats.
   */
  capacitorInsulationTemperatureC?: number;
}

/** What differs between the linear pieces of one output state. */
export interface PieceConfig {
  state: OutputState;
  /** False while the output stage does not drive (open drain released). */
  outputDriven: boolean;
  /** Conduction of the topology's diodes, in its own order (diode-steered topologies). */
  diodesOn?: readonly boolean[];
}
