// `npm run backup [-- --out <file.dump>] [-- --json]`: a custom-format pg_dump of the database
// (everything, the raw spectrum files kept in bytea included), taken as the owner role from one
// exported snapshot, with a manifest beside it (<file>.manifest.json): the dump's SHA-256, the row
// count of every table and the raw files' count, all read from that same snapshot, so
// `npm run restore` can prove that what comes back is what was saved.
import { spawnSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import pg from "pg";
import { databaseUrls, log, root } from "./bootstrap.mjs";
import { findPostgresBin } from "../db/cluster.mjs";

export const BACKUP_FORMAT = "emberline-backup/1";

/** pg_dump/pg_restore from Debian's server packages (matching the local cluster), else from PATH. */
export function pgTool(name) {
  const bin = findPostgresBin();
  return bin ? path.join(bin, name) : name;
}

/** The connection as libpq arguments and environment: the password travels in PGPASSWORD, not argv. */
export function libpqTarget(url) {
  const parsed = new URL(url);
  const env = { ...process.env };
  if (parsed.password) env.PGPASSWORD = decodeURIComponent(parsed.password);
  parsed.password = "";
  return { dbname: parsed.toString(), env };
}

export function fileSha256(file) {
  const hash = crypto.createHash("sha256");
  const fd = fs.openSync(file, "r");
  try {
    const buffer = Buffer.alloc(1 << 20);
    let read;
    while ((read = fs.readSync(fd, buffer, 0, buffer.length, null)) > 0)
      hash.update(buffer.subarray(0, read));
  } finally {
    fs.closeSync(fd);
  }
  return hash.digest("hex");
}

/** Row counts of every table in the public schema, in the client's current snapshot. */
export async function tableCounts(client) {
  const { rows: tables } = await client.query(
    `SELECT c.relname AS name FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
      WHERE n.nspname = 'public' AND c.relkind IN ('r', 'p') ORDER BY c.relname`,
  );
  const counts = {};
  for (const { name } of tables) {
    const { rows } = await client.query(
      `SELECT count(*)::bigint AS n FROM "${name.replace(/"/g, '""')}"`,
    );
    counts[name] = Number(rows[0].n);
  }
  return counts;
}

function argValue(args, flag) {
  const i = args.indexOf(flag);
  return i >= 0 ? args[i + 1] : undefined;
}

async function main() {
  const args = process.argv.slice(2);
  const pgPort = Number(process.env.EMBERLINE_PG_PORT ?? 54329);
  const database = process.env.EMBERLINE_DB_NAME ?? "emberline";
  const { ownerUrl } = databaseUrls({ pgPort, database });
  const dbName = decodeURIComponent(new URL(ownerUrl).pathname.slice(1));
  const stamp = new Date()
    .toISOString()
    .replace(/[-:]/g, "")
    .replace(/\.\d+Z$/, "Z");
  const out = path.resolve(
    argValue(args, "--out") ??
      path.join(
        root,
        process.env.EMBERLINE_DATA_DIR ?? ".data",
        "backups",
        `emberline-${dbName}-${stamp}.dump`,
      ),
  );
  fs.mkdirSync(path.dirname(out), { recursive: true });

  const client = new pg.Client({ connectionString: ownerUrl });
  await client.connect();
  try {
    // One snapshot for the counts and the dump, so they describe the same moment.
    await client.query("BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY");
    const { rows } = await client.query("SELECT pg_export_snapshot() AS snapshot");
    const counts = await tableCounts(client);
    const { rows: files } = await client.query(
      "SELECT count(*)::bigint AS n, coalesce(sum(byte_size), 0)::bigint AS bytes FROM spectrum_files",
    );
    const { rows: migrations } = await client.query(
      "SELECT name FROM schema_migrations ORDER BY name",
    );
    const target = libpqTarget(ownerUrl);
    const dump = spawnSync(
      pgTool("pg_dump"),
      [
        "--format=custom",
        "--no-owner",
        "--no-acl",
        `--snapshot=${rows[0].snapshot}`,
        `--file=${out}`,
        `--dbname=${target.dbname}`,
      ],
      { env: target.env, stdio: ["ignore", "inherit", "inherit"] },
    );
    if (dump.status !== 0) throw new Error(`pg_dump failed (exit ${dump.status})`);
    await client.query("COMMIT");
    const manifest = {
      format: BACKUP_FORMAT,
      database: dbName,
      createdAt: new Date().toISOString(),
      dumpFile: path.basename(out),
      dumpBytes: fs.statSync(out).size,
      dumpSha256: fileSha256(out),
      migrations: migrations.map((m) => m.name),
      tables: counts,
      spectrumFiles: { count: Number(files[0].n), bytes: Number(files[0].bytes) },
    };
    fs.writeFileSync(`${out}.manifest.json`, `${JSON.stringify(manifest, null, 2)}\n`);
    if (args.includes("--json"))
      process.stdout.write(`${JSON.stringify({ file: out, manifest })}\n`);
    else {
      const rowsTotal = Object.values(counts).reduce((a, b) => a + b, 0);
      log(
        `Backed up ${dbName}: ${Object.keys(counts).length} tables, ${rowsTotal} rows, ${manifest.spectrumFiles.count} raw files.`,
      );
      log(`Dump: ${out} (${manifest.dumpBytes} bytes, SHA-256 ${manifest.dumpSha256})`);
      log(`Manifest: ${out}.manifest.json`);
    }
  } finally {
    await client.end();
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  main().catch((error) => {
    process.stderr.write(
      `[emberline] Backup failed: ${error instanceof Error ? error.message : error}\n`,
    );
    process.exit(1);
  });
}
