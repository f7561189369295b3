/**
 * Insulation resistance (leakage) of a capacitor, as catalogues state it: the
 * smaller of a resistance ceiling and a time constant divided by the
 * capacitance ("10 GΩ or 500 Ω·F, whichever is less"). Figures are the
 * class-typical guaranteed minimums, from memory — not a datasheet; typical parts
 * leak less. Ceramics lose about a decade of insulation resistance per 100 K of
 * heating (class-typical, from memory).
 */
import type { Dielectric } from '../dielectric.ts';
import { REFERENCE_TEMPERATURE_C } from './temperature.ts';

interface InsulationFigures {
  ceilingOhm: number;
  timeConstantS: number;
}

function figuresOf(d: Dielectric): InsulationFigures {
  switch (d.family) {
    case 'ceramic-class-1':
      return { ceilingOhm: 10e9, timeConstantS: 1000 };
    case 'ceramic-class-2':
      return { ceilingOhm: 10e9, timeConstantS: 500 };
    case 'ceramic-class-3':
      return { ceilingOhm: 10e9, timeConstantS: 100 };
    case 'film':
      return d.code === 'PP' ? { ceilingOhm: 100e9, timeConstantS: 30000 } : { ceilingOhm: 30e9, timeConstantS: 10000 };
    case 'mica':
      return { ceilingOhm: 100e9, timeConstantS: 10000 };
    case 'tantalum':
    case 'electrolytic':
      // A leakage current of 0.01·C·V (C in µF, I in µA) is a resistance of 100 s / C.
      return { ceilingOhm: 1e9, timeConstantS: 100 };
  }
}

const CERAMIC_DECADES_PER_K = 1 / 100;

/** Insulation resistance of capacitanceF of this dielectric at temperatureC, ohm. No dielectric: Infinity (no leakage, stated default). */
export function insulationResistanceOhm(d: Dielectric | undefined, capacitanceF: number, temperatureC = REFERENCE_TEMPERATURE_C): number {
  if (!d) return Infinity;
  const f = figuresOf(d);
  const r25 = Math.min(f.ceilingOhm, f.timeConstantS / capacitanceF);
  const ceramic = d.family.startsWith('ceramic');
  if (!ceramic || temperatureC <= REFERENCE_TEMPERATURE_C) return r25;
  return r25 * 10 ** (-(temperatureC - REFERENCE_TEMPERATURE_C) * CERAMIC_DECADES_PER_K);
}
