/**
 * Shared typebox schemas. Each has an $id, is registered once with
 * app.addSchema and referenced from routes, so it appears once under
 * #/components/schemas in the OpenAPI document.
 */
import { Type, type Static, type TSchema } from 'typebox';
import { CAPACITANCE_RANGE_F, FREQUENCY_RANGE_HZ, RESISTANCE_RANGE_OHM, type ValueRange } from '../../core/value-ranges.ts';
import { AMPLIFIER_FIGURE_NAMES, describeRange, figureDescriptor, type AmplifierFigureName } from '../../core/amplifiers/figures-table.ts';

/**
 * A number or null, written as a JSON Schema type array rather than anyOf: the
 * response serializer handles type arrays natively but checks anyOf branches
 * with a validator at run time, and ajv reports a plainer error for it.
 */
export function NullableNumber(options: Record<string, unknown> = {}) {
  return Type.Unsafe<number | null>({ type: ['number', 'null'], ...options });
}

/** A string from a fixed set, as `enum` (not an anyOf of consts, for the same reasons). */
export function StringEnum<const T extends readonly string[]>(values: T, options: Record<string, unknown> = {}) {
  return Type.Unsafe<T[number]>({ type: 'string', enum: [...values], ...options });
}

/**
 * Reference a registered schema while keeping its static type. With a
 * description (what this use of the shared schema means), the reference is
 * wrapped as `allOf: [{ $ref }]` with the description beside the allOf:
 * @fastify/swagger 9 deletes every sibling of a `$ref` when it converts a schema
 * to OpenAPI (lib/spec/openapi/utils.js, convertJsonSchemaToOpenapi3), so a
 * description written next to the `$ref` would never reach the contract. A
 * one-entry allOf validates exactly like the bare reference (JSON Schema
 * 2020-12 §10.2.1.1) and fast-json-stringify merges it at build time.
 */
export function ref<T extends TSchema>(schema: T, description?: string) {
  const id = (schema as { $id?: string }).$id;
  if (!id) throw new Error('ref() needs a schema with $id');
  if (description === undefined) return Type.Unsafe<Static<T>>(Type.Ref(id));
  return Type.Unsafe<Static<T>>({ allOf: [Type.Ref(id)], description });
}

/**
 * Numbers in the shared value ranges (core/value-ranges.ts), so every route
 * states and enforces the same ranges as /v1/analyze.
 */
function rangedNumber(range: ValueRange, description: string, options: Record<string, unknown> = {}) {
  return Type.Number({ minimum: range.min, maximum: range.max, description: `${description} (${range.min} to ${range.max} ${range.unit})`, ...options });
}
export const ResistanceOhm = (description: string, options: Record<string, unknown> = {}) => rangedNumber(RESISTANCE_RANGE_OHM, description, options);
export const CapacitanceF = (description: string, options: Record<string, unknown> = {}) => rangedNumber(CAPACITANCE_RANGE_F, description, options);
export const FrequencyHz = (description: string, options: Record<string, unknown> = {}) => rangedNumber(FREQUENCY_RANGE_HZ, description, options);

export const ComponentValue = Type.Union(
  [
    Type.Number({
      minimum: CAPACITANCE_RANGE_F.min,
      maximum: RESISTANCE_RANGE_OHM.max,
      description: `SI base units: ohm for resistors (${RESISTANCE_RANGE_OHM.min} to ${RESISTANCE_RANGE_OHM.max}), farad for capacitors (${CAPACITANCE_RANGE_F.min} to ${CAPACITANCE_RANGE_F.max})`,
    }),
    Type.String({
      minLength: 1,
      maxLength: 40,
      description:
        'IEC 60062 RKM code ("4K7", "R47", "4n7"), SI-prefix form ("4.7k", "10 nF", "0.01u", "3.3 kΩ") or the EIA three-digit marking code ' +
        '(exactly three digits: two significant digits and a power of ten, "103" = 10 kΩ or 10 nF on a picofarad base, "100" = 10 Ω or 10 pF; send plain base units as a number or with a unit)',
    }),
  ],
  { $id: 'ComponentValue', description: 'A component value as a number in SI base units or a value string' },
);

export const Supply = Type.Object(
  {
    positiveV: Type.Number({ description: 'Positive rail relative to ground, V' }),
    negativeV: Type.Optional(Type.Number({ default: 0, description: 'Negative rail relative to ground, V (0 for a single supply)' })),
  },
  { $id: 'Supply', additionalProperties: false, description: 'The supply rails, relative to ground (the circuit\'s 0 V)' },
);

/**
 * One schema per amplifier figure, built from the core's figure table (units,
 * physical ranges, "no limit" as null): the schemas never list figures by hand.
 */
export function amplifierFigureSchema(name: AmplifierFigureName) {
  const d = figureDescriptor(name);
  if (d.kind === 'choice') return StringEnum(d.choices, { description: d.description });
  const options: Record<string, unknown> = {
    description: `${d.description}, ${d.unit}. Accepted: ${describeRange(d)}.${d.rangeNote ? ` Range: ${d.rangeNote}.` : ''}`,
    maximum: d.max,
  };
  // "0 or min..max": the schema admits 0..max and the core refuses the gap (0, min) naming the field.
  if (d.zeroAllowed) options.minimum = 0;
  else if (d.minExclusive) options.exclusiveMinimum = d.min;
  else options.minimum = d.min;
  return d.unlimited ? NullableNumber(options) : Type.Unsafe<number>({ type: 'number', ...options });
}

type FigureSchema = ReturnType<typeof amplifierFigureSchema>;

/** Every figure, optional (inline amplifiers and registrations: omitted figures come from the base or the ideal part). */
export const amplifierFigureProperties = Object.fromEntries(
  AMPLIFIER_FIGURE_NAMES.map((n) => [n, Type.Optional(amplifierFigureSchema(n))]),
) as { [K in AmplifierFigureName]: ReturnType<typeof Type.Optional<FigureSchema>> };

/** Every figure, required (amplifier records as the API shows them). */
export const amplifierFigureRequiredProperties = Object.fromEntries(AMPLIFIER_FIGURE_NAMES.map((n) => [n, amplifierFigureSchema(n)])) as {
  [K in AmplifierFigureName]: FigureSchema;
};

export const AmplifierId = Type.String({ pattern: '^[a-z0-9][a-z0-9._-]{0,63}$', description: 'Id of a built-in archetype or a registered amplifier' });

export const InlineAmplifier = Type.Object(
  {
    base: Type.Optional(AmplifierId),
    name: Type.Optional(Type.String({ maxLength: 120, description: 'A name of your own for this amplifier, shown in answers' })),
    ...amplifierFigureProperties,
  },
  {
    $id: 'InlineAmplifier',
    additionalProperties: false,
    description: 'Amplifier figures given inline. Omitted fields are ideal, or taken from `base` when it names an archetype.',
  },
);

export const AmplifierSpec = Type.Union([AmplifierId, ref(InlineAmplifier)], {
  $id: 'AmplifierSpec',
  description: 'An amplifier id, or inline figures',
});

export const Check = Type.Object(
  {
    code: Type.String({ description: 'Stable machine-readable code' }),
    severity: StringEnum(['info', 'warning', 'error', 'caution'], {
      description: 'error: the circuit will not work as intended; warning: it works with reduced margin; caution: safety note; info: for the record',
    }),
    message: Type.String({ description: 'What was found, in words, with the figures' }),
  },
  {
    $id: 'Check',
    additionalProperties: Type.Unsafe<number | string | boolean | null>({ type: ['number', 'string', 'boolean', 'null'] }),
    description: 'A design check with the figures behind it (SI units) as further properties',
  },
);

export const Problem = Type.Object(
  {
    type: Type.String({ description: 'URI reference identifying the problem type' }),
    title: Type.String({ description: 'Short summary of the problem type' }),
    status: Type.Integer({ description: 'HTTP status code of this answer' }),
    detail: Type.Optional(Type.String({ description: 'What went wrong with this request, in words' })),
    instance: Type.Optional(Type.String({ description: 'The request URL this problem is about' })),
    code: Type.Optional(Type.String({ description: 'Stable machine-readable code' })),
    errors: Type.Optional(
      Type.Array(
        Type.Object({
          pointer: Type.String({ description: 'JSON pointer (RFC 6901) into the request body, or into the part of the request `in` names' }),
          in: Type.Optional(StringEnum(['query', 'path', 'header'], { description: 'Absent: the pointer is into the body; otherwise into the query parameters, path parameters or headers (by name)' })),
          detail: Type.String({ description: 'What is wrong with that field' }),
        }),
        { description: 'One entry per bad field or parameter' },
      ),
    ),
  },
  { $id: 'Problem', additionalProperties: true, description: 'RFC 9457 problem details' },
);

export type ProblemBody = Static<typeof Problem>;

export const SHARED_SCHEMAS: TSchema[] = [ComponentValue, Supply, InlineAmplifier, AmplifierSpec, Check, Problem];

/** Error responses for a route, all as application/problem+json. */
export function problemResponses(...statuses: number[]) {
  const out: Record<number, unknown> = {};
  // Any route can shed load with 503 (event-loop pressure or shutdown), so every route declares it;
  // a route that needs a key can answer 429 to a client with too many failed keys (auth/plugin.ts).
  const limited = statuses.includes(401) ? [429] : [];
  for (const status of [...new Set([...statuses, ...limited, 503])]) {
    out[status] = {
      description: PROBLEM_DESCRIPTIONS[status] ?? 'Problem',
      content: { 'application/problem+json': { schema: ref(Problem) } },
    };
  }
  return out;
}

const PROBLEM_DESCRIPTIONS: Record<number, string> = {
  400: 'Malformed request: a field is missing, has the wrong type or cannot be parsed',
  401: 'An API key is required',
  403: 'The API key lacks the needed scope',
  404: 'Not found',
  409: 'Conflict',
  412: 'The If-Match ETag is stale',
  413: 'Body too large',
  415: 'Unsupported media type',
  422: 'Well-formed but physically impossible or unanswerable request',
  428: 'If-Match is required to change an existing resource',
  429: 'Too many failed API-key attempts from this client; retry after Retry-After seconds',
  503: 'Overloaded; retry later',
};
