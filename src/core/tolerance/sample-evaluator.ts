/**
 * One evaluation per sample: the prepared (compiled) model of the circuit
 * (circuit/engine/prepared.ts), the same walk every analysis uses. The value
 * vector is the shape's parameter layout (parts, supply, amplifier figures
 * including slew rate and recovery delay, load).
 */
import { prepareModel, type ModelChoice } from '../circuit/analyze.ts';
import type { PreparedModel } from '../circuit/engine/prepared.ts';
import type { Circuit } from '../circuit/types.ts';

export type SampleEvaluator = Pick<PreparedModel, 'model' | 'effects' | 'parameters' | 'nominal' | 'indexOf' | 'evaluate'>;

export function createSampleEvaluator(circuit: Circuit, choice: ModelChoice = 'auto'): SampleEvaluator {
  return prepareModel(circuit, { model: choice });
}
