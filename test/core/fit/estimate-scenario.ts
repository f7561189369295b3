/**
 * Our own demo scenario for the fit tests: a 10 kHz square-wave excitation
 * clock for a ratiometric bridge on ±2.5 V rails, split-supply astable with a
 * fast rail-to-rail CMOS op-amp (archetype figures, stiff output so the
 * synthetic pin equals the source). Values invented for the tests.
 */
import { findBuiltInAmplifier, resolveAmplifier, type Circuit } from '../../../src/core/index.ts';

export const bridgeClockAmplifier = resolveAmplifier({ base: 'cmos-rrio-fast', outputResistanceOhm: 0 }, (id) => findBuiltInAmplifier(id));

export const bridgeClock: Circuit = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 2.5, negativeV: -2.5 },
  amplifier: bridgeClockAmplifier,
  parts: { rTiming: 16000, cTiming: 4.7e-9, rFeedback: 22000, rGround: 10000 },
};

export const bridgeClockTolerances = { cTiming: 0.1, rTiming: 0.01, rFeedback: 0.01, rGround: 0.01 };

export function withParts(c: Circuit, parts: Record<string, number>): Circuit {
  return { ...c, parts: { ...c.parts, ...parts } };
}

export function withAmplifier(c: Circuit, figures: Partial<Circuit['amplifier']>): Circuit {
  return { ...c, amplifier: { ...c.amplifier, ...figures } };
}
