/** The circuit description shared by analyze, waveform, tolerance and fit requests. */
import { Type, type Static } from 'typebox';
import { acceptedTopologyIds, aliasNote, TOPOLOGIES } from '../../core/index.ts';
import { AmplifierSpec, ComponentValue, ref, ResistanceOhm, Supply } from './common.ts';

/** Every role of every topology; the core checks which ones the chosen topology needs. */
function partProperties() {
  const props: Record<string, ReturnType<typeof Type.Optional>> = {};
  for (const t of TOPOLOGIES) {
    for (const [role, spec] of Object.entries(t.roles)) {
      props[role] ??= Type.Optional(ref(ComponentValue));
      void spec;
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

export const CIRCUIT_SCHEMAS = [Parts, OutputLoad, Diode, Circuit];

/** The Circuit schema as a typed reference for route bodies. */
export const circuitSchemaRef = ref(Circuit);
