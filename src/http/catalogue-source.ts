/**
 * Stored catalogue bodies -> the core's Catalogue (values in SI base units,
 * dielectric codes canonical). The same reading validates a PUT before it is
 * stored and serves design/snap later, so what was accepted is what is used.
 */
import { CoreError } from '../core/errors.ts';
import { checkInRange, componentRange } from '../core/value-ranges.ts';
import { parseComponentValue, parseDielectric, type Catalogue, type CataloguePart } from '../core/parts/index.ts';
import { StoreError } from '../store/index.ts';
import type { CataloguePartBody, CatalogueWriteBody } from './schemas/catalogue.ts';
import type { Services } from './services.ts';

/**
 * The checks a schema cannot express, with a JSON pointer into the body for the
 * first failure: value strings parse for their kind, dielectric codes parse and
 * sit on capacitors only, part numbers are unique. Throws CoreError('invalid-value').
 */
export function readCatalogueParts(body: CatalogueWriteBody, pointer = ''): CataloguePart[] {
  if (!Array.isArray(body.parts)) throw new CoreError('invalid-value', 'parts must be an array', `${pointer}/parts`);
  const seenPartNumbers = new Map<string, number>();
  return body.parts.map((part, index) => {
    const at = `${pointer}/parts/${index}`;
    const earlier = seenPartNumbers.get(part.partNumber);
    if (earlier !== undefined) {
      throw new CoreError('invalid-value', `part number '${part.partNumber}' already appears at /parts/${earlier}`, `${at}/partNumber`);
    }
    seenPartNumbers.set(part.partNumber, index);
    return readPart(part, at);
  });
}

function readPart(part: CataloguePartBody, at: string): CataloguePart {
  const value = parseComponentValue(part.value, part.kind, `${at}/value`);
  // The value ranges /v1/analyze accepts: a catalogue cannot hold a part no circuit may use.
  checkInRange(value, componentRange(part.kind), `a ${part.kind} value`, `${at}/value`);
  const out: CataloguePart = {
    kind: part.kind,
    value,
    tolerance: part.tolerance,
    partNumber: part.partNumber,
    status: part.status,
  };
  if (part.dielectric !== undefined) {
    if (part.kind !== 'capacitor') {
      throw new CoreError('invalid-value', 'a dielectric belongs to capacitors only', `${at}/dielectric`);
    }
    out.dielectric = parseDielectric(part.dielectric, `${at}/dielectric`).code;
  }
  if (part.tempcoPpmPerK !== undefined) out.tempcoPpmPerK = part.tempcoPpmPerK;
  if (part.ratedVoltageV !== undefined) out.ratedVoltageV = part.ratedVoltageV;
  if (part.package !== undefined) out.package = part.package;
  return out;
}

/**
 * A stored catalogue for the calculation core. Missing -> CoreError('unknown-reference')
 * at `pointer` (the request field that named it). A stored body that no longer reads
 * is the store's fault, not the caller's: StoreError('corrupt').
 */
export async function getCatalogue(services: Services, id: string, pointer?: string): Promise<Catalogue> {
  const doc = await services.store.catalogues.get(id);
  if (!doc) throw new CoreError('unknown-reference', `No catalogue with id '${id}'`, pointer);
  const body = doc.body as unknown as CatalogueWriteBody;
  let parts: CataloguePart[];
  try {
    parts = readCatalogueParts(body);
  } catch (error) {
    if (error instanceof CoreError) {
      throw new StoreError('corrupt', `stored catalogue '${id}' no longer reads: ${error.message}`, { id, pointer: error.pointer }, { cause: error });
    }
    throw error;
  }
  const catalogue: Catalogue = { id, parts };
  if (typeof body.name === 'string') catalogue.name = body.name;
  return catalogue;
}

/** Synchronous catalogue resolution for one request (the core reads catalogues mid-calculation). */
export type CatalogueLookup = (id: string, pointer?: string) => Catalogue;

/**
 * Read every catalogue a request names, once and in parallel, before the
 * synchronous core runs. Each outcome is kept, failures included, and replayed
 * when the core asks for that id: a missing id answers unknown-reference at the
 * pointer of the field that named it, a corrupt one throws its StoreError then
 * (so a BOM batch can still fail just the assembly that names it).
 */
export async function catalogueLookupFor(services: Services, ids: Iterable<unknown>): Promise<CatalogueLookup> {
  const wanted = [...new Set([...ids].filter((id): id is string => typeof id === 'string'))];
  const outcomes = new Map<string, Catalogue | { failure: unknown }>();
  await Promise.all(
    wanted.map(async (id) => {
      try {
        outcomes.set(id, await getCatalogue(services, id));
      } catch (failure) {
        outcomes.set(id, { failure });
      }
    }),
  );
  return (id, pointer) => {
    const outcome = outcomes.get(id);
    if (outcome === undefined || ('failure' in outcome && outcome.failure instanceof CoreError && outcome.failure.code === 'unknown-reference')) {
      throw new CoreError('unknown-reference', `No catalogue with id '${id}'`, pointer);
    }
    if ('failure' in outcome) throw outcome.failure;
    return outcome;
  };
}

/** Catalogue ids named anywhere in a value-source subtree of a request body (`{ catalogue: id }` objects). */
export function cataloguesNamedIn(node: unknown, out: string[] = []): string[] {
  if (Array.isArray(node)) {
    for (const item of node) cataloguesNamedIn(item, out);
  } else if (typeof node === 'object' && node !== null) {
    for (const [key, value] of Object.entries(node)) {
      if (key === 'catalogue' && typeof value === 'string') out.push(value);
      else cataloguesNamedIn(value, out);
    }
  }
  return out;
}
