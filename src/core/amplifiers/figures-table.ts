/**
 * THE amplifier figure table: one entry per figure a caller can set. Everything
 * else about amplifier figures derives from it —
 * - the core type `AmplifierFigures` (model.ts, a mapped type over this table),
 * - the ideal part (`IDEAL_FIGURES`), inline resolution and the ONE validation
 *   used for inline amplifiers and registrations (validate-figures.ts),
 * - the wire form (src/http/convert.ts: JSON null <-> the entry's `unlimited` value),
 * - the typebox schemas (src/http/schemas/common.ts and amplifier.ts build their
 *   properties from the entries, ranges included),
 * - which figures vary in tolerance analysis and which the fit may move
 *   (`TOLERANCE_FIGURES`, `FITTED_FIGURES` below),
 * - whether a figure needs the time-domain engine (`hasDynamicLimits`).
 * Adding a figure = one entry here + the physics that uses it (see DEVELOPERS.md).
 *
 * Ranges are PHYSICAL ranges: a value outside them is a typing mistake or a unit
 * slip, not a part, and would drive the model into degenerate arithmetic
 * (e.g. a slew rate of 1e-300 V/s makes an edge of 1e300 s). They are chosen to
 * contain every real part of the classes the service knows with a wide margin
 * (our own choice, written from memory of the trade; see each entry's `rangeNote`).
 */

/** Core-side unit of a figure (SI base units; compound units written as in the figure's name). */
export type FigureUnit = 'V' | 'ohm' | 'A' | 'F' | 'V/s' | 's' | 'V/K' | 'A/K' | 'K' | 's/K' | 'V·s' | 'ohm/K' | 'none';

/** How a figure may vary in tolerance analysis (Monte Carlo / worst case). */
export interface ToleranceSpec {
  /** Spread as a fraction of the nominal value (the caller's `amplifierSpreads` entry). */
  readonly spread: 'relative';
  /** A spread part-to-part typical of the class, fraction — documentation and a default for callers (common practice, from memory). */
  readonly typicalSpread: number;
  /** The spread only matters to the time-domain engine (the closed form has no such effect). */
  readonly timeDomainOnly?: boolean;
}

/**
 * Where the fit lets a figure move around the circuit's own value `x` (the
 * class-typical figure of its amplifier; our assumptions, see
 * fit/estimate/parameters.ts): the fitted quantity stays inside [lo, hi].
 * - 'level-high': the output high level V+ − x, from V+ − (4x + 0.5 V) to V+;
 * - 'level-low': the output low level V− + x, from V− to V− + 4x + 0.5 V;
 * - 'factor': from x/factor to x·factor;
 * - 'up-to': from 0 to factor·x (a value below 0 from rounding is taken as 0);
 * - 'symmetric': ±(factor·|x| + margin), margin in the figure's unit.
 */
export type FitWindow =
  | { readonly kind: 'level-high' }
  | { readonly kind: 'level-low' }
  | { readonly kind: 'factor'; readonly factor: number }
  | { readonly kind: 'up-to'; readonly factor: number }
  | { readonly kind: 'symmetric'; readonly factor: number; readonly margin: number };

/**
 * How the fit may move a figure (fit/estimate/parameters.ts builds its list of
 * amplifier parameters from these entries, in `order`). `space` is the fitted
 * coordinate: 'logit' of the position inside the window, or 'log-logit' (the
 * position on a log scale, for figures that span decades).
 */
export interface FitSpec {
  /** Name of the fitted parameter in /v1/fit answers (may differ from the figure, e.g. outputHighV). */
  readonly parameter: string;
  /** Position among the fitted amplifier parameters (answers and the fit's vector follow it; a new figure takes the next number). */
  readonly order: number;
  readonly space: 'logit' | 'log-logit';
  readonly window: FitWindow;
  /** Words for messages. */
  readonly label: string;
  /** Words for messages when the output is open drain (default: label). */
  readonly openDrainLabel?: string;
  /** Not fitted for open-drain outputs (the high level belongs to the pull-up). */
  readonly pushPullOnly?: boolean;
}

/**
 * The figure is part of the parameter vector the time-domain walk reads
 * (circuit/engine/compiled-network.ts, `AMPLIFIER_PARAMETERS`). `slot` is its
 * position among the amplifier figures in that vector: answers list
 * sensitivities and corner values in vector order, so a figure keeps its slot
 * and a new one takes the next free number.
 */
export interface WalkSpec {
  readonly slot: number;
}

export interface NumberFigure {
  readonly kind: 'number';
  readonly unit: FigureUnit;
  readonly description: string;
  /** Smallest finite value accepted (inclusive unless minExclusive). */
  readonly min: number;
  readonly minExclusive?: boolean;
  /** Largest finite value accepted (inclusive). */
  readonly max: number;
  /** Exactly 0 is accepted too although below `min` (e.g. 0 Ω: an ideal output). */
  readonly zeroAllowed?: boolean;
  /**
   * "No such limit": JSON null on the wire, this infinite value in the core.
   * Absent: the figure is always a finite number.
   */
  readonly unlimited?: { readonly value: number; readonly meaning: string };
  /** Value of the ideal part (an `unlimited.value` where the ideal part has no limit). */
  readonly ideal: number;
  /** A value other than `ideal` needs the time-domain engine (slew, delay, limits, clamps). */
  readonly timeDomain?: boolean;
  /** Why the range is what it is (documentation; goes into the schema description). */
  readonly rangeNote?: string;
  readonly tolerance?: ToleranceSpec;
  readonly fit?: FitSpec;
  readonly walk?: WalkSpec;
}

export interface ChoiceFigure {
  readonly kind: 'choice';
  readonly description: string;
  readonly choices: readonly string[];
  readonly ideal: string;
}

export type FigureDescriptor = NumberFigure | ChoiceFigure;

export const AMPLIFIER_FIGURE_TABLE = {
  outputStage: {
    kind: 'choice',
    description: 'Output stage: push-pull drives both states; open-drain only sinks (the high level comes from a pull-up)',
    choices: ['push-pull', 'open-drain'],
    ideal: 'push-pull',
  },
  supplyMinV: {
    kind: 'number',
    unit: 'V',
    description: 'Minimum total supply span V+ − V− the part is rated for',
    min: 0,
    max: 1000,
    ideal: 0,
    rangeNote: 'the service accepts rails within ±2000 V; no amplifier needs more than 1 kV to run',
  },
  supplyMaxV: {
    kind: 'number',
    unit: 'V',
    description: 'Maximum total supply span V+ − V− the part is rated for (not below supplyMinV)',
    min: 0.5,
    max: 4000,
    unlimited: { value: Infinity, meaning: 'no rating (any supply)' },
    ideal: Infinity,
    rangeNote: 'from half a volt (the lowest-voltage parts) to the widest span the service accepts (±2000 V)',
  },
  outputHeadroomHighV: {
    kind: 'number',
    unit: 'V',
    description: 'Light-load output swing limit below V+ in the high state',
    min: 0,
    max: 20,
    ideal: 0,
    rangeNote: 'class-typical headrooms are millivolts to about 2 V; 20 V covers high-voltage parts',
    tolerance: { spread: 'relative', typicalSpread: 0.2 },
    fit: { parameter: 'outputHighV', order: 0, space: 'logit', window: { kind: 'level-high' }, label: 'output high level', pushPullOnly: true },
    walk: { slot: 0 },
  },
  outputHeadroomLowV: {
    kind: 'number',
    unit: 'V',
    description: 'Light-load output swing limit above V− in the low state (saturation voltage for open drain)',
    min: 0,
    max: 20,
    ideal: 0,
    rangeNote: 'as outputHeadroomHighV',
    tolerance: { spread: 'relative', typicalSpread: 0.2 },
    fit: { parameter: 'outputLowV', order: 1, space: 'logit', window: { kind: 'level-low' }, label: 'output low level', openDrainLabel: 'open-drain low level' },
    walk: { slot: 1 },
  },
  outputResistanceOhm: {
    kind: 'number',
    unit: 'ohm',
    description: 'Output resistance behind the swing limit: the output sags by I·R under load',
    min: 1e-3,
    max: 1e6,
    zeroAllowed: true,
    ideal: 0,
    rangeNote: '0 (ideal) or 1 mΩ to 1 MΩ; below 1 mΩ is indistinguishable from 0 and only makes the network solve ill-conditioned',
    tolerance: { spread: 'relative', typicalSpread: 0.3 },
    fit: { parameter: 'outputResistanceOhm', order: 4, space: 'log-logit', window: { kind: 'factor', factor: 5 }, label: 'output resistance' },
    walk: { slot: 2 },
  },
  outputCurrentLimitA: {
    kind: 'number',
    unit: 'A',
    description: 'Short-circuit / current-limit magnitude of the output',
    min: 1e-6,
    max: 100,
    unlimited: { value: Infinity, meaning: 'no current limit' },
    ideal: Infinity,
    timeDomain: true,
    rangeNote: '1 µA (nanopower parts) to 100 A',
    walk: { slot: 7 },
  },
  slewRateVPerS: {
    kind: 'number',
    unit: 'V/s',
    description: 'Large-signal slew rate of the output',
    min: 100,
    max: 1e12,
    unlimited: { value: Infinity, meaning: 'instant edges' },
    ideal: Infinity,
    timeDomain: true,
    rangeNote: '100 V/s (0.0001 V/µs, slower than any nanopower part) to 1e12 V/s (1 V/ps)',
    tolerance: { spread: 'relative', typicalSpread: 0.3, timeDomainOnly: true },
    fit: { parameter: 'slewRateVPerS', order: 2, space: 'log-logit', window: { kind: 'factor', factor: 5 }, label: 'slew rate' },
    walk: { slot: 5 },
  },
  recoveryDelayS: {
    kind: 'number',
    unit: 's',
    description: 'Saturation-recovery (op-amp) or propagation (comparator) delay from the input crossing to the output starting to move',
    min: 0,
    max: 1,
    ideal: 0,
    timeDomain: true,
    rangeNote: '0 to 1 s; real parts take nanoseconds to a few hundred microseconds',
    tolerance: { spread: 'relative', typicalSpread: 0.3, timeDomainOnly: true },
    fit: { parameter: 'recoveryDelayS', order: 3, space: 'logit', window: { kind: 'up-to', factor: 5 }, label: 'recovery delay', openDrainLabel: 'propagation delay' },
    walk: { slot: 6 },
  },
  inputCommonModeLowMarginV: {
    kind: 'number',
    unit: 'V',
    description: 'Input common-mode range lower end relative to V− (negative: extends below the rail)',
    min: -20,
    max: 20,
    unlimited: { value: -Infinity, meaning: 'no lower limit' },
    ideal: -Infinity,
    rangeNote: 'class-typical margins are a few hundred millivolts beyond to a few volts inside the rail',
  },
  inputCommonModeHighMarginV: {
    kind: 'number',
    unit: 'V',
    description: 'Input common-mode range upper end below V+ (the range ends at V+ − margin; negative: beyond the rail)',
    min: -20,
    max: 20,
    unlimited: { value: -Infinity, meaning: 'no upper limit' },
    ideal: -Infinity,
    rangeNote: 'as inputCommonModeLowMarginV',
  },
  inputBiasCurrentA: {
    kind: 'number',
    unit: 'A',
    description: 'Input bias current flowing INTO each input pin (negative for PNP-input stages)',
    min: -1e-4,
    max: 1e-4,
    ideal: 0,
    rangeNote: '±100 µA; bipolar inputs take nanoamperes to a few microamperes, CMOS picoamperes',
    tolerance: { spread: 'relative', typicalSpread: 0.5 },
    fit: { parameter: 'inputBiasCurrentA', order: 6, space: 'logit', window: { kind: 'symmetric', factor: 5, margin: 10e-9 }, label: 'input bias current' },
    walk: { slot: 4 },
  },
  inputCapacitanceF: {
    kind: 'number',
    unit: 'F',
    description:
      'Capacitance from each input pin to ground (common mode). At the inverting input it adds to the timing capacitor; at the non-inverting input it gives the threshold node an RC of its own (a state of the pieces, solved exactly; beside a class II/III C(V) timing capacitor by collocation, to the accuracy of the model). The archetypes leave it at 0',
    min: 0,
    max: 1e-9,
    ideal: 0,
    rangeNote: 'real inputs have about 1 to 20 pF; up to 1 nF accepted',
    walk: { slot: 11 },
  },
  inputOffsetV: {
    kind: 'number',
    unit: 'V',
    description: 'Input offset voltage referred to the non-inverting input (switching happens at N = P + offset)',
    min: -0.1,
    max: 0.1,
    ideal: 0,
    rangeNote: '±100 mV; real parts are microvolts to about 10 mV',
    tolerance: { spread: 'relative', typicalSpread: 1 },
    fit: { parameter: 'inputOffsetV', order: 5, space: 'logit', window: { kind: 'symmetric', factor: 5, margin: 2e-3 }, label: 'input offset' },
    walk: { slot: 3 },
  },
  differentialClampV: {
    kind: 'number',
    unit: 'V',
    description: 'Differential input clamp: the inputs are diode-clamped beyond ±this',
    min: 0.1,
    max: 100,
    unlimited: { value: Infinity, meaning: 'no clamp' },
    ideal: Infinity,
    timeDomain: true,
    rangeNote: 'one diode drop (about 0.6 V) to a few in series; 0.1 V to 100 V accepted',
    walk: { slot: 8 },
  },
  quiescentCurrentA: {
    kind: 'number',
    unit: 'A',
    description: 'Supply current of the amplifier itself',
    min: 0,
    max: 1,
    ideal: 0,
    rangeNote: '0 to 1 A',
  },
  overdriveDelayChargeVS: {
    kind: 'number',
    unit: 'V·s',
    description:
      'Comparator delay versus overdrive (charge-control law, see propagation-delay.ts): after a step of overdrive Vod the delay is recoveryDelayS + k/Vod; ' +
      'when the input crosses the threshold at a slope S it is recoveryDelayS + √(2k/S). 0: the delay does not depend on overdrive. ' +
      'Two published points {overdriveV, delayS} give recoveryDelayS and k (delayLawFromPoints)',
    min: 0,
    max: 1e-3,
    ideal: 0,
    timeDomain: true,
    rangeNote: 'class-typical comparators: about 1e-10 to 1e-8 V·s (a few mV of overdrive costing a microsecond); up to 1 mV·s accepted',
    walk: { slot: 10 },
  },
  internalHysteresisV: {
    kind: 'number',
    unit: 'V',
    description: 'Hysteresis built into the input stage: the output goes high when N falls below P + offset − h/2 and low when N rises above P + offset + h/2',
    min: 0,
    max: 0.2,
    ideal: 0,
    timeDomain: true,
    rangeNote: 'comparators with internal hysteresis have a few millivolts; 200 mV accepted',
    walk: { slot: 9 },
  },
  inputOffsetDriftVPerK: {
    kind: 'number',
    unit: 'V/K',
    description: 'Magnitude of the input offset drift with temperature (its sign differs part to part: temperature corners take both)',
    min: 0,
    max: 1e-3,
    ideal: 0,
    rangeNote: 'class-typical 0.5 to 20 µV/K; up to 1 mV/K accepted',
  },
  inputBiasDoublingK: {
    kind: 'number',
    unit: 'K',
    description: 'Temperature rise that doubles the input bias current (JFET and CMOS gate leakage: about 10 K, common practice)',
    min: 1,
    max: 1000,
    unlimited: { value: Infinity, meaning: 'does not double with heat (bipolar inputs)' },
    ideal: Infinity,
    rangeNote: '1 K to 1000 K; leakage-dominated inputs double every 8 to 12 K',
  },
  outputHeadroomDriftVPerK: {
    kind: 'number',
    unit: 'V/K',
    description: 'Change of both output headrooms per kelvin (bipolar stages shrink with heat as V_BE falls, about −2 mV/K per junction)',
    min: -0.05,
    max: 0.05,
    ideal: 0,
    rangeNote: '±50 mV/K; class-typical figures are a few mV/K',
  },
  recoveryDelayDriftPerK: {
    kind: 'number',
    unit: 'none',
    description: 'Fractional change of the recovery/propagation delay per kelvin (0.003 = +0.3 %/K)',
    min: -0.05,
    max: 0.05,
    ideal: 0,
    rangeNote: '±5 %/K; class-typical figures are a few tenths of a percent per kelvin',
  },
} as const satisfies Record<string, FigureDescriptor>;

export type AmplifierFigureTable = typeof AMPLIFIER_FIGURE_TABLE;
export type AmplifierFigureName = keyof AmplifierFigureTable;

/** The value type of one table entry: the choice literals, or number. */
export type FigureValue<D> = D extends { readonly kind: 'choice'; readonly choices: readonly (infer C)[] } ? C : number;

/** Every figure a caller may set, typed from the table. */
export type FigureValues = { -readonly [K in AmplifierFigureName]: FigureValue<AmplifierFigureTable[K]> };

/** Figure names in table order. */
export const AMPLIFIER_FIGURE_NAMES = Object.keys(AMPLIFIER_FIGURE_TABLE) as AmplifierFigureName[];

/** The table entry of a figure, widened to the descriptor type (for code that walks the table). */
export function figureDescriptor(name: AmplifierFigureName): FigureDescriptor {
  return AMPLIFIER_FIGURE_TABLE[name];
}

/** Table entries as [name, descriptor] pairs, widened. */
export const AMPLIFIER_FIGURE_ENTRIES: readonly (readonly [AmplifierFigureName, FigureDescriptor])[] = AMPLIFIER_FIGURE_NAMES.map(
  (n) => [n, figureDescriptor(n)] as const,
);

/** Names of the number figures (all but the choices). */
export type NumberFigureName = { [K in AmplifierFigureName]: AmplifierFigureTable[K] extends { kind: 'number' } ? K : never }[AmplifierFigureName];

export const NUMBER_FIGURE_NAMES = AMPLIFIER_FIGURE_NAMES.filter((n) => figureDescriptor(n).kind === 'number') as NumberFigureName[];

/** Figures that may be JSON null on the wire ("no limit"), with the core value null stands for. */
export const UNLIMITED_FIGURES: readonly { readonly name: NumberFigureName; readonly value: number }[] = NUMBER_FIGURE_NAMES.flatMap((name) => {
  const d = AMPLIFIER_FIGURE_TABLE[name] as NumberFigure;
  return d.unlimited ? [{ name, value: d.unlimited.value }] : [];
});

/** Names of the figures with a tolerance entry, typed (the tolerance analysis takes its spread list from here). */
export type ToleranceFigureName = { [K in AmplifierFigureName]: AmplifierFigureTable[K] extends { tolerance: ToleranceSpec } ? K : never }[AmplifierFigureName];
export type FittedFigureName = { [K in AmplifierFigureName]: AmplifierFigureTable[K] extends { fit: FitSpec } ? K : never }[AmplifierFigureName];

/** Figures that may spread in tolerance analysis, in table order. */
export const TOLERANCE_FIGURES = NUMBER_FIGURE_NAMES.filter((n) => (AMPLIFIER_FIGURE_TABLE[n] as NumberFigure).tolerance !== undefined) as ToleranceFigureName[];

/** Figures the fit may move, in the fit's order (FitSpec.order), with their fit description. */
export const FITTED_FIGURES: readonly { readonly figure: FittedFigureName; readonly fit: FitSpec; readonly descriptor: NumberFigure }[] = NUMBER_FIGURE_NAMES.flatMap((n) => {
  const d = AMPLIFIER_FIGURE_TABLE[n] as NumberFigure;
  return d.fit ? [{ figure: n as FittedFigureName, fit: d.fit, descriptor: d }] : [];
}).sort((x, y) => x.fit.order - y.fit.order);

/** Names of the figures the walk reads from the parameter vector, typed. */
export type WalkFigureName = { [K in AmplifierFigureName]: AmplifierFigureTable[K] extends { walk: WalkSpec } ? K : never }[AmplifierFigureName];

/** Figures the walk reads, in parameter-vector order (WalkSpec.slot). */
export const WALK_FIGURES = NUMBER_FIGURE_NAMES.filter((n) => (AMPLIFIER_FIGURE_TABLE[n] as NumberFigure).walk !== undefined).sort(
  (x, y) => (AMPLIFIER_FIGURE_TABLE[x] as NumberFigure).walk!.slot - (AMPLIFIER_FIGURE_TABLE[y] as NumberFigure).walk!.slot,
) as WalkFigureName[];

/** The tolerance entry of a figure (undefined when it does not vary). */
export function toleranceSpec(name: AmplifierFigureName): ToleranceSpec | undefined {
  const d = figureDescriptor(name);
  return d.kind === 'number' ? d.tolerance : undefined;
}

/**
 * The fit's window for a figure whose circuit value is `value` (FitWindow), on
 * a supply (V+, V−): the natural value of the fitted quantity and its bounds.
 * For the levels the quantity is the level itself (V+ − headroom, V− + headroom).
 */
export function fitWindow(window: FitWindow, value: number, supply: { positiveV: number; negativeV: number }): { nominal: number; lo: number; hi: number } {
  switch (window.kind) {
    case 'level-high':
      return { nominal: supply.positiveV - value, lo: supply.positiveV - (4 * value + 0.5), hi: supply.positiveV };
    case 'level-low':
      return { nominal: supply.negativeV + value, lo: supply.negativeV, hi: supply.negativeV + 4 * value + 0.5 };
    case 'factor':
      return { nominal: value, lo: value / window.factor, hi: value * window.factor };
    case 'up-to':
      return { nominal: value, lo: 0, hi: window.factor * value };
    case 'symmetric': {
      const half = Math.abs(value) * window.factor + window.margin;
      return { nominal: value, lo: -half, hi: half };
    }
  }
}

/** Words for the accepted values of a number figure, e.g. "0, or 0.001 to 1e+6 ohm; null: no limit". */
export function describeRange(d: NumberFigure): string {
  const low = `${d.min}${d.minExclusive ? ' (exclusive)' : ''}`;
  let text = `${d.zeroAllowed ? '0, or ' : ''}${low} to ${d.max} ${d.unit}`;
  if (d.unlimited) text += `; null: ${d.unlimited.meaning}`;
  return text;
}
