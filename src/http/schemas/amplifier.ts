/** Amplifier records as the API shows them: limits that do not exist are null. */
import { Type } from 'typebox';
import { AmplifierId, amplifierFigureProperties, NullableNumber, StringEnum } from './common.ts';

const Nullable = (description: string) => NullableNumber({ description });

export const Amplifier = Type.Object(
  {
    id: Type.String(),
    name: Type.String(),
    technologyClass: Type.String(),
    description: Type.String(),
    figuresBasis: StringEnum(['ideal', 'class-typical', 'caller-supplied'], {
      description: 'class-typical: figures typical of the technology class, from memory of the trade, not a datasheet',
    }),
    source: StringEnum(['built-in', 'registered']),
    outputStage: StringEnum(['push-pull', 'open-drain']),
    supplyMinV: Type.Number({ description: 'Minimum total supply span, V' }),
    supplyMaxV: Nullable('Maximum total supply span, V (null: unlimited)'),
    outputHeadroomHighV: Type.Number({ description: 'Output swing limit below V+ at light load, V' }),
    outputHeadroomLowV: Type.Number({ description: 'Output swing limit above V− at light load, V' }),
    outputResistanceOhm: Type.Number({ description: 'Output resistance, ohm' }),
    outputCurrentLimitA: Nullable('Output current limit, A (null: none)'),
    slewRateVPerS: Nullable('Slew rate, V/s (null: instant)'),
    recoveryDelayS: Type.Number({ description: 'Saturation-recovery / propagation delay, s' }),
    inputCommonModeLowMarginV: Nullable('Common-mode range lower end above V−, V (null: unlimited)'),
    inputCommonModeHighMarginV: Nullable('Common-mode range upper end below V+, V (null: unlimited)'),
    inputBiasCurrentA: Type.Number({ description: 'Bias current into each input, A' }),
    inputOffsetV: Type.Number({ description: 'Input offset voltage, V' }),
    differentialClampV: Nullable('Differential input clamp, V (null: none)'),
    quiescentCurrentA: Type.Number({ description: 'Amplifier supply current, A' }),
  },
  { $id: 'Amplifier', additionalProperties: false },
);

export const AmplifierList = Type.Object({ amplifiers: Type.Array(Type.Unsafe(Type.Ref('Amplifier'))) }, { $id: 'AmplifierList', additionalProperties: false });

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
    ...amplifierFigureProperties,
  },
  { $id: 'AmplifierRegistration', additionalProperties: false, description: 'A caller-registered amplifier model' },
);
