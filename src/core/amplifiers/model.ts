/**
 * The amplifier model every analysis uses. An op-amp run open loop or a
 * comparator is, for a relaxation oscillator, a decision element (P vs N) driving
 * an output stage. The figures, their units, ranges and ideal values are the
 * entries of figures-table.ts; this file adds the identity fields.
 * Figures are SI base units; `Infinity` (or `-Infinity` for the common-mode
 * margins) means "no such limit" (the HTTP layer carries that as JSON null).
 */
import {
  AMPLIFIER_FIGURE_ENTRIES,
  AMPLIFIER_FIGURE_NAMES,
  AMPLIFIER_FIGURE_TABLE,
  type FigureValues,
  type NumberFigure,
} from './figures-table.ts';

export type OutputStage = FigureValues['outputStage'];

/** The fields a caller may set (everything but identity), used for inline and stored amplifiers: one per table entry. */
export type AmplifierFigures = FigureValues;

export interface AmplifierModel extends AmplifierFigures {
  /** Our own id (kebab-case). */
  id: string;
  name: string;
  /** Technology class in words, e.g. "bipolar, single supply, general purpose". */
  technologyClass: string;
  description: string;
  /** Where the figures come from: class-typical archetype, registered by a caller, or inline in a request. */
  figuresBasis: 'ideal' | 'class-typical' | 'caller-supplied';
}

/** Ideal behaviour (each table entry's `ideal`): rails reached, no resistance, no limits, instant, no input errors. */
export const IDEAL_FIGURES: Readonly<AmplifierFigures> = Object.freeze(
  Object.fromEntries(AMPLIFIER_FIGURE_NAMES.map((n) => [n, AMPLIFIER_FIGURE_TABLE[n].ideal])) as unknown as AmplifierFigures,
);

/** Figures whose departure from ideal needs the time-domain engine (the table's `timeDomain` flag). */
const TIME_DOMAIN_FIGURES = AMPLIFIER_FIGURE_ENTRIES.filter(([, d]) => d.kind === 'number' && d.timeDomain).map(([n, d]) => [n, (d as NumberFigure).ideal] as const);

/** True when the time-domain dynamics (slew, delay, limits, clamps) can change the answer. */
export function hasDynamicLimits(amp: AmplifierFigures): boolean {
  for (const [name, ideal] of TIME_DOMAIN_FIGURES) {
    if ((amp[name] as number) !== ideal) return true;
  }
  return false;
}
