// A pool of worker threads with a bounded queue (piscina): heavy work waits its turn off the request
// thread, and when the queue is full the caller gets 503 with Retry-After instead of an ever longer wait.
import os from "node:os";
import { Piscina } from "piscina";
import { AppError } from "@/lib/errors";

export interface WorkPoolOptions {
  /** Absolute path of the worker module (its default export takes a task and returns the result). */
  filename: string;
  /** Threads that run tasks at once. @default max(1, cores − 1) */
  threads?: number;
  /** Tasks that may wait for a thread; one more is refused with 503. @default 16 × threads */
  maxQueue?: number;
  /** Retry-After of the 503, in seconds. @default 5 */
  retryAfterSeconds?: number;
  /** A thread idle this long exits (it is started again on demand). @default 60000 */
  idleTimeoutMs?: number;
}

export interface WorkPool {
  /** Runs a task on a thread; throws AppError("unavailable", …, {retryAfterSeconds}) when the queue is full. */
  run<T>(task: unknown): Promise<T>;
  /** Tasks waiting, threads started and tasks done, for logs and the bench. */
  stats(): { queued: number; threads: number; completed: number };
  close(): Promise<void>;
}

/** Threads for heavy work: one core is left to the request thread (and the database beside it). */
export function defaultThreadCount(): number {
  return Math.max(1, os.availableParallelism() - 1);
}

const QUEUE_FULL = "Task queue is at limit";

export function createWorkPool(options: WorkPoolOptions): WorkPool {
  const threads = Math.max(1, Math.floor(options.threads ?? defaultThreadCount()));
  const maxQueue = Math.max(0, Math.floor(options.maxQueue ?? 16 * threads));
  const retryAfterSeconds = options.retryAfterSeconds ?? 5;
  const pool = new Piscina({
    filename: options.filename,
    // Threads stay up: starting one compiles the tasks (seconds), which a request should not wait for.
    minThreads: threads,
    maxThreads: threads,
    maxQueue,
    idleTimeout: options.idleTimeoutMs ?? 60_000,
  });
  return {
    async run<T>(task: unknown): Promise<T> {
      try {
        return (await pool.run(task)) as T;
      } catch (error) {
        if (error instanceof Error && error.message === QUEUE_FULL) throw busy(retryAfterSeconds);
        throw error;
      }
    },
    stats: () => ({
      queued: pool.queueSize,
      threads: pool.threads.length,
      completed: pool.completed,
    }),
    close: () => pool.close({ force: true }),
  };
}

function busy(retryAfterSeconds: number): AppError {
  return new AppError(
    "unavailable",
    `The server is busy with other heavy work (reports, imports, calibrations). Try again in ${retryAfterSeconds} seconds.`,
    { retryAfterSeconds },
  );
}
