/**
 * Capacitor dielectric codes -> temperature behaviour and fitness for a timing capacitor.
 *
 * Ceramics follow the EIA-198 three-character codes:
 * - class II/III "X7R": low-temperature letter, high-temperature digit, change letter;
 * - class I "C0G", "U2J": tempco significant figure letter, multiplier digit, tolerance letter.
 * The two schemes never share a first letter (class II/III use X, Y, Z only).
 * BOM words for other technologies (film, electrolytic, tantalum, mica) map to
 * class-typical figures (from memory, class-typical: not a datasheet).
 */
import { CoreError } from '../errors.ts';

export type DielectricFamily =
  | 'ceramic-class-1'
  | 'ceramic-class-2'
  | 'ceramic-class-3'
  | 'film'
  | 'electrolytic'
  | 'tantalum'
  | 'mica';

export interface Dielectric {
  /** Canonical code or name ("X7R", "C0G", "PP"). */
  code: string;
  family: DielectricFamily;
  /** Rated temperature range, °C (from the code for class II/III; class-typical otherwise). */
  tempMinC?: number;
  tempMaxC?: number;
  /** Capacitance change bound across the rated range vs 25 °C, fractions (+0.15 / -0.15). */
  changeMaxFraction?: number;
  changeMinFraction?: number;
  /** Linear temperature coefficient and its tolerance, ppm/K (class I ceramics, film, mica). */
  tempcoPpmPerK?: number;
  tempcoTolerancePpmPerK?: number;
  /** Whether the dielectric is a sensible choice for an oscillator's timing capacitor. */
  fitForTiming: boolean;
  /** Why, in words (and the source of the figures). */
  reason: string;
}

// --- EIA-198 class II/III ---------------------------------------------------
const CLASS2_LOW_TEMP_C: Readonly<Record<string, number>> = { X: -55, Y: -30, Z: 10 };
const CLASS2_HIGH_TEMP_C: Readonly<Record<string, number>> = { '2': 45, '4': 65, '5': 85, '6': 105, '7': 125, '8': 150, '9': 200 };
/** [max, min] capacitance change as fractions. */
const CLASS2_CHANGE: Readonly<Record<string, readonly [number, number]>> = {
  A: [0.01, -0.01],
  B: [0.015, -0.015],
  C: [0.022, -0.022],
  D: [0.033, -0.033],
  E: [0.047, -0.047],
  F: [0.075, -0.075],
  P: [0.1, -0.1],
  R: [0.15, -0.15],
  S: [0.22, -0.22],
  T: [0.22, -0.33],
  U: [0.22, -0.56],
  V: [0.22, -0.82],
};

// --- EIA-198 class I --------------------------------------------------------
const CLASS1_SIGNIFICANT: Readonly<Record<string, number>> = {
  C: 0.0, B: 0.3, L: 0.8, A: 0.9, M: 1.0, P: 1.5, R: 2.2, S: 3.3, T: 4.7, V: 5.6, U: 7.5,
};
const CLASS1_MULTIPLIER: Readonly<Record<string, number>> = {
  '0': -1, '1': -10, '2': -100, '3': -1000, '4': -10000, '5': 1, '6': 10, '7': 100, '8': 1000, '9': 10000,
};
const CLASS1_TOLERANCE_PPM: Readonly<Record<string, number>> = { G: 30, H: 60, J: 120, K: 250, L: 500, M: 1000, N: 2500 };

/** Old and misspelt names for C0G seen on BOMs (letter O for digit 0). */
const C0G_ALIASES = new Set(['C0G', 'COG', 'NP0', 'NPO']);

function invalid(message: string, pointer?: string): never {
  throw new CoreError('invalid-value', message, pointer);
}

function parseClass2(code: string): Dielectric | undefined {
  const m = /^([XYZ])(\d)([A-Z])$/.exec(code);
  if (!m) return undefined;
  const low = CLASS2_LOW_TEMP_C[m[1]];
  const high = CLASS2_HIGH_TEMP_C[m[2]];
  const change = CLASS2_CHANGE[m[3]];
  if (high === undefined || change === undefined) return undefined;
  // EIA class III covers the high-k bodies whose change reaches -56 % or worse (Z5U, Y5V):
  // common practice grouping.
  const family: DielectricFamily = change[1] <= -0.56 ? 'ceramic-class-3' : 'ceramic-class-2';
  return {
    code,
    family,
    tempMinC: low,
    tempMaxC: high,
    changeMaxFraction: change[0],
    changeMinFraction: change[1],
    fitForTiming: false,
    reason:
      `EIA-198 ${family === 'ceramic-class-3' ? 'class III' : 'class II'} ceramic: capacitance may change ` +
      `${formatPercent(change[0])}/${formatPercent(change[1])} over ${low}..${high} °C and also drifts with DC bias ` +
      'and age, so a clock timed by it is neither accurate nor stable',
  };
}

function parseClass1(code: string): Dielectric | undefined {
  const canonical = C0G_ALIASES.has(code) ? 'C0G' : code;
  const m = /^([A-Z])(\d)([A-Z])$/.exec(canonical);
  if (!m) return undefined;
  const significant = CLASS1_SIGNIFICANT[m[1]];
  const multiplier = CLASS1_MULTIPLIER[m[2]];
  const tolerance = CLASS1_TOLERANCE_PPM[m[3]];
  if (significant === undefined || multiplier === undefined || tolerance === undefined) return undefined;
  // Round away binary noise (7.5 × -100) and turn -0 (C0G) into 0.
  const tempco = Math.round(significant * multiplier * 1000) / 1000 + 0;
  return {
    code: canonical,
    family: 'ceramic-class-1',
    tempcoPpmPerK: tempco,
    tempcoTolerancePpmPerK: tolerance,
    fitForTiming: true,
    reason: `EIA-198 class I ceramic: linear tempco ${tempco} ±${tolerance} ppm/K, no DC-bias or ageing loss`,
  };
}

interface NamedDielectric {
  names: readonly string[];
  make: () => Dielectric;
}

/** BOM words for non-ceramic technologies; all figures from memory, class-typical. */
const NAMED: readonly NamedDielectric[] = [
  {
    names: ['PP', 'POLYPROPYLENE', 'MKP', 'FKP'],
    make: () => ({
      code: 'PP', family: 'film', tempMinC: -55, tempMaxC: 105, tempcoPpmPerK: -200, tempcoTolerancePpmPerK: 100,
      fitForTiming: true, reason: 'polypropylene film: low loss, about -200 ppm/K (from memory, class-typical)',
    }),
  },
  {
    names: ['PET', 'POLYESTER', 'MYLAR', 'MKT', 'MKS'],
    make: () => ({
      code: 'PET', family: 'film', tempMinC: -55, tempMaxC: 125, tempcoPpmPerK: 400, tempcoTolerancePpmPerK: 200,
      fitForTiming: true,
      reason: 'polyester film: usable for timing, tempco about +400 ppm/K and somewhat nonlinear (from memory, class-typical)',
    }),
  },
  {
    names: ['PPS', 'POLYPHENYLENE SULFIDE', 'POLYPHENYLENE SULPHIDE'],
    make: () => ({
      code: 'PPS', family: 'film', tempMinC: -55, tempMaxC: 125, tempcoPpmPerK: 0, tempcoTolerancePpmPerK: 100,
      fitForTiming: true, reason: 'PPS film: very stable with temperature, within about ±100 ppm/K (from memory, class-typical)',
    }),
  },
  {
    names: ['PEN', 'POLYETHYLENE NAPHTHALATE'],
    make: () => ({
      code: 'PEN', family: 'film', tempMinC: -55, tempMaxC: 125, tempcoPpmPerK: 200, tempcoTolerancePpmPerK: 200,
      fitForTiming: true, reason: 'PEN film: tempco about +200 ppm/K (from memory, class-typical)',
    }),
  },
  {
    names: ['MICA', 'SILVER MICA'],
    make: () => ({
      code: 'MICA', family: 'mica', tempMinC: -55, tempMaxC: 125, tempcoPpmPerK: 50, tempcoTolerancePpmPerK: 50,
      fitForTiming: true, reason: 'silver mica: very stable, about +50 ppm/K (from memory, class-typical)',
    }),
  },
  {
    names: ['TANTALUM', 'TANT', 'TA'],
    make: () => ({
      code: 'TANTALUM', family: 'tantalum', tempMinC: -55, tempMaxC: 125, changeMaxFraction: 0.1, changeMinFraction: -0.1,
      fitForTiming: false,
      reason: 'tantalum: polarised, leaky and wide-tolerance; about ±10 % over temperature (from memory, class-typical)',
    }),
  },
  {
    names: [
      'ELECTROLYTIC', 'ALUMINIUM ELECTROLYTIC', 'ALUMINUM ELECTROLYTIC', 'AL ELECTROLYTIC', 'AL-ELECTROLYTIC',
      'ELCAP', 'ELKO', 'ALU',
    ],
    make: () => ({
      code: 'ELECTROLYTIC', family: 'electrolytic', tempMinC: -40, tempMaxC: 105, changeMaxFraction: 0.1, changeMinFraction: -0.2,
      fitForTiming: false,
      reason:
        'aluminium electrolytic: polarised, leakage current, -20 %/+10 % typical over temperature plus wide initial ' +
        'tolerance and ageing (from memory, class-typical); unfit for a timing path',
    }),
  },
];

function formatPercent(fraction: number): string {
  const p = Math.round(fraction * 1000) / 10;
  return `${p > 0 ? '+' : ''}${p} %`;
}

/** Parses a ceramic EIA-198 code or a dielectric/technology word. Unknown -> CoreError('invalid-value'). */
export function parseDielectric(code: string, pointer?: string): Dielectric {
  if (typeof code !== 'string' || code.trim() === '') invalid('empty dielectric code', pointer);
  const key = code.trim().toUpperCase().replace(/\s+/g, ' ');
  const found = parseClass2(key) ?? parseClass1(key);
  if (found) return found;
  const named = NAMED.find((n) => n.names.includes(key));
  if (named) return named.make();
  return invalid(
    `"${code}" is not a known dielectric: expected an EIA-198 ceramic code (X7R, C0G, U2J...) or a technology ` +
      '(PP, PET, PPS, PEN, mica, tantalum, electrolytic)',
    pointer,
  );
}

export interface CapacitanceChange {
  /** Lowest and highest capacitance change vs the 25 °C value, fractions. */
  minFraction: number;
  maxFraction: number;
  /** False when temperatureC lies outside the dielectric's rated range (the figures then only extrapolate). */
  withinRatedRange: boolean;
}

/** Reference temperature of tempco and change figures (EIA-198 measures against 25 °C). */
const REFERENCE_TEMP_C = 25;

/**
 * Capacitance change at temperatureC relative to 25 °C.
 * - Linear-tempco dielectrics (class I, film, mica): (tempco ± tolerance) × (T - 25 °C).
 * - Band dielectrics (class II/III, electrolytic, tantalum): the code gives only a bound across
 *   the whole rated range, so the full band is returned at every temperature.
 */
export function capacitanceChangeAt(dielectric: Dielectric, temperatureC: number): CapacitanceChange {
  if (!Number.isFinite(temperatureC)) invalid(`temperatureC must be finite, got ${temperatureC}`);
  const withinRatedRange =
    (dielectric.tempMinC === undefined || temperatureC >= dielectric.tempMinC) &&
    (dielectric.tempMaxC === undefined || temperatureC <= dielectric.tempMaxC);
  if (dielectric.tempcoPpmPerK !== undefined) {
    const dT = temperatureC - REFERENCE_TEMP_C;
    const tol = dielectric.tempcoTolerancePpmPerK ?? 0;
    const a = (dielectric.tempcoPpmPerK - tol) * dT * 1e-6;
    const b = (dielectric.tempcoPpmPerK + tol) * dT * 1e-6;
    return { minFraction: Math.min(a, b) + 0, maxFraction: Math.max(a, b) + 0, withinRatedRange };
  }
  if (dielectric.changeMinFraction !== undefined && dielectric.changeMaxFraction !== undefined) {
    return { minFraction: dielectric.changeMinFraction, maxFraction: dielectric.changeMaxFraction, withinRatedRange };
  }
  return invalid(`dielectric "${dielectric.code}" carries neither a tempco nor a change band`);
}

/**
 * The one verdict on a timing capacitor's dielectric, shared by design, analyze and BOM checks.
 * Policy: electrolytic and tantalum parts are always an error (polarised, leaky, ±20 % and drifting);
 * class II/III ceramics are an error unless the caller explicitly allows them, then a warning.
 * Class I ceramics, film and mica pass (undefined).
 */
export interface TimingDielectricVerdict {
  code: 'dielectric-unfit-for-timing' | 'electrolytic-in-timing-path';
  severity: 'error' | 'warning';
  dielectric: string;
  family: DielectricFamily;
  reason: string;
  hint: string;
}

export function timingDielectricVerdict(d: Dielectric, options: { allowHighK?: boolean } = {}): TimingDielectricVerdict | undefined {
  if (d.family === 'electrolytic' || d.family === 'tantalum') {
    return {
      code: 'electrolytic-in-timing-path',
      severity: 'error',
      dielectric: d.code,
      family: d.family,
      reason: d.reason,
      hint: 'use a film or class I (C0G) ceramic capacitor and raise the timing resistance instead of the capacitance',
    };
  }
  if (d.family === 'ceramic-class-2' || d.family === 'ceramic-class-3') {
    return {
      code: 'dielectric-unfit-for-timing',
      severity: options.allowHighK ? 'warning' : 'error',
      dielectric: d.code,
      family: d.family,
      reason: d.reason,
      hint: 'use a class I (C0G) ceramic or a film capacitor; allow class II/III only where a loose, drifting frequency is acceptable',
    };
  }
  return undefined;
}
