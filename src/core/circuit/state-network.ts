/**
 * Assembles the linear network of one piece: rails, the output stage (a source
 * at the state's saturation level behind the output resistance), an optional
 * load, input bias currents, and the topology's own branches.
 */
import { NODE } from './nodes.ts';
import type { Branch, NetworkSpec } from './network.ts';
import type { TopologyDefinition } from './topologies/topology.ts';
import type { Circuit, PieceConfig } from './types.ts';

export function buildStateNetwork(topology: TopologyDefinition, circuit: Circuit, piece: PieceConfig): NetworkSpec {
  const nodeCount = NODE.firstInternal + topology.internalNodeCount;
  const fixedV = new Float64Array(nodeCount).fill(Number.NaN);
  const injectionA = new Float64Array(nodeCount);
  fixedV[NODE.ground] = 0;
  fixedV[NODE.positiveRail] = circuit.supply.positiveV;
  fixedV[NODE.negativeRail] = circuit.supply.negativeV;
  fixedV[NODE.loadReturn] = circuit.load ? circuit.load.returnV : 0;

  const branches: Branch[] = topology.branches(circuit.parts, piece, circuit.diode);
  const rOut = circuit.amplifier.outputResistanceOhm;
  let sourceNode: number;
  if (!piece.outputDriven) {
    // Output stage released (open drain off): nothing drives the pin.
    sourceNode = -1;
    fixedV[NODE.source] = 0;
  } else if (rOut > 0) {
    sourceNode = NODE.source;
    branches.push({ from: NODE.source, to: NODE.output, resistanceOhm: rOut, emfV: 0, label: 'outputResistance' });
  } else {
    // A stiff output: the pin itself is the source; the unused source node is parked at 0 V.
    sourceNode = NODE.output;
    fixedV[NODE.source] = 0;
  }
  if (circuit.load) {
    branches.push({ from: NODE.output, to: NODE.loadReturn, resistanceOhm: circuit.load.resistanceOhm, emfV: 0, label: 'load' });
  }
  // Bias current flows into the input pins, i.e. out of the network nodes.
  const bias = circuit.amplifier.inputBiasCurrentA;
  injectionA[NODE.decision] -= bias;
  injectionA[NODE.capacitor] -= bias;
  return {
    nodeCount,
    fixedV,
    capNode: NODE.capacitor,
    sourceNode,
    probeNode: NODE.decision,
    branches,
    injectionA,
  };
}

/** The output-stage source voltage of a state (its light-load saturation level). */
export function saturationLevelV(circuit: Circuit, state: PieceConfig['state']): number {
  const { supply, amplifier } = circuit;
  return state === 'high' ? supply.positiveV - amplifier.outputHeadroomHighV : supply.negativeV + amplifier.outputHeadroomLowV;
}
