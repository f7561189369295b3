/**
 * The effective parameters the fit can move, with their priors.
 *
 * - Every part role of the topology (cTiming, rTiming, rFeedback, ...), in log
 *   space x = ln(value/nominal), prior N(0, (tolerance/3)²): the tolerance read
 *   as a ±3σ band (common practice). Only ratios of the threshold resistors
 *   matter to the waveform, so some of them cannot be told apart; the priors
 *   keep the fit determinate and the correlations say so.
 * - outputHighV / outputLowV: the output stage's light-load source levels
 *   (supply minus headroom), linear, prior σ = max(0.1 V, 2 % of the supply
 *   span) — our assumption for how far a class-typical headroom may be off.
 * - recoveryDelayS: linear, ≥ 0, prior σ = max(2 × nominal, 1 % of the
 *   nominal period) — our assumption: class-typical dynamic figures are
 *   uncertain by a factor of a few, and deep saturation in open-loop use can
 *   stretch recovery well beyond a quoted figure.
 * - slewRateVPerS: fitted as its reciprocal (edge time per volt, s/V, ≥ 0, so
 *   "instant" is the finite value 0), prior σ = max(2 × nominal, 1 % of the
 *   nominal period per volt of swing) — our assumption, as above.
 * For open-drain outputs the high level is the pull-up's and outputHighV is not fitted.
 */
import type { AmplifierModel } from '../../amplifiers/model.ts';
import { getTopology } from '../../circuit/analyze.ts';
import type { Circuit } from '../../circuit/types.ts';
import { CoreError } from '../../errors.ts';

export type ParameterKind = 'part' | 'amplifier';
export type ParameterSpace = 'log' | 'linear' | 'reciprocal';

export interface FitParameter {
  /** Part role (cTiming...) or amplifier effect (outputHighV, outputLowV, slewRateVPerS, recoveryDelayS). */
  name: string;
  kind: ParameterKind;
  /** SI unit of the natural value. */
  unit: 'ohm' | 'F' | 'V' | 'V/s' | 's';
  space: ParameterSpace;
  /** Natural value in the nominal circuit (Infinity for an instant slew rate). */
  nominal: number;
  /** Prior in the fitted space. */
  priorMean: number;
  priorSd: number;
  lower?: number;
  /** Part tolerance as a fraction (parts only). */
  tolerance?: number;
  /** Words for messages. */
  label: string;
}

/** Defaults when the caller gives no tolerance for a role: 1 % resistors, 10 % capacitors (common practice for timing parts). */
export const DEFAULT_TOLERANCE = { resistor: 0.01, capacitor: 0.1 } as const;
/** A tolerance is a ±3σ band (common practice). */
export const TOLERANCE_SIGMAS = 3;

/** Prior width of slew and delay: this many times the nominal figure, at least this share of the period (our assumptions). */
const DYNAMIC_PRIOR_FACTOR = 2;
const DYNAMIC_PRIOR_PERIOD_SHARE = 0.01;

export const AMPLIFIER_PARAMETERS = ['outputHighV', 'outputLowV', 'slewRateVPerS', 'recoveryDelayS'] as const;
export type AmplifierParameterName = (typeof AMPLIFIER_PARAMETERS)[number];

export function buildParameters(circuit: Circuit, nominalPeriodS: number, nominalSwingV: number, tolerances: Readonly<Record<string, number>> = {}): FitParameter[] {
  const topology = getTopology(circuit.topology);
  for (const [role, tol] of Object.entries(tolerances)) {
    if (!(role in topology.roles)) {
      throw new CoreError('unexpected-part', `tolerances names '${role}', which topology '${topology.id}' does not have; its roles are ${Object.keys(topology.roles).join(', ')}`, `/tolerances/${role}`);
    }
    if (!(tol > 0 && tol < 1)) throw new CoreError('invalid-value', `tolerance of ${role} must be a fraction between 0 and 1 (0.05 for 5 %)`, `/tolerances/${role}`);
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
      priorMean: 0,
      // ln(1 ± t) is asymmetric; the 3σ band is matched on the mean of both sides' log widths.
      priorSd: (Math.log(1 + tolerance) - Math.log(1 - tolerance)) / 2 / TOLERANCE_SIGMAS,
      tolerance,
      label: `${role} (${spec.description.split(',')[0]})`,
    });
  }
  const amp = circuit.amplifier;
  const span = circuit.supply.positiveV - circuit.supply.negativeV;
  const levelSd = Math.max(0.1, 0.02 * span);
  if (amp.outputStage !== 'open-drain') {
    const highV = circuit.supply.positiveV - amp.outputHeadroomHighV;
    params.push({ name: 'outputHighV', kind: 'amplifier', unit: 'V', space: 'linear', nominal: highV, priorMean: highV, priorSd: levelSd, label: 'output high level' });
  }
  const lowV = circuit.supply.negativeV + amp.outputHeadroomLowV;
  params.push({ name: 'outputLowV', kind: 'amplifier', unit: 'V', space: 'linear', nominal: lowV, priorMean: lowV, priorSd: levelSd, label: 'output low level' });
  const perVolt = 1 / Math.max(nominalSwingV, 1e-3);
  const uNominal = Number.isFinite(amp.slewRateVPerS) ? 1 / amp.slewRateVPerS : 0;
  params.push({
    name: 'slewRateVPerS',
    kind: 'amplifier',
    unit: 'V/s',
    space: 'reciprocal',
    nominal: amp.slewRateVPerS,
    priorMean: uNominal,
    priorSd: Math.max(DYNAMIC_PRIOR_FACTOR * uNominal, DYNAMIC_PRIOR_PERIOD_SHARE * nominalPeriodS * perVolt),
    lower: 0,
    label: 'slew rate',
  });
  params.push({
    name: 'recoveryDelayS',
    kind: 'amplifier',
    unit: 's',
    space: 'linear',
    nominal: amp.recoveryDelayS,
    priorMean: amp.recoveryDelayS,
    priorSd: Math.max(DYNAMIC_PRIOR_FACTOR * amp.recoveryDelayS, DYNAMIC_PRIOR_PERIOD_SHARE * nominalPeriodS),
    lower: 0,
    label: 'recovery delay',
  });
  return params;
}

/** Natural value (ohm, F, V, V/s, s) of a parameter at its fitted-space value. */
export function naturalValue(p: FitParameter, x: number): number {
  switch (p.space) {
    case 'log':
      return p.nominal * Math.exp(x);
    case 'linear':
      return x;
    case 'reciprocal':
      return x > 0 ? 1 / x : Infinity;
  }
}

/** Standard deviation in natural units by first-order propagation from the fitted space. */
export function naturalSd(p: FitParameter, x: number, sdX: number): number {
  switch (p.space) {
    case 'log':
      return p.nominal * Math.exp(x) * sdX;
    case 'linear':
      return sdX;
    case 'reciprocal':
      return x > 0 ? sdX / (x * x) : Infinity;
  }
}

/** The circuit with every parameter at the given fitted-space values. */
export function circuitAt(base: Circuit, params: readonly FitParameter[], x: ArrayLike<number>): Circuit {
  const parts: Record<string, number> = { ...base.parts };
  const amplifier: AmplifierModel = { ...base.amplifier };
  for (let j = 0; j < params.length; j++) {
    const p = params[j];
    const v = naturalValue(p, x[j]);
    if (p.kind === 'part') {
      parts[p.name] = v;
      continue;
    }
    switch (p.name as AmplifierParameterName) {
      case 'outputHighV':
        amplifier.outputHeadroomHighV = base.supply.positiveV - v;
        break;
      case 'outputLowV':
        amplifier.outputHeadroomLowV = v - base.supply.negativeV;
        break;
      case 'slewRateVPerS':
        amplifier.slewRateVPerS = v;
        break;
      case 'recoveryDelayS':
        amplifier.recoveryDelayS = Math.max(0, v);
        break;
    }
  }
  return { ...base, parts, amplifier };
}

export function nominalVector(params: readonly FitParameter[]): Float64Array {
  return Float64Array.from(params, (p) => p.priorMean);
}
