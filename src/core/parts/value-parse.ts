/**
 * Component value strings -> SI base units (ohm, farad).
 *
 * Accepted forms, by function:
 * - parseComponentValue: finite numbers > 0; SI-prefix strings ("4.7k", "10 nF", "2.2 Mohm");
 *   IEC 60062 RKM codes where the multiplier letter stands for the decimal point
 *   ("4K7", "R47", "4n7", "p68"). Plain numbers ("4700") are base units.
 *   A string of exactly three digits is the EIA three-digit marking code (IEC 60062 numeric
 *   code): "103" = 10 kΩ or 10 nF, "100" = 10 Ω or 10 pF — the one reader for the API and the
 *   BOM reader alike. Plain base units go as JSON numbers or with a unit ("100 Ω", "100R").
 * - parseNumericCode: the 3/4-digit marking code ("103", "4702"); four digits stay out of
 *   parseComponentValue because "4700" reads as both 4700 Ω and 470 × 10^0.
 * - parseEia96Code: two-digit E96 index + multiplier letter ("01C").
 * - parseToleranceLetter: IEC 60062 tolerance letters.
 * Every rejection is a CoreError('invalid-value') with the caller's JSON pointer.
 */
import { CoreError } from '../errors.ts';
import { seriesSignificands } from './series.ts';

export type ComponentKind = 'resistor' | 'capacitor';

const UNIT_SYMBOL: Record<ComponentKind, string> = { resistor: 'Ω', capacitor: 'F' };

/** Decimal exponent for each multiplier letter a kind accepts (SI prefix or RKM letter). */
const RESISTOR_PREFIX_EXP: Readonly<Record<string, number>> = { '': 0, R: 0, k: 3, K: 3, M: 6, G: 9, T: 12, m: -3 };
// Upper-case N/P/U appear in all-capitals BOM exports and cannot be confused with anything.
// Upper-case M is refused for capacitors: old drawings used "MF" for µF, SI reads it as mega.
const CAPACITOR_PREFIX_EXP: Readonly<Record<string, number>> = { '': 0, p: -12, P: -12, n: -9, N: -9, u: -6, U: -6, m: -3 };

function prefixTable(kind: ComponentKind): Readonly<Record<string, number>> {
  return kind === 'resistor' ? RESISTOR_PREFIX_EXP : CAPACITOR_PREFIX_EXP;
}

/** Both micro code points (U+00B5 micro sign, U+03BC Greek mu) become "u"; both ohm code points become "Ω". */
function normaliseSymbols(text: string): string {
  return text.replace(/[\u00B5\u03BC]/g, 'u').replace(/\u2126/g, '\u03A9').trim();
}

function invalid(message: string, pointer?: string): never {
  throw new CoreError('invalid-value', message, pointer);
}

/** A decimal mantissa × 10^exponent through string conversion: correctly rounded, no 4699.999. */
function decimalValue(mantissa: string, exponent: number): number {
  return Number(`${mantissa}e${exponent}`);
}

const RESISTOR_UNIT = /(ohms?|Ω)$/i;
const CAPACITOR_UNIT = /[fF]$/;

interface UnitSplit {
  body: string;
  hasUnit: boolean;
}

/** Removes the kind's unit suffix; a unit of the other kind is a mismatch error. */
function stripUnit(text: string, kind: ComponentKind, original: string, pointer?: string): UnitSplit {
  const own = kind === 'resistor' ? RESISTOR_UNIT : CAPACITOR_UNIT;
  const other = kind === 'resistor' ? CAPACITOR_UNIT : RESISTOR_UNIT;
  const m = own.exec(text);
  if (m) return { body: text.slice(0, m.index).trim(), hasUnit: true };
  if (other.test(text)) {
    const otherKind = kind === 'resistor' ? 'a capacitance (farad)' : 'a resistance (ohm)';
    invalid(`"${original}" is ${otherKind}, but a ${kind} value is expected here`, pointer);
  }
  return { body: text, hasUnit: false };
}

const SI_FORM = /^(\d+(?:\.\d*)?|\.\d+)(?:[eE]([+-]?\d+))?\s*([A-Za-z]?)$/;
const RKM_FORM = /^(\d*)([A-Za-z])(\d+)$/;

function exponentFor(letter: string, kind: ComponentKind, hasUnit: boolean, original: string, pointer?: string): number {
  const table = prefixTable(kind);
  if (!(letter in table)) {
    invalid(`"${original}": multiplier "${letter}" is not valid for a ${kind} (allowed: ${Object.keys(table).filter(Boolean).join(' ')})`, pointer);
  }
  // "m" without a unit is ambiguous for resistors (milli by SI, mega in careless writing), and
  // unusual for capacitors; only accept it when the unit makes the intent plain ("1.5 mΩ", "1 mF").
  if (letter === 'm' && !hasUnit) {
    invalid(`"${original}": "m" without a unit is ambiguous (milli or mega?); write "m${UNIT_SYMBOL[kind]}" or "M"`, pointer);
  }
  // "R" is the RKM ohm marker ("4R7", "47R"); after a unit it makes no sense.
  if (letter === 'R' && hasUnit) invalid(`"${original}": "R" and a unit together are ambiguous`, pointer);
  return table[letter];
}

function requirePositive(value: number, original: string, pointer?: string): number {
  if (!Number.isFinite(value) || value <= 0) invalid(`"${original}" must be a finite value > 0`, pointer);
  return value;
}

/**
 * A component value from an API field: a number in SI base units (finite, > 0), or a string
 * in SI-prefix or IEC 60062 RKM notation. Throws CoreError('invalid-value') otherwise.
 */
const THREE_DIGIT_CODE = /^\d{3}$/;

export function parseComponentValue(text: string | number, kind: ComponentKind, pointer?: string): number {
  if (typeof text === 'number') return requirePositive(text, String(text), pointer);
  if (typeof text !== 'string') invalid(`a ${kind} value must be a number or a string`, pointer);
  const original = text;
  const normalised = normaliseSymbols(text);
  if (normalised === '') invalid(`empty ${kind} value`, pointer);
  // The EIA three-digit marking code: two significant digits and a multiplier ("103" = 10 kΩ / 10 nF).
  if (THREE_DIGIT_CODE.test(normalised)) return parseNumericCode(normalised, kind, pointer);
  const { body, hasUnit } = stripUnit(normalised, kind, original, pointer);

  const si = SI_FORM.exec(body);
  if (si) {
    const exp = exponentFor(si[3], kind, hasUnit, original, pointer);
    return requirePositive(decimalValue(si[1], Number(si[2] ?? 0) + exp), original, pointer);
  }
  const rkm = RKM_FORM.exec(body);
  if (rkm) {
    const exp = exponentFor(rkm[2], kind, hasUnit, original, pointer);
    return requirePositive(decimalValue(`${rkm[1] || '0'}.${rkm[3]}`, exp), original, pointer);
  }
  return invalid(
    `"${original}" is not a ${kind} value: expected a number with an optional SI prefix and unit ` +
      `("4.7k", "10 nF") or an IEC 60062 code ("4K7", "4n7")`,
    pointer,
  );
}

/**
 * The numeric marking code: significant digits then a power-of-ten digit.
 * - resistors: 3 digits ("103" = 10 kΩ) or 4 digits ("4702" = 47 kΩ); "R" as the decimal
 *   point for small values ("4R7", "R10").
 * - capacitors: 3 digits on a picofarad base ("104" = 100 nF); the multiplier digits 8 and 9
 *   mean ×0.01 and ×0.1 (common practice, from memory); "1R5" = 1.5 pF.
 * Only call this where the text is known to be a code (a marking, a BOM value column).
 */
export function parseNumericCode(text: string, kind: ComponentKind, pointer?: string): number {
  const original = text;
  const t = typeof text === 'string' ? text.trim() : '';
  const baseExp = kind === 'capacitor' ? -12 : 0;
  const rDecimal = /^(\d*)[Rr](\d+)$/.exec(t);
  if (rDecimal && (rDecimal[1] + rDecimal[2]).length <= 4) {
    return requirePositive(decimalValue(`${rDecimal[1] || '0'}.${rDecimal[2]}`, baseExp), original, pointer);
  }
  const digits = kind === 'resistor' ? /^(\d{2,3})(\d)$/ : /^(\d{2})(\d)$/;
  const m = digits.exec(t);
  if (!m) {
    const shape = kind === 'resistor' ? '3 or 4 digits ("103", "4702") or "4R7"' : '3 digits ("104") or "1R5"';
    invalid(`"${original}" is not a ${kind} numeric code: expected ${shape}`, pointer);
  }
  const multiplierDigit = Number(m[2]);
  let exp: number;
  if (kind === 'capacitor' && multiplierDigit >= 8) exp = multiplierDigit === 8 ? -2 : -1;
  else if (multiplierDigit <= 7) exp = multiplierDigit;
  else invalid(`"${original}": multiplier digit ${multiplierDigit} is not used on resistor codes`, pointer);
  if (Number(m[1]) === 0) invalid(`"${original}" is a zero value (zero-ohm link), not a usable ${kind} value`, pointer);
  return decimalValue(m[1], exp + baseExp);
}

/** EIA-96 multiplier letters as decimal exponents (Y and R, X and S, B and H are synonyms). */
const EIA96_MULTIPLIER_EXP: Readonly<Record<string, number>> = {
  Z: -3, Y: -2, R: -2, X: -1, S: -1, A: 0, B: 1, H: 1, C: 2, D: 3, E: 4, F: 5,
};

/** EIA-96 1 % resistor code: "01".."96" indexes the E96 series (01 = 100), then a multiplier letter. */
export function parseEia96Code(text: string, pointer?: string): number {
  const original = text;
  const m = /^(\d{2})([A-Za-z])$/.exec(typeof text === 'string' ? text.trim() : '');
  if (!m) invalid(`"${original}" is not an EIA-96 code: expected two digits and a multiplier letter ("01C")`, pointer);
  const index = Number(m[1]);
  const letter = m[2].toUpperCase();
  if (index < 1 || index > 96) invalid(`"${original}": EIA-96 index must be 01..96`, pointer);
  if (!(letter in EIA96_MULTIPLIER_EXP)) {
    invalid(`"${original}": "${letter}" is not an EIA-96 multiplier letter (${Object.keys(EIA96_MULTIPLIER_EXP).join(' ')})`, pointer);
  }
  // E96 significands run 100..976, so index 01 with multiplier A is 100 Ω.
  return decimalValue(String(seriesSignificands('E96')[index - 1]), EIA96_MULTIPLIER_EXP[letter]);
}

export interface ToleranceBand {
  letter: string;
  /** Permitted deviation above nominal, fraction (0.01 for +1 %). */
  plusFraction: number;
  /** Permitted deviation below nominal, fraction, as a positive number (0.2 for -20 %). */
  minusFraction: number;
  asymmetric: boolean;
}

/**
 * IEC 60062 tolerance letters (relative tolerances). B, C, D, F also denote absolute
 * tolerances in pF on capacitors below 10 pF; that reading is not modelled here.
 * E, L, P, W, N, S, Z are from memory of the same table.
 */
const TOLERANCE_LETTERS: Readonly<Record<string, readonly [plus: number, minus: number]>> = {
  E: [0.00005, 0.00005],
  L: [0.0001, 0.0001],
  P: [0.0002, 0.0002],
  W: [0.0005, 0.0005],
  B: [0.001, 0.001],
  C: [0.0025, 0.0025],
  D: [0.005, 0.005],
  F: [0.01, 0.01],
  G: [0.02, 0.02],
  J: [0.05, 0.05],
  K: [0.1, 0.1],
  M: [0.2, 0.2],
  N: [0.3, 0.3],
  S: [0.5, 0.2],
  Z: [0.8, 0.2],
};

export const TOLERANCE_LETTER_CODES: readonly string[] = Object.freeze(Object.keys(TOLERANCE_LETTERS));

export function parseToleranceLetter(letter: string, pointer?: string): ToleranceBand {
  const l = typeof letter === 'string' ? letter.trim().toUpperCase() : '';
  const entry = TOLERANCE_LETTERS[l];
  if (l.length !== 1 || !entry) {
    invalid(`"${letter}" is not an IEC 60062 tolerance letter (${TOLERANCE_LETTER_CODES.join(' ')})`, pointer);
  }
  const [plusFraction, minusFraction] = entry;
  return { letter: l, plusFraction, minusFraction, asymmetric: plusFraction !== minusFraction };
}

const FORMAT_PREFIXES: Record<ComponentKind, readonly (readonly [exp: number, symbol: string])[]> = {
  resistor: [[-3, 'm'], [0, ''], [3, 'k'], [6, 'M'], [9, 'G']],
  capacitor: [[-12, 'p'], [-9, 'n'], [-6, 'µ'], [-3, 'm'], [0, '']],
};

/** A human-readable value for messages: "4.7 kΩ", "10 nF" (up to 4 significant figures). */
export function formatValue(value: number, kind: ComponentKind): string {
  const unit = UNIT_SYMBOL[kind];
  if (!Number.isFinite(value) || value <= 0) return `${value} ${unit}`;
  const prefixes = FORMAT_PREFIXES[kind];
  let i = 0;
  while (i + 1 < prefixes.length && value >= 10 ** prefixes[i + 1][0]) i++;
  let mantissa = Number((value / 10 ** prefixes[i][0]).toPrecision(4));
  // Rounding can carry into the next prefix (999.96 -> 1000).
  if (mantissa >= 1000 && i + 1 < prefixes.length) {
    i++;
    mantissa = Number((value / 10 ** prefixes[i][0]).toPrecision(4));
  }
  return `${mantissa} ${prefixes[i][1]}${unit}`;
}
