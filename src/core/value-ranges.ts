/**
 * The ONE definition of the value ranges every route accepts for component
 * values and frequencies: /v1/analyze, snap, design, tolerance, catalogues and
 * BOM checks all read these. Outside them the input is a mistake (a unit slip,
 * a typo), not a design — and arithmetic on such values gives 1e300-second
 * periods or errors that overflow to Infinity.
 * Our own choice: wide enough for every real timing part and oscillator.
 */
import { CoreError } from './errors.ts';

export interface ValueRange {
  readonly min: number;
  readonly max: number;
  readonly unit: string;
}

/** 1 mΩ (a shunt) to 1 TΩ (an electrometer resistor). */
export const RESISTANCE_RANGE_OHM: ValueRange = Object.freeze({ min: 1e-3, max: 1e12, unit: 'Ω' });
/** 1 fF (a stray) to 10 F (a supercapacitor). */
export const CAPACITANCE_RANGE_F: ValueRange = Object.freeze({ min: 1e-15, max: 10, unit: 'F' });
/** 1 mHz (a period of about 17 minutes) to 100 MHz, beyond any op-amp or comparator relaxation oscillator (the design search's range too). */
export const FREQUENCY_RANGE_HZ: ValueRange = Object.freeze({ min: 1e-3, max: 1e8, unit: 'Hz' });

export function componentRange(kind: 'resistor' | 'capacitor'): ValueRange {
  return kind === 'capacitor' ? CAPACITANCE_RANGE_F : RESISTANCE_RANGE_OHM;
}

export function inRange(value: number, range: ValueRange): boolean {
  return Number.isFinite(value) && value >= range.min && value <= range.max;
}

/** Refuse a value outside its range, naming the field. */
export function checkInRange(value: number, range: ValueRange, what: string, pointer: string): void {
  if (!inRange(value, range)) {
    throw new CoreError('invalid-value', `${what} must be between ${range.min} ${range.unit} and ${range.max} ${range.unit}, got ${value}`, pointer);
  }
}
