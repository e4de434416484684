// Shared steps of `npm start`, `npm run dev` and `npm test`: dependencies, PostgreSQL, the fake
// SMTP server, the session secret and the database schema. Plain Node, no dependencies of its own.
import { spawn, spawnSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import {
  DEFAULT_APP_ROLE,
  DEFAULT_OWNER_ROLE,
  ensureDatabase,
  ensureRoles,
  isPortOpen,
  startCluster,
} from "../db/cluster.mjs";

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");

export function log(message) {
  process.stdout.write(`[emberline] ${message}\n`);
}

/** Runs `npm ci` when node_modules is missing or older than the lock file. */
export function ensureDependencies() {
  const lock = path.join(root, "package-lock.json");
  const marker = path.join(root, "node_modules", ".package-lock.json");
  const stale = !fs.existsSync(marker) || fs.statSync(marker).mtimeMs < fs.statSync(lock).mtimeMs;
  if (!stale) return;
  log("Installing Node dependencies (npm ci)…");
  const result = spawnSync("npm", ["ci", "--no-audit", "--no-fund"], {
    cwd: root,
    stdio: "inherit",
  });
  if (result.status !== 0) throw new Error("npm ci failed");
}

/** Reads (or generates once) the development session secret kept under the data folder. */
export function developmentSecret(dataDir) {
  const file = path.join(dataDir, "session-secret");
  if (!fs.existsSync(file)) {
    fs.mkdirSync(dataDir, { recursive: true });
    fs.writeFileSync(file, crypto.randomBytes(32).toString("base64url"), { mode: 0o600 });
  }
  return fs.readFileSync(file, "utf8").trim();
}

const children = new Set();

/** Starts a child process that is stopped with us. */
export function startChild(command, args, options = {}) {
  const child = spawn(command, args, { cwd: root, stdio: "inherit", ...options });
  children.add(child);
  child.once("exit", () => children.delete(child));
  return child;
}

export function stopChildren() {
  for (const child of children) child.kill("SIGTERM");
}

/** Waits until a TCP port accepts connections, or fails after `timeoutMs`. */
export async function waitForPort(port, timeoutMs = 60_000, host = "127.0.0.1") {
  const start = Date.now();
  while (Date.now() - start < timeoutMs) {
    if (await isPortOpen(port, host)) return;
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
  throw new Error(`Nothing listened on ${host}:${port} within ${timeoutMs / 1000} s`);
}

/** Runs a TypeScript entry point with tsx (and any Node options first) and fails loudly on a non-zero exit. */
export function runTs(file, env, nodeOptions = []) {
  const tsx = path.join(root, "node_modules", ".bin", "tsx");
  const result = spawnSync(tsx, [...nodeOptions, file], { cwd: root, stdio: "inherit", env });
  if (result.status !== 0) throw new Error(`${file} failed with exit code ${result.status}`);
}

/**
 * The two connection URLs: DATABASE_URL (the app's role) and DATABASE_OWNER_URL (the owner's, for
 * migrations), from the environment or the local cluster's defaults. Also returns the roles to create
 * on the local cluster (with the passwords the URLs carry), for URLs that point at it.
 */
export function databaseUrls({ pgPort, database }) {
  const local = (role) => `postgres://${role}@127.0.0.1:${pgPort}/${database}`;
  const appUrl = process.env.DATABASE_URL ?? local(DEFAULT_APP_ROLE);
  let ownerUrl = process.env.DATABASE_OWNER_URL;
  if (!ownerUrl) {
    const url = new URL(appUrl);
    url.username = DEFAULT_OWNER_ROLE;
    url.password = "";
    ownerUrl = url.toString();
  }
  const isLocal = (url) =>
    ["127.0.0.1", "localhost"].includes(url.hostname) && Number(url.port || 5432) === pgPort;
  const roleOf = (text) => {
    const url = new URL(text);
    return {
      local: isLocal(url),
      database: decodeURIComponent(url.pathname.slice(1)),
      name: decodeURIComponent(url.username),
      password: url.password ? decodeURIComponent(url.password) : undefined,
    };
  };
  return { appUrl, ownerUrl, app: roleOf(appUrl), owner: roleOf(ownerUrl) };
}

/**
 * Brings up everything the app needs and returns the environment for it:
 * the PostgreSQL cluster, a database (fresh when asked), the fake SMTP server and the schema.
 */
export async function bootstrap({
  database,
  freshDatabase = false,
  mailPort,
  mailDir,
  seed = true,
  appUrl,
}) {
  ensureDependencies();
  const dataRoot = path.resolve(root, process.env.EMBERLINE_DATA_DIR ?? ".data");
  const pgPort = Number(process.env.EMBERLINE_PG_PORT ?? 54329);
  const cluster = await startCluster({ dataDir: path.join(dataRoot, "postgres"), port: pgPort });
  const urls = databaseUrls({ pgPort, database });
  // The roles and the database are ours to create only on the local cluster; a managed database
  // comes with them (DEVELOPERS.md says what it must have).
  if (urls.owner.local && urls.app.local) {
    ensureRoles({ bin: cluster.bin, port: pgPort, owner: urls.owner, app: urls.app });
    ensureDatabase({
      bin: cluster.bin,
      port: pgPort,
      name: urls.owner.database,
      owner: urls.owner.name,
      fresh: freshDatabase,
    });
  }

  const mailFolder = path.resolve(dataRoot, mailDir);
  fs.mkdirSync(mailFolder, { recursive: true });
  if (!(await isPortOpen(mailPort))) {
    startChild(process.execPath, [path.join(root, "scripts", "mail-server.mjs")], {
      env: {
        ...process.env,
        EMBERLINE_MAIL_DIR: mailFolder,
        EMBERLINE_SMTP_PORT: String(mailPort),
      },
    });
    await waitForPort(mailPort, 20_000);
  }

  const env = {
    ...process.env,
    DATABASE_URL: urls.appUrl,
    SMTP_HOST: process.env.SMTP_HOST ?? "127.0.0.1",
    SMTP_PORT: process.env.SMTP_PORT ?? String(mailPort),
    EMBERLINE_MAIL_DIR: mailFolder,
    SESSION_SECRET: process.env.SESSION_SECRET ?? developmentSecret(dataRoot),
    NEXT_TELEMETRY_DISABLED: "1",
    // The address the app will serve at: the seed's mails (the demo review request) link to it too.
    ...(appUrl ? { APP_URL: appUrl } : {}),
  };
  // Migrations run as the owner; the seed, like the app, as the app role (it goes through the app's
  // services, so it proves that the app's privileges suffice). The seed makes its demo analyses
  // through the services, whose "server-only" import needs the react-server condition.
  // Only the migration step gets the owner's URL: the environment returned for the app leaves it out.
  runTs("db/migrate.ts", { ...env, DATABASE_OWNER_URL: urls.ownerUrl });
  if (seed) runTs("db/seed.ts", env, ["--conditions=react-server"]);
  return { env, stopCluster: cluster.stop };
}
