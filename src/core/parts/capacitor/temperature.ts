/**
 * Capacitance versus temperature from the dielectric code.
 *
 * - The BAND is the standard's: EIA-198 bounds the change of a class II/III
 *   body against 25 °C across its rated range by the code's third letter
 *   (X7R: ±15 % over −55…125 °C); class I and film follow their linear
 *   tempco ± its tolerance (capacitanceChangeAt in ../dielectric.ts).
 *   Worst-case corners use the band.
 * - The TYPICAL curve is where a class II/III part of the class usually sits
 *   inside that band: a bowl with its top near room temperature, reaching a
 *   class-typical fraction of the lower limit at the rated extremes (typical of
 *   the class, from memory). Nominal analyses at a temperature use it.
 */
import { capacitanceChangeAt, type CapacitanceChange, type Dielectric } from '../dielectric.ts';

export const REFERENCE_TEMPERATURE_C = 25;

/** The EIA-198 (class II/III) or tempco (class I, film) band at temperatureC, vs 25 °C. */
export function temperatureBand(d: Dielectric, temperatureC: number): CapacitanceChange {
  return capacitanceChangeAt(d, temperatureC);
}

/** Fraction of the lower band limit a typical class II / class III body reaches at its rated extremes (from memory). */
const TYPICAL_DEPTH_CLASS_2 = 0.5;
const TYPICAL_DEPTH_CLASS_3 = 0.85;

/**
 * Typical capacitance change at temperatureC vs 25 °C, a fraction. Linear-tempco
 * bodies: the nominal tempco. Band-only bodies: the class-typical bowl, clipped
 * to the band; outside the rated range it is held at the range's edge value.
 */
export function typicalTemperatureChange(d: Dielectric, temperatureC: number): number {
  if (d.tempcoPpmPerK !== undefined) return d.tempcoPpmPerK * 1e-6 * (temperatureC - REFERENCE_TEMPERATURE_C) + 0;
  const lower = d.changeMinFraction ?? 0;
  const tMin = d.tempMinC ?? REFERENCE_TEMPERATURE_C - 80;
  const tMax = d.tempMaxC ?? REFERENCE_TEMPERATURE_C + 100;
  const t = Math.min(tMax, Math.max(tMin, temperatureC));
  const edge = t < REFERENCE_TEMPERATURE_C ? tMin : tMax;
  if (edge === REFERENCE_TEMPERATURE_C) return 0;
  const x = (t - REFERENCE_TEMPERATURE_C) / (edge - REFERENCE_TEMPERATURE_C);
  const depth = d.family === 'ceramic-class-3' ? TYPICAL_DEPTH_CLASS_3 : TYPICAL_DEPTH_CLASS_2;
  return depth * lower * x * x + 0;
}
