/** The circuit description shared by analyze, waveform, tolerance and fit requests. */
import { Type, type Static } from 'typebox';
import { acceptedTopologyIds, aliasNote, DEFAULT_STEERING_DIODE, TOPOLOGIES } from '../../core/index.ts';
import { LEAKAGE_RANGE_OHM, STRAY_CAPACITANCE_MAX_F, TIMING_STRAY_RATIO_MIN } from '../../core/circuit/strays.ts';
import { CASE_SIZES } from '../../core/parts/capacitor/index.ts';
import { AmplifierSpec, ComponentValue, ref, ResistanceOhm, Supply } from './common.ts';

/** The timing capacitor as a part (docs/model.md, "non-linear capacitor"): API names are binding. */
export const TimingCapacitor = Type.Object(
  {
    value: ref(ComponentValue, 'Nominal capacitance (at 0 V bias for class II/III ceramics): farads as a number, or a value string such as "4n7"'),
    tolerance: Type.Optional(
      Type.Union([Type.Number({ minimum: 0, exclusiveMaximum: 1 }), Type.String({ minLength: 1, maxLength: 8 })], {
        description: 'Fraction (0.1), percent text ("10%") or an IEC 60062 letter ("K")',
      }),
    ),
    dielectric: Type.Optional(
      Type.String({ minLength: 1, maxLength: 40, description: 'EIA-198 code (C0G, X7R, Y5V...) or technology word (PP, PET, mica...). Class II/III codes bring a class-typical C(V) curve and ageing; every code brings its class\'s minimum insulation resistance, checked (capacitor-leakage-significant: the frequency with that leakage across the part), not applied' }),
    ),
    ratedVoltageV: Type.Optional(Type.Number({ minimum: 1, maximum: 10000, description: 'Rated DC voltage, V (class II/III default: 16 V); ceramic ratings start at a few volts, so below 1 V is refused as a slip' })),
    caseSize: Type.Optional(Type.Union(CASE_SIZES.map((c) => Type.Literal(c)), { description: 'EIA inch case code (class II/III default: 0805)' })),
    ageHours: Type.Optional(
      Type.Number({ minimum: 0, maximum: 1e7, description: 'Hours since the last de-ageing (reflow soldering de-ages a class II part); default: the 1000 h reference age' }),
    ),
    biasCurve: Type.Optional(
      Type.Array(
        Type.Object(
          {
            voltageV: Type.Number({ minimum: 0, maximum: 10000, description: 'DC bias across the capacitor at this point, V (0 to 10 kV); the curve is taken as symmetric in the sign of the bias' }),
            capacitanceF: Type.Number({ exclusiveMinimum: 0, description: 'Capacitance measured or published at that bias, F (absolute, not a fraction of the nominal)' }),
          },
          { additionalProperties: false },
        ),
        { minItems: 1, maxItems: 64, description: 'Measured or published C(V) points of the actual part (absolute farads); replace the class-typical curve' },
      ),
    ),
  },
  {
    $id: 'TimingCapacitor',
    additionalProperties: false,
    description: 'A timing capacitor with its dielectric, rating, case and age; class II/III ceramics then charge along their C(V) curve',
  },
);

/**
 * What a role is, in words from the registry: its place in the network, its kind
 * and unit, and which topologies need it (the core refuses a missing required
 * role and a role the chosen topology does not have, both with 400).
 */
function roleDescription(role: string): string {
  const users = TOPOLOGIES.filter((t) => role in t.roles);
  const spec = users[0].roles[role];
  const required = users.filter((t) => t.roles[role].required).map((t) => t.id);
  const optional = users.filter((t) => !t.roles[role].required).map((t) => t.id);
  const value =
    spec.kind === 'capacitor'
      ? 'farads as a number, a value string ("4n7"), or a TimingCapacitor part with its dielectric, rating and C(V) behaviour'
      : 'ohms as a number or a value string ("4k7")';
  return (
    `${spec.description[0].toUpperCase()}${spec.description.slice(1)}: ${value}. ` +
    `Required by ${required.length ? required.join(', ') : 'no topology'}` +
    `${optional.length ? `; optional in ${optional.join(', ')}` : ''}` +
    `${users.length < TOPOLOGIES.length ? '; any other topology refuses it (400)' : ''}`
  );
}

/** Every role of every topology; the core checks which ones the chosen topology needs. Capacitors may be given as parts. */
function partProperties() {
  const props: Record<string, ReturnType<typeof Type.Optional>> = {};
  for (const t of TOPOLOGIES) {
    for (const [role, spec] of Object.entries(t.roles)) {
      const description = roleDescription(role);
      props[role] ??= Type.Optional(
        spec.kind === 'capacitor' ? Type.Union([ref(ComponentValue), ref(TimingCapacitor)], { description }) : ref(ComponentValue, description),
      );
    }
  }
  return props;
}

export const Parts = Type.Object(partProperties(), {
  $id: 'Parts',
  additionalProperties: false,
  description: 'Part values by role. Which roles a topology needs: see the topology descriptions.',
});

export const OutputLoad = Type.Object(
  {
    resistanceOhm: ResistanceOhm('Load resistance on the output pin, ohm'),
    returnV: Type.Optional(Type.Number({ default: 0, description: 'Voltage the far end of the load returns to, V (default 0: a load to ground; e.g. 5 for a pull-up to a 5 V rail)' })),
  },
  { $id: 'OutputLoad', additionalProperties: false, description: 'A resistive load on the output pin besides the timing and threshold networks' },
);

export const Diode = Type.Object(
  {
    forwardDropV: Type.Optional(Type.Number({ minimum: 0, maximum: 5, description: `Forward drop while conducting, V (0 to 5; default ${DEFAULT_STEERING_DIODE.forwardDropV}, a small-signal silicon diode, common practice)` })),
    resistanceOhm: Type.Optional(Type.Number({ minimum: 0, description: `Series resistance while conducting, ohm (default ${DEFAULT_STEERING_DIODE.resistanceOhm}); below its forward drop the diode is open` })),
  },
  { $id: 'Diode', additionalProperties: false, description: 'Steering-diode model for diode-steered circuits: a fixed drop in series with a resistance' },
);

const strayF = (where: string, modelled: string) =>
  Type.Optional(Type.Number({ minimum: 0, maximum: STRAY_CAPACITANCE_MAX_F, default: 0, description: `Board capacitance ${where} to ground, F (default 0). ${modelled}` }));
const leakageOhm = (where: string) =>
  Type.Optional(
    Type.Number({
      minimum: LEAKAGE_RANGE_OHM.min,
      maximum: LEAKAGE_RANGE_OHM.max,
      description: `Leakage resistance ${where} to ground, ohm (default: absent, no leakage; e.g. a class II capacitor's insulation resistance, a humid or flux-contaminated board)`,
    }),
  );

/** Strays and leakage at the nodes (docs/model.md, "strays and leakage"); defaults: none. */
export const Strays = Type.Object(
  {
    timingNodeF: strayF(
      'at the timing node N (inverting input)',
      `Adds to the timing capacitor together with the amplifier's inputCapacitanceF; the timing capacitor should be ≥ ${TIMING_STRAY_RATIO_MIN}× their sum (check stray-capacitance-significant). Beside a class II/III capacitor it is a flat part of the node's C(V)`,
    ),
    thresholdNodeF: strayF(
      'at the threshold node P (non-inverting input)',
      "Together with the amplifier's inputCapacitanceF it gives P an RC of its own (solved exactly, multi-state pieces, beside a class II/III C(V) capacitor too; check stray-capacitance-significant when it and outputNodeF move the frequency by more than 2 %)",
    ),
    outputNodeF: strayF(
      'at the output pin',
      'Makes the pin an RC of its own: an open-drain rise charges it through the pull-up, a driven pin through the output resistance (solved exactly, beside a class II/III C(V) capacitor too)',
    ),
    timingLeakageOhm: leakageOhm('across the timing capacitor (N)'),
    thresholdLeakageOhm: leakageOhm('at the threshold node P'),
  },
  {
    $id: 'Strays',
    additionalProperties: false,
    description: 'Board and input capacitance and leakage at the oscillator nodes. Absent fields: no stray capacitance, no leakage',
  },
);

export const ModelChoice = Type.Union([Type.Literal('auto'), Type.Literal('closed-form'), Type.Literal('time-domain')], {
  description: 'Which model answers; auto picks the time-domain engine whenever slew, delay, limits or clamps matter',
});

export const Circuit = Type.Object(
  {
    topology: Type.Union(
      acceptedTopologyIds().map((id) => Type.Literal(id)),
      { description: `${TOPOLOGIES.map((t) => `${t.id}: ${t.description}`).join(' | ')}. ${aliasNote()}` },
    ),
    supply: ref(Supply, 'The rails the amplifier runs from and the divider networks return to'),
    amplifier: ref(AmplifierSpec, 'The op-amp or comparator: a built-in archetype or registered id (GET /v1/amplifiers), or inline figures; `ideal` for the textbook part'),
    parts: ref(Parts, 'Part values by role; which roles the topology needs: GET /v1/topologies'),
    load: Type.Optional(ref(OutputLoad, 'Resistive load on the output (absent: no load beyond the circuit itself)')),
    diode: Type.Optional(ref(Diode, `Steering-diode model, read by diode-steered only (absent: ${DEFAULT_STEERING_DIODE.forwardDropV} V drop, ${DEFAULT_STEERING_DIODE.resistanceOhm} Ω)`)),
    strays: Type.Optional(ref(Strays, 'Board and input capacitance and leakage at the nodes (absent: none)')),
    model: Type.Optional(ModelChoice),
    edgeFractionLimit: Type.Optional(
      Type.Number({
        exclusiveMinimum: 0,
        maximum: 0.5,
        default: 0.05,
        description: 'Largest share of the period an edge (recovery delay + slew) may take before the design counts as slew-limited; also sets frequencyCeilingHz',
      }),
    ),
  },
  { $id: 'Circuit', additionalProperties: false, description: 'One oscillator: topology, supply, amplifier and part values' },
);

export type CircuitBody = Static<typeof Circuit>;
export type StraysBody = Static<typeof Strays>;

export const CIRCUIT_SCHEMAS = [TimingCapacitor, Parts, OutputLoad, Diode, Strays, Circuit];

/** The Circuit schema as a typed reference for route bodies. */
export const circuitSchemaRef = ref(Circuit);
