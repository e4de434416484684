// The app's one pool for heavy work (PDF reports, line-table import plans, automatic lamp calibration,
// large analyses), sized from the environment, and the typed way services hand it a task.
import path from "node:path";
import { CalibrationError, type CalibrationErrorCode } from "@/lib/spectrum/calibration";
import type { HeavyOutcome, HeavyResults, HeavyTask, HeavyTaskError } from "./heavy-tasks";
import { createWorkPool, defaultThreadCount, type WorkPool } from "./work-pool";

const holder = globalThis as typeof globalThis & { emberlineHeavyPool?: WorkPool };

function positiveInteger(name: string): number | undefined {
  const raw = process.env[name];
  if (raw === undefined || raw.trim() === "") return undefined;
  const value = Number(raw);
  if (!Number.isInteger(value) || value < 0)
    throw new Error(`${name} must be a whole number, got "${raw}".`);
  return value;
}

/**
 * Started on first use; kept on globalThis so development's hot reload does not start another. The
 * worker file is found from the working directory (the app's root under `next start`, `next dev` and
 * the tests), like fonts/, because the server bundle does not carry it.
 */
export function heavyPool(): WorkPool {
  if (!holder.emberlineHeavyPool) {
    const threads = positiveInteger("EMBERLINE_WORKER_THREADS") || defaultThreadCount();
    holder.emberlineHeavyPool = createWorkPool({
      filename: path.join(process.cwd(), "lib", "workers", "heavy-worker.mjs"),
      threads,
      maxQueue: positiveInteger("EMBERLINE_WORKER_QUEUE") ?? 32 * threads,
      retryAfterSeconds: positiveInteger("EMBERLINE_WORKER_RETRY_AFTER_S") || 5,
    });
  }
  return holder.emberlineHeavyPool;
}

/** The error a task threw on its thread, as the class the services catch (RangeError, CalibrationError). */
export function reviveTaskError(error: HeavyTaskError): Error {
  if (error.name === "CalibrationError" && error.code) {
    return new CalibrationError(
      error.code as CalibrationErrorCode,
      error.message,
      error.details ?? {},
    );
  }
  const Kind =
    error.name === "RangeError" ? RangeError : error.name === "TypeError" ? TypeError : Error;
  const revived = new Kind(error.message);
  if (Kind === Error && error.name) revived.name = error.name;
  return revived;
}

/** Runs a task in the pool and returns its result, or throws what it threw (503 when the queue is full). */
export async function runHeavyTask<T extends HeavyTask>(
  task: T,
  pool: WorkPool = heavyPool(),
): Promise<HeavyResults[T["kind"]]> {
  const outcome = await pool.run<HeavyOutcome<T["kind"]>>(task);
  if (!outcome.ok) throw reviveTaskError(outcome.error);
  return outcome.value as HeavyResults[T["kind"]];
}
