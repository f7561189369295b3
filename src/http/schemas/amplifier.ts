/**
 * Amplifier records as the API shows them, and the registration body. The
 * figure properties come from the core's figure table (common.ts); limits that
 * do not exist are null. Every record GET returns is a valid registration body:
 * its read-only fields (id, source, figuresBasis) are accepted on PUT and ignored.
 */
import { Type } from 'typebox';
import { AmplifierId, amplifierFigureProperties, amplifierFigureRequiredProperties, StringEnum } from './common.ts';

const FIGURES_BASIS = ['ideal', 'class-typical', 'caller-supplied'] as const;
const SOURCES = ['built-in', 'registered'] as const;

export const Amplifier = Type.Object(
  {
    id: Type.String(),
    name: Type.String(),
    technologyClass: Type.String(),
    description: Type.String(),
    figuresBasis: StringEnum(FIGURES_BASIS, {
      description: 'class-typical: figures typical of the technology class, from memory of the trade, not a datasheet',
    }),
    source: StringEnum(SOURCES),
    ...amplifierFigureRequiredProperties,
  },
  { $id: 'Amplifier', additionalProperties: false },
);

export const AmplifierList = Type.Object({ amplifiers: Type.Array(Type.Unsafe(Type.Ref('Amplifier'))) }, { $id: 'AmplifierList', additionalProperties: false });

/** Names of the read-only record fields a registration may carry (from a GET body) and that the service ignores. */
export const READ_ONLY_AMPLIFIER_FIELDS = ['id', 'source', 'figuresBasis'] as const;

/**
 * What a caller PUTs to register an amplifier. Omitted figures are ideal, or
 * taken from `base` when it names a built-in archetype; limits are null for "none".
 */
export const AmplifierRegistration = Type.Object(
  {
    name: Type.String({ minLength: 1, maxLength: 120 }),
    technologyClass: Type.Optional(Type.String({ maxLength: 120, description: 'Technology class in words' })),
    description: Type.Optional(Type.String({ maxLength: 2000 })),
    base: Type.Optional(AmplifierId),
    id: Type.Optional(Type.String({ maxLength: 64, description: 'Read-only (as GET shows it); ignored: the path names the amplifier' })),
    source: Type.Optional(StringEnum(SOURCES, { description: 'Read-only (as GET shows it); ignored' })),
    figuresBasis: Type.Optional(StringEnum(FIGURES_BASIS, { description: 'Read-only (as GET shows it); ignored: registered figures are caller-supplied' })),
    ...amplifierFigureProperties,
  },
  { $id: 'AmplifierRegistration', additionalProperties: false, description: 'A caller-registered amplifier model' },
);
