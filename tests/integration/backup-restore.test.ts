// `npm run backup` and `npm run restore`: the test database dumped (raw files included) and restored
// into a scratch database, where every table's row count matches the manifest and the source, every
// raw file's bytes hash to their stored SHA-256, and the audit chains verify. The checks can fail: a
// damaged dump is refused before anything is written, a manifest that disagrees is reported, and a
// raw file changed in a copy is named. Scratch databases are dropped afterwards.
import { execFile } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { Client } from "pg";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db, ownerUrl, superuserDb } from "./support/database";

const exec = promisify(execFile);
const root = path.resolve(__dirname, "../..");
const folder = fs.mkdtempSync(path.join(os.tmpdir(), "emberline-backup-"));
const scratch = [
  `emberline_restore_${process.pid}`,
  `emberline_restore_${process.pid}_b`,
  `emberline_restore_${process.pid}_c`,
];

interface Manifest {
  database: string;
  dumpSha256: string;
  tables: Record<string, number>;
  spectrumFiles: { count: number; bytes: number };
}

interface RestoreReport {
  ok: boolean;
  tables: Record<string, number>;
  countMismatches: { table: string; expected: number | null; found: number | null }[];
  rawFiles: {
    checked: number;
    expected: number;
    mismatches: { id: string; stored: string; recomputed: string }[];
  };
  migrated: boolean;
  audit: { ok: boolean }[] | null;
}

/** The test database's URL for the owner, the app role or the local superuser, on another database. */
function urlFor(database: string, user: "owner" | "app" | "postgres"): string {
  const url = new URL(user === "owner" ? ownerUrl() : (process.env.DATABASE_URL ?? ""));
  if (user === "postgres") {
    url.username = "postgres";
    url.password = "";
  }
  url.pathname = `/${database}`;
  return url.toString();
}

/** The scripts print their JSON on the last line of stdout (the cluster helpers may log before it). */
function lastLine<T>(stdout: string): T {
  const lines = stdout.trim().split("\n");
  return JSON.parse(lines[lines.length - 1]) as T;
}

async function backup(out: string, env: NodeJS.ProcessEnv = process.env): Promise<Manifest> {
  const { stdout } = await exec("node", ["scripts/backup.mjs", "--out", out, "--json"], {
    cwd: root,
    env,
  });
  return lastLine<{ manifest: Manifest }>(stdout).manifest;
}

async function restore(
  dump: string,
  into: string,
): Promise<{ code: number; report: RestoreReport | null; stderr: string }> {
  try {
    const { stdout, stderr } = await exec(
      "node",
      ["scripts/restore.mjs", dump, "--into", into, "--json"],
      {
        cwd: root,
        env: process.env,
      },
    );
    return { code: 0, report: lastLine<RestoreReport>(stdout), stderr };
  } catch (error) {
    const e = error as { code: number; stdout: string; stderr: string };
    if (typeof e.code !== "number") throw error;
    return {
      code: e.code,
      report: e.stdout.trim() ? lastLine<RestoreReport>(e.stdout) : null,
      stderr: e.stderr,
    };
  }
}

afterAll(async () => {
  for (const name of scratch)
    await superuserDb().query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
  await closeDb();
  fs.rmSync(folder, { recursive: true, force: true });
});

describe("backup and restore", () => {
  const dump = path.join(folder, "test.dump");

  it(
    "restores every row and raw file of the test database into a scratch database",
    { timeout: 180_000 },
    async () => {
      const manifest = await backup(dump);
      expect(fs.existsSync(`${dump}.manifest.json`)).toBe(true);
      expect(manifest.tables.spectrum_files).toBeGreaterThan(0);
      expect(manifest.spectrumFiles.count).toBe(manifest.tables.spectrum_files);
      const { rows } = await db().query<{ n: string }>("SELECT count(*) AS n FROM audit_events");
      expect(manifest.tables.audit_events).toBeGreaterThan(0);
      expect(manifest.tables.audit_events).toBeLessThanOrEqual(Number(rows[0].n));

      const { code, report } = await restore(dump, scratch[0]);
      expect(code, JSON.stringify(report)).toBe(0);
      expect(report).toMatchObject({ ok: true, countMismatches: [], migrated: true });
      expect(report!.tables).toEqual(manifest.tables);
      expect(report!.rawFiles).toEqual({
        checked: manifest.spectrumFiles.count,
        expected: manifest.spectrumFiles.count,
        mismatches: [],
      });
      expect(report!.audit!.length).toBeGreaterThan(0);
      expect(report!.audit!.every((chain) => chain.ok)).toBe(true);

      // The restored database is usable by the app's role, with the app's privileges only.
      const app = new Client({ connectionString: urlFor(scratch[0], "app") });
      await app.connect();
      try {
        const restored = await app.query<{ n: string; bytes: string }>(
          "SELECT count(*) AS n, coalesce(sum(octet_length(raw_bytes)), 0) AS bytes FROM spectrum_files",
        );
        expect(Number(restored.rows[0].n)).toBe(manifest.spectrumFiles.count);
        expect(Number(restored.rows[0].bytes)).toBe(manifest.spectrumFiles.bytes);
        await expect(app.query("DELETE FROM audit_events")).rejects.toThrow(
          "permission denied for table audit_events",
        );
      } finally {
        await app.end();
      }
    },
  );

  it(
    "refuses a damaged dump before writing anything, and reports a manifest that disagrees",
    { timeout: 180_000 },
    async () => {
      const damaged = path.join(folder, "damaged.dump");
      const bytes = fs.readFileSync(dump);
      bytes[Math.floor(bytes.length / 2)] ^= 0xff;
      fs.writeFileSync(damaged, bytes);
      fs.copyFileSync(`${dump}.manifest.json`, `${damaged}.manifest.json`);
      const refused = await restore(damaged, scratch[1]);
      expect(refused.code).toBe(1);
      expect(refused.stderr).toContain("the file is damaged");
      const { rows } = await superuserDb().query("SELECT 1 FROM pg_database WHERE datname = $1", [
        scratch[1],
      ]);
      expect(rows).toHaveLength(0);

      const lying = path.join(folder, "lying.dump");
      fs.copyFileSync(dump, lying);
      const manifest = JSON.parse(fs.readFileSync(`${dump}.manifest.json`, "utf8")) as Manifest;
      manifest.tables.audit_events += 1;
      fs.writeFileSync(`${lying}.manifest.json`, JSON.stringify(manifest));
      const reported = await restore(lying, scratch[1]);
      expect(reported.code).toBe(1);
      expect(reported.report!.ok).toBe(false);
      expect(reported.report!.countMismatches).toEqual([
        {
          table: "audit_events",
          expected: manifest.tables.audit_events,
          found: manifest.tables.audit_events - 1,
        },
      ]);
    },
  );

  it(
    "names a raw file whose bytes no longer match their SHA-256",
    { timeout: 180_000 },
    async () => {
      // Change a raw file in the first scratch copy (as a superuser past the trigger), back that up and restore it.
      const su = new Client({ connectionString: urlFor(scratch[0], "postgres") });
      await su.connect();
      let changedId: string;
      try {
        await su.query("SET session_replication_role = replica");
        const { rows } = await su.query<{ id: string }>(
          "UPDATE spectrum_files SET raw_bytes = raw_bytes || '\\x0a'::bytea, byte_size = byte_size + 1 WHERE id = (SELECT min(id::text)::uuid FROM spectrum_files) RETURNING id",
        );
        changedId = rows[0].id;
      } finally {
        await su.end();
      }
      const copy = path.join(folder, "changed.dump");
      await backup(copy, {
        ...process.env,
        DATABASE_URL: urlFor(scratch[0], "app"),
        DATABASE_OWNER_URL: urlFor(scratch[0], "owner"),
      });
      const reported = await restore(copy, scratch[2]);
      expect(reported.code).toBe(1);
      expect(reported.report!.countMismatches).toEqual([]);
      expect(reported.report!.rawFiles.mismatches.map((m) => m.id)).toEqual([changedId]);
    },
  );
});
