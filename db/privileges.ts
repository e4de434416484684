// What the app's database role may do, table by table, applied after every migration run by the owner
// role. The app role owns nothing, so it can neither disable a trigger nor alter a table; records that
// are append-only (the audit trail, signatures, overrides, review marks, calibrations, raw files) get
// SELECT and INSERT only, so even a hijacked app connection cannot rewrite or delete them.
import { QueryTypes, type Sequelize } from "sequelize";

export type TablePrivilege = "SELECT" | "INSERT" | "UPDATE" | "DELETE";

const READ_APPEND: readonly TablePrivilege[] = ["SELECT", "INSERT"];
const READ_WRITE: readonly TablePrivilege[] = ["SELECT", "INSERT", "UPDATE"];
const FULL: readonly TablePrivilege[] = ["SELECT", "INSERT", "UPDATE", "DELETE"];

/**
 * Every table of the schema with what the app needs on it. A migration that adds a table adds it
 * here too: the privilege step refuses to finish while a table is missing, rather than leave the app
 * to fail with "permission denied" at run time. `[]` means the app never touches the table.
 */
export const APP_TABLE_PRIVILEGES: Readonly<Record<string, readonly TablePrivilege[]>> = {
  schema_migrations: [],
  // Accounts: people change their names and passwords; memberships, invitations, tokens and sessions
  // are granted and withdrawn.
  users: READ_WRITE,
  teams: READ_WRITE,
  memberships: FULL,
  invitations: FULL,
  password_reset_tokens: FULL,
  access_tokens: FULL,
  user_sessions: FULL,
  sign_in_attempts: READ_APPEND,
  // Removals from teams are history: sessions and tokens issued before one are refused its team.
  membership_removals: READ_APPEND,
  // The append-only trail.
  audit_events: READ_APPEND,
  // The line library: drafts are edited (publishing deletes a draft's retired rows); published
  // releases are frozen by triggers the app cannot switch off.
  line_releases: READ_WRITE,
  lines: FULL,
  // The workflow: raw files and calibrations are records; runs and review rounds move through their
  // workflow columns (guarded by triggers); overrides, marks and signatures are appended.
  instruments: READ_WRITE,
  spectrum_files: READ_APPEND,
  calibrations: READ_APPEND,
  notebooks: READ_WRITE,
  runs: READ_WRITE,
  run_rounds: READ_WRITE,
  run_overrides: READ_APPEND,
  run_review_marks: READ_APPEND,
  run_signatures: READ_APPEND,
  // A signed run's PDF, rendered once and kept (a trigger refuses any change).
  run_report_pdfs: READ_APPEND,
};

function quoteIdent(name: string): string {
  if (!/^[a-z_][a-z0-9_]*$/.test(name)) throw new Error(`Unsafe SQL name: ${name}`);
  return `"${name}"`;
}

/** The database roles that the app's URL names (the user part), refusing the owner itself. */
export function appRoleOf(appUrl: string, ownerUrl: string): string {
  const app = decodeURIComponent(new URL(appUrl).username);
  const owner = decodeURIComponent(new URL(ownerUrl).username);
  if (!app) throw new Error("DATABASE_URL names no user: the app must connect as its own role.");
  if (app === owner) {
    throw new Error(
      `DATABASE_URL and DATABASE_OWNER_URL both name the role ${app}: the app must connect as a role that owns nothing.`,
    );
  }
  return app;
}

/**
 * Grants the app role exactly APP_TABLE_PRIVILEGES (revoking anything else first, TRUNCATE, REFERENCES
 * and TRIGGER included), the sequences its inserts draw from, and nothing on the schema but USAGE.
 * Run as the owner of the tables. Refuses an app role that could bypass all this.
 */
export async function applyAppPrivileges(owner: Sequelize, appRole: string): Promise<void> {
  const [role] = await owner.query<{
    rolsuper: boolean;
    rolbypassrls: boolean;
    rolcreaterole: boolean;
  }>("SELECT rolsuper, rolbypassrls, rolcreaterole FROM pg_roles WHERE rolname = $1", {
    bind: [appRole],
    type: QueryTypes.SELECT,
  });
  if (!role)
    throw new Error(
      `The app's database role ${appRole} does not exist: create it first (see DEVELOPERS.md).`,
    );
  if (role.rolsuper || role.rolbypassrls || role.rolcreaterole) {
    throw new Error(
      `The app's database role ${appRole} must be NOSUPERUSER NOBYPASSRLS NOCREATEROLE.`,
    );
  }
  const tables = await owner.query<{ name: string; owned: boolean }>(
    `SELECT c.relname AS name, pg_has_role(c.relowner, 'USAGE') AS owned
       FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
      WHERE n.nspname = 'public' AND c.relkind IN ('r', 'p') ORDER BY c.relname`,
    { type: QueryTypes.SELECT },
  );
  const unknown = tables.filter((t) => !(t.name in APP_TABLE_PRIVILEGES)).map((t) => t.name);
  if (unknown.length) {
    throw new Error(
      `No app privileges are declared for ${unknown.join(", ")}: add them to APP_TABLE_PRIVILEGES in db/privileges.ts.`,
    );
  }
  const notOwned = tables.filter((t) => !t.owned).map((t) => t.name);
  if (notOwned.length) throw new Error(`The migration role does not own ${notOwned.join(", ")}.`);
  const app = quoteIdent(appRole);
  const [{ database }] = await owner.query<{ database: string }>(
    "SELECT current_database() AS database",
    {
      type: QueryTypes.SELECT,
    },
  );
  const statements = [
    `GRANT CONNECT ON DATABASE "${database.replace(/"/g, '""')}" TO ${app}`,
    `GRANT USAGE ON SCHEMA public TO ${app}`,
  ];
  for (const { name } of tables) {
    statements.push(`REVOKE ALL ON TABLE ${quoteIdent(name)} FROM ${app}`);
    const privileges = APP_TABLE_PRIVILEGES[name];
    if (privileges.length)
      statements.push(`GRANT ${privileges.join(", ")} ON TABLE ${quoteIdent(name)} TO ${app}`);
  }
  // nextval() for the bigserial ids of tables the app inserts into.
  statements.push(`GRANT USAGE, SELECT ON ALL SEQUENCES IN SCHEMA public TO ${app}`);
  await owner.transaction(async (transaction) => {
    for (const sql of statements) await owner.query(sql, { transaction });
  });
}
