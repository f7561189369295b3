/**
 * How a figure is read off a waveform — ONE definition shared by the capture
 * analysis (which applies it to sampled, noisy records) and the forward model
 * (which applies it to the engine's exact cycle). Keeping the definitions here,
 * and nowhere else, is what makes a noiseless capture of a circuit fit that
 * circuit exactly, however slow its edges.
 *
 * Output channel (IEEE Std 181-2011 terms):
 * - state levels: the mean of the pin over the settled part of each state, i.e.
 *   from the arriving transition's 90 % (rising) / 10 % (falling) reference
 *   instant plus LEVEL_MARGIN × its 10–90 % duration, to the departing
 *   transition's first reference instant minus LEVEL_MARGIN × its duration.
 *   The reference levels themselves come from the state levels, so both sides
 *   iterate LEVEL_ITERATIONS times (IEEE 181's histogram levels start the
 *   capture's iteration; the settled levels of the engine start the model's);
 * - period and duty cycle: the 50 % reference-level instants;
 * - transition durations: 10 % to 90 % reference-level instants.
 * Capacitor channel:
 * - capacitorMaxV / capacitorMinV: the turning points (overshoot included);
 * - capacitorAboveMidShare: the share of the period the capacitor spends above
 *   the middle of its range (level crossings are sharp where turning-point
 *   instants are not);
 * - time constants: over the part of each charging (discharging) stretch
 *   between the TAU_WINDOW_LOW and TAU_WINDOW_HIGH levels of the capacitor's
 *   range, from the means m1, m2, m3 of three equal sub-windows of width h:
 *   τ = h / ln((m2 − m1)/(m3 − m2)), exact for one exponential (the sub-window
 *   means of A + B·e^(−t/τ) are in geometric progression with ratio e^(−h/τ));
 *   where an edge reaches into the window it is an effective figure, read the
 *   same way on both sides.
 */

/** Margin after/before a transition, in 10–90 % durations: a linear ramp ends 0.125 durations past its 90 % instant (our margin: twice that). */
export const LEVEL_MARGIN = 0.25;
/** Fixed-point passes levels → reference instants → levels. */
export const LEVEL_ITERATIONS = 2;
/** IEEE Std 181 reference levels, fractions of the amplitude. */
export const REF_LOW = 0.1;
export const REF_MID = 0.5;
export const REF_HIGH = 0.9;
/** Time-constant window: between these shares of the capacitor's range (min → max). */
export const TAU_WINDOW_LOW = 0.25;
export const TAU_WINDOW_HIGH = 0.75;
/** Half-width of the local fit around a capacitor level crossing, share of the period (capture side only). */
export const CROSSING_WINDOW_SHARE = 0.01;
/** Half-width of the local fits around a capacitor turning point, share of the period (capture side only). */
export const EXTREME_WINDOW_SHARE = 0.03;

/** τ from three equal-width sub-window means (NaN when they are not a decaying geometric progression). */
export function tauFromWindowMeans(m1: number, m2: number, m3: number, widthS: number): number {
  const ratio = (m3 - m2) / (m2 - m1);
  return ratio > 0 && ratio < 1 ? widthS / -Math.log(ratio) : Number.NaN;
}
