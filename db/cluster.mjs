// The local PostgreSQL cluster: find Debian's server binaries (installing them when allowed),
// create a cluster on loopback under a git-ignored folder, start it, and create databases.
// Plain Node with no dependencies, so `npm start` can call it before `node_modules` exists.
import { execFileSync, spawnSync } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import path from "node:path";

const isRoot = typeof process.getuid === "function" && process.getuid() === 0;

function log(message) {
  process.stdout.write(`[emberline] ${message}\n`);
}

/** Finds the newest PostgreSQL server binaries from Debian's packages, or null. */
export function findPostgresBin() {
  const fromEnv = process.env.EMBERLINE_PG_BIN;
  if (fromEnv && fs.existsSync(path.join(fromEnv, "pg_ctl"))) return fromEnv;
  const root = "/usr/lib/postgresql";
  if (!fs.existsSync(root)) return null;
  const versions = fs
    .readdirSync(root)
    .filter((name) => fs.existsSync(path.join(root, name, "bin", "pg_ctl")))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? path.join(root, versions[0], "bin") : null;
}

/** Returns the server binaries, installing Debian's `postgresql` package as root when missing. */
export function ensurePostgresInstalled() {
  let bin = findPostgresBin();
  if (bin) return bin;
  if (!isRoot) {
    throw new Error(
      "PostgreSQL's server binaries were not found under /usr/lib/postgresql. " +
        "Install Debian's `postgresql` package (sudo apt-get install postgresql) or set EMBERLINE_PG_BIN.",
    );
  }
  log("PostgreSQL server binaries are missing: installing Debian's postgresql package…");
  run("apt-get", ["update", "-qq"]);
  run("apt-get", ["install", "-y", "-qq", "--no-install-recommends", "postgresql"], {
    env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" },
  });
  bin = findPostgresBin();
  if (!bin) throw new Error("Installing `postgresql` did not provide server binaries under /usr/lib/postgresql.");
  return bin;
}

function run(command, args, options = {}) {
  const result = spawnSync(command, args, { stdio: "inherit", ...options });
  if (result.status !== 0) {
    throw new Error(`${command} ${args.join(" ")} failed with exit code ${result.status}`);
  }
}

/** Runs a PostgreSQL tool, as the `postgres` user when we are root (initdb refuses root). */
function pgTool(bin, tool, args) {
  const file = path.join(bin, tool);
  const [command, fullArgs] = isRoot ? ["runuser", ["-u", "postgres", "--", file, ...args]] : [file, args];
  const result = spawnSync(command, fullArgs, { encoding: "utf8" });
  if (result.status !== 0) {
    throw new Error(`${tool} failed (exit ${result.status}): ${(result.stderr || result.stdout || "").trim()}`);
  }
  return result.stdout;
}

function chownToPostgres(target) {
  if (isRoot) execFileSync("chown", ["-R", "postgres:postgres", target]);
}

/** True when something accepts TCP connections on 127.0.0.1:port. */
export function isPortOpen(port, host = "127.0.0.1") {
  return new Promise((resolve) => {
    const socket = net.connect({ port, host });
    socket.once("connect", () => {
      socket.destroy();
      resolve(true);
    });
    socket.once("error", () => resolve(false));
  });
}

/**
 * Creates (once) and starts a cluster in `dataDir` listening on 127.0.0.1:`port` only.
 * Local connections use trust authentication: the cluster accepts no remote connections.
 * Returns a function that stops the cluster when this process started it.
 */
export async function startCluster({ dataDir, port }) {
  const bin = ensurePostgresInstalled();
  const absolute = path.resolve(dataDir);
  const socketDir = path.join(absolute, "socket");
  if (!fs.existsSync(path.join(absolute, "PG_VERSION"))) {
    log(`Creating a PostgreSQL cluster in ${absolute}…`);
    fs.mkdirSync(absolute, { recursive: true });
    chownToPostgres(absolute);
    pgTool(bin, "initdb", [
      "-D",
      absolute,
      "-U",
      "postgres",
      "--auth=trust",
      "--encoding=UTF8",
      "--locale=C",
    ]);
  }
  fs.mkdirSync(socketDir, { recursive: true });
  chownToPostgres(socketDir);
  if (isRoot) {
    // The postgres user must be able to reach the data folder through its parents.
    let dir = path.dirname(absolute);
    while (dir !== path.dirname(dir)) {
      try {
        fs.chmodSync(dir, fs.statSync(dir).mode | 0o711);
      } catch {
        /* a parent we cannot change is fine when it is already traversable */
      }
      dir = path.dirname(dir);
    }
  }
  if (await isPortOpen(port)) {
    log(`PostgreSQL is already listening on 127.0.0.1:${port}.`);
    return { bin, stop: () => {} };
  }
  log(`Starting PostgreSQL on 127.0.0.1:${port}…`);
  pgTool(bin, "pg_ctl", [
    "-D",
    absolute,
    "-l",
    path.join(absolute, "server.log"),
    "-o",
    `-p ${port} -k ${socketDir} -c listen_addresses=127.0.0.1`,
    "-w",
    "-t",
    "60",
    "start",
  ]);
  return {
    bin,
    stop: () => {
      try {
        pgTool(bin, "pg_ctl", ["-D", absolute, "-m", "fast", "-w", "stop"]);
        log("PostgreSQL stopped.");
      } catch {
        /* already stopped */
      }
    },
  };
}

/** Creates a database when it does not exist; with `fresh`, drops it first. */
export function ensureDatabase({ bin, port, name, fresh = false }) {
  const psql = (sql) =>
    execFileSync(path.join(bin, "psql"), ["-h", "127.0.0.1", "-p", String(port), "-U", "postgres", "-d", "postgres", "-tAc", sql], {
      encoding: "utf8",
    }).trim();
  if (!/^[a-z_][a-z0-9_]*$/.test(name)) throw new Error(`Unsafe database name: ${name}`);
  if (fresh) psql(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
  const exists = psql(`SELECT 1 FROM pg_database WHERE datname = '${name}'`) === "1";
  if (!exists) {
    psql(`CREATE DATABASE ${name}`);
    log(`Created database ${name}.`);
  }
}
