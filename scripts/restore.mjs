// `npm run restore -- <file.dump> --into <database> [--json]` (--json: a report as the last line of stdout): restores a backup made by
// `npm run backup` into a new, empty database and proves it: the dump's SHA-256 against its manifest
// before anything is written, then the row count of every table against the manifest, and every raw
// spectrum file's SHA-256 recomputed from its bytes against the hash stored beside it. The restored
// database is then migrated and given the app role's privileges (db/migrate.ts) and its audit chains
// are verified (db/audit-verify.ts). Refuses a database that already holds tables.
import { spawnSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import pg from "pg";
import { databaseUrls, log, root } from "./bootstrap.mjs";
import { BACKUP_FORMAT, fileSha256, libpqTarget, pgTool, tableCounts } from "./backup.mjs";
import { ensureDatabase, findPostgresBin } from "../db/cluster.mjs";

function argValue(args, flag) {
  const i = args.indexOf(flag);
  return i >= 0 ? args[i + 1] : undefined;
}

function withDatabase(url, database) {
  const parsed = new URL(url);
  parsed.pathname = `/${database}`;
  return parsed.toString();
}

/** Every raw file's bytes hashed again, a few at a time, against its stored SHA-256 and size. */
async function checkRawFiles(client) {
  const bad = [];
  let checked = 0;
  let after = "00000000-0000-0000-0000-000000000000";
  for (;;) {
    const { rows } = await client.query(
      "SELECT id, sha256, byte_size, raw_bytes FROM spectrum_files WHERE id > $1 ORDER BY id LIMIT 20",
      [after],
    );
    for (const row of rows) {
      const actual = crypto.createHash("sha256").update(row.raw_bytes).digest("hex");
      if (actual !== row.sha256 || row.raw_bytes.length !== row.byte_size) {
        bad.push({
          id: row.id,
          stored: row.sha256,
          recomputed: actual,
          bytes: row.raw_bytes.length,
        });
      }
      checked += 1;
    }
    if (rows.length < 20) return { checked, bad };
    after = rows[rows.length - 1].id;
  }
}

async function main() {
  const args = process.argv.slice(2);
  const json = args.includes("--json");
  const file = args.find((a, i) => !a.startsWith("--") && args[i - 1] !== "--into");
  const into = argValue(args, "--into");
  if (!file || !into) throw new Error("Usage: npm run restore -- <file.dump> --into <database>");
  if (!/^[a-z_][a-z0-9_]*$/.test(into))
    throw new Error(`Choose a plain database name (a-z, 0-9, _): ${into}`);
  const dump = path.resolve(file);
  const manifest = JSON.parse(fs.readFileSync(`${dump}.manifest.json`, "utf8"));
  if (manifest.format !== BACKUP_FORMAT)
    throw new Error(`${dump}.manifest.json is not an Emberline backup manifest.`);
  const dumpSha256 = fileSha256(dump);
  if (dumpSha256 !== manifest.dumpSha256) {
    throw new Error(
      `The dump's SHA-256 is ${dumpSha256}, its manifest says ${manifest.dumpSha256}: the file is damaged.`,
    );
  }

  const pgPort = Number(process.env.EMBERLINE_PG_PORT ?? 54329);
  const urls = databaseUrls({ pgPort, database: into });
  const ownerUrl = withDatabase(urls.ownerUrl, into);
  const appUrl = withDatabase(urls.appUrl, into);
  if (urls.owner.local) {
    const bin = findPostgresBin();
    if (!bin) throw new Error("PostgreSQL's binaries were not found.");
    ensureDatabase({ bin, port: pgPort, name: into, owner: urls.owner.name });
  }
  const client = new pg.Client({ connectionString: ownerUrl });
  await client.connect();
  try {
    const { rows } = await client.query(
      `SELECT count(*)::int AS n FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
        WHERE n.nspname = 'public' AND c.relkind IN ('r', 'p')`,
    );
    if (rows[0].n > 0)
      throw new Error(
        `Database ${into} already holds ${rows[0].n} tables: restore into a new one.`,
      );

    if (!json)
      log(
        `Restoring ${path.basename(dump)} (${manifest.database}, ${manifest.createdAt}) into ${into}…`,
      );
    const target = libpqTarget(ownerUrl);
    const restored = spawnSync(
      pgTool("pg_restore"),
      [
        "--no-owner",
        "--no-acl",
        "--exit-on-error",
        "--single-transaction",
        `--dbname=${target.dbname}`,
        dump,
      ],
      { env: target.env, stdio: ["ignore", json ? "ignore" : "inherit", "inherit"] },
    );
    if (restored.status !== 0) throw new Error(`pg_restore failed (exit ${restored.status})`);

    const counts = await tableCounts(client);
    const tables = [...new Set([...Object.keys(manifest.tables), ...Object.keys(counts)])].sort();
    const countMismatches = tables
      .filter((t) => manifest.tables[t] !== counts[t])
      .map((t) => ({ table: t, expected: manifest.tables[t] ?? null, found: counts[t] ?? null }));
    const rawFiles = await checkRawFiles(client);
    const rawCountOk = rawFiles.checked === manifest.spectrumFiles.count;

    const env = { ...process.env, DATABASE_URL: appUrl, DATABASE_OWNER_URL: ownerUrl };
    const tsx = path.join(root, "node_modules", ".bin", "tsx");
    const quiet = { cwd: root, env, stdio: ["ignore", json ? "ignore" : "inherit", "inherit"] };
    const migrated = spawnSync(tsx, ["db/migrate.ts"], quiet).status === 0;
    const audit = spawnSync(tsx, ["--conditions=react-server", "db/audit-verify.ts", "--json"], {
      cwd: root,
      env,
      encoding: "utf8",
    });
    const auditReports = audit.status === 0 || audit.status === 1 ? JSON.parse(audit.stdout) : null;
    const auditOk = audit.status === 0;

    const ok =
      countMismatches.length === 0 &&
      rawFiles.bad.length === 0 &&
      rawCountOk &&
      migrated &&
      auditOk;
    const report = {
      ok,
      database: into,
      dumpSha256,
      tables: counts,
      countMismatches,
      rawFiles: {
        checked: rawFiles.checked,
        expected: manifest.spectrumFiles.count,
        mismatches: rawFiles.bad,
      },
      migrated,
      audit: auditReports,
    };
    if (json) process.stdout.write(`${JSON.stringify(report)}\n`);
    else {
      const total = Object.values(counts).reduce((a, b) => a + b, 0);
      log(
        countMismatches.length
          ? `Row counts differ: ${countMismatches.map((m) => `${m.table} ${m.found} (expected ${m.expected})`).join(", ")}`
          : `Row counts match the manifest: ${tables.length} tables, ${total} rows.`,
      );
      log(
        rawFiles.bad.length || !rawCountOk
          ? `Raw files: ${rawFiles.bad.length} of ${rawFiles.checked} differ from their stored SHA-256 (expected ${manifest.spectrumFiles.count} files).`
          : `Raw files: all ${rawFiles.checked} match their stored SHA-256.`,
      );
      if (auditOk) log(`Audit chains: all ${auditReports.length} verify.`);
      else if (!auditReports)
        log("Audit chains: not checked (db/audit-verify.ts failed, see above).");
      else {
        for (const r of auditReports.filter((chain) => !chain.ok)) {
          log(
            `Audit chain of team ${r.teamId ?? "(no team)"} BROKEN at sequence ${r.break.sequence}, event ${r.break.eventId}: ${r.break.detail}`,
          );
        }
      }
      log(
        ok ? `Restored and verified: ${into}.` : `Restored into ${into}, but verification FAILED.`,
      );
    }
    process.exitCode = ok ? 0 : 1;
  } finally {
    await client.end();
  }
}

main().catch((error) => {
  process.stderr.write(
    `[emberline] Restore failed: ${error instanceof Error ? error.message : error}\n`,
  );
  process.exit(1);
});
