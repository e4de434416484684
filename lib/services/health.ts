// The app's readiness for GET /api/health: the process answers, and the database answers a trivial
// query within a short time. Says nothing secret (no addresses, versions or error texts).
import "server-only";
import { sequelize } from "@/db/sequelize";

/** A database that takes longer than this to answer `select 1` counts as unreachable. */
const DATABASE_CHECK_TIMEOUT_MS = 3_000;

export interface HealthReport {
  status: "ok" | "unavailable";
  app: { status: "ok"; uptimeS: number };
  database: { status: "ok" | "unreachable"; latencyMs: number | null };
}

export async function checkHealth(): Promise<HealthReport> {
  const started = performance.now();
  let reachable = false;
  let timer: ReturnType<typeof setTimeout> | undefined;
  try {
    await Promise.race([
      sequelize.query("SELECT 1"),
      new Promise((_, reject) => {
        timer = setTimeout(
          () => reject(new Error("database check timed out")),
          DATABASE_CHECK_TIMEOUT_MS,
        );
      }),
    ]);
    reachable = true;
  } catch {
    reachable = false;
  } finally {
    clearTimeout(timer);
  }
  return {
    status: reachable ? "ok" : "unavailable",
    app: { status: "ok", uptimeS: Math.round(process.uptime()) },
    database: {
      status: reachable ? "ok" : "unreachable",
      latencyMs: reachable ? Math.round(performance.now() - started) : null,
    },
  };
}
