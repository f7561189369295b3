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
    id: Type.String({ description: 'The id to name in a circuit\'s `amplifier` or an inline `base`; for registrations, the id of the PUT path' }),
    name: Type.String({ description: 'Display name shown in answers' }),
    technologyClass: Type.String({ description: 'Technology class in words (e.g. "bipolar, split supply, general purpose"); a registration that gave none shows its base\'s' }),
    description: Type.String({ description: 'What the archetype stands for and where its figures come from; a registration that gave none shows its base\'s' }),
    figuresBasis: StringEnum(FIGURES_BASIS, {
      description:
        'ideal: the textbook part; class-typical: figures typical of the technology class, from memory of the trade, not a datasheet; caller-supplied: a registration',
    }),
    source: StringEnum(SOURCES, { description: 'built-in: an archetype shipped with the service (read-only); registered: stored by PUT /v1/amplifiers/{id}' }),
    ...amplifierFigureRequiredProperties,
  },
  { $id: 'Amplifier', additionalProperties: false, description: 'An amplifier model with every figure (null: no such limit)' },
);

export const AmplifierList = Type.Object(
  { amplifiers: Type.Array(Type.Unsafe(Type.Ref('Amplifier')), { description: 'Built-in archetypes first, then registered amplifiers (a stored one that no longer passes validation is left out), each with every figure' }) },
  { $id: 'AmplifierList', additionalProperties: false, description: 'Every amplifier a circuit can name' },
);

/** Names of the read-only record fields a registration may carry (from a GET body) and that the service ignores. */
export const READ_ONLY_AMPLIFIER_FIELDS = ['id', 'source', 'figuresBasis'] as const;

/**
 * What a caller PUTs to register an amplifier. Omitted figures are ideal, or
 * taken from `base` when it names a built-in archetype; limits are null for "none".
 */
export const AmplifierRegistration = Type.Object(
  {
    name: Type.String({ minLength: 1, maxLength: 120, description: 'Display name shown in answers (1 to 120 characters)' }),
    technologyClass: Type.Optional(Type.String({ maxLength: 120, description: 'Technology class in words (default: that of `base`, or the ideal part\'s)' })),
    description: Type.Optional(Type.String({ maxLength: 2000, description: 'Free text for people, e.g. which part and datasheet revision the figures come from (default: that of `base`, or the ideal part\'s)' })),
    base: Type.Optional(AmplifierId),
    id: Type.Optional(Type.String({ maxLength: 64, description: 'Read-only (as GET shows it); ignored: the path names the amplifier' })),
    source: Type.Optional(StringEnum(SOURCES, { description: 'Read-only (as GET shows it); ignored' })),
    figuresBasis: Type.Optional(StringEnum(FIGURES_BASIS, { description: 'Read-only (as GET shows it); ignored: registered figures are caller-supplied' })),
    ...amplifierFigureProperties,
  },
  { $id: 'AmplifierRegistration', additionalProperties: false, description: 'A caller-registered amplifier model' },
);
