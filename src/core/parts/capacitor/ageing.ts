/**
 * Ageing of ferroelectric (class II/III) ceramics: after each heating above the
 * Curie point (soldering reflow de-ages a part) the capacitance falls by a fixed
 * fraction per decade of hours — the log-decade law
 *
 *     C(t) = C(t0) · (1 − k · log10(t / t0))
 *
 * with t the hours since the last de-ageing and t0 the reference age at which
 * the marked value applies. Rates k per decade are TYPICAL OF THE CLASS, from
 * memory: about 2 % for X7R-like bodies, 3 % for the higher-k X5R/S/T bodies,
 * 7 % for class III (Y5V, Z5U); class I, film and mica do not age this way.
 */
import type { Dielectric } from '../dielectric.ts';

/** Hours after the last de-ageing at which the marked value applies (common practice for class II, from memory). */
export const AGEING_REFERENCE_HOURS = 1000;
/** The law holds from about one hour after de-ageing; younger ages are taken as 1 h. */
export const AGEING_MIN_HOURS = 1;
/** Hours per year used for a service life in years (Julian year, 365.25 d). */
export const HOURS_PER_YEAR = 8766;

/** Fractional loss per decade of hours, typical of the class (from memory). */
export function ageingRatePerDecade(d: Dielectric | undefined): number {
  if (!d) return 0;
  if (d.family === 'ceramic-class-3') return 0.07;
  if (d.family !== 'ceramic-class-2') return 0;
  const change = d.code[2];
  if ('ABCDEF'.includes(change)) return 0.01;
  if (change === 'S' || change === 'T' || d.code[1] === '5') return 0.03;
  return 0.02;
}

/** C(t)/C(t0) by the log-decade law at ageHours since the last de-ageing. */
export function ageingFactor(ratePerDecade: number, ageHours: number, referenceHours = AGEING_REFERENCE_HOURS): number {
  if (ratePerDecade === 0) return 1;
  const t = Math.max(AGEING_MIN_HOURS, ageHours);
  return 1 - ratePerDecade * Math.log10(t / referenceHours);
}
