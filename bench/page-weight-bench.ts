// `npm run bench` (and `npm run bench -- --pages [--build] [--json]` alone): the page-weight report of the
// production build in .next: first-load JavaScript per page route and the lazily loaded chart chunk,
// against the budgets of issue 14 (chart pages ≤ 500 KB gzip, other pages ≤ 200 KB). Exits 1 when a page
// is over its budget or carries the charting library in its first load. Builds first with --build, or
// when there is no build yet.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import {
  formatPageWeights,
  measurePageWeights,
  PageWeightError,
} from "../scripts/page-weight/page-weight";

const root = path.resolve(__dirname, "..");
const buildDir = path.join(root, ".next");
const json = process.argv.includes("--json");

if (process.argv.includes("--build") || !fs.existsSync(path.join(buildDir, "BUILD_ID"))) {
  process.stderr.write("[page-weight] Building the app (next build)…\n");
  const result = spawnSync(path.join(root, "node_modules", ".bin", "next"), ["build"], {
    cwd: root,
    stdio: ["ignore", "ignore", "inherit"],
    env: { ...process.env, NODE_ENV: "production" },
  });
  if (result.status !== 0) {
    process.stderr.write("[page-weight] next build failed.\n");
    process.exit(1);
  }
}

try {
  const report = measurePageWeights((file) => {
    // Only files inside the build folder are read.
    const full = path.resolve(buildDir, file);
    if (!full.startsWith(buildDir + path.sep)) return null;
    return fs.existsSync(full) ? fs.readFileSync(full) : null;
  });
  const builtAt = fs.statSync(path.join(buildDir, "BUILD_ID")).mtime.toISOString();
  if (json) process.stdout.write(`${JSON.stringify({ builtAt, ...report })}\n`);
  else process.stdout.write(`${formatPageWeights(report)}\n(built ${builtAt})\n`);
  process.exit(report.problems.length > 0 ? 1 : 0);
} catch (error) {
  if (!(error instanceof PageWeightError)) throw error;
  process.stderr.write(`[page-weight] ${error.message}\n`);
  process.exit(1);
}
