/**
 * One evaluation per sample, whatever the model: the compiled closed form when
 * it answers, or the full analysis (with its time-domain engine) when slew,
 * delay or limits matter. Both take the same value vector: the closed-form
 * layout followed by the two dynamic figures only the engine uses.
 */
import { analyzeCircuit, chooseModel, type ModelChoice } from '../circuit/analyze.ts';
import {
  compileClosedForm,
  EVALUATION_STATUS,
  type ClosedFormCompileCache,
  type ClosedFormEvaluator,
  type EvaluationStatus,
  type ParameterInfo,
} from '../circuit/fast-evaluator.ts';
import type { ModelName } from '../circuit/result.ts';
import type { Circuit } from '../circuit/types.ts';
import { CoreError } from '../errors.ts';

export const DYNAMIC_PARAMETERS = ['slewRateVPerS', 'recoveryDelayS'] as const;

export interface SampleEvaluator {
  model: ModelName;
  parameters: readonly ParameterInfo[];
  nominal: Float64Array;
  indexOf(name: string): number;
  /** Writes periodS, dutyCycle, timeHighS, timeLowS (OUTPUT_SLOT order); NaN and a status on failure. */
  evaluate(values: Float64Array, out: Float64Array): EvaluationStatus;
}

/** `compileCache`: reuse compiled structures across circuits of one shape (batches); same evaluator either way. */
export function createSampleEvaluator(circuit: Circuit, choice: ModelChoice = 'auto', compileCache?: ClosedFormCompileCache): SampleEvaluator {
  const closedForm = compileCache ? compileCache.compile(circuit) : compileClosedForm(circuit);
  const base = closedForm.parameters.length;
  const parameters: ParameterInfo[] = [...closedForm.parameters, ...DYNAMIC_PARAMETERS.map((name) => ({ name, kind: 'amplifier' as const }))];
  const nominal = new Float64Array(parameters.length);
  nominal.set(closedForm.nominal);
  nominal[base] = circuit.amplifier.slewRateVPerS;
  nominal[base + 1] = circuit.amplifier.recoveryDelayS;
  const indexOf = (name: string) => {
    const i = closedForm.indexOf(name);
    if (i >= 0) return i;
    const d = DYNAMIC_PARAMETERS.indexOf(name as (typeof DYNAMIC_PARAMETERS)[number]);
    return d >= 0 ? base + d : -1;
  };
  const model = chooseModel(circuit, choice);
  return model === 'closed-form'
    ? new ClosedFormSamples(parameters, nominal, indexOf, closedForm)
    : new TimeDomainSamples(parameters, nominal, indexOf, closedForm, base);
}

/** Classes, not closures: one hidden class per path keeps the sampling loop's calls monomorphic across requests. */
class ClosedFormSamples implements SampleEvaluator {
  readonly model = 'closed-form' as const;
  constructor(
    readonly parameters: readonly ParameterInfo[],
    readonly nominal: Float64Array,
    readonly indexOf: (name: string) => number,
    private readonly closedForm: ClosedFormEvaluator,
  ) {}

  evaluate(values: Float64Array, out: Float64Array): EvaluationStatus {
    return this.closedForm.evaluate(values, out);
  }
}

class TimeDomainSamples implements SampleEvaluator {
  readonly model = 'time-domain' as const;
  constructor(
    readonly parameters: readonly ParameterInfo[],
    readonly nominal: Float64Array,
    readonly indexOf: (name: string) => number,
    private readonly closedForm: ClosedFormEvaluator,
    private readonly base: number,
  ) {}

  evaluate(values: Float64Array, out: Float64Array): EvaluationStatus {
    const base = this.base;
    const circuit = this.closedForm.circuitAt(values.subarray(0, base));
    circuit.amplifier.slewRateVPerS = values[base];
    circuit.amplifier.recoveryDelayS = values[base + 1];
    try {
      const r = analyzeCircuit(circuit, { model: 'time-domain' });
      out[0] = r.periodS;
      out[1] = r.dutyCycle;
      out[2] = r.timeHighS;
      out[3] = r.timeLowS;
      return EVALUATION_STATUS.ok;
    } catch (err) {
      out[0] = out[1] = out[2] = out[3] = Number.NaN;
      if (err instanceof CoreError) {
        if (err.code === 'no-oscillation') return EVALUATION_STATUS.latched;
        if (err.code === 'not-converged') return EVALUATION_STATUS.noPath;
        return EVALUATION_STATUS.invalidValue;
      }
      throw err;
    }
  }
}
