/**
 * The value column of a BOM line ("3K3 1% 0603", "10nF 50V C0G 5%") -> its attributes.
 *
 * BOM text mixes the value with tolerance, voltage, dielectric, tempco and package in
 * no fixed order, so each token is offered to a list of recognisers. Nothing is thrown
 * for a token that is not understood: it is returned in `unparsed` for the caller's checks.
 *
 * Conventions specific to this context (the value column of a BOM is a code context):
 * - a bare 3-digit number is the IEC 60062 numeric code ("103" = 10 kΩ, or 10 nF on a
 *   capacitor, picofarad base); "104M" on a capacitor is code + tolerance letter;
 * - a bare 4-digit number on a resistor is read as a code only when that is the only
 *   reading giving a preferred-number value ("4702" = 47 kΩ); "4700" (4700 Ω or 470 Ω)
 *   is reported as ambiguous;
 * - a lone upper-case letter after the value is a tolerance letter ("103 K" = ±10 %);
 * - a capacitor value needs a prefix or unit: "47" alone could be pF or µF on old BOMs;
 * - imperial package codes (0603, 1206...) win over numeric codes of the same digits.
 */
import { parseDielectric, type Dielectric } from './dielectric.ts';
import { isInSeries } from './series.ts';
import {
  formatValue,
  parseComponentValue,
  parseNumericCode,
  parseToleranceLetter,
  TOLERANCE_LETTER_CODES,
  type ComponentKind,
  type ToleranceBand,
} from './value-parse.ts';

export interface BomValueText {
  /** The kind used for reading the value: the caller's expected kind, or inferred from units. */
  kind?: ComponentKind;
  /** The component value in the kind's SI base unit (ohm for resistors, farad for capacitors). */
  value?: number;
  resistanceOhm?: number;
  capacitanceF?: number;
  /** Tolerance as a fraction (0.01 for 1 %); for an asymmetric band the larger side (conservative). */
  tolerance?: number;
  toleranceBand?: Omit<ToleranceBand, 'letter'>;
  ratedVoltageV?: number;
  dielectric?: Dielectric;
  /** Temperature coefficient written in the text (resistor "25ppm" as a magnitude, capacitor "N750" signed). */
  tempcoPpmPerK?: number;
  packageCode?: string;
  /** What was recognised, in words. */
  understood: string[];
  /** Tokens not understood (or duplicated), as written. */
  unparsed: string[];
  /** Readings that were possible but refused, and why. */
  notes: string[];
}

/** Imperial chip sizes common on BOMs. */
const IMPERIAL_PACKAGES = new Set(['01005', '0201', '0402', '0603', '0805', '1206', '1210', '1806', '1812', '2010', '2220', '2512']);
const PACKAGE_WORDS = new Set(['SMD', 'SMT', 'THT', 'TH', 'AXIAL', 'RADIAL', 'MELF', 'MINIMELF']);

function percent(fraction: number): string {
  return `${Number((fraction * 100).toPrecision(6))} %`;
}

/** Brings the text into a shape where tokens split on whitespace and "/" keep their meaning. */
function normalise(text: string): string {
  return text
    .replace(/[\u00B5\u03BC]/g, 'u')
    .replace(/\u2126/g, '\u03A9')
    .replace(/\+\s*\/\s*-|\+-/g, '±')
    .replace(/ppm\s*\/\s*(K|°C|C)\b/gi, 'ppm')
    .replace(/(\d)\s+(%|ppm\b)/gi, '$1$2');
}

const ASYMMETRIC_TOLERANCE = /\+\s*(\d+(?:\.\d+)?)\s*%?\s*\/\s*-\s*(\d+(?:\.\d+)?)\s*%/;

/** Unit-bearing or lower-case prefix tokens that belong to the number before them ("10 nF", "4.7 k"). */
const VALUE_WITH_UNIT = /^[pnumkKMG]?(F|Ω|ohms?)$/i;
const LOWERCASE_PREFIX = /^[pnumk]$/;
const VOLTAGE_SUFFIX = /^k?V(DC)?$/i;

function tokenise(text: string): string[] {
  const raw = text.split(/[\s,;/]+/).filter(Boolean);
  const out: string[] = [];
  for (let i = 0; i < raw.length; i++) {
    const t = raw[i];
    const next = raw[i + 1];
    const isNumber = /^\d*\.?\d+$/.test(t);
    const joins =
      next !== undefined &&
      isNumber &&
      // A single capital ("103 K") stays apart: it is a tolerance letter, not a prefix.
      ((VALUE_WITH_UNIT.test(next) && !/^[A-Z]$/.test(next)) || LOWERCASE_PREFIX.test(next) || VOLTAGE_SUFFIX.test(next));
    if (joins) {
      out.push(t + next);
      i++;
    } else {
      out.push(t);
    }
  }
  return out;
}

function tryValue(token: string, kind: ComponentKind): number | undefined {
  try {
    return parseComponentValue(token, kind);
  } catch {
    return undefined;
  }
}

/** Kind from the text alone, when the caller does not say: units, capacitor attributes, ppm. */
function inferKind(tokens: readonly string[]): ComponentKind | undefined {
  let capacitor = false;
  let resistor = false;
  for (const t of tokens) {
    const asR = tryValue(t, 'resistor') !== undefined;
    const asC = tryValue(t, 'capacitor') !== undefined;
    if (asR && !asC) resistor = true;
    if (asC && !asR) capacitor = true;
    if (/^\d+(\.\d+)?k?V$/i.test(t) || isDielectricWord(t)) capacitor = true;
    if (/^±?\d+(\.\d+)?ppm$/i.test(t)) resistor = true;
  }
  if (capacitor === resistor) return undefined;
  return capacitor ? 'capacitor' : 'resistor';
}

/** Most tokens remembered by findDielectric before it starts over (bounds memory on odd inputs). */
const DIELECTRIC_MEMO_LIMIT = 2048;
/** Token -> its dielectric, or null for "not a dielectric". */
const dielectricMemo = new Map<string, Dielectric | null>();

/**
 * The dielectric a token names, or undefined; never throws. parseDielectric reports an
 * unknown word by throwing, and most tokens of a value column ("1%", "0603", "50V") are
 * not dielectrics: an error with its stack for each of them costs far more than the parse.
 * A token is parsed once and remembered (BOM batches repeat the same few tokens),
 * so each distinct non-dielectric token costs one throw per process, not one per line.
 * Each call returns its own copy, so a caller may not change what others get.
 */
function findDielectric(token: string): Dielectric | undefined {
  let known = dielectricMemo.get(token);
  if (known === undefined) {
    try {
      known = parseDielectric(token);
    } catch {
      known = null;
    }
    if (dielectricMemo.size >= DIELECTRIC_MEMO_LIMIT) dielectricMemo.clear();
    dielectricMemo.set(token, known);
  }
  return known === null ? undefined : { ...known };
}

function isDielectricWord(token: string): boolean {
  return findDielectric(token) !== undefined;
}

function inAnySeries(value: number): boolean {
  return isInSeries('E24', value, 1e-9) || isInSeries('E192', value, 1e-9);
}

interface ValueReading {
  value: number;
  how: string;
  toleranceLetter?: string;
}

/** The BOM-context value readings of one token, or a note explaining why none is taken. */
function readValue(token: string, kind: ComponentKind): ValueReading | { note: string } | undefined {
  if (/^\d{3}$/.test(token)) {
    try {
      return { value: parseNumericCode(token, kind), how: '3-digit numeric code' };
    } catch {
      return undefined;
    }
  }
  const codeWithLetter = /^(\d{3})([A-Z])$/.exec(token);
  if (kind === 'capacitor' && codeWithLetter && TOLERANCE_LETTER_CODES.includes(codeWithLetter[2])) {
    try {
      return { value: parseNumericCode(codeWithLetter[1], kind), how: '3-digit numeric code', toleranceLetter: codeWithLetter[2] };
    } catch {
      return undefined;
    }
  }
  if (/^\d{4}$/.test(token)) {
    if (kind === 'capacitor') return { note: `"${token}": a bare number on a capacitor has no unit (pF or µF?)` };
    let code: number | undefined;
    try {
      code = parseNumericCode(token, kind);
    } catch {
      code = undefined;
    }
    const plain = Number(token);
    const codeFits = code !== undefined && inAnySeries(code);
    const plainFits = plain > 0 && inAnySeries(plain);
    if (codeFits && !plainFits) return { value: code as number, how: '4-digit numeric code' };
    if (plainFits && !codeFits) return { value: plain, how: 'number in ohms' };
    return {
      note: `"${token}" is ambiguous: ${formatValue(plain, kind)} as a number or ${code === undefined ? 'nothing' : formatValue(code, kind)} as a 4-digit code`,
    };
  }
  if (kind === 'capacitor' && /^\d*\.?\d+$/.test(token)) {
    return { note: `"${token}": a bare number on a capacitor has no unit (pF or µF?)` };
  }
  const v = tryValue(token, kind);
  return v === undefined ? undefined : { value: v, how: 'value' };
}

/**
 * Parses a BOM value text. `expectedKind` comes from the line's role (r... resistors,
 * c... capacitors); without it the kind is inferred from units when they settle it.
 */
export function parseBomValueText(text: string, expectedKind?: ComponentKind): BomValueText {
  const result: BomValueText = { understood: [], unparsed: [], notes: [] };
  let working = normalise(typeof text === 'string' ? text : '');

  const setTolerance = (band: Omit<ToleranceBand, 'letter'>, source: string): boolean => {
    if (result.toleranceBand) return false;
    result.toleranceBand = { plusFraction: band.plusFraction, minusFraction: band.minusFraction, asymmetric: band.asymmetric };
    result.tolerance = Math.max(band.plusFraction, band.minusFraction);
    result.understood.push(
      band.asymmetric
        ? `tolerance +${percent(band.plusFraction)}/-${percent(band.minusFraction)} from "${source}"`
        : `tolerance ±${percent(band.plusFraction)} from "${source}"`,
    );
    return true;
  };

  const asym = ASYMMETRIC_TOLERANCE.exec(working);
  if (asym) {
    const plus = Number(asym[1]) / 100;
    const minus = Number(asym[2]) / 100;
    setTolerance({ plusFraction: plus, minusFraction: minus, asymmetric: plus !== minus }, asym[0]);
    working = working.replace(asym[0], ' ');
  }

  const tokens = tokenise(working);
  const kind = expectedKind ?? inferKind(tokens);
  if (kind) result.kind = kind;

  for (let i = 0; i < tokens.length; i++) {
    const t = tokens[i];
    const upper = t.toUpperCase();

    const pct = /^±?(\d+(?:\.\d+)?)%$/.exec(t);
    if (pct) {
      const f = Number(pct[1]) / 100;
      if (!setTolerance({ plusFraction: f, minusFraction: f, asymmetric: false }, t)) result.unparsed.push(t);
      continue;
    }

    const volts = /^(\d+(?:\.\d+)?)(k?)V(?:DC)?$/i.exec(t) ?? /^(\d+)V(\d+)$/i.exec(t);
    if (volts && result.ratedVoltageV === undefined) {
      const isRkm = /^\d+V\d+$/i.test(t);
      const v = isRkm ? Number(`${volts[1]}.${volts[2]}`) : Number(volts[1]) * (volts[2].toLowerCase() === 'k' ? 1000 : 1);
      result.ratedVoltageV = v;
      result.understood.push(`rated voltage ${v} V from "${t}"`);
      continue;
    }

    const ppm = /^±?(\d+(?:\.\d+)?)ppm$/i.exec(t);
    if (ppm && result.tempcoPpmPerK === undefined) {
      result.tempcoPpmPerK = Number(ppm[1]);
      result.understood.push(`temperature coefficient ±${ppm[1]} ppm/K from "${t}"`);
      continue;
    }

    if ((IMPERIAL_PACKAGES.has(t) || PACKAGE_WORDS.has(upper)) && result.packageCode === undefined) {
      result.packageCode = IMPERIAL_PACKAGES.has(t) ? t : upper;
      result.understood.push(IMPERIAL_PACKAGES.has(t) ? `package ${t} (imperial chip size)` : `package ${upper}`);
      continue;
    }

    // Old capacitor tempco notation: N750 = -750 ppm/K, P100 = +100 ppm/K (NP0 is a dielectric).
    const oldTempco = /^([NP])(\d{2,4})$/.exec(upper);
    if (oldTempco && kind !== 'resistor' && result.tempcoPpmPerK === undefined) {
      result.tempcoPpmPerK = (oldTempco[1] === 'N' ? -1 : 1) * Number(oldTempco[2]);
      result.understood.push(`temperature coefficient ${result.tempcoPpmPerK} ppm/K from "${t}"`);
      continue;
    }

    if (kind !== 'resistor' && result.dielectric === undefined) {
      // Two-word names first ("aluminium electrolytic").
      const pair = tokens[i + 1] !== undefined ? `${t} ${tokens[i + 1]}` : undefined;
      const pairDielectric = pair !== undefined ? findDielectric(pair) : undefined;
      if (pairDielectric) {
        result.dielectric = pairDielectric;
        result.understood.push(`dielectric ${pairDielectric.code} (${pairDielectric.family}) from "${pair}"`);
        i++;
        continue;
      }
      const dielectric = findDielectric(t);
      if (dielectric) {
        result.dielectric = dielectric;
        result.understood.push(`dielectric ${dielectric.code} (${dielectric.family}) from "${t}"`);
        continue;
      }
    }

    if (result.value === undefined && kind !== undefined) {
      const reading = readValue(t, kind);
      if (reading && 'value' in reading) {
        result.value = reading.value;
        if (kind === 'resistor') result.resistanceOhm = reading.value;
        else result.capacitanceF = reading.value;
        result.understood.push(`value ${formatValue(reading.value, kind)} from "${t}" (${reading.how})`);
        if (reading.toleranceLetter !== undefined) {
          setTolerance(parseToleranceLetter(reading.toleranceLetter), `${reading.toleranceLetter} in ${t}`);
        }
        continue;
      }
      if (reading && 'note' in reading) {
        result.notes.push(reading.note);
        result.unparsed.push(t);
        continue;
      }
    }

    // A lone capital letter after the value is an IEC 60062 tolerance letter.
    if (result.value !== undefined && /^[A-Z]$/.test(t) && TOLERANCE_LETTER_CODES.includes(t) && !result.toleranceBand) {
      setTolerance(parseToleranceLetter(t), `letter ${t}`);
      continue;
    }

    result.unparsed.push(t);
  }
  if (kind === undefined && tokens.length > 0) {
    result.notes.push('component kind not given and not settled by the text; the value was not read');
  }
  return result;
}
