/**
 * Strays among the hypotheses (issue 14, fit): something the circuit does not
 * declare — at the timing node N a capacitance (board, the amplifier's input, a
 * probe left on the node) or a leakage to ground (flux residue, moisture); a
 * capacitance at the threshold node P (board, the amplifier's input, a probe)
 * or at the output pin (trace, the inputs the clock feeds, a probe or cable).
 * The model solves all of them (circuit/strays.ts; at P and at the pin as a
 * state of its own beside N, engine/modal.ts), so each is one scalar fitted
 * within a physical window, on top of whatever `circuit.strays` already declares.
 *
 * Windows (our choice, from common practice, not measured):
 * - capacitance at N: 0.1 pF to 220 pF. A pad and trace give 0.5–5 pF, an
 *   amplifier input 1–20 pF, a 10× passive probe 10–15 pF and a 1× probe with
 *   its cable 50–150 pF; 220 pF covers all of them together with margin.
 *   Anything larger is a part, not a stray (a capacitor on an unpopulated
 *   footprint, or the timing capacitor itself off: `off:cTiming`). Below
 *   0.1 pF nothing on a board is that clean and nothing measurable moves.
 * - capacitance at P: the same window as at N (the same sources: pad, input,
 *   probe). It delays P's step after each switch (an RC with the threshold
 *   network): the capacitor turns before P reaches its new level, the
 *   hysteresis the capacitor sees shrinks and the clock runs faster, the more
 *   so the larger that RC against the half period.
 * - capacitance at the output pin: 0.1 pF to 2.2 nF. Besides the sources at N
 *   the pin drives the loads of the clock: a few logic inputs (5–10 pF each)
 *   and a cable (about 100 pF per metre), a couple of metres with margin.
 *   Behind a pull-up (an open drain released) the rising edge is then an RC
 *   with the pull-up, 2.2·R·C from 10 to 90 %; behind a push-pull stage its
 *   output resistance and current limit make the edges.
 * - leakage at N: 100 kΩ (a wet or badly contaminated board) to 100 GΩ (a
 *   clean FR-4 surface, beyond which nothing moves a clock). Within the
 *   model's accepted range (LEAKAGE_RANGE_OHM).
 * Both fitted on a log scale bounded by the window (log-logit), prior σ 1.8
 * (nearly flat across the window, as for an amplifier effect that is off).
 * Prior probabilities (our assumptions): a capacitance at N, at P or at the
 * pin that matters, 1 % each (about half as likely as a given part or
 * amplifier effect being off, PRIOR_EFFECT_OFF: a probe left on the node, a
 * long trace, a cable on the output); a leakage that
 * moves the clock, 0.2 % (as rare as a specific wrong part: a clean board
 * leaks gigaohms, and megohms at a high-impedance node take a contaminated or
 * wet one).
 *
 * A stray capacitance parallels a linear timing capacitor exactly: from timing
 * alone it is the capacitor +Cs/C, and the diagnosis declares them
 * indistinguishable (explain.ts) and names the swap of a known capacitor as the
 * experiment that separates them. With a class II capacitor (C(V)) a flat stray
 * changes the shape of the charging curve, and the capture can tell.
 * A capacitance at P or at the pin makes the pieces multi-state (engine/modal.ts;
 * beside a C(V) capacitor engine/modal-curved.ts): weighed for every timing
 * capacitor, linear or not.
 */
import { formatSi } from '../../circuit/format.ts';
import { NO_STRAYS, type Strays } from '../../circuit/strays.ts';
import { findTopology } from '../../circuit/topologies/index.ts';
import type { Circuit } from '../../circuit/types.ts';
import type { FitParameter } from '../estimate/parameters.ts';

export type StrayField = 'timingNodeF' | 'thresholdNodeF' | 'outputNodeF' | 'timingLeakageOhm';

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
  /** Starts and search steps of its scalar fit when the diagnosis' defaults are too coarse (explain.ts scoreScalar). */
  starts?: readonly number[];
  iterations?: number;
}

export const PRIOR_STRAY_CAPACITANCE = 0.01;
export const PRIOR_LEAKAGE = 0.002;
export const STRAY_CAPACITANCE_WINDOW_F = Object.freeze({ lo: 0.1e-12, hi: 220e-12 });
export const PIN_CAPACITANCE_WINDOW_F = Object.freeze({ lo: 0.1e-12, hi: 2.2e-9 });
export const STRAY_LEAKAGE_WINDOW_OHM = Object.freeze({ lo: 100e3, hi: 100e9 });
const STRAY_PRIOR_SD = 1.8;
/**
 * A capacitance at P or at the pin moves the figures steeply once its RC nears
 * the half period, and past a point the clock chatters (no oscillation): a
 * start every unit of the window's logit (2.2× in capacitance near the
 * middle) and more search steps, so the fit does not stall between two
 * coarse starts. Each trial is a multi-state walk, a few times a one-state one.
 */
const NODE_STRAY_STARTS = [-5, -4, -3, -2, -1, 0, 1, 2, 3, 4, 5];
const NODE_STRAY_ITERATIONS = 10;

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
  const { lo: pinLo, hi: pinHi } = PIN_CAPACITANCE_WINDOW_F;
  const nodeStrays: StrayEffect[] = [
    {
      field: 'thresholdNodeF',
      prior: PRIOR_STRAY_CAPACITANCE,
      parameter: windowParameter('strayThresholdNodeF', 'F', declared.thresholdNodeF, cLo, cHi, 'capacitance at the threshold node P'),
      strays: (c, value) => ({ ...NO_STRAYS, ...c.strays, thresholdNodeF: declared.thresholdNodeF + value }),
      starts: NODE_STRAY_STARTS,
      iterations: NODE_STRAY_ITERATIONS,
      words: (value) =>
        `a capacitance of ${formatSi(value, 'F', 3)} at the threshold node P (board, amplifier input or a probe left on the node): P lags each switch, so the capacitor turns short of the thresholds`,
    },
    {
      field: 'outputNodeF',
      prior: PRIOR_STRAY_CAPACITANCE,
      parameter: windowParameter('strayOutputNodeF', 'F', declared.outputNodeF, pinLo, pinHi, 'capacitance at the output pin'),
      strays: (c, value) => ({ ...NO_STRAYS, ...c.strays, outputNodeF: declared.outputNodeF + value }),
      starts: NODE_STRAY_STARTS,
      iterations: NODE_STRAY_ITERATIONS,
      words: (value) => `a capacitance of ${formatSi(value, 'F', 3)} at the output pin (trace, the inputs it drives, a cable or a probe)${pinEdgeWords(circuit)}`,
    },
  ];
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
    ...nodeStrays,
  ];
}

/** What a capacitance at the pin does to the edges: behind a pull-up the rise is an RC with it. */
function pinEdgeWords(circuit: Circuit): string {
  if (circuit.amplifier.outputStage !== 'open-drain') return '';
  const pullUp = Object.entries(findTopology(circuit.topology)?.roles ?? {}).find(([role, r]) => r.purpose === 'output-level' && circuit.parts[role] !== undefined);
  return pullUp ? `: the rising edge is an RC with ${pullUp[0]}` : '';
}
