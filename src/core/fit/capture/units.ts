/**
 * Unit labels as scopes write them in CSV headers ("Time (us)", "mV",
 * "second", "Volt") reduced to an SI base unit and a scale factor. Only time,
 * voltage, current and frequency matter for captures.
 */
export type BaseUnit = 's' | 'V' | 'A' | 'Hz';

export interface UnitScale {
  base: BaseUnit;
  /** Multiply a value in the labelled unit by this to get base units. */
  scale: number;
}

const PREFIX: Record<string, number> = {
  '': 1,
  p: 1e-12,
  n: 1e-9,
  u: 1e-6,
  '\u00b5': 1e-6, // micro sign
  '\u03bc': 1e-6, // Greek mu
  m: 1e-3,
  k: 1e3,
  K: 1e3,
  M: 1e6,
  G: 1e9,
};

const WORD_PREFIX: Record<string, number> = { pico: 1e-12, nano: 1e-9, micro: 1e-6, milli: 1e-3, kilo: 1e3, mega: 1e6 };

const WORD_BASE: Record<string, BaseUnit> = {
  s: 's',
  sec: 's',
  secs: 's',
  second: 's',
  seconds: 's',
  v: 'V',
  volt: 'V',
  volts: 'V',
  a: 'A',
  amp: 'A',
  amps: 'A',
  ampere: 'A',
  amperes: 'A',
  hz: 'Hz',
  hertz: 'Hz',
  'sa/s': 'Hz',
  'samples/s': 'Hz',
};

/** Parse one unit label; undefined when it is not a unit we know. */
export function parseUnit(label: string): UnitScale | undefined {
  const u = label.trim().replace(/^[[(]\s*|\s*[\])]$/g, '');
  if (u === '') return undefined;
  // Whole words, any case: "second", "Volt", "millivolt".
  const lower = u.toLowerCase();
  const word = WORD_BASE[lower];
  if (word !== undefined) return { base: word, scale: 1 };
  for (const [p, f] of Object.entries(WORD_PREFIX)) {
    if (lower.startsWith(p)) {
      const rest = WORD_BASE[lower.slice(p.length)];
      if (rest !== undefined && lower.length - p.length > 1) return { base: rest, scale: f };
    }
  }
  // Symbol forms, case kept for the prefix: "us", "µs", "mV", "kHz", "MSa/s".
  const first = u[0];
  const prefixScale = PREFIX[first];
  if (prefixScale !== undefined && u.length > 1) {
    const rest = WORD_BASE[u.slice(1).toLowerCase()];
    // The prefix keeps its case ("ms" milli, "Ms" mega); the base does not.
    if (rest !== undefined) return { base: rest, scale: prefixScale };
  }
  return undefined;
}

/**
 * Split a header cell into a name and a unit: "Time (us)", "CH1 [mV]",
 * "Output(V)", "Capacitor / V". Returns the cell unchanged as the name when
 * no unit can be found.
 */
export function splitNameAndUnit(cell: string): { name: string; unitLabel?: string } {
  const c = cell.trim();
  const bracket = /^(.*?)\s*[([]\s*([^()[\]]+?)\s*[)\]]\s*$/.exec(c);
  if (bracket && parseUnit(bracket[2]) !== undefined) return { name: bracket[1].trim() || c, unitLabel: bracket[2] };
  const slash = /^(.*?)\s*\/\s*(\S+)$/.exec(c);
  if (slash && slash[1] !== '' && parseUnit(slash[2]) !== undefined) return { name: slash[1].trim(), unitLabel: slash[2] };
  return { name: c };
}
