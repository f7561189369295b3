/**
 * A base assembly of our own for the BOM rule tests: a 5 V single-rail clock for
 * a soil-moisture probe's excitation, ~7 kHz from 22 kΩ and 4.7 nF with three
 * equal 68 kΩ threshold resistors (T = 2·ln2·R·C for equal resistors,
 * Sedra & Smith, op-amp astable section). Invented values, demo only.
 */
import { findBuiltInAmplifier } from '../../../src/core/amplifiers/archetypes.ts';
import { CoreError, DEFAULT_BOM_OPTIONS, type BomAssembly, type BomCheckContext, type BomCheckOptions, type BomLine } from '../../../src/core/index.ts';
import type { Catalogue } from '../../../src/core/parts/index.ts';

export const R_TIMING_OHM = 22e3;
export const C_TIMING_F = 4.7e-9;
/** Textbook period of the equal-resistor single-supply astable with rail-to-rail output. */
export const NOMINAL_FREQUENCY_HZ = 1 / (2 * Math.LN2 * R_TIMING_OHM * C_TIMING_F);

export function baseLines(): BomLine[] {
  return [
    { refdes: 'R1', value: '22K 1% 0603' },
    { refdes: 'C1', value: '4n7 50V C0G 2%' },
    { refdes: 'R2, R3, R4', value: '68K 1% 0603' },
  ];
}

export function baseAssembly(overrides: Partial<BomAssembly> = {}): BomAssembly {
  return {
    id: 'probe-clock-rev-b',
    lines: baseLines(),
    roles: { rTiming: 'R1', cTiming: 'C1', rTop: 'R2', rBottom: 'R3', rFeedback: 'R4' },
    topology: 'three-resistor-divider',
    amplifier: 'ideal',
    supply: { positiveV: 5, negativeV: 0, tolerance: 0 },
    spec: { frequencyHz: NOMINAL_FREQUENCY_HZ, frequencyTolerance: 0.1 },
    ...overrides,
  };
}

/** The base assembly with one line's value text replaced. */
export function withLine(refdes: string, line: Partial<BomLine>, overrides: Partial<BomAssembly> = {}): BomAssembly {
  const lines = baseLines().map((l) => (l.refdes === refdes ? { ...l, ...line } : l));
  if (!lines.some((l) => l.refdes === refdes)) lines.push({ refdes, value: '', ...line });
  return baseAssembly({ lines, ...overrides });
}

export function context(options: Partial<BomCheckOptions> = {}, catalogues: Catalogue[] = []): BomCheckContext {
  return {
    lookupAmplifier: findBuiltInAmplifier,
    lookupCatalogue: (id) => {
      const found = catalogues.find((c) => c.id === id);
      if (!found) throw new CoreError('unknown-reference', `No catalogue with id '${id}'`, '/catalogue');
      return found;
    },
    options: { ...DEFAULT_BOM_OPTIONS, mode: 'worst-case', ...options },
  };
}
