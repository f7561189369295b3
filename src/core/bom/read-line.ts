/**
 * A BOM line -> the attributes the rules need, for the role it fills (the role
 * says resistor or capacitor, which settles codes like "103").
 *
 * The value column is read with parseBomValueText. Two additions for BOMs:
 * - an EIA-96 marking ("01C", "24C") left unread by the value text is tried as
 *   such on resistors; EIA-96 marks 1 % parts, so it implies 1 % when no
 *   tolerance is written (common practice);
 * - attributes missing from the value column (tolerance, voltage, dielectric,
 *   tempco, package) are taken from the description ("CAP CER 50V X7R"), never
 *   the value itself: descriptions are free text and their numbers mean many things.
 */
import { parseBomValueText, type BomValueText } from '../parts/bom-value-text.ts';
import { formatValue, parseEia96Code, type ComponentKind } from '../parts/value-parse.ts';
import type { BomLine, BomLineReading } from './types.ts';

/** EIA-96 is the marking system of 1 % E96 resistors (common practice). */
export const EIA96_IMPLIED_TOLERANCE = 0.01;

const EIA96_SHAPE = /^\d{2}[A-Z]$/;

function percent(fraction: number): string {
  return `${Number((fraction * 100).toPrecision(6))} %`;
}

function tryEia96(token: string): number | undefined {
  if (!EIA96_SHAPE.test(token)) return undefined;
  try {
    return parseEia96Code(token);
  } catch {
    return undefined;
  }
}

/**
 * BOM value texts repeat heavily across a batch ("68K 1% 0603" on every board),
 * and reading one costs tens of microseconds: readings are memoised by kind and
 * text. parseBomValueText is a pure function; the cache is bounded and starts
 * over when full. Cached readings are shared, so callers copy before changing.
 */
const VALUE_TEXT_CACHE_LIMIT = 10_000;
const valueTextCache = new Map<string, BomValueText>();

function readValueText(text: string, kind: ComponentKind): BomValueText {
  const key = `${kind}\u0000${text}`;
  let reading = valueTextCache.get(key);
  if (reading === undefined) {
    reading = parseBomValueText(text, kind);
    if (valueTextCache.size >= VALUE_TEXT_CACHE_LIMIT) valueTextCache.clear();
    valueTextCache.set(key, reading);
  }
  return reading;
}

function fromValueText(reading: BomLineReading, text: BomValueText): void {
  reading.value = text.value;
  if (text.tolerance !== undefined) {
    reading.tolerance = text.tolerance;
    reading.toleranceSource = 'text';
  }
  reading.ratedVoltageV = text.ratedVoltageV;
  reading.dielectricCode = text.dielectric?.code;
  reading.tempcoPpmPerK = text.tempcoPpmPerK;
  reading.packageCode = text.packageCode;
  reading.understood.push(...text.understood);
  reading.unparsed.push(...text.unparsed);
  reading.notes.push(...text.notes);
}

function eia96Fallback(reading: BomLineReading): void {
  for (const token of reading.unparsed) {
    const value = tryEia96(token);
    if (value === undefined) continue;
    reading.value = value;
    reading.unparsed = reading.unparsed.filter((t) => t !== token);
    // The value text refused it as an ambiguous or unknown reading; the note no longer applies.
    reading.notes = reading.notes.filter((n) => !n.includes(`"${token}"`));
    reading.understood.push(`value ${formatValue(value, 'resistor')} from "${token}" (EIA-96 code)`);
    if (reading.tolerance === undefined) {
      reading.tolerance = EIA96_IMPLIED_TOLERANCE;
      reading.toleranceSource = 'code';
      reading.understood.push(`tolerance ±${percent(EIA96_IMPLIED_TOLERANCE)} implied by the EIA-96 marking`);
    }
    return;
  }
}

function fillFromDescription(reading: BomLineReading, description: string, kind: ComponentKind): void {
  const d = readValueText(description, kind);
  if (reading.tolerance === undefined && d.tolerance !== undefined) {
    reading.tolerance = d.tolerance;
    reading.toleranceSource = 'description';
    reading.understood.push(`tolerance ±${percent(d.tolerance)} from the description`);
  }
  if (reading.ratedVoltageV === undefined && d.ratedVoltageV !== undefined) {
    reading.ratedVoltageV = d.ratedVoltageV;
    reading.understood.push(`rated voltage ${d.ratedVoltageV} V from the description`);
  }
  if (reading.dielectricCode === undefined && d.dielectric !== undefined) {
    reading.dielectricCode = d.dielectric.code;
    reading.understood.push(`dielectric ${d.dielectric.code} from the description`);
  }
  if (reading.tempcoPpmPerK === undefined && d.tempcoPpmPerK !== undefined) {
    reading.tempcoPpmPerK = d.tempcoPpmPerK;
    reading.understood.push(`temperature coefficient ${d.tempcoPpmPerK} ppm/K from the description`);
  }
  if (reading.packageCode === undefined && d.packageCode !== undefined) {
    reading.packageCode = d.packageCode;
    reading.understood.push(`package ${d.packageCode} from the description`);
  }
}

/** Reads one line for a role of the given kind. Never throws: what is not understood is reported. */
export function readBomLine(line: BomLine, role: string, kind: ComponentKind): BomLineReading {
  const valueText = typeof line.value === 'string' ? line.value : '';
  const reading: BomLineReading = { refdes: line.refdes, role, kind, valueText, understood: [], unparsed: [], notes: [] };
  if (line.partNumber !== undefined) reading.partNumber = line.partNumber;
  fromValueText(reading, readValueText(valueText, kind));
  if (reading.value === undefined && kind === 'resistor') eia96Fallback(reading);
  if (line.description) fillFromDescription(reading, line.description, kind);
  return reading;
}
