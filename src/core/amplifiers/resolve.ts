/**
 * Turns what a request says about the amplifier (an id, or inline figures with
 * an optional base archetype) into a complete AmplifierModel. Omitted inline
 * fields default to ideal behaviour unless a base is named, so a caller can say
 * "this archetype, but with my slew rate".
 */
import { CoreError } from '../errors.ts';
import { IDEAL_FIGURES, type AmplifierFigures, type AmplifierModel } from './model.ts';

export type AmplifierLookup = (id: string) => AmplifierModel | undefined;

export interface InlineAmplifier extends Partial<AmplifierFigures> {
  base?: string;
  name?: string;
}

const FIGURE_KEYS = Object.keys(IDEAL_FIGURES) as (keyof AmplifierFigures)[];

export function resolveAmplifier(
  spec: string | InlineAmplifier,
  lookup: AmplifierLookup,
  pointer = '/amplifier',
): AmplifierModel {
  if (typeof spec === 'string') {
    const found = lookup(spec);
    if (!found) throw new CoreError('unknown-reference', `No amplifier with id '${spec}'`, pointer);
    return found;
  }
  let base: AmplifierModel | undefined;
  if (spec.base !== undefined) {
    base = lookup(spec.base);
    if (!base) throw new CoreError('unknown-reference', `No amplifier with id '${spec.base}' to use as base`, `${pointer}/base`);
  }
  // Copy only the figures from the base: its identity (id, name, basis) must not leak into an inline model.
  const start: AmplifierFigures = base ?? IDEAL_FIGURES;
  const figures = {} as Record<string, unknown>;
  for (const key of FIGURE_KEYS) {
    const value = spec[key];
    figures[key] = value !== undefined ? value : start[key];
  }
  const model: AmplifierModel = {
    id: 'inline',
    name: spec.name ?? (base ? `${base.name} (modified inline)` : 'Inline amplifier'),
    technologyClass: base?.technologyClass ?? 'caller-supplied',
    description: base ? `Inline figures over the '${base.id}' archetype` : 'Inline figures; omitted fields are ideal',
    figuresBasis: 'caller-supplied',
    ...(figures as unknown as AmplifierFigures),
  };
  validateFigures(model, pointer);
  return model;
}

/** Physical sanity of a figure set; the schema already checked types. */
export function validateFigures(amp: AmplifierFigures, pointer: string): void {
  const nonNegative: (keyof AmplifierFigures)[] = [
    'supplyMinV',
    'outputHeadroomHighV',
    'outputHeadroomLowV',
    'outputResistanceOhm',
    'recoveryDelayS',
    'quiescentCurrentA',
  ];
  for (const key of nonNegative) {
    const v = amp[key] as number;
    if (!(v >= 0) || !Number.isFinite(v)) throw new CoreError('invalid-value', `${key} must be a finite number >= 0`, `${pointer}/${key}`);
  }
  const positive: (keyof AmplifierFigures)[] = ['outputCurrentLimitA', 'slewRateVPerS', 'differentialClampV', 'supplyMaxV'];
  for (const key of positive) {
    const v = amp[key] as number;
    if (!(v > 0)) throw new CoreError('invalid-value', `${key} must be > 0 (omit or null for no limit)`, `${pointer}/${key}`);
  }
  if (amp.supplyMaxV < amp.supplyMinV) {
    throw new CoreError('invalid-value', 'supplyMaxV must not be below supplyMinV', `${pointer}/supplyMaxV`);
  }
}
