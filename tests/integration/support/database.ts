// Direct checks against the test database: audit events written since a mark, and raw SQL.
import { Pool } from "pg";

let pool: Pool | undefined;

export function db(): Pool {
  const connectionString = process.env.DATABASE_URL;
  if (!connectionString) throw new Error("DATABASE_URL is not set: run the tests through scripts/test.mjs");
  pool ??= new Pool({ connectionString, max: 2 });
  return pool;
}

export async function closeDb(): Promise<void> {
  await pool?.end();
  pool = undefined;
}

/** The newest audit event id now; events written later have a larger id (bigserial). */
export async function auditMark(): Promise<number> {
  const { rows } = await db().query<{ id: string | null }>("SELECT max(id) AS id FROM audit_events");
  return Number(rows[0].id ?? 0);
}

export interface AuditRow {
  id: string;
  actor_id: string | null;
  team_id: string | null;
  action: string;
  entity: string;
  entity_id: string | null;
  before: unknown;
  after: unknown;
  reason: string | null;
  created_at: Date;
}

/** Audit events after `mark`, optionally of one action and one actor, oldest first. */
export async function auditEventsSince(
  mark: number,
  filter: { action?: string; actorId?: string } = {},
): Promise<AuditRow[]> {
  const { rows } = await db().query<AuditRow>(
    `SELECT * FROM audit_events
      WHERE id > $1 AND ($2::text IS NULL OR action = $2) AND ($3::uuid IS NULL OR actor_id = $3)
      ORDER BY id`,
    [mark, filter.action ?? null, filter.actorId ?? null],
  );
  return rows;
}

export async function userIdByEmail(email: string): Promise<string> {
  const { rows } = await db().query<{ id: string }>("SELECT id FROM users WHERE lower(email) = lower($1)", [email]);
  if (!rows[0]) throw new Error(`No user ${email}`);
  return rows[0].id;
}
