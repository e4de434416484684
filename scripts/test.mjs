// `npm test`: every check from a fresh clone — the same bootstrap as `npm start` against a test
// database created afresh, then Prettier's check, ESLint, the type check, the licence check of the
// production dependencies, a production build served
// on a test port, and Vitest (unit, integration against the real PostgreSQL, end to end in Debian's Chromium).
import fs from "node:fs";
import path from "node:path";
import { spawnSync } from "node:child_process";
import { bootstrap, log, root, startChild, stopChildren, waitForPort } from "./bootstrap.mjs";

const testPort = Number(process.env.EMBERLINE_TEST_PORT ?? 3100);
const mailPort = Number(process.env.EMBERLINE_TEST_SMTP_PORT ?? 2526);
const bin = (name) => path.join(root, "node_modules", ".bin", name);
// `npm test -- --quick <vitest args>` skips ESLint and tsc and passes the rest to Vitest,
// for a fast loop on a few test files.
const argv = process.argv.slice(2);
const quick = argv.includes("--quick");
const vitestArgs = argv.filter((a) => a !== "--quick");
const isRoot = typeof process.getuid === "function" && process.getuid() === 0;

function step(title, command, args, env) {
  log(`${title}…`);
  const result = spawnSync(command, args, { cwd: root, stdio: "inherit", env });
  if (result.status !== 0) throw new Error(`${title} failed (exit ${result.status})`);
}

function ensureChromium() {
  if (fs.existsSync("/usr/bin/chromium")) return;
  if (!isRoot)
    throw new Error(
      "Browser tests need Debian's `chromium` package: sudo apt-get install chromium",
    );
  log("Installing Debian's chromium package for the browser tests…");
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  for (const args of [
    ["update", "-qq"],
    ["install", "-y", "-qq", "--no-install-recommends", "chromium"],
  ]) {
    const result = spawnSync("apt-get", args, { stdio: "inherit", env });
    if (result.status !== 0) throw new Error(`apt-get ${args.join(" ")} failed`);
  }
}

function ensurePdfTools() {
  if (fs.existsSync("/usr/bin/pdftotext") || !isRoot) return;
  log("Installing Debian's poppler-utils for the report tests…");
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  spawnSync("apt-get", ["install", "-y", "-qq", "--no-install-recommends", "poppler-utils"], {
    stdio: "inherit",
    env,
  });
}

async function main() {
  const mailDir = "mail-test";
  fs.rmSync(path.join(root, process.env.EMBERLINE_DATA_DIR ?? ".data", mailDir), {
    recursive: true,
    force: true,
  });
  const appUrl = `http://127.0.0.1:${testPort}`;
  const { env, stopCluster } = await bootstrap({
    database: "emberline_test",
    freshDatabase: true,
    mailPort,
    mailDir,
    appUrl,
  });
  const testEnv = { ...env, APP_URL: appUrl, EMBERLINE_TEST_URL: appUrl };
  let failed = false;
  try {
    if (!quick) {
      step("Prettier (the whole tree is formatted)", bin("prettier"), ["--check", "."], testEnv);
      step("ESLint", bin("eslint"), [".", "--max-warnings=0"], testEnv);
      step("Type check (tsc --noEmit)", bin("tsc"), ["--noEmit"], testEnv);
      step(
        "Licences of the production dependencies (licence-allow-list.json)",
        bin("tsx"),
        ["scripts/check-licences.ts"],
        testEnv,
      );
    }
    ensureChromium();
    ensurePdfTools();
    step("Building the app for the tests (next build)", bin("next"), ["build"], {
      ...testEnv,
      NODE_ENV: "production",
    });
    startChild(bin("next"), ["start", "-H", "127.0.0.1", "-p", String(testPort)], {
      // The tests' HTTP client plays a trusted proxy on 127.0.0.1 (each test file sends its own
      // X-Forwarded-For); clients on other loopback addresses (127.0.0.2…) are untrusted. The tests
      // read outgoing mail through the API too, so the production build's mail viewer is switched on.
      env: {
        ...testEnv,
        NODE_ENV: "production",
        TRUSTED_PROXIES: "127.0.0.1",
        EMBERLINE_MAIL_VIEWER: "1",
      },
      stdio: ["ignore", "ignore", "inherit"],
    });
    await waitForPort(testPort, 120_000);
    step(
      "Vitest: unit, integration and end-to-end tests",
      bin("vitest"),
      ["run", ...vitestArgs],
      testEnv,
    );
  } catch (error) {
    failed = true;
    process.stderr.write(`[emberline] ${error instanceof Error ? error.message : error}\n`);
  } finally {
    stopChildren();
    stopCluster();
  }
  process.exit(failed ? 1 : 0);
}

main().catch((error) => {
  process.stderr.write(`[emberline] ${error instanceof Error ? error.stack : error}\n`);
  stopChildren();
  process.exit(1);
});
