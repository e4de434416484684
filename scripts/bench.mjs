// `npm run bench [-- --json]`: runs the benchmarks with tsx (no timing ever runs inside the tests), then the
// page-weight report of the production build in .next (built first when there is none; `--build` rebuilds).
// `npm run bench -- --pages [--build] [--json]`: the page-weight report alone (bench/page-weight-bench.ts).
// `npm run bench -- --load [--clients N --seconds S --pdf-share F --build]`: the production build under
// load instead (bench/load-bench.mjs, which starts its own database, app and clients on loopback).
// The line-table bench needs PostgreSQL: the local cluster is started here (and stopped after)
// when it is not already running; the bench builds and drops its own throwaway database.
import { spawnSync } from "node:child_process";
import path from "node:path";
import { startCluster } from "../db/cluster.mjs";
import { ensureDependencies, root } from "./bootstrap.mjs";

if (process.argv.includes("--load")) {
  const args = process.argv.slice(2).filter((a) => a !== "--load");
  const result = spawnSync(
    process.execPath,
    [path.join(root, "bench", "load-bench.mjs"), ...args],
    { cwd: root, stdio: "inherit" },
  );
  process.exit(result.status ?? 1);
}
ensureDependencies();
const tsx = path.join(root, "node_modules", ".bin", "tsx");
const pageWeight = path.join("bench", "page-weight-bench.ts");
if (process.argv.includes("--pages")) {
  const args = process.argv.slice(2).filter((a) => a !== "--pages");
  const result = spawnSync(tsx, [pageWeight, ...args], { cwd: root, stdio: "inherit" });
  process.exit(result.status ?? 1);
}
const args = process.argv.slice(2).filter((a) => a !== "--build");
const pgPort = Number(process.env.EMBERLINE_PG_PORT ?? 54329);
const dataRoot = path.resolve(root, process.env.EMBERLINE_DATA_DIR ?? ".data");
const cluster = await startCluster({ dataDir: path.join(dataRoot, "postgres"), port: pgPort });
const env = {
  ...process.env,
  DATABASE_URL: process.env.DATABASE_URL ?? `postgres://postgres@127.0.0.1:${pgPort}/postgres`,
};
let status = 0;
try {
  for (const file of [
    "bench/spectrum-bench.ts",
    "bench/design-packages-bench.ts",
    "bench/line-query-bench.ts",
  ]) {
    const result = spawnSync(tsx, [file, ...args], { cwd: root, stdio: "inherit", env });
    status ||= result.status ?? 1;
  }
} finally {
  cluster.stop();
}
// Needs no database: the build's manifests and chunks only.
const weights = spawnSync(
  tsx,
  [pageWeight, ...process.argv.slice(2).filter((a) => a === "--build" || a === "--json")],
  { cwd: root, stdio: "inherit" },
);
status ||= weights.status ?? 1;
process.exit(status);
