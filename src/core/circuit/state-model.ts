/**
 * Reduces a solved piece network to what the time behaviour needs: time
 * constant, asymptote, the decision-node line p(v) and the switching level,
 * plus affine output/rail currents for the current and supply figures.
 */
import { CoreError } from '../errors.ts';
import { NODE } from './nodes.ts';
import { branchCurrentAffine, nodeAffine, probeResistanceOhm, solveNetwork, type NetworkSolution } from './network.ts';
import { buildStateNetwork, saturationLevelV } from './state-network.ts';
import type { TopologyDefinition } from './topologies/topology.ts';
import type { Circuit, PieceConfig } from './types.ts';

/** q(v) = constA + perCapA·v for a fixed source voltage. */
export interface AffineInCap {
  constant: number;
  perCapV: number;
}

export interface StateModel {
  state: PieceConfig['state'];
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
  solution: NetworkSolution;
}

export function solveState(topology: TopologyDefinition, circuit: Circuit, piece: PieceConfig, sourceV = saturationLevelV(circuit, piece.state)): StateModel {
  const spec = buildStateNetwork(topology, circuit, piece);
  const sol = solveNetwork(spec);
  const driven = spec.sourceNode >= 0;
  const s = driven ? sourceV : 0;
  const capacitanceF = circuit.parts[topology.capacitorRole];
  const conductance = -sol.capPerVoltV;
  if (!(conductance > 0)) {
    throw new CoreError('no-oscillation', `In the ${piece.state} state the timing capacitor has no resistive path to charge through`);
  }
  const tauS = capacitanceF / conductance;
  const asymptoteV = (sol.capConstA + sol.capPerSourceV * s) / conductance;
  const p = nodeAffine(sol, NODE.decision);
  const decision: AffineInCap = { constant: p.constV + p.perSourceV * s, perCapV: p.perCapV };
  const slopeMargin = 1 - decision.perCapV;
  if (!(slopeMargin > 0)) {
    throw new CoreError('no-oscillation', `In the ${piece.state} state the decision node follows the capacitor too closely to switch`);
  }
  // The comparator flips when N reaches P + offset: v = p(v) + Vos.
  const switchingV = (decision.constant + circuit.amplifier.inputOffsetV) / slopeMargin;
  const pin = nodeAffine(sol, NODE.output);
  return {
    state: piece.state,
    sourceV: driven ? sourceV : Number.NaN,
    tauS,
    asymptoteV,
    decision,
    switchingV,
    outputPin: { constant: pin.constV + pin.perSourceV * s, perCapV: pin.perCapV },
    outputCurrent: driven ? currentLeaving(sol, spec.sourceNode, s) : { constant: 0, perCapV: 0 },
    positiveRailCurrent: currentLeaving(sol, NODE.positiveRail, s),
    decisionResistanceOhm: probeResistanceOhm(sol),
    solution: sol,
  };
}

/** Sum of branch currents leaving a node, affine in v. */
function currentLeaving(sol: NetworkSolution, node: number, sourceV: number): AffineInCap {
  let constant = 0;
  let perCapV = 0;
  for (const b of sol.spec.branches) {
    if (b.from !== node && b.to !== node) continue;
    const sign = b.from === node ? 1 : -1;
    const i = branchCurrentAffine(sol, b);
    constant += sign * (i.constA + i.perSourceA * sourceV);
    perCapV += sign * i.perCapA;
  }
  return { constant, perCapV };
}

export function evalAffine(q: AffineInCap, capV: number): number {
  return q.constant + q.perCapV * capV;
}
