/**
 * Worker-thread entry for the pool: runs one named task from tasks.ts. A
 * CoreError cannot cross the thread boundary as its class (structured clone
 * keeps only message and name), so failures travel as data and the pool
 * rebuilds them.
 */
import '../../core/index.ts'; // the core's public surface: registers whatever models it plugs in (e.g. an engine)
import { CoreError } from '../../core/errors.ts';
import { releaseMemorySoon } from '../release-memory.ts';
import { TASKS, type TaskName } from './tasks.ts';

export interface TaskMessage {
  task: TaskName;
  input: unknown;
  /** The input was large (moved typed arrays): collect garbage once the answer is out (release-memory.ts). */
  releaseMemory?: boolean;
}

export type TaskReply =
  | { ok: true; value: unknown }
  | { ok: false; error: { kind: 'core'; code: CoreError['code']; message: string; pointer?: string; details?: Record<string, unknown> } };

export default function runTask(message: TaskMessage): TaskReply {
  const fn = TASKS[message.task] as ((input: unknown) => unknown) | undefined;
  if (typeof fn !== 'function') throw new Error(`unknown worker task '${String(message.task)}'`);
  if (message.releaseMemory) releaseMemorySoon();
  try {
    return { ok: true, value: fn(message.input) };
  } catch (err) {
    if (err instanceof CoreError) {
      return { ok: false, error: { kind: 'core', code: err.code, message: err.message, pointer: err.pointer, details: err.details } };
    }
    throw err;
  }
}
