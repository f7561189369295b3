/**
 * Turns what a request says about the amplifier (an id, or inline figures with
 * an optional base archetype) into a complete AmplifierModel. Omitted inline
 * fields default to ideal behaviour unless a base is named, so a caller can say
 * "this archetype, but with my slew rate".
 */
import { CoreError } from '../errors.ts';
import { AMPLIFIER_FIGURE_NAMES } from './figures-table.ts';
import { IDEAL_FIGURES, type AmplifierFigures, type AmplifierModel } from './model.ts';
import { validateFigures } from './validate-figures.ts';

export { validateFigures };

export type AmplifierLookup = (id: string) => AmplifierModel | undefined;

export interface InlineAmplifier extends Partial<AmplifierFigures> {
  base?: string;
  name?: string;
}

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
  for (const key of AMPLIFIER_FIGURE_NAMES) {
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
