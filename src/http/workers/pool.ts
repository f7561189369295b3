/**
 * A worker-thread pool (piscina) for heavy pure-core work, so one request never
 * stalls the event loop (DESIGN §2). Routes call
 *
 *     const result = await app.services.workers.run('tolerance', input, { signal });
 *
 * with a task name from tasks.ts; input and output are structured-cloned. A
 * CoreError thrown in the worker is rethrown here as a CoreError, so the usual
 * problem+json mapping applies. A full queue rejects with 503 + Retry-After.
 *
 * The worker entry is worker.ts under tsx/vitest (loaded through tsx's ESM
 * hooks, passed to the thread with --import) and worker.js after `npm run build`.
 */
import { availableParallelism } from 'node:os';
import { Piscina } from 'piscina';
import { CoreError } from '../../core/errors.ts';
import { HttpProblem } from '../problem.ts';
import type { TaskName, TaskInput, TaskOutput } from './tasks.ts';
import runTaskInline, { type TaskMessage, type TaskReply } from './worker.ts';

export interface WorkerPoolOptions {
  /** Worker threads; 0 runs tasks inline on the calling thread (debugging only: it blocks the event loop). */
  threads: number;
  /** Threads kept alive when idle (default 0: spawned on first use, so apps that never run heavy work start none). */
  minThreads?: number;
  /** Idle time before a thread above minThreads exits, ms. */
  idleTimeoutMs?: number;
  /** Tasks that may wait for a thread; beyond it run() rejects with 503 (default 8 per thread). */
  maxQueue?: number;
  /** Wraps every run (metrics, tracing): called with the task name and signal, must call `run` once. */
  observe?: TaskObserver;
  /**
   * Longest a task may take from submission to answer, ms (default 30 s). When it passes, a queued task
   * is dropped and a running one's thread is terminated (piscina replaces it), and run() rejects with
   * 503 `deadline-exceeded` — so one costly request can hold a thread for at most this long.
   */
  deadlineMs?: number;
}

export type TaskObserver = <R>(task: TaskName, signal: AbortSignal | undefined, run: () => Promise<R>) => Promise<R>;

export interface RunOptions {
  /** Aborting cancels a queued task and terminates a running one. */
  signal?: AbortSignal;
  /**
   * Typed arrays of the input to move to the thread instead of copying (they are unusable here
   * afterwards). When they add up to RELEASE_AFTER_BYTES or more, the thread collects its garbage
   * once the task is done, so a large capture's memory goes back to the system at once rather than
   * whenever an idle thread next collects.
   */
  move?: readonly Float64Array[];
}

export const RELEASE_AFTER_BYTES = 8 * 1024 * 1024;

export interface WorkerPoolStats {
  threads: number;
  queued: number;
  completed: number;
}

const RUNNING_FROM_SOURCE = import.meta.url.endsWith('.ts');

/** Where the worker entry lives and what a thread needs to load it. */
export function workerEntry(): { filename: string; execArgv: string[] } {
  if (!RUNNING_FROM_SOURCE) return { filename: new URL('./worker.js', import.meta.url).href, execArgv: [] };
  // TypeScript source: a plain-JS entry registers tsx's hooks in the thread, then imports worker.ts
  // (tsx is a dev dependency; dist/ never needs it).
  return { filename: new URL('./source-entry.mjs', import.meta.url).href, execArgv: [] };
}

export const DEFAULT_TASK_DEADLINE_MS = 30_000;

/**
 * Share of the task deadline one analysis (a tolerance run, one BOM assembly) may be projected to take (our own figure). The other half
 * covers what the projection cannot see: time in the queue and a thread's start-up (both count against
 * the deadline), and a machine that gets busier after the pilot was timed.
 */
export const ANALYSIS_DEADLINE_SHARE = 0.5;

export class WorkerPool {
  private readonly piscina: Piscina | undefined;
  private closed = false;
  /** Aborted by cancelAll(): every queued and running task stops (shutdown). */
  private cancelAllController = new AbortController();
  readonly deadlineMs: number;
  /** Tasks submitted and not settled. Piscina does not apply maxQueue to abortable tasks (they wait in a
   *  separate queue), and every task here is abortable, so the bound is kept here. */
  private pending = 0;
  private readonly capacity: number;

  constructor(readonly options: WorkerPoolOptions) {
    this.deadlineMs = options.deadlineMs ?? DEFAULT_TASK_DEADLINE_MS;
    const threads = Math.max(0, Math.floor(options.threads));
    this.capacity = threads + (options.maxQueue ?? threads * 8);
    if (threads === 0) return;
    const entry = workerEntry();
    this.piscina = new Piscina({
      filename: entry.filename,
      execArgv: entry.execArgv,
      maxThreads: threads,
      minThreads: Math.min(threads, options.minThreads ?? 0),
      idleTimeout: options.idleTimeoutMs ?? 60_000,
      maxQueue: options.maxQueue ?? threads * 8,
    });
  }

  /** Default size: the configured count, capped by the machine's parallelism. */
  static sized(threads: number, extra: Omit<WorkerPoolOptions, 'threads'> = {}): WorkerPool {
    return new WorkerPool({ threads: Math.min(threads, Math.max(1, availableParallelism())), ...extra });
  }

  async run<N extends TaskName>(task: N, input: TaskInput<N>, options: RunOptions = {}): Promise<TaskOutput<N>> {
    const observe = this.options.observe;
    return observe ? observe(task, options.signal, () => this.runTask(task, input, options)) : this.runTask(task, input, options);
  }

  private async runTask<N extends TaskName>(task: N, input: TaskInput<N>, options: RunOptions): Promise<TaskOutput<N>> {
    if (this.closed) throw new HttpProblem(503, 'shutting-down', 'The service is shutting down', undefined, { 'retry-after': '5' });
    let reply: TaskReply;
    if (!this.piscina) {
      reply = runTaskInline({ task, input });
    } else {
      if (this.pending >= this.capacity) {
        throw new HttpProblem(503, 'overloaded', 'All worker threads are busy and the queue is full; retry later', undefined, { 'retry-after': '2' });
      }
      const deadline = AbortSignal.timeout(this.deadlineMs);
      const cancelled = this.cancelAllController.signal;
      const signals = [deadline, cancelled, ...(options.signal ? [options.signal] : [])];
      this.pending++;
      try {
        const moved = options.move ?? [];
        const movedBytes = moved.reduce((n, a) => n + a.byteLength, 0);
        const message: TaskMessage = { task, input, releaseMemory: movedBytes >= RELEASE_AFTER_BYTES };
        const transferList = moved.map((a) => a.buffer as ArrayBuffer);
        reply = (await this.piscina.run(message, { signal: AbortSignal.any(signals), transferList })) as TaskReply;
      } catch (err) {
        if (err instanceof Error && /queue is at limit/i.test(err.message)) {
          throw new HttpProblem(503, 'overloaded', 'All worker threads are busy and the queue is full; retry later', undefined, { 'retry-after': '2' });
        }
        // The caller's own signal is reported by the caller (it knows why it aborted).
        if (options.signal?.aborted) throw err;
        if (cancelled.aborted) {
          throw new HttpProblem(503, 'shutting-down', 'The service is shutting down; the task was cancelled', undefined, { 'retry-after': '5' });
        }
        if (deadline.aborted) {
          throw new HttpProblem(
            503,
            'deadline-exceeded',
            `The ${String(task)} task took longer than the ${this.deadlineMs} ms limit (TICKWRIGHT_TASK_DEADLINE_MS) and was stopped; narrow the request or retry when the service is less busy`,
            undefined,
            { 'retry-after': '5' },
          );
        }
        throw err;
      } finally {
        this.pending--;
      }
    }
    if (!reply.ok) throw new CoreError(reply.error.code, reply.error.message, reply.error.pointer, reply.error.details);
    return reply.value as TaskOutput<N>;
  }

  get stats(): WorkerPoolStats {
    if (!this.piscina) return { threads: 0, queued: 0, completed: 0 };
    return { threads: this.piscina.threads.length, queued: Math.max(0, this.pending - this.piscina.threads.length), completed: this.piscina.completed };
  }

  /** Cancels every queued and running task (their callers get 503 shutting-down); the pool stays usable. */
  cancelAll(): void {
    this.cancelAllController.abort();
    this.cancelAllController = new AbortController();
  }

  /** Lets running tasks finish, then stops the threads. */
  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    await this.piscina?.close();
  }
}
