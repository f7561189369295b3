/** Request and response of POST /v1/tolerance. */
import { ModelEffects } from './analysis.ts';
import { Type, type Static } from 'typebox';
import { TOPOLOGIES } from '../../core/index.ts';
import { AMPLIFIER_SPREAD_FIELDS, MAX_EXHAUSTIVE_DIMENSIONS, MAX_HISTOGRAM_BINS, SERVICE_LIFE_LIMIT_YEARS } from '../../core/tolerance/index.ts';
import { Circuit } from './circuit.ts';
import { FrequencyHz, ref } from './common.ts';

const Fraction = (description: string) => Type.Number({ minimum: 0, exclusiveMaximum: 1, description });

const ROLES = [...new Set(TOPOLOGIES.flatMap((t) => Object.keys(t.roles)))];

function byRole<T extends Parameters<typeof Type.Optional>[0]>(schema: (role: string) => T) {
  return Object.fromEntries(ROLES.map((role) => [role, Type.Optional(schema(role))]));
}

export const TemperatureCoefficient = Type.Union(
  [
    Type.Object(
      {
        tempcoPpmPerK: Type.Number({ description: 'Linear temperature coefficient, ppm/K (value × (1 + α·(T − 25 °C)))' }),
        tempcoTolerancePpmPerK: Type.Optional(Type.Number({ minimum: 0, description: 'Spread of the coefficient, ± ppm/K (uniform)' })),
      },
      { additionalProperties: false },
    ),
    Type.Object(
      {
        dielectric: Type.String({
          minLength: 1,
          maxLength: 40,
          description:
            'Capacitor dielectric: an EIA-198 code (class I such as C0G or U2J: linear tempco ± its tolerance; class II/III such as X7R, X5R, Y5V: the code\'s change band, taken as uniform within the band at every temperature of the range) or a technology word (PP, PET, PPS, mica...)',
        }),
      },
      { additionalProperties: false },
    ),
  ],
  { $id: 'TemperatureCoefficient', description: 'A part\'s temperature behaviour' },
);

export const ToleranceRequest = Type.Object(
  {
    circuit: ref(Circuit, 'The nominal circuit, as a POST /v1/analyze body'),
    tolerances: Type.Object(byRole(() => Fraction('Tolerance of this part, fraction (0.01 = 1 %)')), {
      additionalProperties: false,
      description: 'Per-part tolerance by role, fraction. Parts not listed are exact, except a timing capacitor given as a part object with a tolerance (that tolerance is used).',
    }),
    temperatureCoefficients: Type.Optional(
      Type.Object(
        byRole((role) => ref(TemperatureCoefficient, `Temperature behaviour of ${role} over \`temperature\` (absent: its value does not change with temperature)`)),
        { additionalProperties: false, description: 'Temperature behaviour by role. A timing capacitor given as a part object with a dielectric and not listed here follows its dielectric.' },
      ),
    ),
    temperature: Type.Optional(
      Type.Object(
        {
          minC: Type.Number({ description: 'Lowest board temperature, °C' }),
          maxC: Type.Number({ description: 'Highest board temperature, °C' }),
        },
        { additionalProperties: false, description: 'Temperature range; Monte Carlo draws it uniformly, corners take its ends' },
      ),
    ),
    serviceLifeYears: Type.Optional(
      Type.Number({
        minimum: 0,
        maximum: SERVICE_LIFE_LIMIT_YEARS,
        description:
          'Years the board must keep its clock in spec (default 0: no ageing). A class II/III timing capacitor (dielectric from its part object, or from temperatureCoefficients) loses capacitance by the log-decade law C(t) = C(t0)·(1 − k·log10(t/t0)) from its ageHours to ageHours + years × 8766 h; corners take the start and the end of service, Monte Carlo a uniform age.',
      }),
    ),
    supplyTolerance: Type.Optional(Fraction('Supply spread, fraction: both rails scale by one shared draw unless supplyRailsIndependent')),
    supplyRailsIndependent: Type.Optional(Type.Boolean({ description: 'Draw each rail on its own (default false: one regulator, rails move together)' })),
    amplifierSpreads: Type.Optional(
      Type.Object(
        {
          ...Object.fromEntries(AMPLIFIER_SPREAD_FIELDS.map((f) => [f, Type.Optional(Fraction(`Spread of ${f}, fraction of its nominal value`))])),
          inputOffsetRangeV: Type.Optional(Type.Number({ minimum: 0, maximum: 1, description: 'Input offset anywhere within nominal ± this, V' })),
        },
        {
          additionalProperties: false,
          description: 'Amplifier figure spreads. Slew rate and delay matter only when the time-domain model answers; spreads of a figure that is 0 or unlimited have no effect.',
        },
      ),
    ),
    tracking: Type.Optional(
      Type.Array(
        Type.Object(
          {
            roles: Type.Array(Type.Union(ROLES.map((r) => Type.Literal(r))), { minItems: 2, maxItems: 8, description: 'Parts that move together (one resistor network)' }),
            tolerance: Type.Optional(Fraction('Spread of the shared draw (default: the largest tolerance of the members)')),
            residualTolerance: Type.Optional(Fraction('Independent spread of each member on top of the shared draw (default 0)')),
          },
          { additionalProperties: false },
        ),
        { maxItems: 8, description: 'Tracking groups: members share one random draw (their own tolerances then only set the default)' },
      ),
    ),
    monteCarlo: Type.Optional(
      Type.Object(
        {
          samples: Type.Integer({ minimum: 1, description: 'Samples (up to 1e6; 422 beyond). Also 422 limit-exceeded, before the bulk of the samples, when the time of the first samples projects the run past half the task deadline (slow circuits: a C(V) capacitor with strays costs ~2 ms an evaluation); figures.limit is the count that would fit' }),
          seed: Type.Optional(Type.Integer({ minimum: 0, maximum: Number.MAX_SAFE_INTEGER, description: 'Seed (default 1): the same seed gives the same result' })),
          distribution: Type.Optional(
            Type.Union([Type.Literal('uniform'), Type.Literal('normal')], {
              description: 'Of tolerances, supply and amplifier spreads (default normal). Normal is truncated at ± the tolerance.',
            }),
          ),
          sigmaPerTolerance: Type.Optional(
            Type.Number({ exclusiveMinimum: 0, maximum: 1, description: 'Normal only: σ as a fraction of the tolerance (default 1/3, tolerance = 3σ, common practice)' }),
          ),
        },
        { additionalProperties: false, description: 'Monte Carlo settings (default 10 000 samples, seed 1, normal)' },
      ),
    ),
    spec: Type.Optional(
      Type.Object(
        {
          frequencyHz: FrequencyHz('Target frequency, Hz'),
          frequencyTolerance: Fraction('Allowed deviation from frequencyHz, fraction'),
          dutyMin: Type.Optional(Type.Number({ minimum: 0, maximum: 1, description: 'Lowest allowed duty cycle, fraction of the period high (absent: no lower duty limit)' })),
          dutyMax: Type.Optional(Type.Number({ minimum: 0, maximum: 1, description: 'Highest allowed duty cycle, fraction of the period high (absent: no upper duty limit)' })),
        },
        { additionalProperties: false, description: 'Spec the yield is counted against' },
      ),
    ),
    histogramBins: Type.Optional(Type.Integer({ minimum: 1, maximum: MAX_HISTOGRAM_BINS, description: 'Bars of the SVG histogram (default 60)' })),
  },
  { $id: 'ToleranceRequest', additionalProperties: false, description: 'A circuit and how its parts, temperature, supply and amplifier may spread' },
);

export type ToleranceRequestBody = Static<typeof ToleranceRequest>;

const Summary = Type.Object(
  {
    p0_1: Type.Number({ description: '0.1th percentile, in the unit of the summarised figure (Hz, or a fraction for duty)' }),
    p1: Type.Number({ description: '1st percentile' }),
    p5: Type.Number({ description: '5th percentile' }),
    p50: Type.Number({ description: 'Median' }),
    p95: Type.Number({ description: '95th percentile' }),
    p99: Type.Number({ description: '99th percentile' }),
    p99_9: Type.Number({ description: '99.9th percentile' }),
    mean: Type.Number({ description: 'Arithmetic mean of the oscillating samples' }),
    std: Type.Number({ description: 'Sample standard deviation (n − 1)' }),
    min: Type.Number({ description: 'Smallest sample' }),
    max: Type.Number({ description: 'Largest sample' }),
  },
  { $id: 'DistributionSummary', additionalProperties: false, description: 'Percentiles (Hyndman & Fan definition 7), mean, std, extremes' },
);

const NumberMap = (description: string) => Type.Object({}, { additionalProperties: Type.Number(), description });

const Corner = Type.Object(
  {
    frequencyHz: Type.Number({ description: 'Frequency at this corner, Hz' }),
    dutyCycle: Type.Number({ description: 'Duty cycle at this corner, fraction of the period high' }),
    temperatureC: Type.Union([Type.Number(), Type.Null()], { description: 'Board temperature at this corner, °C (null: no temperature range given)' }),
    values: NumberMap('Value of every varied parameter at the corner, SI units'),
    deviations: NumberMap('Relative change of each varied parameter against nominal'),
  },
  { $id: 'ToleranceCorner', additionalProperties: false, description: 'One corner of the variation box and what the circuit does there' },
);

export const ToleranceResult = Type.Object(
  {
    topology: Type.String({ description: 'Topology id of the analysed circuit' }),
    model: Type.Union([Type.Literal('closed-form'), Type.Literal('time-domain')], { description: 'Which model evaluated every point' }),
    modelEffects: ModelEffects,
    nominal: Type.Object(
      {
        frequencyHz: Type.Number({ description: 'Frequency with every part at its nominal value, 25 °C, Hz' }),
        dutyCycle: Type.Number({ description: 'Duty cycle at nominal, fraction of the period high' }),
      },
      { additionalProperties: false, description: 'The circuit with nothing varied' },
    ),
    worstCase: Type.Object(
      {
        frequencyMinHz: Type.Number({ description: 'Lowest frequency found over the corners, Hz' }),
        frequencyMaxHz: Type.Number({ description: 'Highest frequency found over the corners, Hz' }),
        dutyMin: Type.Number({ description: 'Lowest duty cycle found over the corners' }),
        dutyMax: Type.Number({ description: 'Highest duty cycle found over the corners' }),
        method: Type.Union([Type.Literal('all-corners'), Type.Literal('sensitivity-guided')], {
          description: `all-corners: every corner of the box (up to ${MAX_EXHAUSTIVE_DIMENSIONS['closed-form']} varied parameters with the closed form, ${MAX_EXHAUSTIVE_DIMENSIONS['time-domain']} with the time-domain model); sensitivity-guided beyond that: corners chosen from one-at-a-time effects, then improved by ascent`,
        }),
        cornersEvaluated: Type.Integer({ description: 'Circuits evaluated to find the extremes' }),
        latchedCorners: Type.Integer({ description: 'Corners at which the circuit does not oscillate (all-corners: every such corner; sensitivity-guided: those the search met, so more than 0 whenever it met one). The extremes are over the corners that oscillate' }),
        corners: Type.Object(
          {
            frequencyMin: ref(Corner, 'The corner with the lowest frequency'),
            frequencyMax: ref(Corner, 'The corner with the highest frequency'),
            dutyMin: ref(Corner, 'The corner with the lowest duty cycle'),
            dutyMax: ref(Corner, 'The corner with the highest duty cycle'),
          },
          { additionalProperties: false, description: 'The corner that produced each extreme' },
        ),
        withinSpec: Type.Union([Type.Boolean(), Type.Null()], { description: 'Every corner meets the spec (null without a spec)' }),
      },
      { additionalProperties: false, description: 'Extremes over the corners of every tolerance, temperature, supply and amplifier spread' },
    ),
    monteCarlo: Type.Object(
      {
        samples: Type.Integer({ description: 'Samples drawn' }),
        seed: Type.Integer({ description: 'Seed used; the same seed and request give the same figures' }),
        distribution: Type.Union([Type.Literal('uniform'), Type.Literal('normal')], { description: 'Distribution the spreads were drawn from' }),
        sigmaPerTolerance: Type.Union([Type.Number(), Type.Null()], { description: 'σ as a fraction of each tolerance (null: uniform distribution)' }),
        oscillating: Type.Integer({ description: 'Samples that oscillate' }),
        latched: Type.Integer({ description: 'Samples that do not oscillate (they count as failing the spec)' }),
        frequencyHz: Type.Union([ref(Summary), Type.Null()], { description: 'Distribution of the frequency over the oscillating samples, Hz (null: none oscillates)' }),
        dutyCycle: Type.Union([ref(Summary), Type.Null()], { description: 'Distribution of the duty cycle over the oscillating samples (null: none oscillates)' }),
        yield: Type.Union([Type.Number(), Type.Null()], { description: 'Fraction of samples inside the spec (latched samples fail); null without a spec' }),
        yieldDetail: Type.Union([
          Type.Object(
            {
              passing: Type.Integer({ description: 'Samples inside the spec' }),
              failing: Type.Integer({ description: 'Samples outside the spec, latched ones included' }),
              standardError: Type.Number({ description: 'Binomial standard error of the yield, √(y(1 − y)/samples)' }),
              interval95: Type.Object(
                {
                  low: Type.Number({ description: 'Lower end of the 95 % interval, fraction' }),
                  high: Type.Number({ description: 'Upper end of the 95 % interval, fraction' }),
                },
                { additionalProperties: false, description: 'Wilson score interval' },
              ),
              frequencyPassFraction: Type.Number({ description: 'Fraction of samples inside the frequency tolerance alone' }),
              dutyPassFraction: Type.Number({ description: 'Fraction of samples inside the duty limits alone (1 without duty limits)' }),
            },
            { additionalProperties: false },
          ),
          Type.Null(),
        ], { description: 'How the yield splits (null without a spec)' }),
        elapsedS: Type.Number({ description: 'Wall time of the sampling, s (varies with the machine and its load)' }),
        samplesPerSecond: Type.Number({ description: 'samples / elapsedS' }),
      },
      { additionalProperties: false, description: 'Monte Carlo over every spread (settings from the request, or the defaults)' },
    ),
    sensitivities: Type.Array(
      Type.Object(
        {
          role: Type.String({ description: 'Part role, or the supply/amplifier/diode/stray parameter name (diodeForwardDropV: the steering diodes\' forward drop)' }),
          kind: Type.Union([Type.Literal('resistor'), Type.Literal('capacitor'), Type.Literal('supply'), Type.Literal('amplifier'), Type.Literal('load'), Type.Literal('diode'), Type.Literal('stray')], {
            description: 'What the parameter belongs to',
          }),
          sensitivity: Type.Number({ description: 'd ln f / d ln x at nominal' }),
          dutySensitivity: Type.Number({ description: 'd(duty) / d ln x at nominal' }),
          varianceShare: Type.Number({ description: "Share of the first-order variance of ln f from this part's own variations" }),
        },
        { additionalProperties: false },
      ),
      { description: 'Ranked by |sensitivity|' },
    ),
    varianceSources: Type.Array(
      Type.Object(
        {
          source: Type.String({ description: 'The role, tracking group or parameter the variation comes from' }),
          kind: Type.Union([
            Type.Literal('part-tolerance'),
            Type.Literal('tracking'),
            Type.Literal('tracking-residual'),
            Type.Literal('temperature'),
            Type.Literal('tempco-spread'),
            Type.Literal('dielectric-band'),
            Type.Literal('supply'),
            Type.Literal('amplifier'),
            Type.Literal('ageing'),
          ], { description: 'What kind of variation it is' }),
          share: Type.Number({ description: 'First-order share of the variance of ln f, 0..1' }),
          relativeStd: Type.Number({ description: 'First-order contribution to the relative standard deviation of f, fraction' }),
        },
        { additionalProperties: false },
      ),
      { description: 'First-order variance budget of ln f by independent source, largest first' },
    ),
    linearEstimate: Type.Object(
      { frequencyRelativeStd: Type.Number({ description: 'Root sum of squares of the sources, fraction' }) },
      { additionalProperties: false, description: 'First-order (linear) spread estimate, to compare with the Monte Carlo figures' },
    ),
    temperatureModels: Type.Array(
      Type.Object(
        {
          role: Type.String({ description: 'The part role' }),
          model: Type.Union([Type.Literal('tempco'), Type.Literal('dielectric')], { description: 'tempco: a linear coefficient; dielectric: the change band of an EIA-198 code or technology' }),
          dielectric: Type.Union([Type.String(), Type.Null()], { description: 'The dielectric code or technology (null for a tempco)' }),
          changeMinFraction: Type.Number({ description: 'Lowest relative change of the value over the temperature range and its spread, fraction (negative: the value falls)' }),
          changeMaxFraction: Type.Number({ description: 'Highest relative change of the value over the temperature range and its spread, fraction' }),
          withinRatedRange: Type.Boolean({ description: 'false: the temperature range leaves the dielectric\'s rated range (a note says so)' }),
        },
        { additionalProperties: false },
      ),
      { description: 'How each part with a temperature behaviour was modelled' },
    ),
    temperatureDrifts: Type.Array(
      Type.Object(
        {
          parameter: Type.String({ description: 'The drifting parameter (inputOffsetV, inputBiasCurrentA, outputHeadroomHighV/LowV, recoveryDelayS, diodeForwardDropV); the values below are in the unit its name states' }),
          source: Type.Union([Type.Literal('amplifier'), Type.Literal('steering-diodes')], { description: 'amplifier: its drift figures (amplifier table); steering-diodes: the forward drop, −2 mV/K (common practice)' }),
          law: Type.String({ description: 'The law with its figure, in words' }),
          valueAtReference: Type.Number({ description: 'Value at 25 °C' }),
          valueMin: Type.Number({ description: 'Smallest value over the temperature range' }),
          valueMax: Type.Number({ description: 'Largest value over the temperature range' }),
        },
        { additionalProperties: false },
      ),
      {
        description:
          'Active parts that follow the board temperature at every corner and Monte Carlo sample (with a temperature range): amplifier offset, bias current, headroom and delay drift, the steering diodes\' forward drop',
      },
    ),
    ageing: Type.Union(
      [
        Type.Object(
          {
            role: Type.String({ description: 'The timing capacitor' }),
            ratePerDecade: Type.Number({ description: 'Loss per decade of hours, fraction (typical of the class)' }),
            ageStartHours: Type.Number({ description: 'Hours since de-ageing at the start of service' }),
            ageEndHours: Type.Number({ description: 'Hours since de-ageing at the end of service' }),
            serviceLifeYears: Type.Number({ description: 'The service life the run covers' }),
            changeFraction: Type.Number({ description: 'Capacitance change over the service life, fraction (negative: loss)' }),
          },
          { additionalProperties: false },
        ),
        Type.Null(),
      ],
      { description: 'The timing capacitor\'s ageing over serviceLifeYears (null: no service life, or a capacitor that does not age)' },
    ),
    notes: Type.Array(
      Type.Object(
        {
          code: Type.String({ description: 'Stable code, e.g. corners-latch, samples-latch, nothing-varies, spread-without-effect, ageing-not-included' }),
          message: Type.String({ description: 'What the note means for this request, in words with the figures' }),
        },
        { additionalProperties: false },
      ),
      { description: 'Things the caller should know about how the request was read (no effect, latching, ranges left)' },
    ),
  },
  { $id: 'ToleranceResult', additionalProperties: false, description: 'Worst case, Monte Carlo, sensitivities and the variance budget of one circuit' },
);

export const TOLERANCE_SCHEMAS = [TemperatureCoefficient, ToleranceRequest, Summary, Corner, ToleranceResult];
