// The least-privileged database and the tamper-evident trail: the role the app connects as cannot
// switch triggers off, become a replica, or rewrite, delete or empty the audit trail and other
// records (PostgreSQL's own errors are asserted); the served app really connects as that role; audit
// events chain per team even when written concurrently, whatever hash the writer claims; and a row
// changed by a superuser (an event, or a signed run) is named by GET /api/audit/verify and by
// `npm run audit:verify`, which answer ok again once the row is put back. Events for the chain tests
// are written in the outsider's own team; the demo team's signed run is changed and restored.
import { execFile } from "node:child_process";
import { promisify } from "node:util";
import { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  auditChainHash,
  canonicalAuditEvent,
  chainedAuditEventOf,
  type AuditChainRow,
} from "@/lib/audit/audit-chain";
import type { AuditChainReport } from "@/lib/services/audit-chain";
import { FLAME_SCREENING, signInDemo, signedIn, teamIdOf } from "./support/accounts";
import { TEST_APPLICATION_NAME, appDb, closeDb, superuserDb } from "./support/database";
import type { ApiClient, ErrorBody } from "./support/http-client";
import { OUTSIDER, ensureOutsider } from "./support/outsider";

const run = promisify(execFile);

/** Runs a statement as the app's role and returns PostgreSQL's error (code and message). */
async function appError(sql: string): Promise<{ code: string; message: string }> {
  try {
    await appDb().query(sql);
  } catch (error) {
    const e = error as { code: string; message: string };
    return { code: e.code, message: e.message };
  }
  throw new Error(`The app role was allowed to run: ${sql}`);
}

/** As the superuser, with triggers off: what an attacker holding the superuser could do. */
async function asSuperuser(sql: string, params: unknown[]): Promise<void> {
  const client = await superuserDb().connect();
  try {
    await client.query("BEGIN");
    await client.query("SET LOCAL session_replication_role = replica");
    await client.query(sql, params);
    await client.query("COMMIT");
  } finally {
    client.release();
  }
}

interface ChainRow extends AuditChainRow {
  canonical: string;
}

async function chainOf(teamId: string): Promise<ChainRow[]> {
  const { rows } = await appDb().query<ChainRow>(
    `SELECT e.id::text AS id, e.team_id::text AS team_id, e.team_seq::text AS team_seq, e.actor_id::text AS actor_id,
            e.action, e.entity, e.entity_id, e.reason, e.before::text AS before_json, e.after::text AS after_json,
            to_char(e.created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"') AS created_at,
            e.subject_hash, e.prev_hash, e.hash, audit_event_canonical(e) AS canonical
       FROM audit_events e WHERE e.team_id = $1 ORDER BY e.team_seq`,
    [teamId],
  );
  return rows;
}

let outsider: { userId: string; teamId: string };
let outsiderLead: ApiClient;

beforeAll(async () => {
  outsider = await ensureOutsider();
  outsiderLead = await signedIn(OUTSIDER.email, OUTSIDER.password);
});

afterAll(closeDb);

describe("the app's database role", () => {
  it("is not a superuser, owns nothing and is what the served app connects as", async () => {
    const { rows } = await appDb().query<{
      role: string;
      rolsuper: boolean;
      rolcreaterole: boolean;
      rolcreatedb: boolean;
      rolbypassrls: boolean;
      rolreplication: boolean;
      owned: string;
    }>(
      `SELECT current_user AS role, r.rolsuper, r.rolcreaterole, r.rolcreatedb, r.rolbypassrls, r.rolreplication,
              (SELECT count(*) FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
                WHERE n.nspname = 'public' AND c.relowner = r.oid)::text AS owned
         FROM pg_roles r WHERE r.rolname = current_user`,
    );
    expect(rows[0]).toMatchObject({
      rolsuper: false,
      rolcreaterole: false,
      rolcreatedb: false,
      rolbypassrls: false,
      rolreplication: false,
      owned: "0",
    });
    // The served app has just answered a request from the database: its connections are the app role's.
    expect((await outsiderLead.get("/api/me")).status).toBe(200);
    const { rows: connections } = await superuserDb().query<{ usename: string }>(
      `SELECT DISTINCT usename FROM pg_stat_activity
        WHERE datname = current_database() AND backend_type = 'client backend' AND pid <> pg_backend_pid()
          AND application_name <> $1`,
      [TEST_APPLICATION_NAME],
    );
    expect(connections.map((c) => c.usename)).toEqual([rows[0].role]);
  });

  it("cannot switch the audit trail's triggers off", async () => {
    // PostgreSQL: only a table's owner may ALTER TABLE (42501 insufficient_privilege).
    expect(
      await appError("ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_update"),
    ).toEqual({
      code: "42501",
      message: "must be owner of table audit_events",
    });
    expect(await appError("ALTER TABLE audit_events DISABLE TRIGGER ALL")).toMatchObject({
      code: "42501",
    });
    expect(await appError("ALTER TABLE runs DISABLE TRIGGER runs_guarded")).toEqual({
      code: "42501",
      message: "must be owner of table runs",
    });
  });

  it("cannot become a replica to skip triggers", async () => {
    expect(await appError("SET session_replication_role = replica")).toEqual({
      code: "42501",
      message: 'permission denied to set parameter "session_replication_role"',
    });
  });

  it("cannot update, delete or truncate audit events, signatures or raw files", async () => {
    const denied = (table: string) => ({
      code: "42501",
      message: `permission denied for table ${table}`,
    });
    expect(
      await appError(
        "UPDATE audit_events SET reason = 'forged' WHERE id = (SELECT max(id) FROM audit_events)",
      ),
    ).toEqual(denied("audit_events"));
    expect(
      await appError("DELETE FROM audit_events WHERE id = (SELECT max(id) FROM audit_events)"),
    ).toEqual(denied("audit_events"));
    expect(await appError("TRUNCATE audit_events")).toEqual(denied("audit_events"));
    expect(await appError("UPDATE run_signatures SET meaning = 'forged'")).toEqual(
      denied("run_signatures"),
    );
    expect(await appError("DELETE FROM runs")).toEqual(denied("runs"));
    expect(await appError("UPDATE spectrum_files SET label = 'forged'")).toEqual(
      denied("spectrum_files"),
    );
    expect(await appError("DELETE FROM schema_migrations")).toEqual(denied("schema_migrations"));
    expect(await appError("CREATE TABLE audit_shadow (id int)")).toMatchObject({
      code: "42501",
      message: "permission denied for schema public",
    });
  });
});

describe("the audit hash chain", () => {
  it("chains concurrent inserts one after the other, whatever the writer claims", async () => {
    const before = (await chainOf(outsider.teamId)).length;
    const writers = new Pool({
      connectionString: process.env.DATABASE_URL,
      max: 8,
      application_name: TEST_APPLICATION_NAME,
    });
    try {
      await Promise.all(
        Array.from({ length: 24 }, (_, i) =>
          writers.query(
            `INSERT INTO audit_events (actor_id, team_id, action, entity, entity_id, before, after, reason, team_seq, prev_hash, hash)
             VALUES ($1, $2, 'test.chain', 'test', $3, $4::jsonb, $5::jsonb, $6, 1, $7, $7)`,
            [
              outsider.userId,
              outsider.teamId,
              String(i),
              JSON.stringify({ tiny: 1e-7, big: 1e21, nested: { z: [1, 2.5], a: "ü" } }),
              JSON.stringify({ i, quote: 'say "hi"\n\ttab' }),
              i % 3 ? null : `reason ${i} with "quotes", a line\nbreak and ünïcode`,
              "f".repeat(64),
            ],
          ),
        ),
      );
    } finally {
      await writers.end();
    }
    const rows = await chainOf(outsider.teamId);
    expect(rows.length).toBe(before + 24);
    rows.forEach((row, i) => {
      expect(Number(row.team_seq)).toBe(i + 1);
      expect(row.prev_hash).toBe(i === 0 ? "0".repeat(64) : rows[i - 1].hash);
      // The database's canonical text is the TypeScript one, and so is the hash.
      expect(canonicalAuditEvent(chainedAuditEventOf(row))).toBe(row.canonical);
      expect(row.hash).toBe(auditChainHash(row.prev_hash, row.canonical));
    });
  });

  it("answers ok for an untouched team, names the first broken link after tampering, and ok once repaired", async () => {
    const path = `/api/audit/verify?teamId=${outsider.teamId}`;
    const ok = await outsiderLead.get<AuditChainReport>(path);
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ teamId: outsider.teamId, ok: true, break: null });
    expect(ok.body.checked).toBeGreaterThanOrEqual(24);

    const rows = await chainOf(outsider.teamId);
    const target = rows[Math.floor(rows.length / 2)];
    try {
      await asSuperuser("UPDATE audit_events SET reason = 'nothing happened here' WHERE id = $1", [
        target.id,
      ]);
      const broken = await outsiderLead.get<AuditChainReport>(path);
      expect(broken.status).toBe(200);
      expect(broken.body.ok).toBe(false);
      expect(broken.body.break).toMatchObject({
        problem: "hash",
        sequence: Number(target.team_seq),
        eventId: target.id,
        found: target.hash,
      });
      expect(broken.body.head).toEqual({
        sequence: Number(target.team_seq) - 1,
        hash: target.prev_hash,
      });

      // The command names the same link and fails.
      const failure = await run(
        "npm",
        ["run", "-s", "audit:verify", "--", "--team", outsider.teamId],
        {
          env: process.env,
        },
      ).then(
        () => null,
        (error: { code: number; stdout: string }) => error,
      );
      expect(failure?.code).toBe(1);
      expect(failure?.stdout).toContain(
        `BROKEN  team ${outsider.teamId} at sequence ${target.team_seq}, event ${target.id} (hash)`,
      );
    } finally {
      await asSuperuser("UPDATE audit_events SET reason = $2 WHERE id = $1", [
        target.id,
        target.reason,
      ]);
    }
    const repaired = await outsiderLead.get<AuditChainReport>(path);
    expect(repaired.body).toMatchObject({ ok: true, break: null });

    // A deleted event is a gap.
    const last = rows[rows.length - 1];
    const victim = rows[rows.length - 2];
    try {
      await asSuperuser("DELETE FROM audit_events WHERE id = $1", [victim.id]);
      const gap = await outsiderLead.get<AuditChainReport>(path);
      expect(gap.body.break).toMatchObject({
        problem: "sequence",
        sequence: Number(victim.team_seq),
        eventId: last.id,
      });
    } finally {
      await asSuperuser(
        `INSERT INTO audit_events (id, actor_id, team_id, action, entity, entity_id, before, after, reason, created_at,
                                   team_seq, subject_hash, prev_hash, hash)
         VALUES ($1, $2, $3, $4, $5, $6, $7::jsonb, $8::jsonb, $9, $10::timestamptz, $11, $12, $13, $14)`,
        [
          victim.id,
          victim.actor_id,
          victim.team_id,
          victim.action,
          victim.entity,
          victim.entity_id,
          victim.before_json,
          victim.after_json,
          victim.reason,
          victim.created_at,
          victim.team_seq,
          victim.subject_hash,
          victim.prev_hash,
          victim.hash,
        ],
      );
    }
    expect((await outsiderLead.get<AuditChainReport>(path)).body).toMatchObject({ ok: true });
  });

  it("notices a signed run changed after signing, through the content its sign-off bound", async () => {
    const lead = await signInDemo("labLead");
    const teamId = await teamIdOf(lead, FLAME_SCREENING);
    const { rows } = await superuserDb().query<{
      id: string;
      team_seq: string;
      run_id: string;
      notes: string;
      subject_hash: string;
    }>(
      `SELECT e.id::text AS id, e.team_seq::text AS team_seq, r.id::text AS run_id, r.notes, e.subject_hash
         FROM audit_events e JOIN runs r ON r.id::text = e.entity_id
        WHERE e.action = 'run.sign' AND e.team_id = $1 ORDER BY e.team_seq LIMIT 1`,
      [teamId],
    );
    expect(rows[0], "the demo team has a signed run").toBeDefined();
    const signed = rows[0];
    const path = `/api/audit/verify?teamId=${teamId}`;
    expect((await lead.get<AuditChainReport>(path)).body).toMatchObject({ ok: true });
    try {
      await asSuperuser("UPDATE runs SET notes = notes || ' (and a forged line)' WHERE id = $1", [
        signed.run_id,
      ]);
      const broken = await lead.get<AuditChainReport>(path);
      expect(broken.body.ok).toBe(false);
      expect(broken.body.break).toMatchObject({
        problem: "signature",
        sequence: Number(signed.team_seq),
        eventId: signed.id,
        expected: signed.subject_hash,
      });
      expect(broken.body.break!.detail).toContain(signed.run_id);
    } finally {
      await asSuperuser("UPDATE runs SET notes = $2 WHERE id = $1", [signed.run_id, signed.notes]);
    }
    expect((await lead.get<AuditChainReport>(path)).body).toMatchObject({ ok: true });
  });

  it("is for lab leads: a chemist gets 403, another team's lead 404", async () => {
    const chemist = await signInDemo("chemist");
    const teamId = await teamIdOf(chemist, FLAME_SCREENING);
    const refused = await chemist.get<ErrorBody>(`/api/audit/verify?teamId=${teamId}`);
    expect(refused.status).toBe(403);
    expect(refused.body.error.code).toBe("forbidden");
    expect((await outsiderLead.get<ErrorBody>(`/api/audit/verify?teamId=${teamId}`)).status).toBe(
      404,
    );
    expect((await outsiderLead.get<ErrorBody>("/api/audit/verify?teamId=not-a-team")).status).toBe(
      400,
    );
  });
});
