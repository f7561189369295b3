/** Number formatting for human-readable messages (the figures travel as numbers beside them). */

const PREFIXES: [number, string][] = [
  [1e9, 'G'],
  [1e6, 'M'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'µ'],
  [1e-9, 'n'],
  [1e-12, 'p'],
  [1e-15, 'f'],
];

export function formatSi(value: number, unit: string, digits = 4): string {
  if (!Number.isFinite(value)) return `${value} ${unit}`;
  if (value === 0) return `0 ${unit}`;
  const abs = Math.abs(value);
  for (const [scale, prefix] of PREFIXES) {
    if (abs >= scale * 0.9995) return `${Number((value / scale).toPrecision(digits))} ${prefix}${unit}`;
  }
  return `${value.toExponential(digits - 1)} ${unit}`;
}

export const formatVolts = (v: number) => formatSi(v, 'V');
export const formatAmps = (a: number) => formatSi(a, 'A');
export const formatOhms = (r: number) => formatSi(r, 'Ω');
export const formatSeconds = (s: number) => formatSi(s, 's');
export const formatPercent = (fraction: number, digits = 3) => `${Number((fraction * 100).toPrecision(digits))} %`;
