/** POST /v1/design: target -> ranked complete designs. */
import { Type, type Static } from 'typebox';
import { AmplifierSpec, Check, ref, Supply } from './common.ts';
import { Circuit, Diode } from './circuit.ts';
import {
  acceptedTopologyIds,
  aliasNote,
  DEFAULT_DESIGN_COUNT,
  DEFAULT_DUTY_TOLERANCE,
  DEFAULT_NODE_CAPACITANCE_F,
  designable,
  DESIGN_REQUEST_RANGES as R,
  DESIGN_WINDOWS,
  NODE_CAPACITANCE_FACTOR,
  ROBUSTNESS_DEFAULTS,
  ROBUSTNESS_SAMPLE_RANGE,
  TOPOLOGIES,
} from '../../core/index.ts';

/** The tolerance a design must meet when the request gives none (the built board, not only the nominal). */
export const DEFAULT_DESIGN_FREQUENCY_TOLERANCE = 0.05;
import { FittedPart, Prediction, ValueSources } from './snap.ts';

/** Topologies design sizes (registry), with their deprecated aliases. */
export const DESIGN_TOPOLOGIES: readonly string[] = acceptedTopologyIds(designable);

export const DesignRequest = Type.Object(
  {
    targetFrequencyHz: Type.Number({ minimum: R.targetFrequencyHz.min, maximum: R.targetFrequencyHz.max, description: 'Target frequency, Hz' }),
    targetDutyCycle: Type.Optional(
      Type.Number({
        minimum: R.targetDutyCycle.min,
        maximum: R.targetDutyCycle.max,
        default: 0.5,
        description: 'Fraction of the period the output is high; 0.1..0.9 by threshold placement, beyond that by diode steering',
      }),
    ),
    dutyTolerance: Type.Optional(
      Type.Number({ minimum: R.dutyTolerance.min, maximum: R.dutyTolerance.max, default: DEFAULT_DUTY_TOLERANCE, description: 'Absolute duty-cycle tolerance the built board must meet' }),
    ),
    frequencyTolerance: Type.Optional(
      Type.Number({
        minimum: R.frequencyTolerance.min,
        maximum: R.frequencyTolerance.max,
        default: DEFAULT_DESIGN_FREQUENCY_TOLERANCE,
        description: 'Frequency tolerance the built board must meet, fraction: the nominal design lies inside it and the yield counts boards inside it',
      }),
    ),
    supply: ref(Supply, 'The rails the design runs from; a negative rail below 0 V also offers the split-supply networks'),
    amplifier: ref(AmplifierSpec, 'The amplifier every design is sized and analysed with'),
    values: Type.Optional(ref(ValueSources, 'Where each role takes its values from; a kind not given takes E24 resistors at 1 % or E12 C0G capacitors at 5 %')),
    constraints: Type.Optional(
      Type.Object(
        {
          rMinOhm: Type.Optional(Type.Number({ minimum: 1, maximum: 1e9, default: DESIGN_WINDOWS.resistor.min, description: 'Resistor window, lower end, ohm' })),
          rMaxOhm: Type.Optional(Type.Number({ minimum: 1, maximum: 1e9, default: DESIGN_WINDOWS.resistor.max, description: 'Resistor window, upper end, ohm' })),
          cMinF: Type.Optional(Type.Number({ minimum: 1e-12, maximum: 1, default: DESIGN_WINDOWS.capacitor.min, description: `Timing-capacitor window, lower end, F (raised to ${NODE_CAPACITANCE_FACTOR}× nodeCapacitanceF when that is higher)` })),
          cMaxF: Type.Optional(Type.Number({ minimum: 1e-12, maximum: 1, default: DESIGN_WINDOWS.capacitor.max, description: 'Timing-capacitor window, upper end, F' })),
          nodeCapacitanceF: Type.Optional(
            Type.Number({ minimum: 0, maximum: 1e-9, default: DEFAULT_NODE_CAPACITANCE_F, description: 'Stray plus input capacitance at the inverting input, F; the timing capacitor is kept at least 50× above it' }),
          ),
          allowHighKDielectric: Type.Optional(
            Type.Boolean({ default: false, description: 'Offer class II/III ceramic timing capacitors (then a warning; otherwise refused, as in analyze and BOM checks). Even then a class I, film or mica part of the same value is preferred, and a class II/III part is kept only when its DC-bias loss over the capacitor swing and its ageing over 10 years (class-typical figures for its dielectric, rating and case) leave the frequency inside frequencyTolerance. Electrolytics are never offered.' }),
          ),
          dielectrics: Type.Optional(
            Type.Array(Type.String({ minLength: 1, maxLength: 16 }), { maxItems: 32, description: 'Allowed dielectric codes for catalogue timing capacitors' }),
          ),
          maxSupplyCurrentA: Type.Optional(Type.Number({ exclusiveMinimum: 0, description: 'Mean supply current budget including the amplifier, A (absent: no budget)' })),
        },
        { additionalProperties: false, description: 'Windows and budgets every offered design keeps to (absent: the defaults of each field)' },
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
    diode: Type.Optional(ref(Diode, 'Steering-diode model for diode-steered designs (absent: 0.6 V drop, 10 Ω)')),
    count: Type.Optional(
      Type.Integer({ minimum: R.count.min, maximum: R.count.max, default: DEFAULT_DESIGN_COUNT, description: `How many ranked designs to return at most (${R.count.min} to ${R.count.max})` }),
    ),
    robustness: Type.Optional(
      Type.Object(
        {
          temperature: Type.Optional(
            Type.Object(
              {
                minC: Type.Number({ minimum: -60, maximum: 200, description: 'Lowest board temperature, °C (−60 to 200)' }),
                maxC: Type.Number({ minimum: -60, maximum: 200, description: 'Highest board temperature, °C (−60 to 200, at least minC)' }),
              },
              {
                additionalProperties: false,
                description: `Board temperature range, °C (default ${ROBUSTNESS_DEFAULTS.temperature.minC} to ${ROBUSTNESS_DEFAULTS.temperature.maxC})`,
              },
            ),
          ),
          supplyTolerance: Type.Optional(Type.Number({ minimum: 0, maximum: 0.3, default: ROBUSTNESS_DEFAULTS.supplyTolerance, description: 'Both rails within ± this fraction' })),
          resistorTempcoPpmPerK: Type.Optional(
            Type.Number({ minimum: -5000, maximum: 5000, default: ROBUSTNESS_DEFAULTS.resistorTempcoPpmPerK, description: 'Tempco of resistors whose source states none (metal film, common practice), ppm/K' }),
          ),
          capacitorDielectric: Type.Optional(
            Type.String({ minLength: 1, maxLength: 16, default: ROBUSTNESS_DEFAULTS.capacitorDielectric, description: 'Dielectric assumed for series capacitors (catalogue parts carry their own)' }),
          ),
          samples: Type.Optional(
            Type.Integer({ minimum: ROBUSTNESS_SAMPLE_RANGE.min, maximum: ROBUSTNESS_SAMPLE_RANGE.max, default: ROBUSTNESS_DEFAULTS.samples, description: 'Monte Carlo samples per design (normal, tolerance = 3σ)' }),
          ),
          seed: Type.Optional(
            Type.Integer({
              minimum: -2147483648,
              maximum: 2147483647,
              default: ROBUSTNESS_DEFAULTS.seed,
              description: 'Monte Carlo seed, a 32-bit integer: the same seed and request give the same yields',
            }),
          ),
          minYield: Type.Optional(Type.Number({ minimum: 0, maximum: 1, description: 'Offer only designs whose yield reaches this fraction (422 when none does)' })),
        },
        {
          additionalProperties: false,
          description:
            'Each design\'s worst case and Monte Carlo yield against frequencyTolerance and dutyTolerance, over the parts\' tolerances (from their series or catalogue), ' +
            'their temperature behaviour over the range and the supply tolerance.',
        },
      ),
    ),
  },
  {
    $id: 'DesignRequest',
    additionalProperties: false,
    description:
      'Values default to E24 resistors at 1 % and E12 capacitors at 5 % (C0G) when `values` is omitted. `diode` models the steering diodes of diode-steered designs ' +
      '(default 0.6 V forward drop, 10 Ω); each such design\'s `circuit` carries the model it was analysed with.',
  },
);

export type DesignRequestBody = Static<typeof DesignRequest>;

const DesignItem = Type.Object(
  {
    rank: Type.Integer({ minimum: 1, description: 'Position in the ranking, 1 = best' }),
    topology: Type.String({ description: 'Topology id of this design' }),
    parts: Type.Array(ref(FittedPart), { description: 'Every role of the topology with the part(s) filling it' }),
    predicted: ref(Prediction, 'What the full analysis of the built design predicts at nominal values'),
    frequencyError: Type.Number({ description: '(predicted − target) / target, from the full analysis' }),
    dutyCycleError: Type.Number({ description: 'predicted − target duty cycle' }),
    hysteresisFraction: Type.Number({ description: 'Hysteresis the design was built around, as a fraction of the output swing' }),
    robustness: Type.Object(
      {
        yield: Type.Number({ description: 'Fraction of Monte Carlo boards inside both tolerances' }),
        yieldStandardError: Type.Number({ description: 'Binomial standard error of yield, √(y(1 − y)/samples)' }),
        yieldInterval95: Type.Object(
          {
            low: Type.Number({ description: 'Lower end of the 95 % interval, fraction' }),
            high: Type.Number({ description: 'Upper end of the 95 % interval, fraction' }),
          },
          { additionalProperties: false, description: 'Wilson score interval of the yield' },
        ),
        samples: Type.Integer({ description: 'Monte Carlo boards drawn for this design' }),
        seed: Type.Integer({ description: 'Seed used (repeat the request with it to reproduce the figures)' }),
        worstCase: Type.Object(
          {
            frequencyMinHz: Type.Number({ description: 'Lowest frequency over the tolerance, temperature and supply corners, Hz' }),
            frequencyMaxHz: Type.Number({ description: 'Highest frequency over the corners, Hz' }),
            dutyMin: Type.Number({ description: 'Lowest duty cycle over the corners' }),
            dutyMax: Type.Number({ description: 'Highest duty cycle over the corners' }),
            withinSpec: Type.Boolean({ description: 'Every corner inside frequencyTolerance and dutyTolerance' }),
          },
          { additionalProperties: false, description: 'Extremes over the corners of every part tolerance, the temperature range and the supply tolerance' },
        ),
        marginFraction: Type.Number({ description: 'Share of the tolerance left at the worst corner (smaller of frequency and duty); negative when a corner leaves the spec' }),
        partTolerances: Type.Record(Type.String(), Type.Number(), { description: 'Tolerance each role was given, fraction' }),
        model: Type.Union([Type.Literal('closed-form'), Type.Literal('time-domain')], { description: 'Which model evaluated the corners and samples' }),
      },
      { additionalProperties: false, description: 'How the built boards spread: worst case and Monte Carlo yield against the requested tolerances' },
    ),
    practicality: Type.Object(
      {
        edgeProximity: Type.Number({ description: '0 when every value sits in the geometric middle of its window, 1 at an edge' }),
        supplyCurrentA: Type.Number({ description: 'Mean supply current including the amplifier, A' }),
        partCount: Type.Integer({ description: 'Parts on the board besides the amplifier: a series or parallel pair counts two, steering diodes count' }),
        score: Type.Number({ description: 'Smaller is more practical (edge proximity, part count, supply current, and a class II/III timing capacitor counting as much as a value at the edge of its window; our weighting)' }),
      },
      { additionalProperties: false, description: 'How easy the design is to build; used to rank designs of equal yield and margin' },
    ),
    limits: Type.Array(
      Type.Object(
        {
          role: Type.String({ description: 'The role this window applies to' }),
          min: Type.Number({ description: 'Smallest value the role may take, ohm or farad' }),
          max: Type.Number({ description: 'Largest value the role may take, ohm or farad' }),
          minReason: Type.String({ description: 'What sets min, in words with the figures' }),
          maxReason: Type.String({ description: 'What sets max, in words with the figures' }),
          atLimit: Type.Union([Type.Literal('min'), Type.Literal('max'), Type.Null()], { description: 'The end of the window the chosen value sits on (null: inside)' }),
        },
        { additionalProperties: false },
      ),
      { description: 'What bounds each role: the window, output drive, bias-current error, supply budget or stray capacitance' },
    ),
    circuit: ref(Circuit, 'The design as a circuit: send it to /v1/analyze, /v1/waveform or /v1/tolerance as it stands'),
    checks: Type.Array(ref(Check), { description: 'Design checks on this design, as POST /v1/analyze reports them' }),
  },
  { additionalProperties: false, description: 'One complete design' },
);

export const DesignResponse = Type.Object(
  {
    designs: Type.Array(DesignItem, {
      description: 'Ranked by yield (whole percent), then the margin left at the worst corner, then practicality, best first',
    }),
    notes: Type.Array(Type.String(), { description: 'Topologies or hysteresis widths that gave nothing, and why' }),
  },
  { $id: 'DesignResponse', additionalProperties: false, description: 'Ranked designs for the target' },
);

export const DESIGN_SCHEMAS = [DesignRequest, DesignResponse];
