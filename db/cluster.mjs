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
  if (!bin)
    throw new Error(
      "Installing `postgresql` did not provide server binaries under /usr/lib/postgresql.",
    );
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
  const [command, fullArgs] = isRoot
    ? ["runuser", ["-u", "postgres", "--", file, ...args]]
    : [file, args];
  const result = spawnSync(command, fullArgs, { encoding: "utf8" });
  if (result.status !== 0) {
    throw new Error(
      `${tool} failed (exit ${result.status}): ${(result.stderr || result.stdout || "").trim()}`,
    );
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

/** The local cluster's superuser, used only by these scripts to create roles and databases. */
export const SUPERUSER = "postgres";

/** The default roles on the local cluster: the owner runs migrations, the app role runs the app. */
export const DEFAULT_OWNER_ROLE = "emberline_owner";
export const DEFAULT_APP_ROLE = "emberline_app";

const SAFE_NAME = /^[a-z_][a-z0-9_]*$/;

function superuserPsql(bin, port, database = "postgres") {
  return (sql) =>
    execFileSync(
      path.join(bin, "psql"),
      [
        "-h",
        "127.0.0.1",
        "-p",
        String(port),
        "-U",
        SUPERUSER,
        "-d",
        database,
        "-v",
        "ON_ERROR_STOP=1",
        "-tAc",
        sql,
      ],
      { encoding: "utf8" },
    ).trim();
}

function sqlLiteral(value) {
  return `'${String(value).replace(/'/g, "''")}'`;
}

/**
 * Creates (or brings into line) the two roles of the least-privileged design: `owner` owns the
 * schema and runs migrations; `app` is what the running app connects as: it may log in and nothing
 * more (no superuser, no role or database creation, no row-level-security bypass, no replication),
 * and gets its table privileges from the migration step (db/privileges.ts). Passwords are optional
 * on the local cluster (trust on loopback) but are set when the connection URLs carry them.
 */
export function ensureRoles({ bin, port, owner, app }) {
  const psql = superuserPsql(bin, port);
  for (const role of [owner, app]) {
    if (!SAFE_NAME.test(role.name)) throw new Error(`Unsafe role name: ${role.name}`);
    if (role.name === SUPERUSER)
      throw new Error(`The ${role.name} role is the cluster's superuser: choose another name`);
  }
  if (owner.name === app.name)
    throw new Error("The owner role and the app role must be different roles.");
  const attributes = {
    [owner.name]: "LOGIN NOSUPERUSER NOCREATEROLE NOCREATEDB NOREPLICATION NOBYPASSRLS",
    [app.name]: "LOGIN NOSUPERUSER NOCREATEROLE NOCREATEDB NOREPLICATION NOBYPASSRLS NOINHERIT",
  };
  for (const role of [owner, app]) {
    const exists = psql(`SELECT 1 FROM pg_roles WHERE rolname = ${sqlLiteral(role.name)}`) === "1";
    const password = role.password ? ` PASSWORD ${sqlLiteral(role.password)}` : "";
    psql(`${exists ? "ALTER" : "CREATE"} ROLE ${role.name} ${attributes[role.name]}${password}`);
    if (!exists) log(`Created database role ${role.name}.`);
  }
}

/**
 * Creates a database owned by `owner` when it does not exist; with `fresh`, drops it first. An
 * existing database made before the owner role existed is handed over to it (the database and every
 * table, sequence, function and type in its public schema), so migrations keep running as the owner.
 */
export function ensureDatabase({ bin, port, name, owner, fresh = false }) {
  const psql = superuserPsql(bin, port);
  if (!SAFE_NAME.test(name)) throw new Error(`Unsafe database name: ${name}`);
  if (owner && !SAFE_NAME.test(owner)) throw new Error(`Unsafe role name: ${owner}`);
  if (fresh) psql(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
  const exists = psql(`SELECT 1 FROM pg_database WHERE datname = '${name}'`) === "1";
  if (!exists) {
    psql(`CREATE DATABASE ${name}${owner ? ` OWNER ${owner}` : ""}`);
    log(`Created database ${name}${owner ? ` owned by ${owner}` : ""}.`);
    return;
  }
  if (!owner) return;
  const current = psql(`SELECT pg_get_userbyid(datdba) FROM pg_database WHERE datname = '${name}'`);
  if (current !== owner) psql(`ALTER DATABASE ${name} OWNER TO ${owner}`);
  superuserPsql(
    bin,
    port,
    name,
  )(`DO $$
    DECLARE item record;
    BEGIN
      FOR item IN
        SELECT format('ALTER %s %s OWNER TO ${owner}',
                 CASE c.relkind WHEN 'S' THEN 'SEQUENCE' WHEN 'v' THEN 'VIEW' WHEN 'm' THEN 'MATERIALIZED VIEW' ELSE 'TABLE' END,
                 c.oid::regclass) AS statement
          FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
         WHERE n.nspname = 'public' AND c.relkind IN ('r', 'p', 'v', 'm', 'S')
           AND pg_get_userbyid(c.relowner) <> '${owner}'
           AND NOT EXISTS (SELECT 1 FROM pg_depend d WHERE d.objid = c.oid AND d.deptype = 'a' AND c.relkind = 'S')
        UNION ALL
        SELECT format('ALTER FUNCTION %s OWNER TO ${owner}', p.oid::regprocedure)
          FROM pg_proc p JOIN pg_namespace n ON n.oid = p.pronamespace
         WHERE n.nspname = 'public' AND pg_get_userbyid(p.proowner) <> '${owner}'
           AND NOT EXISTS (SELECT 1 FROM pg_depend d WHERE d.objid = p.oid AND d.deptype = 'e')
        UNION ALL
        SELECT format('ALTER TYPE %s OWNER TO ${owner}', t.oid::regtype)
          FROM pg_type t JOIN pg_namespace n ON n.oid = t.typnamespace
         WHERE n.nspname = 'public' AND t.typtype IN ('e', 'd', 'c') AND pg_get_userbyid(t.typowner) <> '${owner}'
           AND (t.typrelid = 0 OR (SELECT relkind FROM pg_class WHERE oid = t.typrelid) = 'c')
           AND NOT EXISTS (SELECT 1 FROM pg_depend d WHERE d.objid = t.oid AND d.deptype = 'e')
      LOOP
        EXECUTE item.statement;
      END LOOP;
    END $$`);
}
