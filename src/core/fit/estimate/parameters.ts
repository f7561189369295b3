/**
 * The effects the fit can move, each with a transform that keeps it physical
 * and two priors.
 *
 * Transforms (bounded optimisation by reparametrisation):
 * - parts: x = ln(value/nominal) — every value positive;
 * - amplifier effects and the supply: x = logit of the position inside a
 *   physical range [lo, hi] (on a log scale for slew rate and output
 *   resistance), so no estimate leaves the range: output levels stay within the
 *   rails (an open-drain low level at or above the negative rail), delays ≥ 0.
 * Priors (Gaussian in x):
 * - `nuisance`: how far the effect wanders on a board that is in order — a
 *   part within its tolerance read as ±3σ (common practice), an amplifier
 *   figure about ±50 % (1σ) around its class-typical value, the supply ±1 %
 *   (our assumptions);
 * - `off`: the prior of the hypothesis "this effect is what is wrong": a part
 *   out of tolerance, log-normal with σ = 0.2 (a factor 1.8 at 3σ); an
 *   amplifier figure or the supply anywhere in its range (σ = 1.8 in logit
 *   space is close to flat across it). Our assumptions, documented here.
 * Ranges for amplifier effects (our assumptions, carried by the amplifier
 * figure table's `fit` entries, amplifiers/figures-table.ts): a factor of five
 * either side of the class-typical figure; levels from the rail to 4 × the
 * headroom + 0.5 V inside it; delay 0 to 5 × typical; offset ±(5 × typical +
 * 2 mV); bias ±(5 × typical + 10 nA); supply ±20 %.
 */
import { FITTED_FIGURES, fitWindow, type NumberFigure } from '../../amplifiers/figures-table.ts';
import type { AmplifierModel } from '../../amplifiers/model.ts';
import { getTopology } from '../../circuit/analyze.ts';
import type { Circuit } from '../../circuit/types.ts';
import { CoreError } from '../../errors.ts';

/** 'stray': only a stray hypothesis frees it (diagnose/stray-hypotheses.ts); never in the full estimate's vector. */
export type ParameterKind = 'part' | 'amplifier' | 'supply' | 'stray';
export type ParameterSpace = 'log' | 'logit' | 'log-logit';

export interface FitParameter {
  /** Part role (cTiming...), amplifier effect (outputHighV, slewRateVPerS, ...) or supplyScale. */
  name: string;
  kind: ParameterKind;
  unit: 'ohm' | 'F' | 'V' | 'V/s' | 's' | 'A' | '1';
  space: ParameterSpace;
  /** Natural value in the nominal circuit. */
  nominal: number;
  /** Physical range (natural units) for logit spaces. */
  lo: number;
  hi: number;
  /** Fitted-space value of the nominal. */
  priorMean: number;
  /** Nuisance prior σ (fitted space): the board is in order. */
  priorSd: number;
  /** Prior σ when this effect is the hypothesis (fitted space). */
  offSd: number;
  /** Part tolerance as a fraction (parts only). */
  tolerance?: number;
  /** Words for messages. */
  label: string;
}

/** Defaults when the caller gives no tolerance for a role: 1 % resistors, 10 % capacitors (common practice for timing parts). */
export const DEFAULT_TOLERANCE = { resistor: 0.01, capacitor: 0.1 } as const;
/** A tolerance is a ±3σ band (common practice). */
export const TOLERANCE_SIGMAS = 3;
/** Smallest tolerance accepted: 0.01 % (the tightest precision resistors sold, common practice). */
export const MIN_TOLERANCE = 1e-4;

const PART_OFF_SD = 0.2;
const AMP_NUISANCE_SD = 0.6;
const AMP_OFF_SD = 1.8;
const SUPPLY_RANGE = 0.2;
const SUPPLY_NUISANCE = 0.01;

const logistic = (x: number) => 1 / (1 + Math.exp(-x));
const logit = (p: number) => Math.log(p / (1 - p));

function ranged(name: string, kind: ParameterKind, unit: FitParameter['unit'], space: 'logit' | 'log-logit', nominal: number, lo: number, hi: number, label: string, nuisanceShare?: number): FitParameter | undefined {
  if (!(Number.isFinite(nominal) && Number.isFinite(lo) && Number.isFinite(hi) && hi > lo)) return undefined;
  const [a, b, v] = space === 'log-logit' ? [Math.log(lo), Math.log(hi), Math.log(nominal)] : [lo, hi, nominal];
  const p = (v - a) / (b - a);
  if (!(p > 1e-6 && p < 1 - 1e-6)) return undefined;
  const mean = logit(p);
  // A nuisance spread given as a share of the value becomes a logit σ through the slope at the nominal.
  const sd = nuisanceShare === undefined ? AMP_NUISANCE_SD : nuisanceShare / ((b - a) * p * (1 - p)) / (space === 'log-logit' ? 1 : 1 / Math.abs(nominal));
  return { name, kind, unit, space, nominal, lo, hi, priorMean: mean, priorSd: sd, offSd: AMP_OFF_SD, label };
}

export function buildParameters(circuit: Circuit, tolerances: Readonly<Record<string, number>> = {}): FitParameter[] {
  const topology = getTopology(circuit.topology);
  for (const [role, tol] of Object.entries(tolerances)) {
    if (!(role in topology.roles)) {
      throw new CoreError('unexpected-part', `tolerances names '${role}', which topology '${topology.id}' does not have; its roles are ${Object.keys(topology.roles).join(', ')}`, `/tolerances/${role}`);
    }
    if (!(tol >= MIN_TOLERANCE && tol < 1)) {
      throw new CoreError('invalid-value', `tolerance of ${role} must be a fraction from ${MIN_TOLERANCE} (0.01 %) to below 1 (0.05 for 5 %), got ${tol}`, `/tolerances/${role}`);
    }
  }
  const params: FitParameter[] = [];
  for (const [role, spec] of Object.entries(topology.roles)) {
    const value = circuit.parts[role];
    if (value === undefined) continue;
    const tolerance = tolerances[role] ?? DEFAULT_TOLERANCE[spec.kind];
    params.push({
      name: role,
      kind: 'part',
      unit: spec.kind === 'capacitor' ? 'F' : 'ohm',
      space: 'log',
      nominal: value,
      lo: 0,
      hi: Infinity,
      priorMean: 0,
      // ln(1 ± t) is asymmetric; the 3σ band is matched on the mean of both sides' log widths.
      priorSd: (Math.log(1 + tolerance) - Math.log(1 - tolerance)) / 2 / TOLERANCE_SIGMAS,
      offSd: PART_OFF_SD,
      tolerance,
      label: `${role} (${spec.description.split(',')[0]})`,
    });
  }
  const amp = circuit.amplifier;
  const openDrain = amp.outputStage === 'open-drain';
  const add = (p: FitParameter | undefined) => p && params.push(p);
  // The amplifier effects, their windows and order come from the figure table (FitSpec).
  for (const { figure, fit, descriptor } of FITTED_FIGURES) {
    if (fit.pushPullOnly && openDrain) continue;
    const w = fitWindow(fit.window, amp[figure], circuit.supply);
    const label = openDrain && fit.openDrainLabel ? fit.openDrainLabel : fit.label;
    add(ranged(fit.parameter, 'amplifier', fitUnit(descriptor), fit.space, w.nominal, w.lo, w.hi, label));
  }
  add(ranged('supplyScale', 'supply', '1', 'logit', 1, 1 - SUPPLY_RANGE, 1 + SUPPLY_RANGE, 'supply voltage', SUPPLY_NUISANCE));
  return params;
}

/** The unit of a fitted amplifier figure as fit answers name it. */
function fitUnit(descriptor: NumberFigure): FitParameter['unit'] {
  const unit = descriptor.unit;
  if (unit === 'ohm' || unit === 'V' || unit === 'V/s' || unit === 's' || unit === 'A') return unit;
  throw new Error(`a fitted amplifier figure in ${unit} has no fit unit: add it to FitParameter['unit']`);
}

/** What the fit does with the natural value of each fitted amplifier parameter, by parameter name. */
const FITTED_BY_PARAMETER = new Map(FITTED_FIGURES.map((f) => [f.fit.parameter, f]));

/** Natural value of a parameter at its fitted-space value. */
export function naturalValue(p: FitParameter, x: number): number {
  switch (p.space) {
    case 'log':
      return p.nominal * Math.exp(x);
    case 'logit':
      return p.lo + (p.hi - p.lo) * logistic(x);
    case 'log-logit':
      return Math.exp(Math.log(p.lo) + (Math.log(p.hi) - Math.log(p.lo)) * logistic(x));
  }
}

/** Fitted-space value of a natural value (clamped inside a range). */
export function fittedValue(p: FitParameter, v: number): number {
  switch (p.space) {
    case 'log':
      return Math.log(v / p.nominal);
    case 'logit': {
      const q = Math.min(1 - 1e-12, Math.max(1e-12, (v - p.lo) / (p.hi - p.lo)));
      return logit(q);
    }
    case 'log-logit': {
      const q = Math.min(1 - 1e-12, Math.max(1e-12, (Math.log(v) - Math.log(p.lo)) / (Math.log(p.hi) - Math.log(p.lo))));
      return logit(q);
    }
  }
}

/** Standard deviation in natural units by first-order propagation from the fitted space. */
export function naturalSd(p: FitParameter, x: number, sdX: number): number {
  switch (p.space) {
    case 'log':
      return p.nominal * Math.exp(x) * sdX;
    case 'logit': {
      const q = logistic(x);
      return (p.hi - p.lo) * q * (1 - q) * sdX;
    }
    case 'log-logit': {
      const q = logistic(x);
      return naturalValue(p, x) * (Math.log(p.hi) - Math.log(p.lo)) * q * (1 - q) * sdX;
    }
  }
}

/** The circuit with every parameter at the given fitted-space values (parts overridden by `parts`). */
export function circuitAt(base: Circuit, params: readonly FitParameter[], x: ArrayLike<number>, parts?: Readonly<Record<string, number>>): Circuit {
  const partValues: Record<string, number> = { ...base.parts, ...parts };
  const amplifier: AmplifierModel = { ...base.amplifier };
  let supply = base.supply;
  let highV: number | undefined;
  let lowV: number | undefined;
  for (let j = 0; j < params.length; j++) {
    const p = params[j];
    if (p.kind === 'part') {
      partValues[p.name] = (parts?.[p.name] ?? base.parts[p.name]) * Math.exp(x[j]);
      continue;
    }
    const v = naturalValue(p, x[j]);
    if (p.name === 'supplyScale') {
      supply = { positiveV: base.supply.positiveV * v, negativeV: base.supply.negativeV * v };
      continue;
    }
    const fitted = FITTED_BY_PARAMETER.get(p.name);
    if (!fitted) continue;
    switch (fitted.fit.window.kind) {
      case 'level-high':
        highV = v;
        break;
      case 'level-low':
        lowV = v;
        break;
      case 'up-to':
        // The window starts at 0: rounding in the logistic must not take the figure below it.
        amplifier[fitted.figure] = Math.max(0, v);
        break;
      default:
        amplifier[fitted.figure] = v;
    }
  }
  // Levels are absolute; the supply scale moves the rails, and the headroom is what is left.
  if (highV !== undefined) amplifier.outputHeadroomHighV = Math.max(0, base.supply.positiveV - highV);
  if (lowV !== undefined) amplifier.outputHeadroomLowV = Math.max(0, lowV - base.supply.negativeV);
  return { ...base, supply, parts: partValues, amplifier };
}

export function nominalVector(params: readonly FitParameter[]): Float64Array {
  return Float64Array.from(params, (p) => p.priorMean);
}
