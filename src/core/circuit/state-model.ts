/**
 * One output state reduced to what its time behaviour needs (docs/model.md §1):
 * time constant, asymptote, the decision-node line p(v) and the switching level,
 * plus affine output/rail currents. Read off the compiled network solve of the
 * state's nominal configuration at its saturation level — the same solve the
 * walk uses, so checks, ceilings and the walk can never disagree.
 */
import { CoreError } from '../errors.ts';
import type { ConfigModel } from './engine/configs.ts';
import type { OutputState } from './types.ts';

/** q(v) = constA + perCapV·v for a fixed source voltage. */
export interface AffineInCap {
  constant: number;
  perCapV: number;
}

export interface StateModel {
  state: OutputState;
  /** Output-stage source level in this state, V (NaN when not driven). */
  sourceV: number;
  tauS: number;
  /** Capacitor voltage the state would settle at, V. */
  asymptoteV: number;
  /** Decision-node voltage as a function of the capacitor voltage, V. */
  decision: AffineInCap;
  /** Capacitor voltage at which the comparator flips out of this state, V. */
  switchingV: number;
  outputPin: AffineInCap;
  /** Current out of the amplifier output pin into the network, A (positive = sourcing). */
  outputCurrent: AffineInCap;
  /** Current the passive network draws from the positive rail, A. */
  positiveRailCurrent: AffineInCap;
  /** Thevenin resistance at the decision node, ohm. */
  decisionResistanceOhm: number;
}

/** The state model of a solved configuration with the source at `sourceV` (NaN: the stage does not drive). */
export function stateModelOf(cfg: ConfigModel, state: OutputState, sourceV: number, inputOffsetV: number): StateModel {
  const driven = !Number.isNaN(sourceV);
  const s = driven ? sourceV : 0;
  if (!(cfg.a > 0)) {
    throw new CoreError('no-oscillation', `In the ${state} state the timing capacitor has no resistive path to charge through`);
  }
  const decision: AffineInCap = { constant: cfg.pC + cfg.pS * s, perCapV: cfg.pV };
  const slopeMargin = 1 - decision.perCapV;
  if (!(slopeMargin > 0)) {
    throw new CoreError('no-oscillation', `In the ${state} state the decision node follows the capacitor too closely to switch`);
  }
  return {
    state,
    sourceV,
    tauS: 1 / cfg.a,
    asymptoteV: (cfg.b0 + cfg.bS * s) / cfg.a,
    decision,
    // The comparator flips when N reaches P + offset: v = p(v) + Vos.
    switchingV: (decision.constant + inputOffsetV) / slopeMargin,
    outputPin: { constant: cfg.oC + cfg.oS * s, perCapV: cfg.oV },
    outputCurrent: driven ? { constant: cfg.iC + cfg.iS * s, perCapV: cfg.iV } : { constant: 0, perCapV: 0 },
    positiveRailCurrent: { constant: cfg.railC + cfg.railS * s, perCapV: cfg.railV },
    decisionResistanceOhm: cfg.pR,
  };
}

export function evalAffine(q: AffineInCap, capV: number): number {
  return q.constant + q.perCapV * capV;
}
