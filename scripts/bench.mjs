// `npm run bench [-- --json]`: runs the benchmarks with tsx (no timing ever runs inside the tests).
import { spawnSync } from "node:child_process";
import path from "node:path";
import { ensureDependencies, root } from "./bootstrap.mjs";

ensureDependencies();
const tsx = path.join(root, "node_modules", ".bin", "tsx");
const args = process.argv.slice(2);
let status = 0;
for (const file of ["bench/spectrum-bench.ts"]) {
  const result = spawnSync(tsx, [file, ...args], { cwd: root, stdio: "inherit" });
  status ||= result.status ?? 1;
}
process.exit(status);
