/**
 * Runs a pool task on behalf of one HTTP request: the task is cancelled when the
 * client goes away before the answer is written, so abandoned heavy work does
 * not keep a thread busy.
 */
import type { FastifyReply } from 'fastify';
import { HttpProblem } from '../problem.ts';
import type { WorkerPool } from './pool.ts';
import type { TaskInput, TaskName, TaskOutput } from './tasks.ts';

export async function runForRequest<N extends TaskName>(
  workers: WorkerPool,
  reply: FastifyReply,
  task: N,
  input: TaskInput<N>,
  what: string,
  move?: readonly Float64Array[],
): Promise<TaskOutput<N>> {
  const abort = new AbortController();
  reply.raw.once('close', () => {
    if (!reply.raw.writableFinished) abort.abort();
  });
  try {
    return await workers.run(task, input, { signal: abort.signal, move });
  } catch (err) {
    if (abort.signal.aborted) throw new HttpProblem(400, 'client-closed', `The client closed the connection; the ${what} was cancelled`);
    throw err;
  }
}
