/**
 * Strays among the hypotheses (issue 14, fit): something at the timing node N
 * that the circuit does not declare — a capacitance (board, the amplifier's
 * input, a probe left on the node) or a leakage to ground (flux residue,
 * moisture). The model solves both at N (circuit/strays.ts), so each is one
 * scalar fitted within a physical window, on top of whatever `circuit.strays`
 * already declares.
 *
 * Windows (our choice, from common practice, not measured):
 * - capacitance at N: 0.1 pF to 220 pF. A pad and trace give 0.5–5 pF, an
 *   amplifier input 1–20 pF, a 10× passive probe 10–15 pF and a 1× probe with
 *   its cable 50–150 pF; 220 pF covers all of them together with margin.
 *   Anything larger is a part, not a stray (a capacitor on an unpopulated
 *   footprint, or the timing capacitor itself off: `off:cTiming`). Below
 *   0.1 pF nothing on a board is that clean and nothing measurable moves.
 * - leakage at N: 100 kΩ (a wet or badly contaminated board) to 100 GΩ (a
 *   clean FR-4 surface, beyond which nothing moves a clock). Within the
 *   model's accepted range (LEAKAGE_RANGE_OHM).
 * Both fitted on a log scale bounded by the window (log-logit), prior σ 1.8
 * (nearly flat across the window, as for an amplifier effect that is off).
 * Prior probabilities (our assumptions): a capacitance at N that matters,
 * 1 % (about half as likely as a given part or amplifier effect being off,
 * PRIOR_EFFECT_OFF: a probe left on the node, a long trace); a leakage that
 * moves the clock, 0.2 % (as rare as a specific wrong part: a clean board
 * leaks gigaohms, and megohms at a high-impedance node take a contaminated or
 * wet one).
 *
 * A stray capacitance parallels a linear timing capacitor exactly: from timing
 * alone it is the capacitor +Cs/C, and the diagnosis declares them
 * indistinguishable (explain.ts) and names the swap of a known capacitor as the
 * experiment that separates them. With a class II capacitor (C(V)) a flat stray
 * changes the shape of the charging curve, and the capture can tell.
 */
import { formatSi } from '../../circuit/format.ts';
import { NO_STRAYS, type Strays } from '../../circuit/strays.ts';
import type { Circuit } from '../../circuit/types.ts';
import type { FitParameter } from '../estimate/parameters.ts';

export type StrayField = 'timingNodeF' | 'timingLeakageOhm';

export interface StrayEffect {
  /** The circuit's strays field it adds to. */
  field: StrayField;
  /** As a fit parameter (kind 'stray', log-logit over the window): its prior is the `off` one, centred in the window. */
  parameter: FitParameter;
  /** Prior probability of the hypothesis "this stray is what is wrong". */
  prior: number;
  /** The strays with the fitted amount added to what the circuit declares. */
  strays(circuit: Circuit, value: number): Strays;
  words(value: number): string;
}

export const PRIOR_STRAY_CAPACITANCE = 0.01;
export const PRIOR_LEAKAGE = 0.002;
export const STRAY_CAPACITANCE_WINDOW_F = Object.freeze({ lo: 0.1e-12, hi: 220e-12 });
export const STRAY_LEAKAGE_WINDOW_OHM = Object.freeze({ lo: 100e3, hi: 100e9 });
const STRAY_PRIOR_SD = 1.8;

function windowParameter(name: string, unit: 'F' | 'ohm', nominal: number, lo: number, hi: number, label: string): FitParameter {
  // Centre of the window (log scale) with a near-flat σ: the stray hypothesis says "something in the window", no more.
  return { name, kind: 'stray', unit, space: 'log-logit', nominal, lo, hi, priorMean: 0, priorSd: STRAY_PRIOR_SD, offSd: STRAY_PRIOR_SD, label };
}

const parallelOhm = (a: number, b: number) => (Number.isFinite(a) ? (a * b) / (a + b) : b);

/** The stray effects the diagnosis weighs for this circuit (each adds to what `circuit.strays` declares). */
export function strayEffects(circuit: Circuit): StrayEffect[] {
  const declared = circuit.strays ?? NO_STRAYS;
  const { lo: cLo, hi: cHi } = STRAY_CAPACITANCE_WINDOW_F;
  const { lo: rLo, hi: rHi } = STRAY_LEAKAGE_WINDOW_OHM;
  return [
    {
      field: 'timingNodeF',
      prior: PRIOR_STRAY_CAPACITANCE,
      parameter: windowParameter('strayTimingNodeF', 'F', declared.timingNodeF, cLo, cHi, 'capacitance at the timing node N'),
      strays: (c, value) => ({ ...NO_STRAYS, ...c.strays, timingNodeF: declared.timingNodeF + value }),
      words: (value) => `a capacitance of ${formatSi(value, 'F', 3)} at the timing node N besides the timing capacitor (board, amplifier input or a probe left on the node)`,
    },
    {
      field: 'timingLeakageOhm',
      prior: PRIOR_LEAKAGE,
      parameter: windowParameter('leakageTimingNodeOhm', 'ohm', declared.timingLeakageOhm, rLo, rHi, 'leakage from the timing node N to ground'),
      // A leakage found on a board that already declares one is in parallel with it.
      strays: (c, value) => ({ ...NO_STRAYS, ...c.strays, timingLeakageOhm: parallelOhm(declared.timingLeakageOhm, value) }),
      words: (value) => `a leakage of ${formatSi(value, 'Ω', 3)} from the timing node N to ground (flux residue, moisture or a damaged input)`,
    },
  ];
}
