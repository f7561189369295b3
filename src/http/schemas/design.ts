/** POST /v1/design: target -> ranked complete designs. */
import { Type, type Static } from 'typebox';
import { AmplifierSpec, Check, ref, Supply } from './common.ts';
import { Circuit, Diode } from './circuit.ts';
import { acceptedTopologyIds, aliasNote, designable, TOPOLOGIES } from '../../core/index.ts';
import { FittedPart, Prediction, ValueSources } from './snap.ts';

/** Topologies design sizes (registry), with their deprecated aliases. */
export const DESIGN_TOPOLOGIES: readonly string[] = acceptedTopologyIds(designable);

export const DesignRequest = Type.Object(
  {
    targetFrequencyHz: Type.Number({ exclusiveMinimum: 0 }),
    targetDutyCycle: Type.Optional(
      Type.Number({ exclusiveMinimum: 0, exclusiveMaximum: 1, default: 0.5, description: 'Fraction of the period the output is high; 0.1..0.9 by threshold placement, beyond that by diode steering' }),
    ),
    dutyTolerance: Type.Optional(Type.Number({ minimum: 0, maximum: 1, description: 'Absolute duty-cycle tolerance (default 0.02)' })),
    frequencyTolerance: Type.Optional(
      Type.Number({ exclusiveMinimum: 0, maximum: 1, default: 0.01, description: 'Largest |frequencyError| a design may have, fraction' }),
    ),
    supply: ref(Supply),
    amplifier: ref(AmplifierSpec),
    values: Type.Optional(ref(ValueSources)),
    constraints: Type.Optional(
      Type.Object(
        {
          rMinOhm: Type.Optional(Type.Number({ exclusiveMinimum: 0 })),
          rMaxOhm: Type.Optional(Type.Number({ exclusiveMinimum: 0 })),
          cMinF: Type.Optional(Type.Number({ exclusiveMinimum: 0 })),
          cMaxF: Type.Optional(Type.Number({ exclusiveMinimum: 0 })),
          dielectrics: Type.Optional(
            Type.Array(Type.String({ minLength: 1, maxLength: 16 }), { maxItems: 32, description: 'Allowed dielectric codes for catalogue timing capacitors' }),
          ),
          maxSupplyCurrentA: Type.Optional(Type.Number({ exclusiveMinimum: 0, description: 'Mean supply current budget including the amplifier, A' })),
        },
        { additionalProperties: false },
      ),
    ),
    topologies: Type.Optional(
      Type.Array(Type.Union(DESIGN_TOPOLOGIES.map((t) => Type.Literal(t))), {
        minItems: 1,
        maxItems: 4,
        uniqueItems: true,
        description:
          'Default: the threshold-placement topologies that suit the supply for duty cycles of 0.1..0.9, diode-steered outside that range. Name diode-steered to have it offered inside the range too. ' +
          aliasNote(TOPOLOGIES.filter(designable).map((t) => t.id)),
      }),
    ),
    diode: Type.Optional(ref(Diode)),
    count: Type.Optional(Type.Integer({ minimum: 1, maximum: 20, default: 5 })),
  },
  {
    $id: 'DesignRequest',
    additionalProperties: false,
    description:
      'Values default to E24 resistors and E12 capacitors when `values` is omitted. `diode` models the steering diodes of diode-steered designs ' +
      '(default 0.6 V forward drop, 10 Ω); each such design\'s `circuit` carries the model it was analysed with.',
  },
);

export type DesignRequestBody = Static<typeof DesignRequest>;

const DesignItem = Type.Object(
  {
    rank: Type.Integer({ minimum: 1 }),
    topology: Type.String(),
    parts: Type.Array(ref(FittedPart)),
    predicted: ref(Prediction),
    frequencyError: Type.Number({ description: '(predicted − target) / target, from the full analysis' }),
    dutyCycleError: Type.Number({ description: 'predicted − target duty cycle' }),
    hysteresisFraction: Type.Number({ description: 'Hysteresis the design was built around, as a fraction of the output swing' }),
    circuit: ref(Circuit),
    checks: Type.Array(ref(Check)),
  },
  { additionalProperties: false },
);

export const DesignResponse = Type.Object(
  {
    designs: Type.Array(DesignItem, {
      description: 'Ranked by the share of the frequency and duty tolerances used (|frequencyError|/frequencyTolerance + |dutyCycleError|/dutyTolerance), best first',
    }),
    notes: Type.Array(Type.String(), { description: 'Topologies or hysteresis widths that gave nothing, and why' }),
  },
  { $id: 'DesignResponse', additionalProperties: false },
);

export const DESIGN_SCHEMAS = [DesignRequest, DesignResponse];
