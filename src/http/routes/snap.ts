/** POST /v1/snap: ideal values -> series/catalogue neighbours; a circuit target -> the best joint choices. */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import { buildValueSet, jointSnap, snapValue, type JointCandidate, type RoleSources, type RoleValue, type SnapChoice, type ValueSource } from '../../core/design/index.ts';
import { parseComponentValue } from '../../core/parts/value-parse.ts';
import { checkInRange, componentRange, RESISTANCE_RANGE_OHM } from '../../core/value-ranges.ts';
import type { AnalysisResult } from '../../core/index.ts';
import { catalogueLookupFor, cataloguesNamedIn, type CatalogueLookup } from '../catalogue-source.ts';
import type { AmplifierLookup } from '../amplifier-directory.ts';
import { resolveAmplifierSpec, withPointerPrefix } from '../convert.ts';
import { HttpProblem } from '../problem.ts';
import { problemResponses, ref } from '../schemas/common.ts';
import { SnapRequest, SnapResponse, type CircuitSnapBody, type SnapRequestBody } from '../schemas/snap.ts';
import type { Services } from '../services.ts';

type SourceBody = { series: string; tolerance?: number } | { catalogue: string };

/** What the synchronous helpers below read stored documents through (read up front by `storedFor`). */
export interface StoredLookups {
  amplifiers: AmplifierLookup;
  catalogue: CatalogueLookup;
}

/** Read the registered amplifiers and catalogues a request names, before the synchronous work. */
export async function storedFor(services: Services, amplifierSpecs: unknown[], valueSources: unknown): Promise<StoredLookups> {
  const [amplifiers, catalogue] = await Promise.all([
    services.amplifiers.forSpecs(...amplifierSpecs),
    catalogueLookupFor(services, cataloguesNamedIn(valueSources)),
  ]);
  return { amplifiers, catalogue };
}

export function valueSourceFromBody(src: SourceBody, services: StoredLookups, pointer: string): ValueSource {
  if ('catalogue' in src) return { catalogue: services.catalogue(src.catalogue, `${pointer}/catalogue`) };
  return src as ValueSource;
}

export function roleSourcesFromBody(
  body: { resistor?: SourceBody; capacitor?: SourceBody; roles?: Record<string, SourceBody> },
  services: StoredLookups,
  pointer = '/values',
): RoleSources {
  const out: { resistor?: ValueSource; capacitor?: ValueSource; roles?: Record<string, ValueSource> } = {};
  if (body.resistor) out.resistor = valueSourceFromBody(body.resistor, services, `${pointer}/resistor`);
  if (body.capacitor) out.capacitor = valueSourceFromBody(body.capacitor, services, `${pointer}/capacitor`);
  if (body.roles) {
    out.roles = {};
    for (const [role, src] of Object.entries(body.roles)) out.roles[role] = valueSourceFromBody(src, services, `${pointer}/roles/${role}`);
  }
  return out;
}

function reference(p: RoleValue['parts'][number]) {
  const out: Record<string, unknown> = { tolerance: p.tolerance };
  if (p.series) out.series = p.series;
  if (p.partNumber) out.partNumber = p.partNumber;
  if (p.catalogueId) out.catalogue = p.catalogueId;
  if (p.dielectric) out.dielectric = p.dielectric;
  return out;
}

/** A fitted role on the wire: a single part carries its reference inline, a combination lists both parts. */
export function fittedJson(v: RoleValue): Record<string, unknown> {
  if (v.arrangement === 'single') return { value: v.value, arrangement: 'single', ...reference(v.parts[0]) };
  return { value: v.value, arrangement: v.arrangement, parts: v.parts.map((p) => ({ value: p.value, ...reference(p) })) };
}

export function fittedPartsJson(parts: Record<string, RoleValue>): Record<string, unknown>[] {
  return Object.entries(parts).map(([role, v]) => ({ role, ...fittedJson(v) }));
}

export function predictionJson(a: AnalysisResult) {
  return {
    frequencyHz: a.frequencyHz,
    dutyCycle: a.dutyCycle,
    model: a.model,
    thresholds: { upperV: a.thresholds.upperV, lowerV: a.thresholds.lowerV },
    supplyCurrentA: a.currents.supplyAverageA,
  };
}

function choiceJson(c: SnapChoice | null | undefined) {
  return c ? { ...fittedJson(c), error: c.error } : null;
}

/** Widest span a single-value snap needs around its ideal: neighbours and two-part partners down to 1/1000 of it. */
const SINGLE_SPAN = 1000;

function snapOneValue(v: NonNullable<SnapRequestBody['values']>[number], index: number, services: StoredLookups) {
  const at = `/values/${index}`;
  const ideal = parseComponentValue(v.ideal, v.kind, `${at}/ideal`);
  checkInRange(ideal, componentRange(v.kind), `a ${v.kind} value`, `${at}/ideal`);
  const source = valueSourceFromBody(v.source as SourceBody, services, `${at}/source`);
  const range = 'series' in source ? { min: ideal / SINGLE_SPAN, max: ideal * SINGLE_SPAN } : { min: Number.MIN_VALUE, max: Number.MAX_VALUE };
  const set = buildValueSet(source, v.kind, range, { pointer: `${at}/source` });
  const snap = snapValue(ideal, set, v.combinations ?? false);
  const out: Record<string, unknown> = {
    ideal,
    kind: v.kind,
    nearest: choiceJson(snap.nearest),
    lower: choiceJson(snap.lower),
    higher: choiceJson(snap.higher),
  };
  if (v.label !== undefined) out.label = v.label;
  if (v.combinations) out.combination = choiceJson(snap.combination);
  return out;
}

function candidateJson(c: JointCandidate) {
  return {
    topology: c.topology,
    parts: fittedPartsJson(c.parts),
    predicted: predictionJson(c.analysis),
    frequencyError: c.frequencyError,
    dutyCycleError: c.dutyCycleError,
    checks: c.analysis.checks,
  };
}

function snapCircuit(body: CircuitSnapBody, services: StoredLookups) {
  const amplifier = resolveAmplifierSpec((body.amplifier ?? 'ideal') as string | Record<string, unknown>, services.amplifiers, '/amplifier');
  const r = body.ranges ?? {};
  let ideal: Record<string, number> | undefined;
  if (body.hysteresis?.ideal) {
    ideal = {};
    for (const [role, value] of Object.entries(body.hysteresis.ideal)) {
      ideal[role] = parseComponentValue(value as string | number, 'resistor', `/hysteresis/ideal/${role}`);
      checkInRange(ideal[role], RESISTANCE_RANGE_OHM, 'a resistor value', `/hysteresis/ideal/${role}`);
    }
  }
  const result = jointSnap({
    topology: body.topology,
    supply: { positiveV: body.supply.positiveV, negativeV: body.supply.negativeV ?? 0 },
    amplifier,
    targetFrequencyHz: body.targetFrequencyHz,
    targetDutyCycle: body.targetDutyCycle,
    dutyTolerance: body.dutyTolerance,
    values: roleSourcesFromBody(body.values as never, services),
    ranges: {
      ...(r.rMinOhm !== undefined || r.rMaxOhm !== undefined ? { resistor: { min: r.rMinOhm ?? 100, max: r.rMaxOhm ?? 10e6 } } : {}),
      ...(r.cMinF !== undefined || r.cMaxF !== undefined ? { capacitor: { min: r.cMinF ?? 100e-12, max: r.cMaxF ?? 10e-6 } } : {}),
    },
    dielectrics: body.dielectrics,
    hysteresis: { ...body.hysteresis, ideal },
    combine: body.combine,
    count: body.count,
  });
  return { candidates: result.candidates.map(candidateJson), search: result.stats };
}

export const snapRoutes: FastifyPluginAsyncTypebox = async (app) => {
  app.post(
    '/v1/snap',
    {
      schema: {
        tags: ['design'],
        summary: 'Snap ideal values to a series or catalogue',
        description:
          'Per value: the nearest, next-lower and next-higher values of a series or catalogue with their errors, optionally the best two-part combination. ' +
          'Per circuit: the best joint choices of timing resistor, timing capacitor and threshold-network resistors for a frequency (and duty) target, each analysed in full.',
        body: ref(SnapRequest),
        response: { 200: ref(SnapResponse), ...problemResponses(400, 401, 403, 413, 415, 422) },
      },
    },
    async (request) => {
      const body = request.body;
      if (!body.values && !body.circuit) {
        throw new HttpProblem(400, 'validation', 'Give `values`, `circuit` or both', [{ pointer: '/', detail: 'needs values or circuit' }]);
      }
      const stored = await storedFor(app.services, [body.circuit?.amplifier], [body.values, body.circuit?.values]);
      const values = (body.values ?? []).map((v, i) => snapOneValue(v, i, stored));
      const out: Record<string, unknown> = { values };
      if (body.circuit) {
        const circuit = body.circuit;
        out.circuit = withPointerPrefix('/circuit', () => snapCircuit(circuit, stored));
      }
      return out as never;
    },
  );
};
