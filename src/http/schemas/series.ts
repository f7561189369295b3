/** IEC 60063 preferred-number series as the API shows them. */
import { Type, type Static } from 'typebox';
import { SERIES_NAMES } from '../../core/parts/index.ts';

/** Decade exponents the route enumerates: 10^-15 (1 fF) .. 10^14 (100 TΩ) covers every real part. */
export const MIN_DECADE = -15;
export const MAX_DECADE = 14;

/** Loose on purpose: a well-formed but unknown name is a 404, not a validation error. */
export const SeriesName = Type.String({
  minLength: 1,
  maxLength: 16,
  description: `Series name, case-insensitive: ${SERIES_NAMES.join(', ')}`,
});

/**
 * Query strings arrive as text and the service does not coerce types, so the
 * decade exponents are declared as integer-looking strings and parsed by the route.
 */
const DecadeParam = (description: string) => Type.Optional(Type.String({ pattern: '^[+-]?[0-9]{1,2}$', description }));

export const SeriesQuery = Type.Object(
  {
  fromDecade: DecadeParam(
    `First decade as a power of ten: 3 starts the values at 1000 (1 kΩ, or 1 nF with -9). ${MIN_DECADE}..${MAX_DECADE}; default 0, or toDecade when only that is given`,
  ),
  toDecade: DecadeParam(
    `Last decade as a power of ten, inclusive: 4 ends the values below 100000. ${MIN_DECADE}..${MAX_DECADE}; default fromDecade`,
  ),
  },
  // A misspelt parameter would otherwise be ignored silently and answer a different range.
  { additionalProperties: false },
);

export const Series = Type.Object(
  {
    name: Type.String({ description: 'Canonical series name (E3 ... E192)' }),
    valuesPerDecade: Type.Integer({ description: 'Values in one decade: the number in the series name (E24: 24)' }),
    significantFigures: Type.Integer({ description: 'Figures each value carries: 2 for E3..E24, 3 for E48..E192 (IEC 60063)' }),
    tolerance: Type.Number({ description: 'Tolerance usually sold with the series, as a fraction (0.05 = 5 %)' }),
    toleranceBasis: Type.Literal('common practice', { description: 'The tolerance is trade practice, not part of IEC 60063' }),
    mantissas: Type.Array(Type.Number(), { description: 'One decade as mantissas in [1, 10), ascending' }),
    fromDecade: Type.Integer({ description: 'First decade listed, as a power of ten (3: from 1 k)' }),
    toDecade: Type.Integer({ description: 'Last decade listed, as a power of ten (4: values below 100 k)' }),
    values: Type.Array(Type.Number(), { description: 'Every series value from 10^fromDecade up to (not including) 10^(toDecade+1), ascending' }),
  },
  { $id: 'Series', additionalProperties: false, description: 'An IEC 60063 preferred-number series over a range of decades' },
);

export const SeriesSummary = Type.Object(
  {
    name: Type.String({ description: 'Canonical series name (E3 ... E192)' }),
    valuesPerDecade: Type.Integer({ description: 'Values in one decade' }),
    tolerance: Type.Number({ description: 'Tolerance usually sold with the series, as a fraction (common practice)' }),
  },
  { additionalProperties: false },
);

export const SeriesList = Type.Object(
  { series: Type.Array(SeriesSummary, { description: 'Every series, fewest values per decade first' }) },
  { $id: 'SeriesList', additionalProperties: false, description: 'The IEC 60063 series the service knows' },
);

export type SeriesBody = Static<typeof Series>;
export const SERIES_SCHEMAS = [Series, SeriesList];
