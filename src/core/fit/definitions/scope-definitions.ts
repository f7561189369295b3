/**
 * How a capacitor-channel figure is read off a waveform — ONE definition shared
 * by the capture analysis (which applies it to sampled, noisy records) and the
 * forward model (which applies it to the engine's exact cycle). Keeping the definitions here,
 * and nowhere else, is what makes a noiseless capture of a circuit fit that
 * circuit exactly, however slow its edges.
 *
 * Output channel: the state levels, 50 % reference-level instants, duty
 * cycle and 10–90 % transition durations of ../../scope/ieee181.ts — the same
 * definitions /v1/analyze reports, read by the engine on the exact cycle and
 * by the capture analysis on samples.
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
