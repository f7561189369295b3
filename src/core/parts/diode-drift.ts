/**
 * Forward drop of a silicon steering diode versus temperature: it falls by about
 * 2 mV per kelvin at a fixed current (common practice; the textbook silicon
 * junction figure, −1.8…−2.2 mV/K at small currents). Linear about 25 °C.
 */
export const DIODE_FORWARD_DROP_TEMPCO_V_PER_K = -2e-3;
export const DIODE_REFERENCE_TEMPERATURE_C = 25;

/** Forward drop at temperatureC from its 25 °C value, V. Never below zero. */
export function forwardDropAtV(
  forwardDrop25V: number,
  temperatureC: number,
  tempcoVPerK: number = DIODE_FORWARD_DROP_TEMPCO_V_PER_K,
): number {
  return Math.max(0, forwardDrop25V + tempcoVPerK * (temperatureC - DIODE_REFERENCE_TEMPERATURE_C));
}
