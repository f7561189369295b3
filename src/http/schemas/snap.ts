/** POST /v1/snap, and the value-source and fitted-part shapes design shares. */
import { Type, type Static } from 'typebox';
import { acceptedTopologyIds, aliasNote, snappable, TOPOLOGIES } from '../../core/index.ts';
import { SERIES_NAMES } from '../../core/parts/index.ts';
import { AmplifierSpec, CapacitanceF, Check, ComponentValue, FrequencyHz, ref, ResistanceOhm, Supply } from './common.ts';

const Fraction = (description: string) => Type.Number({ minimum: 0, maximum: 1, description });

export const ValueSource = Type.Union(
  [
    Type.Object(
      {
        series: Type.Union(
          SERIES_NAMES.map((n) => Type.Literal(n)),
          { description: 'IEC 60063 preferred-number series' },
        ),
        tolerance: Type.Optional(Type.Number({ exclusiveMinimum: 0, maximum: 1, description: 'Part tolerance as a fraction (default: the tolerance usual for the series)' })),
      },
      { additionalProperties: false },
    ),
    Type.Object(
      { catalogue: Type.String({ minLength: 1, maxLength: 64, description: 'Id of a stored catalogue; only parts not marked not-for-new-designs are used' }) },
      { additionalProperties: false },
    ),
  ],
  { $id: 'ValueSource', description: 'Where a role takes its values from: a series, or an approved-parts catalogue' },
);

const ROLE_PATTERN = '^[a-z][A-Za-z0-9]{0,31}$';

export const ValueSources = Type.Object(
  {
    resistor: Type.Optional(ref(ValueSource, 'Source for every resistor role without its own entry in `roles`. Absent: design uses E24 at 1 %; snap refuses a resistor role left with no source (400 at /values/resistor)')),
    capacitor: Type.Optional(ref(ValueSource, 'Source for every capacitor role without its own entry in `roles`. Absent: design uses E12 at 5 % (C0G); snap refuses a capacitor role left with no source (400 at /values/capacitor)')),
    roles: Type.Optional(
      Type.Record(Type.String({ pattern: ROLE_PATTERN }), ref(ValueSource), { description: 'Per-role sources, overriding the per-kind ones (e.g. rTiming from a catalogue)' }),
    ),
  },
  { $id: 'ValueSources', additionalProperties: false, description: 'Value source per kind of part, with per-role overrides' },
);

const SourceReference = {
  tolerance: Type.Number({ description: 'Part tolerance, fraction' }),
  series: Type.Optional(Type.String({ description: 'Series the value belongs to' })),
  partNumber: Type.Optional(Type.String({ description: 'Catalogue part number' })),
  catalogue: Type.Optional(Type.String({ description: 'Catalogue id' })),
  dielectric: Type.Optional(Type.String({ description: 'Capacitors: the dielectric the part has (catalogue) or was assumed to have (series), e.g. C0G' })),
};

export const PartReference = Type.Object(
  { value: Type.Number({ description: 'Ohm or farad' }), ...SourceReference },
  { $id: 'PartReference', additionalProperties: false, description: 'One physical part: its value and where it comes from' },
);

const fittedProperties = {
  value: Type.Number({ description: 'Effective value of the role, ohm or farad' }),
  arrangement: Type.Union([Type.Literal('single'), Type.Literal('series'), Type.Literal('parallel')], {
    description: 'single: one part fills the role; series or parallel: two parts (listed in `parts`) combine to `value`',
  }),
  tolerance: Type.Optional(SourceReference.tolerance),
  series: SourceReference.series,
  partNumber: SourceReference.partNumber,
  catalogue: SourceReference.catalogue,
  dielectric: SourceReference.dielectric,
  parts: Type.Optional(Type.Array(ref(PartReference), { description: 'The two parts of a series or parallel combination' })),
};

export const FittedPart = Type.Object(
  { role: Type.String({ description: 'The role this part fills, a key of the circuit\'s `parts`' }), ...fittedProperties },
  {
    $id: 'FittedPart',
    additionalProperties: false,
    description: 'A role filled by one part (its reference inline) or by two parts in series or parallel (listed in `parts`)',
  },
);

export const SnapChoice = Type.Object(
  { ...fittedProperties, error: Type.Number({ description: '(value − ideal) / ideal' }) },
  { $id: 'SnapChoice', additionalProperties: false, description: 'A value available from the source, and how far it is from the ideal' },
);

const ValueRequest = Type.Object(
  {
    ideal: ref(ComponentValue, 'The value wanted: ohms or farads as a number, or a value string ("15k8")'),
    kind: Type.Union([Type.Literal('resistor'), Type.Literal('capacitor')], { description: 'What the value is for: picks the unit and, in a catalogue, the parts of that kind' }),
    source: ref(ValueSource, 'Where the snapped value may come from'),
    combinations: Type.Optional(Type.Boolean({ default: false, description: 'Also look for the best two-part series or parallel combination' })),
    label: Type.Optional(Type.String({ maxLength: 64, description: 'Echoed back (e.g. a reference designator)' })),
  },
  { additionalProperties: false },
);

const Ranges = Type.Object(
  {
    rMinOhm: Type.Optional(ResistanceOhm('Smallest resistor value searched, ohm')),
    rMaxOhm: Type.Optional(ResistanceOhm('Largest resistor value searched, ohm')),
    cMinF: Type.Optional(CapacitanceF('Smallest capacitor value searched, F')),
    cMaxF: Type.Optional(CapacitanceF('Largest capacitor value searched, F')),
  },
  { additionalProperties: false, description: 'Value ranges searched (default 100 Ω to 10 MΩ, 100 pF to 10 µF)' },
);

/** Topologies joint snap sizes (registry: one shared timing resistor, one threshold network), with their deprecated aliases. */
export const SNAP_TOPOLOGIES: readonly string[] = acceptedTopologyIds(snappable);

const CircuitSnapRequest = Type.Object(
  {
    topology: Type.Union(SNAP_TOPOLOGIES.map((t) => Type.Literal(t)), { description: aliasNote(TOPOLOGIES.filter(snappable).map((t) => t.id)) }),
    supply: ref(Supply, 'The rails the circuit runs from'),
    amplifier: Type.Optional(ref(AmplifierSpec, 'The amplifier the candidates are analysed with (default: ideal)')),
    targetFrequencyHz: FrequencyHz('Target oscillation frequency, Hz'),
    targetDutyCycle: Type.Optional(
      Type.Number({
        exclusiveMinimum: 0,
        exclusiveMaximum: 1,
        description: 'Wanted fraction of the period high, strictly between 0 and 1; absent: networks are placed for 0.5 and the duty cycle is not screened (dutyCycleError null)',
      }),
    ),
    dutyTolerance: Type.Optional(Fraction('Absolute duty-cycle tolerance when targetDutyCycle is given (default 0.02)')),
    values: ref(ValueSources, 'Where each role takes its values from: series or catalogue, per kind or per role'),
    ranges: Type.Optional(Ranges),
    dielectrics: Type.Optional(Type.Array(Type.String({ minLength: 1, maxLength: 16 }), { maxItems: 32, description: 'Allowed dielectric codes for catalogue capacitors' })),
    hysteresis: Type.Optional(
      Type.Object(
        {
          ideal: Type.Optional(
            Type.Record(Type.String({ pattern: ROLE_PATTERN }), ref(ComponentValue), {
              description: 'Ideal threshold-network values to snap near (rTop, rBottom, rFeedback or rFeedback, rGround); without them the network is free',
            }),
          ),
          feedbackFractionMin: Type.Optional(Type.Number({ exclusiveMinimum: 0, exclusiveMaximum: 1, description: 'Split supply, free network: lowest β = rGround/(rGround+rFeedback) (default 0.1)' })),
          feedbackFractionMax: Type.Optional(Type.Number({ exclusiveMinimum: 0, exclusiveMaximum: 1, description: 'Split supply, free network: highest β (default 0.9)' })),
          hysteresisFraction: Type.Optional(Type.Number({ exclusiveMinimum: 0, exclusiveMaximum: 1, description: 'Single-supply divider, free network: hysteresis as a fraction of the swing (default 1/3)' })),
        },
        { additionalProperties: false, description: 'How the threshold network is chosen: near given ideal values, or freely within a hysteresis window' },
      ),
    ),
    combine: Type.Optional(Type.Union([Type.Literal('rTiming'), Type.Literal('cTiming')], { description: 'Role that may be a two-part series or parallel combination' })),
    count: Type.Optional(Type.Integer({ minimum: 1, maximum: 50, default: 5, description: 'How many candidates to return, best first (1 to 50)' })),
  },
  { additionalProperties: false, description: 'Size a whole circuit jointly: timing parts and threshold network from the value sources, for a target frequency' },
);

export const SnapRequest = Type.Object(
  {
    values: Type.Optional(Type.Array(ValueRequest, { maxItems: 200, description: 'Ideal values to snap one by one' })),
    circuit: Type.Optional(CircuitSnapRequest),
  },
  { $id: 'SnapRequest', additionalProperties: false, description: 'Give `values`, `circuit` or both' },
);

export type SnapRequestBody = Static<typeof SnapRequest>;
export type CircuitSnapBody = NonNullable<SnapRequestBody['circuit']>;

const ValueSnapResult = Type.Object(
  {
    label: Type.Optional(Type.String({ description: 'The request\'s label, echoed (absent when none was given)' })),
    ideal: Type.Number({ description: 'The ideal value as the service read it, ohm or farad' }),
    kind: Type.String({ description: 'resistor or capacitor, as requested' }),
    nearest: ref(SnapChoice, 'The single value with the smallest relative error |value − ideal| / ideal (lower or higher)'),
    lower: Type.Union([ref(SnapChoice), Type.Null()], { description: 'Largest value <= ideal (null: none in the source)' }),
    higher: Type.Union([ref(SnapChoice), Type.Null()], { description: 'Smallest value >= ideal (null: none in the source)' }),
    combination: Type.Optional(Type.Union([ref(SnapChoice), Type.Null()], { description: 'Best two-part combination when it beats the nearest single part' })),
  },
  { additionalProperties: false, description: 'One snapped value' },
);

export const Prediction = Type.Object(
  {
    frequencyHz: Type.Number({ description: 'Predicted steady-state frequency, Hz' }),
    dutyCycle: Type.Number({ description: 'Predicted fraction of the period the output is high' }),
    model: Type.Union([Type.Literal('closed-form'), Type.Literal('time-domain')], {
      description: 'Which model predicted it: time-domain when slew, delay, limits or clamps of the amplifier matter, else its closed-form special case',
    }),
    thresholds: Type.Object(
      {
        upperV: Type.Number({ description: 'Capacitor voltage at which a high output switches low, V' }),
        lowerV: Type.Number({ description: 'Capacitor voltage at which a low output switches high, V' }),
      },
      { additionalProperties: false, description: 'Predicted switching thresholds' },
    ),
    supplyCurrentA: Type.Number({ description: 'Mean supply current including the amplifier, A' }),
  },
  { $id: 'Prediction', additionalProperties: false, description: 'Figures from the full analysis of the fitted circuit (as POST /v1/analyze reports them)' },
);

const SnapCandidate = Type.Object(
  {
    topology: Type.String({ description: 'Topology id of the candidate' }),
    parts: Type.Array(ref(FittedPart), { description: 'Every role of the topology with the part(s) filling it' }),
    predicted: ref(Prediction, 'What the full analysis of this candidate predicts'),
    frequencyError: Type.Number({ description: '(predicted − target) / target' }),
    dutyCycleError: Type.Union([Type.Number(), Type.Null()], { description: 'predicted − target duty cycle (null: no duty target)' }),
    checks: Type.Array(ref(Check), { description: 'Design checks on the candidate circuit, as POST /v1/analyze reports them' }),
  },
  { additionalProperties: false, description: 'One jointly snapped circuit' },
);

export const SnapResponse = Type.Object(
  {
    values: Type.Array(ValueSnapResult, { description: 'One result per requested value, in request order (empty without `values`)' }),
    circuit: Type.Optional(
      Type.Object(
        {
          candidates: Type.Array(SnapCandidate, { description: 'Best first by |frequencyError|' }),
          search: Type.Object(
            {
              thresholdNetworks: Type.Integer({ description: 'Threshold networks built from the sources, before merging equal ratios' }),
              distinctThresholdNetworks: Type.Integer({ description: 'Distinct threshold networks searched, after merging equal ratios and the duty screen' }),
              resistorValues: Type.Integer({ description: 'Timing-resistor values available in the ranges' }),
              capacitorValues: Type.Integer({ description: 'Timing-capacitor values available in the ranges' }),
              pairsExamined: Type.Integer({ description: 'Candidate evaluations of the screening search' }),
              exhaustiveTuples: Type.Number({ description: 'Tuples an exhaustive search would evaluate' }),
              closedFormEvaluations: Type.Integer({ description: 'Short-listed candidates re-evaluated with the closed form' }),
              fullAnalyses: Type.Integer({ description: 'Candidates analysed in full (the model POST /v1/analyze uses)' }),
            },
            { additionalProperties: false, description: 'How much work the search did, for judging a slow request' },
          ),
        },
        { additionalProperties: false, description: 'Present when the request had `circuit`' },
      ),
    ),
  },
  { $id: 'SnapResponse', additionalProperties: false, description: 'Snapped values and jointly snapped circuits' },
);

export const SNAP_SCHEMAS = [ValueSource, ValueSources, PartReference, FittedPart, SnapChoice, Prediction, SnapRequest, SnapResponse];
