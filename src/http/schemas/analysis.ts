/** Response schema of POST /v1/analyze. */
import { Type } from 'typebox';
import { Check, NullableNumber, ref, StringEnum } from './common.ts';

/** The amplifier effects an answer's model included (docs/model.md §3). */
export const ModelEffects = Type.Array(StringEnum(['slew-rate', 'recovery-delay', 'current-limit', 'input-clamp']), {
  description: 'Amplifier effects included in the model that produced this answer (empty: the closed-form special case)',
});

const StateSummary = Type.Object(
  {
    tauS: Type.Number({ description: 'Capacitor time constant in this state, s' }),
    asymptoteV: Type.Number({ description: 'Capacitor voltage the state heads for, V' }),
    switchingV: Type.Number({ description: 'Capacitor voltage at which the output leaves the state, V' }),
    sourceV: NullableNumber({ description: 'Output-stage source level, V (null: not driven)' }),
    dwellS: Type.Number({ description: 'Time spent in the state, s' }),
  },
  { additionalProperties: false },
);

export const AmplifierSummary = Type.Object(
  {
    id: Type.String(),
    name: Type.String(),
    figuresBasis: Type.String(),
  },
  { additionalProperties: false },
);

export const Analysis = Type.Object(
  {
    topology: Type.String(),
    amplifier: AmplifierSummary,
    model: StringEnum(['closed-form', 'time-domain'], {
      description: "Which model answered: the walk of exactly solved pieces; 'closed-form' is its special case with no amplifier effect active (one exponential per state)",
    }),
    modelEffects: ModelEffects,
    frequencyHz: Type.Number(),
    periodS: Type.Number(),
    dutyCycle: Type.Number({ description: 'Fraction of the period the output is high, between 50 % crossings' }),
    timeHighS: Type.Number(),
    timeLowS: Type.Number(),
    firstEdgeS: Type.Number({ description: 'From power-up with the capacitor empty to the first output edge, s' }),
    thresholds: Type.Object({ upperV: Type.Number(), lowerV: Type.Number(), hysteresisV: Type.Number() }, { additionalProperties: false }),
    output: Type.Object(
      {
        highV: Type.Number({ description: 'High state level as a scope shows it (IEEE Std 181-2011): the level the output settles to, V' }),
        lowV: Type.Number({ description: 'Low state level as a scope shows it (IEEE Std 181-2011), V' }),
        swingV: Type.Number({ description: 'highV − lowV, V' }),
        meanHighV: Type.Number({ description: 'Time-mean of the output over the high drive interval (recovery delay and slew included), V' }),
        meanLowV: Type.Number({ description: 'Time-mean of the output over the low drive interval, V' }),
      },
      { additionalProperties: false },
    ),
    transitions: Type.Object(
      {
        riseTimeS: Type.Number({ description: 'Output 10–90 % rise time (IEEE Std 181-2011 reference levels), s (0: instant edge)' }),
        fallTimeS: Type.Number({ description: 'Output 90–10 % fall time, s' }),
      },
      { additionalProperties: false },
    ),
    capacitor: Type.Object(
      {
        minV: Type.Number(),
        maxV: Type.Number(),
        effectiveCapacitanceF: Type.Optional(
          Type.Number({ description: 'With a voltage-dependent (class II/III) capacitor: ΔQ/ΔV over minV…maxV, the capacitance the timing effectively sees, F' }),
        ),
        capacitanceCurve: Type.Optional(
          Type.Array(
            Type.Object({ voltageV: Type.Number(), capacitanceF: Type.Number() }, { additionalProperties: false }),
            { description: 'The C(V) curve the model used, sampled over minV…maxV' },
          ),
        ),
      },
      { additionalProperties: false },
    ),
    states: Type.Object({ high: StateSummary, low: StateSummary }, { additionalProperties: false }),
    powerUp: Type.Object(
      {
        initialState: StringEnum(['high', 'low']),
        determinate: Type.Boolean({ description: 'False when both states are consistent at power-up (then high is assumed)' }),
      },
      { additionalProperties: false },
    ),
    currents: Type.Object(
      {
        outputPeakSourceA: Type.Number(),
        outputPeakSinkA: Type.Number(),
        supplyAverageA: Type.Number({ description: 'Mean current from the positive rail incl. quiescent current, A' }),
        supplyPeakA: Type.Number(),
      },
      { additionalProperties: false },
    ),
    inputs: Type.Object(
      {
        nonInvertingMinV: Type.Number(),
        nonInvertingMaxV: Type.Number(),
        invertingMinV: Type.Number(),
        invertingMaxV: Type.Number(),
        differentialMaxV: Type.Number(),
      },
      { additionalProperties: false },
    ),
    biasThresholdShiftV: Type.Number({ description: 'Threshold shift from input bias current, V' }),
    edges: Type.Optional(
      Type.Object(
        {
          riseSettleS: Type.Number({
            description: 'From the comparator decision to the output settled high (recovery delay + full-swing slew), s; not the 10–90 % rise time',
          }),
          fallSettleS: Type.Number({ description: 'From the comparator decision to the output settled low, s' }),
        },
        { additionalProperties: false, description: 'Edge durations: measured by the time-domain engine, estimated from delay + swing/slew rate otherwise' },
      ),
    ),
    currentLimit: Type.Optional(
      Type.Object(
        {
          limitedFraction: Type.Number({ description: 'Share of the period the output spends in current limit (0..1)' }),
          demandPeakA: Type.Number({ description: 'Largest current the network would have drawn from the voltage drive while limited, A' }),
        },
        { additionalProperties: false, description: 'Present when the time-domain engine saw the output run into its current limit' },
      ),
    ),
    frequencyCeilingHz: Type.Optional(
      NullableNumber({
        description: 'Highest frequency at which both edges stay within edgeFractionLimit of the period, Hz (null: instant edges)',
      }),
    ),
    edgeFractionLimit: Type.Optional(Type.Number({ description: 'Share of the period an edge may take before the slew-limited check fires' })),
    checks: Type.Array(ref(Check)),
  },
  { $id: 'Analysis', additionalProperties: false },
);
