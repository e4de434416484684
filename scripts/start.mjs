// `npm start`: a fresh clone to the running app with demo data; `npm run dev` for hot reload.
// Idempotent: a second run reuses the cluster, the database and the demo data.
import path from "node:path";
import { spawnSync } from "node:child_process";
import { bootstrap, log, root, startChild, stopChildren, waitForPort } from "./bootstrap.mjs";

const dev = process.argv.includes("--dev");
const port = Number(process.env.PORT ?? 3000);
const host = process.env.HOST ?? "127.0.0.1";
/** An app that ran this long before dying is restarted after the shortest pause again. */
const RESTART_RESET_MS = 60_000;

/** 1 s, 2 s, 4 s … up to 30 s between restarts of an app that keeps dying. */
function restartDelayMs(failures) {
  return Math.min(30_000, 1_000 * 2 ** Math.max(0, failures - 1));
}

async function main() {
  const appUrl = process.env.APP_URL ?? `http://${host}:${port}`;
  const { env, stopCluster } = await bootstrap({
    database: process.env.EMBERLINE_DB_NAME ?? "emberline",
    mailPort: Number(process.env.EMBERLINE_SMTP_PORT ?? 2525),
    mailDir: "mail",
    appUrl,
  });
  const appEnv = {
    ...env,
    APP_URL: appUrl,
    // The demo keeps the outgoing-mail viewer (secret links masked); a production install has it off.
    EMBERLINE_MAIL_VIEWER: process.env.EMBERLINE_MAIL_VIEWER ?? "1",
  };
  const next = path.join(root, "node_modules", ".bin", "next");

  if (!dev) {
    log("Building the app (next build)…");
    const build = spawnSync(next, ["build"], {
      cwd: root,
      stdio: "inherit",
      env: { ...appEnv, NODE_ENV: "production" },
    });
    if (build.status !== 0) throw new Error("next build failed");
  }
  let stopping = false;
  const shutdown = () => {
    stopping = true;
    log("Stopping…");
    stopChildren();
    stopCluster();
    process.exit(0);
  };
  process.on("SIGINT", shutdown);
  process.on("SIGTERM", shutdown);

  // The app is restarted when it dies (a crash, the kernel's OOM killer), with a growing pause
  // between quick deaths; PostgreSQL and the mail server keep running. Only Ctrl-C stops everything.
  let failures = 0;
  const runApp = () => {
    const startedAt = Date.now();
    const app = startChild(next, [dev ? "dev" : "start", "-H", host, "-p", String(port)], {
      env: { ...appEnv, NODE_ENV: dev ? "development" : "production" },
    });
    app.once("exit", (code, signal) => {
      if (stopping) return;
      // A run that lasted a while starts the backoff afresh.
      failures = Date.now() - startedAt > RESTART_RESET_MS ? 1 : failures + 1;
      const delayMs = restartDelayMs(failures);
      log(
        `The app exited (${signal ?? code}); restarting it in ${delayMs / 1000} s. The database keeps running.`,
      );
      setTimeout(() => stopping || runApp(), delayMs);
    });
  };
  runApp();

  await waitForPort(port, 180_000, host);
  {
    log(`Emberline is running at ${appEnv.APP_URL}`);
    log("Demo sign-ins (password emberline-demo):");
    log("  chem@demo.emberline.example   chemist");
    log("  super@demo.emberline.example  supervisor");
    log(
      "  lead@demo.emberline.example   lab lead (Flame Screening), supervisor (Arc and Spark Bench)",
    );
    log("  bench@demo.emberline.example  lab lead (Arc and Spark Bench)");
    log("Press Ctrl-C to stop; the data stays in .data/.");
  }
}

main().catch((error) => {
  process.stderr.write(`[emberline] ${error instanceof Error ? error.message : error}\n`);
  stopChildren();
  process.exit(1);
});
