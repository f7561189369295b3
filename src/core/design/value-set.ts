/**
 * The values a role may take: a preferred-number series clipped to a range, or
 * the designable parts of a catalogue. Every option remembers where it came
 * from so a design can name the part (series name, or part number and catalogue).
 */
import { CoreError } from '../errors.ts';
import { designableParts, type Catalogue, type CataloguePart, type PartStatus } from '../parts/catalogue.ts';
import { parseDielectric, timingDielectricVerdict } from '../parts/dielectric.ts';
import { seriesTolerance, seriesValues, type SeriesName } from '../parts/series.ts';

export type ValueKind = 'resistor' | 'capacitor';

/** Where a role's values come from. */
export type ValueSource = { series: SeriesName; tolerance?: number } | { catalogue: Catalogue };

export interface PartOption {
  /** Resistance in ohm or capacitance in farad, by the role's kind. */
  value: number;
  /** Tolerance as a fraction (0.01 = 1 %). */
  tolerance: number;
  series?: SeriesName;
  partNumber?: string;
  catalogueId?: string;
  dielectric?: string;
  tempcoPpmPerK?: number;
  /** Capacitors from a catalogue: rated voltage, V, and package (EIA inch case code when it is one). */
  ratedVoltageV?: number;
  caseSize?: string;
}

export interface ValueSet {
  kind: ValueKind;
  /** Ascending by value, one option per value. */
  options: readonly PartOption[];
  /** The option values, ascending, for bisection. */
  values: Float64Array;
}

export interface ValueRange {
  min: number;
  max: number;
}

export interface ValueSetOptions {
  /** Allowed dielectric codes for capacitors (case-insensitive); parts without a dielectric pass only when the list is absent. */
  dielectrics?: readonly string[];
  /** JSON pointer of the source field, for errors. */
  pointer?: string;
  /** A timing capacitor: catalogue parts the shared dielectric verdict calls an error are left out. */
  timingCapacitor?: { allowHighK: boolean };
}

/** Whether the shared timing-dielectric verdict lets a part into a timing role (unknown codes pass: the checks report them). */
function fitsTiming(part: CataloguePart, allowHighK: boolean): boolean {
  if (!part.dielectric) return true;
  const d = tryParseDielectric(part.dielectric);
  return !d || timingDielectricVerdict(d, { allowHighK })?.severity !== 'error';
}

function tryParseDielectric(code: string) {
  try {
    return parseDielectric(code);
  } catch {
    return undefined;
  }
}

const STATUS_RANK: Record<PartStatus, number> = { preferred: 0, active: 1, 'not-for-new-designs': 2 };

/** 0 for bodies that hold their value (class I ceramics, film, mica, or unknown), 1 for class II/III ceramics. */
function highKRank(part: CataloguePart): number {
  const d = part.dielectric ? tryParseDielectric(part.dielectric) : undefined;
  return d && (d.family === 'ceramic-class-2' || d.family === 'ceramic-class-3') ? 1 : 0;
}

/**
 * Of two parts with the same value, the one to offer: a class I, film or mica capacitor before a class II/III
 * one (no DC-bias or ageing loss), then preferred status, then the tighter tolerance.
 */
function betterPart(a: CataloguePart, b: CataloguePart): CataloguePart {
  const byBody = highKRank(a) - highKRank(b);
  if (byBody !== 0) return byBody < 0 ? a : b;
  const byStatus = STATUS_RANK[a.status] - STATUS_RANK[b.status];
  if (byStatus !== 0) return byStatus < 0 ? a : b;
  return a.tolerance <= b.tolerance ? a : b;
}

function fromCatalogue(catalogue: Catalogue, kind: ValueKind, range: ValueRange, options: ValueSetOptions): PartOption[] {
  const allowed = options.dielectrics?.map((d) => d.toUpperCase());
  const byValue = new Map<number, CataloguePart>();
  for (const part of designableParts(catalogue, kind)) {
    if (part.value < range.min || part.value > range.max) continue;
    if (kind === 'capacitor' && allowed && !(part.dielectric && allowed.includes(part.dielectric.toUpperCase()))) continue;
    if (kind === 'capacitor' && options.timingCapacitor && !fitsTiming(part, options.timingCapacitor.allowHighK)) continue;
    const seen = byValue.get(part.value);
    byValue.set(part.value, seen ? betterPart(seen, part) : part);
  }
  return [...byValue.values()]
    .sort((a, b) => a.value - b.value)
    .map((p) => {
      const o: PartOption = { value: p.value, tolerance: p.tolerance, partNumber: p.partNumber, catalogueId: catalogue.id };
      if (p.dielectric !== undefined) o.dielectric = p.dielectric;
      if (p.tempcoPpmPerK !== undefined) o.tempcoPpmPerK = p.tempcoPpmPerK;
      if (p.ratedVoltageV !== undefined) o.ratedVoltageV = p.ratedVoltageV;
      if (p.package !== undefined) o.caseSize = p.package;
      return o;
    });
}

/**
 * The options of one source within [range.min, range.max]. An empty result is
 * 'infeasible' (nothing to choose from), with the source's pointer.
 */
export function buildValueSet(source: ValueSource, kind: ValueKind, range: ValueRange, options: ValueSetOptions = {}): ValueSet {
  if (!(range.min > 0) || !(range.max >= range.min) || !Number.isFinite(range.max)) {
    throw new CoreError('infeasible', `No ${kind} value can satisfy the range ${range.min} to ${range.max}`, options.pointer);
  }
  let list: PartOption[];
  if ('series' in source) {
    const tolerance = source.tolerance ?? seriesTolerance(source.series);
    list = seriesValues(source.series, range.min, range.max).map((value) => ({ value, tolerance, series: source.series }));
  } else {
    list = fromCatalogue(source.catalogue, kind, range, options);
  }
  if (list.length === 0) {
    const what = 'series' in source ? `series ${source.series}` : `catalogue '${source.catalogue.id}'`;
    const filter = kind === 'capacitor' && options.dielectrics && !('series' in source) ? ` with dielectric ${options.dielectrics.join('/')}` : '';
    throw new CoreError('infeasible', `The ${what} has no designable ${kind} values${filter} between ${range.min} and ${range.max}`, options.pointer, {
      rangeMin: range.min,
      rangeMax: range.max,
    });
  }
  return { kind, options: list, values: Float64Array.from(list, (o) => o.value) };
}

/** Index of the first value >= x (values.length when none). */
export function lowerBound(values: Float64Array, x: number): number {
  let lo = 0;
  let hi = values.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (values[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
