/** Response schema of POST /v1/analyze. */
import { Type } from 'typebox';
import { Check, NullableNumber, ref, StringEnum } from './common.ts';

/** The amplifier effects an answer's model included (docs/model.md §3). */
export const ModelEffects = Type.Array(StringEnum(['slew-rate', 'recovery-delay', 'current-limit', 'input-clamp']), {
  description: 'Amplifier effects included in the model that produced this answer (empty: the closed-form special case)',
});

const stateSummary = (description: string) => Type.Object(
  {
    tauS: Type.Number({ description: 'Capacitor time constant in this state, s' }),
    asymptoteV: Type.Number({ description: 'Capacitor voltage the state heads for, V' }),
    switchingV: Type.Number({ description: 'Capacitor voltage at which the output leaves the state, V' }),
    sourceV: NullableNumber({ description: 'Output-stage source level, V (null: not driven)' }),
    dwellS: Type.Number({ description: 'Time spent in the state, s' }),
  },
  { additionalProperties: false, description },
);

export const AmplifierSummary = Type.Object(
  {
    id: Type.String({ description: 'Id of the archetype or registered amplifier; "inline" when the request gave figures inline (with or without a base)' }),
    name: Type.String({ description: 'Display name: the archetype or registration name, or the inline `name`' }),
    figuresBasis: Type.String({
      description: 'Where the figures come from: ideal (the textbook part), class-typical (a built-in archetype, not a datasheet) or caller-supplied (inline or registered)',
    }),
  },
  { additionalProperties: false, description: 'The amplifier the answer was computed with' },
);

export const Analysis = Type.Object(
  {
    topology: Type.String({ description: 'Topology id of the analysed circuit (the current id even when the request used a deprecated alias)' }),
    amplifier: AmplifierSummary,
    model: StringEnum(['closed-form', 'time-domain'], {
      description: "Which model answered: the walk of exactly solved pieces; 'closed-form' is its special case with no amplifier effect active (one exponential per state)",
    }),
    modelEffects: ModelEffects,
    frequencyHz: Type.Number({ description: 'Steady-state oscillation frequency, Hz (1 / periodS)' }),
    periodS: Type.Number({ description: 'Steady-state period, s: timeHighS + timeLowS' }),
    dutyCycle: Type.Number({ description: 'Fraction of the period the output is high, between 50 % crossings' }),
    timeHighS: Type.Number({ description: 'Time the output spends above its 50 % level in one period, s' }),
    timeLowS: Type.Number({ description: 'Time the output spends below its 50 % level in one period, s' }),
    firstEdgeS: Type.Number({ description: 'From power-up with the capacitor empty to the first output edge, s' }),
    thresholds: Type.Object(
      {
        upperV: Type.Number({ description: 'Capacitor voltage at which a high output switches low, V (the decision node while the output is high)' }),
        lowerV: Type.Number({ description: 'Capacitor voltage at which a low output switches high, V' }),
        hysteresisV: Type.Number({ description: 'upperV − lowerV, V: the swing the capacitor makes between decisions (before overshoot)' }),
      },
      { additionalProperties: false, description: 'Switching thresholds as capacitor voltages, bias-current shift included' },
    ),
    output: Type.Object(
      {
        highV: Type.Number({ description: 'High state level as a scope shows it (IEEE Std 181-2011): the level the output settles to, V' }),
        lowV: Type.Number({ description: 'Low state level as a scope shows it (IEEE Std 181-2011), V' }),
        swingV: Type.Number({ description: 'highV − lowV, V' }),
        meanHighV: Type.Number({ description: 'Time-mean of the output over the high drive interval (recovery delay and slew included), V' }),
        meanLowV: Type.Number({ description: 'Time-mean of the output over the low drive interval, V' }),
      },
      { additionalProperties: false, description: 'Output pin levels in steady state' },
    ),
    transitions: Type.Object(
      {
        riseTimeS: Type.Number({ description: 'Output 10–90 % rise time (IEEE Std 181-2011 reference levels), s (0: instant edge)' }),
        fallTimeS: Type.Number({ description: 'Output 90–10 % fall time, s (0: instant edge)' }),
      },
      { additionalProperties: false, description: 'Output edge durations between the IEEE Std 181 10 % and 90 % reference levels' },
    ),
    capacitor: Type.Object(
      {
        minV: Type.Number({ description: 'Lowest timing-capacitor voltage over the steady cycle, V (below lowerV when delay or slew lets it overshoot)' }),
        maxV: Type.Number({ description: 'Highest timing-capacitor voltage over the steady cycle, V (above upperV on overshoot)' }),
        effectiveCapacitanceF: Type.Optional(
          Type.Number({ description: 'With a voltage-dependent (class II/III) capacitor: ΔQ/ΔV over minV…maxV, the capacitance the timing effectively sees, F' }),
        ),
        capacitanceCurve: Type.Optional(
          Type.Array(
            Type.Object(
              {
                voltageV: Type.Number({ description: 'Capacitor voltage of this point, V' }),
                capacitanceF: Type.Number({ description: 'Small-signal capacitance the model used at that voltage, F' }),
              },
              { additionalProperties: false },
            ),
            { description: 'The C(V) curve the model used, sampled over minV…maxV' },
          ),
        ),
      },
      { additionalProperties: false, description: 'The timing capacitor over the steady cycle' },
    ),
    states: Type.Object(
      {
        high: stateSummary('While the output is high and the capacitor charges toward it'),
        low: stateSummary('While the output is low and the capacitor discharges toward it'),
      },
      { additionalProperties: false, description: 'The two output states as the model solved them (one exponential each in the closed form)' },
    ),
    powerUp: Type.Object(
      {
        initialState: StringEnum(['high', 'low'], { description: 'Output state right after power-up with the capacitor empty' }),
        determinate: Type.Boolean({ description: 'False when both states are consistent at power-up (then high is assumed)' }),
      },
      { additionalProperties: false, description: 'How the circuit starts from power-up with the capacitor empty' },
    ),
    currents: Type.Object(
      {
        outputPeakSourceA: Type.Number({ description: 'Largest current the output sources into the networks and load over the cycle, A (compare with the output current limit)' }),
        outputPeakSinkA: Type.Number({ description: 'Largest current the output sinks from the networks and load over the cycle, A' }),
        supplyAverageA: Type.Number({ description: 'Mean current from the positive rail incl. quiescent current, A' }),
        supplyPeakA: Type.Number({ description: 'Peak current from the positive rail over the cycle (networks, output stage, quiescent), A' }),
      },
      { additionalProperties: false, description: 'Currents over the steady cycle, magnitudes in A' },
    ),
    inputs: Type.Object(
      {
        nonInvertingMinV: Type.Number({ description: 'Lowest voltage at the non-inverting input (decision node P) over the cycle, V' }),
        nonInvertingMaxV: Type.Number({ description: 'Highest voltage at the non-inverting input over the cycle, V' }),
        invertingMinV: Type.Number({ description: 'Lowest voltage at the inverting input (the capacitor node N) over the cycle, V' }),
        invertingMaxV: Type.Number({ description: 'Highest voltage at the inverting input over the cycle, V' }),
        differentialMaxV: Type.Number({ description: 'Largest |P − N| over the cycle, V (compare with the amplifier\'s differential input limit)' }),
      },
      { additionalProperties: false, description: 'Input voltages over the cycle, for the common-mode and differential checks' },
    ),
    biasThresholdShiftV: Type.Number({ description: 'Threshold shift from input bias current, V' }),
    edges: Type.Optional(
      Type.Object(
        {
          riseSettleS: Type.Number({
            description:
              'From the comparator decision to the output settled high (recovery delay + full-swing slew; with capacitance on the output pin, until the pin reaches the 90 % level of its rise: e.g. an open drain charging it through the pull-up), s; not the 10–90 % rise time',
          }),
          fallSettleS: Type.Number({ description: 'From the comparator decision to the output settled low (with capacitance on the output pin, until the pin reaches the 10 % level of its fall), s' }),
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
    checks: Type.Array(ref(Check), { description: 'Design checks on the analysed circuit (empty: nothing to report); an error-severity check means the circuit will not work as intended' }),
  },
  { $id: 'Analysis', additionalProperties: false, description: 'Steady-state figures of one circuit, with the design checks' },
);
