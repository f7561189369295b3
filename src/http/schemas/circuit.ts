/** The circuit description shared by analyze, waveform, tolerance and fit requests. */
import { Type, type Static } from 'typebox';
import { acceptedTopologyIds, aliasNote, TOPOLOGIES } from '../../core/index.ts';
import { CASE_SIZES } from '../../core/parts/capacitor/index.ts';
import { AmplifierSpec, ComponentValue, ref, ResistanceOhm, Supply } from './common.ts';

/** The timing capacitor as a part (docs/model.md, "non-linear capacitor"): API names are binding. */
export const TimingCapacitor = Type.Object(
  {
    value: ref(ComponentValue),
    tolerance: Type.Optional(
      Type.Union([Type.Number({ minimum: 0, exclusiveMaximum: 1 }), Type.String({ minLength: 1, maxLength: 8 })], {
        description: 'Fraction (0.1), percent text ("10%") or an IEC 60062 letter ("K")',
      }),
    ),
    dielectric: Type.Optional(
      Type.String({ minLength: 1, maxLength: 40, description: 'EIA-198 code (C0G, X7R, Y5V...) or technology word (PP, PET, mica...). Class II/III codes bring a class-typical C(V) curve, ageing and leakage' }),
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
            voltageV: Type.Number({ minimum: 0, maximum: 10000 }),
            capacitanceF: Type.Number({ exclusiveMinimum: 0 }),
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

/** Every role of every topology; the core checks which ones the chosen topology needs. Capacitors may be given as parts. */
function partProperties() {
  const props: Record<string, ReturnType<typeof Type.Optional>> = {};
  for (const t of TOPOLOGIES) {
    for (const [role, spec] of Object.entries(t.roles)) {
      props[role] ??= Type.Optional(spec.kind === 'capacitor' ? Type.Union([ref(ComponentValue), ref(TimingCapacitor)]) : ref(ComponentValue));
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
    returnV: Type.Optional(Type.Number({ default: 0, description: 'Voltage the load returns to, V' })),
  },
  { $id: 'OutputLoad', additionalProperties: false },
);

export const Diode = Type.Object(
  {
    forwardDropV: Type.Optional(Type.Number({ minimum: 0, maximum: 5, description: 'Forward drop, V' })),
    resistanceOhm: Type.Optional(Type.Number({ minimum: 0, description: 'Series resistance while conducting, ohm' })),
  },
  { $id: 'Diode', additionalProperties: false },
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
    supply: ref(Supply),
    amplifier: ref(AmplifierSpec),
    parts: ref(Parts),
    load: Type.Optional(ref(OutputLoad)),
    diode: Type.Optional(ref(Diode)),
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
  { $id: 'Circuit', additionalProperties: false },
);

export type CircuitBody = Static<typeof Circuit>;

export const CIRCUIT_SCHEMAS = [TimingCapacitor, Parts, OutputLoad, Diode, Circuit];

/** The Circuit schema as a typed reference for route bodies. */
export const circuitSchemaRef = ref(Circuit);
