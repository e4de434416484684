// Stops and starts the test's PostgreSQL cluster the way db/cluster.mjs runs it (pg_ctl, as the
// postgres user when root), for the outage tests. Callers start it again in afterAll, whatever happens.
import { spawnSync } from "node:child_process";
import path from "node:path";

const root = path.resolve(__dirname, "../../..");
const dataDir = path.resolve(root, process.env.EMBERLINE_DATA_DIR ?? ".data", "postgres");
const pgPort = Number(
  process.env.EMBERLINE_PG_PORT ??
    new URL(process.env.DATABASE_URL ?? "postgres://x@127.0.0.1:54329/x").port,
);
const clusterModule = path.join(root, "db", "cluster.mjs");

/** Runs a snippet against db/cluster.mjs in a plain Node process (the script is plain ESM JavaScript). */
function cluster(snippet: string): void {
  const script = `import * as c from ${JSON.stringify(clusterModule)};\n${snippet}`;
  const result = spawnSync(process.execPath, ["--input-type=module", "-e", script], {
    encoding: "utf8",
    timeout: 90_000,
  });
  if (result.status !== 0)
    throw new Error(`cluster step failed: ${result.stderr || result.stdout}`);
}

export function stopDatabase(): void {
  cluster(`
    import { spawnSync } from "node:child_process";
    const bin = c.findPostgresBin();
    const args = ["-D", ${JSON.stringify(dataDir)}, "-m", "fast", "-w", "stop"];
    const isRoot = process.getuid?.() === 0;
    const r = isRoot ? spawnSync("runuser", ["-u", "postgres", "--", bin + "/pg_ctl", ...args], { encoding: "utf8" })
                     : spawnSync(bin + "/pg_ctl", args, { encoding: "utf8" });
    if (r.status !== 0) { console.error(r.stderr); process.exit(1); }
  `);
}

export function startDatabase(): void {
  cluster(`await c.startCluster({ dataDir: ${JSON.stringify(dataDir)}, port: ${pgPort} });`);
}
