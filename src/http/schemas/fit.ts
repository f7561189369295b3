/** Request and response schemas of POST /v1/fit (measurement fitting and diagnosis). */
import { Type, type Static } from 'typebox';
import { OBSERVABLES } from '../../core/fit/index.ts';
import { Circuit } from './circuit.ts';
import { ref } from './common.ts';

const MEASUREMENT_WORDS: Record<(typeof OBSERVABLES)[number], string> = {
  frequencyHz: 'Oscillation frequency, Hz (default uncertainty 0.1 %)',
  dutyCycle: 'Output-high share of the period between 50 % crossings, 0..1 (default uncertainty 0.005)',
  capacitorMinV: 'Lowest capacitor voltage (its turning point, overshoot included), V (default 1 % + 20 mV)',
  capacitorMaxV: 'Highest capacitor voltage (its turning point, overshoot included), V (default 1 % + 20 mV)',
  outputHighV: 'Settled output high level, V (default 1 % + 20 mV)',
  outputLowV: 'Settled output low level, V (default 1 % + 20 mV)',
  riseTimeS: '10–90 % rise time of the output, s (default 5 %)',
  fallTimeS: '90–10 % fall time of the output, s (default 5 %)',
  capacitorRisingTauS: 'Time constant of the charging capacitor, s (default 5 %)',
  capacitorFallingTauS: 'Time constant of the discharging capacitor, s (default 5 %)',
  capacitorAboveMidShare: 'Share of the period the capacitor spends above the middle of its range, 0..1 (default uncertainty 0.005)',
};

export const ScalarMeasurement = Type.Union(
  [
    Type.Number({ description: 'The value; its uncertainty is the default for this figure' }),
    Type.Object(
      {
        value: Type.Number({ description: 'The measured value, in the unit the figure\'s name states' }),
        uncertainty: Type.Optional(Type.Number({ exclusiveMinimum: 0, description: 'Standard uncertainty (1σ), same unit as the value (absent: the figure\'s default)' })),
      },
      { additionalProperties: false },
    ),
  ],
  { $id: 'ScalarMeasurement', description: 'A measured figure: a number, or {value, uncertainty} with its standard uncertainty (1σ)' },
);

export const FitMeasurements = Type.Object(
  Object.fromEntries(OBSERVABLES.map((name) => [name, Type.Optional(ref(ScalarMeasurement, MEASUREMENT_WORDS[name]))])),
  { $id: 'FitMeasurements', additionalProperties: false, description: 'Scalar figures read off a scope, each with its uncertainty' },
);

/**
 * Sample arrays: `type: ['number', 'null']` is one type test per item for ajv
 * (measured: a few ms per million samples), unlike an anyOf. JSON cannot carry
 * NaN, so null stands for a sample the scope could not give; the capture
 * analysis rejects it with 422 naming the index.
 */
const Samples = (description: string) =>
  Type.Optional(Type.Unsafe<(number | null)[]>({ type: 'array', items: { type: ['number', 'null'] }, description }));

export const FitCapture = Type.Object(
  {
    sampleIntervalS: Type.Optional(Type.Number({ minimum: 1e-15, maximum: 1e3, description: 'Sample interval, s, from 1 fs to 1000 s (or give timeS)' })),
    timeS: Samples('Sample instants, s, strictly increasing (wins over sampleIntervalS)'),
    output: Samples('Amplifier output channel, V (null = missing sample, rejected with 422)'),
    capacitor: Samples('Timing-capacitor channel, V (null = missing sample, rejected with 422)'),
    csv: Type.Optional(
      Type.String({
        description:
          'A scope CSV export as text, instead of the arrays: header/metadata lines, a time column (or a sample-interval entry) and channel columns, units in the header ("Time (us)", "CH1 [mV]" or a units row); tab, semicolon or comma separated, decimal commas accepted. The same text can be sent as a text/csv body, see the operation description.',
      }),
    ),
    outputChannel: Type.Optional(Type.String({ maxLength: 120, description: 'CSV column name of the output channel (default: by name hints, then CH1)' })),
    capacitorChannel: Type.Optional(Type.String({ maxLength: 120, description: 'CSV column name of the capacitor channel (default: by name hints, then CH2)' })),
    verticalUncertainty: Type.Optional(
      Type.Number({ exclusiveMinimum: 0, maximum: 0.5, description: 'Vertical accuracy, fraction: σ = f·|reading| ⊕ f·swing ⊕ half an ADC step (default 0.005)' }),
    ),
    timebaseUncertainty: Type.Optional(Type.Number({ exclusiveMinimum: 0, maximum: 0.1, description: 'Time-base accuracy, fraction (default 5e-5)' })),
  },
  { $id: 'FitCapture', additionalProperties: false, description: 'A scope capture: one or two channels as arrays with a sample interval or time column, or a CSV export' },
);

export const Tolerances = Type.Record(Type.String({ pattern: '^[A-Za-z][A-Za-z0-9]*$' }), Type.Number({ minimum: 1e-4, exclusiveMaximum: 1 }), {
  $id: 'Tolerances',
  description: 'Part tolerances by role as fractions from 1e-4 (0.01 %) to below 1 (0.05 = 5 %); defaults 1 % for resistors and 10 % for capacitors. Read as ±3σ.',
});

export const FitRequest = Type.Object(
  {
    circuit: ref(Circuit, 'The circuit as designed (nominal values), as a POST /v1/analyze body'),
    tolerances: Type.Optional(ref(Tolerances, 'How far each part may be from nominal before it counts as off (absent: 1 % resistors, 10 % capacitors)')),
    measurements: Type.Optional(ref(FitMeasurements, 'Figures read off the bench; give these, a capture, or both')),
    capture: Type.Optional(ref(FitCapture, 'Sampled scope channels the figures are read from (IEEE Std 181); give this, measurements, or both')),
    diagnosis: Type.Optional(
      Type.Object(
        {
          maxCauses: Type.Optional(Type.Union([Type.Literal(1), Type.Literal(2)], { description: 'Explanations with up to this many causes (default 2)' })),
          maxExplanations: Type.Optional(Type.Integer({ minimum: 1, maximum: 50, description: 'How many ranked explanations to return (default 8)' })),
        },
        { additionalProperties: false, description: 'How many explanations to rank and how complex they may be (absent: the defaults)' },
      ),
    ),
  },
  { $id: 'FitRequest', additionalProperties: false, description: 'A circuit and what was measured on the built board' },
);
export type FitRequestBody = Static<typeof FitRequest>;

export const FitCsvQuery = Type.Object(
  {
    circuit: Type.Optional(Type.String({ description: 'text/csv bodies only (required then): the circuit as URL-encoded JSON, the same object as an /v1/analyze body' })),
    tolerances: Type.Optional(Type.String({ description: 'text/csv bodies only: tolerances as URL-encoded JSON' })),
    measurements: Type.Optional(Type.String({ description: 'text/csv bodies only: scalar measurements as URL-encoded JSON, combined with the capture' })),
    outputChannel: Type.Optional(Type.String({ maxLength: 120, description: 'text/csv bodies only: CSV column of the output channel' })),
    capacitorChannel: Type.Optional(Type.String({ maxLength: 120, description: 'text/csv bodies only: CSV column of the capacitor channel' })),
    sampleIntervalS: Type.Optional(Type.String({ pattern: '^[0-9.eE+-]+$', description: 'text/csv bodies only: sample interval, s, when the file has neither a time column nor an interval entry' })),
    maxCauses: Type.Optional(Type.Union([Type.Literal('1'), Type.Literal('2')], { description: 'text/csv bodies only: as diagnosis.maxCauses' })),
  },
  { additionalProperties: false },
);
export type FitCsvQueryString = Static<typeof FitCsvQuery>;

// ---- response ----

const NumberOrNull = (description?: string) => Type.Union([Type.Number(), Type.Null()], description ? { description } : {});
const num = (description?: string) => Type.Number(description ? { description } : {});

const figures = (description: string) =>
  Type.Object(
    {
      frequencyHz: num('Oscillation frequency, Hz'),
      periodS: num('Period, s'),
      dutyCycle: num('Fraction of the period the output is high, between 50 % crossings'),
      capacitorMinV: num('Lowest capacitor voltage (its turning point), V'),
      capacitorMaxV: num('Highest capacitor voltage (its turning point), V'),
      outputHighV: num('Settled output high level, V'),
      outputLowV: num('Settled output low level, V'),
      riseTimeS: num('Output 10–90 % rise time, s'),
      fallTimeS: num('Output 90–10 % fall time, s'),
      capacitorRisingTauS: num('Time constant of the charging capacitor, s'),
      capacitorFallingTauS: num('Time constant of the discharging capacitor, s'),
      capacitorAboveMidShare: num('Share of the period the capacitor spends above the middle of its range'),
      upperThresholdV: num('Switching level at node P while the output is high, V'),
      lowerThresholdV: num('Switching level at node P while the output is low, V'),
      hysteresisRatio: num('(upper − lower threshold)/(output high − low)'),
    },
    { additionalProperties: false, description },
  );

const ObservableName = (description: string) => Type.Union(OBSERVABLES.map((n) => Type.Literal(n)), { description });

const MeasurementReport = Type.Object(
  {
    name: ObservableName('The measured figure (a key of `measurements`)'),
    value: num('The measured value, in the unit the name states'),
    uncertainty: num('Standard uncertainty used, same unit'),
    source: Type.Union([Type.Literal('scalar'), Type.Literal('capture')], { description: 'scalar: from `measurements`; capture: read off the capture' }),
    nominal: num('What the nominal circuit predicts'),
    fitted: num('What the fitted circuit predicts'),
    nominalResidual: num('(nominal − measured)/uncertainty'),
    fittedResidual: num('(fitted − measured)/uncertainty'),
  },
  { additionalProperties: false, description: 'One measured figure beside what the nominal and the fitted circuit predict' },
);

const EstimateProperties = {
  parameter: Type.String({
    description:
      'Part role (from the topology), amplifier effect (outputHighV, outputLowV, slewRateVPerS, recoveryDelayS, outputResistanceOhm, inputOffsetV, inputBiasCurrentA), supplyScale, ' +
      'or a stray that the circuit does not declare (strayTimingNodeF, leakageTimingNodeOhm at the timing node N, strayThresholdNodeF at the threshold node P, strayOutputNodeF at the output pin; diagnosis causes only)',
  }),
  kind: Type.Union([Type.Literal('part'), Type.Literal('amplifier'), Type.Literal('supply'), Type.Literal('stray')], {
    description:
      'part: a passive part of the topology; amplifier: an amplifier figure; supply: the common scale of the rails; ' +
      'stray: a capacitance (0.1–220 pF) or leakage (100 kΩ–100 GΩ) at the timing node N, a capacitance at the threshold node P (0.1–220 pF) or at the output pin (0.1 pF–2.2 nF), beyond what circuit.strays declares (diagnosis causes only)',
  }),
  unit: Type.Union([Type.Literal('ohm'), Type.Literal('F'), Type.Literal('V'), Type.Literal('V/s'), Type.Literal('s'), Type.Literal('A'), Type.Literal('1')], {
    description: 'Unit of nominal, estimate, the standard deviations and shift ("1": dimensionless)',
  }),
  nominal: NumberOrNull('Nominal value (null: no limit, e.g. an instant slew rate)'),
  estimate: NumberOrNull('MAP estimate (null: no limit)'),
  standardDeviation: NumberOrNull('Posterior standard deviation, first order (null: unbounded)'),
  priorStandardDeviation: NumberOrNull('Prior standard deviation at nominal'),
  tolerance: Type.Optional(num('Part tolerance, fraction')),
  shift: num('estimate − nominal (slew rate: in its reciprocal, s/V; a leakage where none is declared: its conductance, S)'),
  relativeShift: Type.Optional(num('estimate/nominal − 1 (parts)')),
  shiftInTolerances: num('Shift over the tolerance (parts) or over the 3σ prior spread (amplifier effects)'),
  posteriorToPriorSd: num('Posterior over prior width; near 1: the data say nothing about this parameter'),
};

export const ParameterEstimate = Type.Object(EstimateProperties, {
  $id: 'ParameterEstimate',
  additionalProperties: false,
  description: 'What the measurements say about one effective parameter',
});

const Cause = Type.Object(
  {
    ...EstimateProperties,
    withinTolerance: Type.Boolean({ description: 'The fitted shift stays inside the part\'s tolerance (or the 3σ prior spread of an amplifier effect)' }),
    fault: Type.Union([Type.Literal('off'), Type.Literal('neighbouring-value'), Type.Literal('decade-slip'), Type.Literal('swapped'), Type.Literal('other-dielectric'), Type.Literal('stray')], {
      description:
        'off: the effect departs from nominal (fitted within its physical range); stray: a capacitance or leakage at the timing node N, or a capacitance at the threshold node P or at the output pin, that the circuit does not declare (fitted within its window); ' +
        'the others: a wrong part fitted — the neighbouring series value, a decade slip, two roles swapped, ' +
        'or a timing capacitor of another dielectric class (a class II ceramic in place of a flat part, its DC-bias C(V) fitted on the class-typical law within the span class II and III parts cover, or the reverse; its marked value within a class II tolerance)',
    }),
    text: Type.String({ description: 'e.g. "cTiming +8.9 % (4.7 nF -> 5.12 nF), inside its 10 % tolerance"' }),
  },
  { additionalProperties: false, description: 'One cause of an explanation, with its fitted value' },
);

const Explanation = Type.Object(
  {
    rank: Type.Integer({ minimum: 1, description: 'Position in the ranking, 1 = most plausible' }),
    hypothesis: Type.String({ description: 'Stable id of the hypothesis, e.g. off:rTiming, decade-slip:cTiming×10, swapped:rTop/rBottom, stray:timingNodeF, stray:outputNodeF' }),
    causes: Type.Array(Cause, { minItems: 1, maxItems: 2, description: 'The one or two effects this explanation blames' }),
    score: num('Posterior probability among the nominal circuit and the explanations listed (they sum to one with verdict.nominalScore)'),
    logEvidence: num('Laplace-approximated log evidence times prior'),
    residualChiSquare: num('χ² of the measurements this explanation leaves, the other effects allowed their tolerances'),
    measurementCount: Type.Integer({ description: 'Measurements the χ² figures count' }),
    accountsForMeasurements: Type.Boolean({ description: 'Residual χ² within its 95 % bound' }),
    passesGoodnessOfFit: Type.Boolean({ description: 'Residual χ² within its 1e-3 bound; one that fails never outranks one that passes' }),
    residuals: Type.Array(
      Type.Object(
        {
          measurement: ObservableName('The measured figure'),
          measured: num('The measured value, in the unit the name states'),
          predicted: num('What this explanation predicts for it'),
          uncertainty: num('Standard uncertainty used, same unit'),
          normalized: num('(predicted − measured)/uncertainty'),
        },
        { additionalProperties: false },
      ),
      { description: 'How well the explanation reproduces each measurement' },
    ),
    summary: Type.String({ description: 'The explanation in one sentence with its figures' }),
  },
  { $id: 'FitExplanation', additionalProperties: false, description: 'A ranked hypothesis of what is off on the board' },
);

const CaptureFeatures = Type.Object(
  {
    timingSource: Type.Union([Type.Literal('output'), Type.Literal('capacitor')], { description: 'The channel the period, duty cycle and edges were read from (output when it is there)' }),
    frequencyHz: num('1 / periodS, Hz'),
    periodS: num('Mean of the whole periods in the record, s'),
    periodJitterS: num('Standard deviation of the periods, s'),
    periodMinS: num('Shortest whole period in the record, s'),
    periodMaxS: num('Longest whole period in the record, s'),
    periodCount: Type.Integer({ description: 'Whole periods in the record' }),
    dutyCycle: Type.Optional(num('Output-high share of the period between 50 % crossings (output channel only)')),
    outputHighV: Type.Optional(num('Settled output level (IEEE Std 181 histogram levels refined over the settled parts of the states), V')),
    outputLowV: Type.Optional(num('Settled output low level, read like outputHighV, V (output channel only)')),
    riseTimeS: Type.Optional(num('Mean 10–90 % transition duration, s')),
    fallTimeS: Type.Optional(num('Mean 90–10 % transition duration of the falling edges, s (output channel only)')),
    edgeCount: Type.Optional(Type.Integer({ description: 'Output transitions (or capacitor turning points when timing comes from the capacitor) found' })),
    capacitorMinV: Type.Optional(num('Capacitor low turning points (local fits on both sides), averaged, V (capacitor channel only)')),
    capacitorMaxV: Type.Optional(num('Capacitor high turning points, averaged, V (capacitor channel only)')),
    risingTauS: Type.Optional(num('Windowed time constant of the charging segments, s')),
    fallingTauS: Type.Optional(num('Windowed time constant of the discharging segments, s')),
    capacitorAboveMidShare: Type.Optional(num('Share of the period the capacitor spends above the middle of its range')),
    turningPointCount: Type.Optional(Type.Integer({ description: 'Capacitor turning points found (capacitor channel only)' })),
    sampleCount: Type.Integer({ description: 'Samples in the record' }),
    sampleIntervalS: num('Mean sample spacing, s'),
    durationS: num('Length of the record, s'),
  },
  { additionalProperties: false, description: 'Figures read off the capture (absent ones: the channel they need was not given)' },
);

export const FitResult = Type.Object(
  {
    forwardModel: Type.String({ description: 'What predicts the figures during the fit' }),
    nominal: figures('What the forward model predicts with every parameter at nominal'),
    fitted: figures('What the forward model predicts with every parameter at its estimate'),
    measurements: Type.Array(MeasurementReport, { description: 'Every measurement the fit used, from `measurements` and the capture' }),
    capture: Type.Optional(
      Type.Object(
        {
          features: CaptureFeatures,
          notes: Type.Array(Type.String(), { description: 'How the capture was read (which column is which channel, and why)' }),
          warnings: Type.Array(Type.String(), { description: 'What may make the readings less trustworthy (clipping, few periods, noise)' }),
        },
        { additionalProperties: false, description: 'What the capture analysis (IEEE Std 181 levels, crossings, segment fits) found' },
      ),
    ),
    estimates: Type.Array(ref(ParameterEstimate), { description: 'MAP estimates of every effective parameter, with priors from the nominal values and tolerances' }),
    hysteresisRatio: Type.Object(
      {
        nominal: num('Hysteresis ratio of the nominal circuit'),
        estimate: num('Hysteresis ratio at the estimate'),
        standardDeviation: num('Posterior standard deviation of the ratio, first order'),
      },
      { additionalProperties: false, description: 'Derived, identifiable: (upper − lower threshold)/(output swing)' },
    ),
    indistinguishable: Type.Array(
      Type.Object(
        {
          parameters: Type.Array(Type.String(), { minItems: 2, maxItems: 2, description: 'The two parameters, as named in `estimates`' }),
          correlation: num('Posterior correlation'),
          sensitivityAlignment: num('Cosine between the data sensitivities of the two: ±1 = the measurements respond to both alike'),
          distinguishingSigma: num('What the measurements could see of the difference between the two across a tolerance band, in σ (< 1: nothing)'),
          note: Type.String({ description: 'What this means for the diagnosis, in words' }),
        },
        { additionalProperties: false },
      ),
      { description: 'Pairs the data cannot tell apart: whatever one does across its tolerance band, the other mimics to within the measurement uncertainty' },
    ),
    uninformed: Type.Array(Type.String(), { description: 'Parameters the data add (almost) nothing to: posterior width over 0.9 of the prior' }),
    correlation: Type.Object(
      {
        parameters: Type.Array(Type.String(), { description: 'Row and column order of the matrix, as named in `estimates`' }),
        matrix: Type.Array(Type.Array(num()), { description: 'Correlation coefficients, −1..1, one row per parameter; the diagonal is 1' }),
      },
      { additionalProperties: false, description: 'Posterior correlation matrix' },
    ),
    fit: Type.Object(
      {
        chiSquare: num('Data χ² at the estimate'),
        priorChiSquare: num('Prior penalty at the estimate: Σ((estimate − nominal)/prior σ)², in the parameters\' fit spaces'),
        measurementCount: Type.Integer({ description: 'Measurements fitted' }),
        iterations: Type.Integer({ description: 'Levenberg–Marquardt iterations taken' }),
        converged: Type.Boolean({ description: 'false: the fit stopped without meeting its convergence test (a warning says so); treat the estimates with care' }),
      },
      { additionalProperties: false, description: 'How the MAP fit went' },
    ),
    verdict: Type.Object(
      {
        agreesWithNominal: Type.Boolean({ description: 'true: the nominal circuit, its parts within tolerance, explains the measurements best and passes the χ² test' }),
        nominalChiSquare: num('χ² with every part at its nominal value'),
        toleranceChiSquare: num('χ² allowing every effect its tolerance or class spread (what the verdict tests)'),
        measurementCount: Type.Integer({ description: 'Measurements the χ² figures count' }),
        chiSquareBound95: num('95 % χ² bound (Wilson–Hilferty)'),
        nominalScore: num('Posterior probability that nothing is off'),
        statement: Type.String({ description: 'The verdict in words with its figures, naming the most plausible explanation when the board departs from nominal' }),
      },
      { additionalProperties: false, description: 'Does the board behave as designed?' },
    ),
    explanations: Type.Array(ref(Explanation), { description: 'Ranked one- and two-cause explanations, wrong parts included' }),
    ambiguities: Type.Array(
      Type.Object(
        {
          hypotheses: Type.Array(Type.String(), { description: 'Hypothesis ids the measurements cannot tell apart, the leading one first' }),
          measuredSeparationSigma: num('Largest difference of their predictions on the measured figures, in σ'),
          statement: Type.String({ description: 'The ambiguity and what would settle it, in words' }),
          separatingMeasurement: Type.Optional(
            Type.Object(
              {
                action: Type.String({ description: 'What to do on the bench, in words' }),
                figure: Type.String({ description: 'The figure that would separate them: an observable, a switching level, or the frequency after a part swap' }),
                predictions: Type.Array(
                  Type.Object(
                    {
                      hypothesis: Type.String({ description: 'Hypothesis id' }),
                      value: num('What that hypothesis predicts for the figure, in its unit'),
                    },
                    { additionalProperties: false },
                  ),
                  { description: 'What each hypothesis predicts for the figure' },
                ),
                separationSigma: num('Difference of the predictions over a typical bench uncertainty of that figure'),
              },
              { additionalProperties: false, description: 'A measurement that would tell them apart (absent: none found)' },
            ),
          ),
        },
        { additionalProperties: false },
      ),
      { description: 'Leading hypotheses the measurements cannot tell apart, and the measurement that would (computed from their predictions)' },
    ),
    candidateCount: Type.Integer({ description: 'Hypotheses scored' }),
    warnings: Type.Array(Type.String(), { description: 'What limits the answer (non-convergence, weak data, a model limit), in words' }),
  },
  { $id: 'FitResult', additionalProperties: false, description: 'Parameter estimates and a ranked diagnosis of the built board' },
);

export const FIT_SCHEMAS = [ScalarMeasurement, FitMeasurements, FitCapture, Tolerances, FitRequest, ParameterEstimate, Explanation, FitResult];
