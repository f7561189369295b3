/** Plain words for a parameter shift: in its unit, in per cent and in tolerances. */
import { formatSeconds, formatSi, formatVolts } from '../../circuit/format.ts';
import type { ParameterEstimate } from '../estimate/estimate.ts';
import type { FitParameter } from '../estimate/parameters.ts';

function signed(text: string, value: number): string {
  return value >= 0 ? `+${text}` : text.startsWith('-') || text.startsWith('−') ? text : `-${text}`;
}

/** "+8.9 %" with two significant digits (three below 1 %, so small shifts do not read as 0). */
export function signedPercent(fraction: number): string {
  const pct = fraction * 100;
  const digits = Math.abs(pct) < 1 ? 2 : Math.abs(pct) < 10 ? 2 : 3;
  return signed(`${Number(Math.abs(pct).toPrecision(digits))} %`, pct);
}

function bandWords(times: number, band: string): string {
  const k = Math.abs(times);
  if (k <= 1) return `inside its ${band}`;
  return `${Number(k.toPrecision(2))}× its ${band}`;
}

export function formatNatural(unit: FitParameter['unit'], value: number): string {
  switch (unit) {
    case 'V':
      return formatVolts(value);
    case 's':
      return formatSeconds(value);
    case 'V/s':
      // The trade quotes slew rates in V/µs.
      return Number.isFinite(value) ? `${Number((value / 1e6).toPrecision(3))} V/µs` : 'instant';
    case 'ohm':
      return formatSi(value, 'Ω', 3);
    case 'F':
      return formatSi(value, 'F', 3);
    case 'A':
      return formatSi(value, 'A', 3);
    case '1':
      return signedPercent(value - 1);
  }
}

/** "cTiming +8.9 % (4.7 nF -> 5.12 nF), inside its 10 % tolerance" / "recovery delay 4 µs -> 11.5 µs, 1.9× its typical spread". */
export function describeShift(e: ParameterEstimate, label: string): string {
  if (e.kind === 'part') {
    const tol = `${Number((e.tolerance! * 100).toPrecision(3))} % tolerance`;
    return `${e.parameter} ${signedPercent(e.relativeShift!)} (${formatNatural(e.unit, e.nominal)} -> ${formatNatural(e.unit, e.estimate)}), ${bandWords(e.shiftInTolerances, tol)}`;
  }
  if (e.kind === 'supply') return `${label} ${formatNatural('1', e.estimate)} off nominal, ${bandWords(e.shiftInTolerances, 'expected spread')}`;
  return `${label} ${formatNatural(e.unit, e.nominal)} -> ${formatNatural(e.unit, e.estimate)}, ${bandWords(e.shiftInTolerances, 'class-typical spread')}`;
}
