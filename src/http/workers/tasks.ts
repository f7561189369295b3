import { reviveBiasShape, type BiasShape } from '../../core/parts/capacitor/index.ts';
/**
 * Named pure-core tasks the worker pool can run. Each is a synchronous function
 * of structured-cloneable input (plain objects, numbers including Infinity,
 * typed arrays) to structured-cloneable output. Add a task: import its core
 * function here and list it; `WorkerPool.run(name, input)` is then typed by it.
 * Only src/core imports belong here: this module is loaded inside worker threads.
 */
import { designOscillator, type DesignRequest } from '../../core/design/index.ts';
import { fitCircuit, type FitInput } from '../../core/fit/index.ts';
import { runToleranceAnalysis, type ToleranceRequest } from '../../core/tolerance/index.ts';
import { waveformTask, type WaveformTaskInput } from './waveform-task.ts';

/** The capacitor's C(v) shape arrives as plain data (structured clone): make it whole again. */
function reviveCircuitShape<T extends { circuit?: unknown }>(input: T): T {
  const circuit = input.circuit as { capacitorShape?: BiasShape } | undefined;
  if (circuit?.capacitorShape) circuit.capacitorShape = reviveBiasShape(circuit.capacitorShape);
  return input;
}

/** A tolerance run and the time it may take (ms; absent: no limit), measured on the thread's own clock. */
export interface ToleranceTaskInput {
  request: ToleranceRequest;
  budgetMs?: number;
}

export const TASKS = {
  /** POST /v1/tolerance: worst case, Monte Carlo, sensitivities (Monte Carlo refused up front when it would not fit budgetMs). */
  tolerance: (input: ToleranceTaskInput) =>
    runToleranceAnalysis(reviveCircuitShape(input.request), input.budgetMs === undefined ? {} : { budget: { limitMs: input.budgetMs } }),
  /** POST /v1/design: searches over series or catalogues with full analyses (tens to hundreds of ms). */
  design: (input: DesignRequest) => designOscillator(input),
  /** POST /v1/fit: capture analysis (up to millions of samples), MAP fit, diagnosis. */
  fit: (input: FitInput) => fitCircuit(input),
  /** POST /v1/waveform: time-domain walk, sampling (up to the sample cap) and the serialised answer. */
  waveform: (input: WaveformTaskInput) => waveformTask(reviveCircuitShape(input)),
  /** Round trip through a worker (health and tests): echoes its input and names the thread. */
  echo: <T>(input: T) => input,
  /** Busy-waits for input.ms milliseconds, then answers (tests of event-loop freedom and queueing). */
  spin: (input: { ms: number }) => {
    const until = performance.now() + input.ms;
    let spins = 0;
    while (performance.now() < until) spins++;
    return { spins };
  },
} as const;

export type TaskName = keyof typeof TASKS;
export type TaskInput<N extends TaskName> = Parameters<(typeof TASKS)[N]>[0];
export type TaskOutput<N extends TaskName> = ReturnType<(typeof TASKS)[N]>;
