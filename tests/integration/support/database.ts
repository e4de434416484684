// Direct checks against the test database: audit events written since a mark, and raw SQL. db() is
// the schema's owner (not a superuser, so every trigger still applies); appDb() is the role the app
// connects as; superuserDb() is the local cluster's superuser, for tests that play an attacker who
// holds it.
import { Pool } from "pg";

const pools = new Map<string, Pool>();

export const TEST_APPLICATION_NAME = "emberline-tests";

function pool(connectionString: string): Pool {
  let found = pools.get(connectionString);
  if (!found) {
    // Named, so that a test can tell the served app's connections from its own.
    found = new Pool({ connectionString, max: 2, application_name: TEST_APPLICATION_NAME });
    pools.set(connectionString, found);
  }
  return found;
}

function required(name: string): string {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set: run the tests through scripts/test.mjs`);
  return value;
}

/**
 * The owner's URL: DATABASE_OWNER_URL, else the local cluster's owner role on the test database (the
 * test scripts keep the owner's URL away from the served app's environment).
 */
export function ownerUrl(): string {
  if (process.env.DATABASE_OWNER_URL) return process.env.DATABASE_OWNER_URL;
  const url = new URL(required("DATABASE_URL"));
  url.username = "emberline_owner";
  url.password = "";
  return url.toString();
}

/** The owner of the schema: may write any table, but triggers still apply. */
export function db(): Pool {
  return pool(ownerUrl());
}

/** The role the app connects as (DATABASE_URL). */
export function appDb(): Pool {
  return pool(required("DATABASE_URL"));
}

/** The local test cluster's superuser on the test database (trust on loopback). */
export function superuserDb(): Pool {
  const url = new URL(required("DATABASE_URL"));
  url.username = "postgres";
  url.password = "";
  return pool(url.toString());
}

export async function closeDb(): Promise<void> {
  await Promise.all([...pools.values()].map((p) => p.end()));
  pools.clear();
}

/** The newest audit event id now; events written later have a larger id (bigserial). */
export async function auditMark(): Promise<number> {
  const { rows } = await db().query<{ id: string | null }>(
    "SELECT max(id) AS id FROM audit_events",
  );
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
  const { rows } = await db().query<{ id: string }>(
    "SELECT id FROM users WHERE lower(email) = lower($1)",
    [email],
  );
  if (!rows[0]) throw new Error(`No user ${email}`);
  return rows[0].id;
}

/** How many calibrations an instrument has. */
export async function calibrationCountOf(instrumentId: string): Promise<number> {
  const { rows } = await db().query<{ n: string }>(
    "SELECT count(*) AS n FROM calibrations WHERE instrument_id = $1",
    [instrumentId],
  );
  return Number(rows[0].n);
}
