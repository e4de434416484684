// Writes and reads the append-only audit trail. Every mutation in every service calls recordAudit
// inside the same transaction as the change it describes; nothing here (or anywhere) edits or
// deletes an event, and the database refuses it too.
import "server-only";
import Papa from "papaparse";
import { FORMULA_START } from "@/lib/reports/formula-guard";
import { csvComment } from "@/lib/reports/csv-table";
import { QueryTypes, type Transaction } from "sequelize";
import { AuditEvent, User, sequelize } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import { authorize, can } from "@/lib/auth/policy";
import { actionLabel, activitySentence } from "@/lib/audit/action-words";
import { entityHref } from "@/lib/audit/entity-href";
import { diffAuditValues, type AuditChange } from "@/lib/audit/diff-audit-values";
import { ROLE_LABELS, type TeamRole } from "@/lib/auth/roles";
import {
  AUDIT_FILTER_KEYS,
  AUDIT_PAGE_DEFAULT,
  AUDIT_PAGE_MAX,
} from "@/lib/validation/audit-schemas";

export type { AuditChange };

export interface AuditInput {
  actorId: string | null;
  teamId?: string | null;
  action: string;
  entity: string;
  entityId?: string | null;
  before?: unknown;
  after?: unknown;
  reason?: string | null;
}

export async function recordAudit(input: AuditInput, transaction?: Transaction): Promise<void> {
  await AuditEvent.create(
    {
      actorId: input.actorId,
      teamId: input.teamId ?? null,
      action: input.action,
      entity: input.entity,
      entityId: input.entityId ?? null,
      before: input.before ?? null,
      after: input.after ?? null,
      reason: input.reason ?? null,
    },
    { transaction },
  );
}

export interface AuditEntry {
  id: string;
  at: string;
  actorName: string | null;
  action: string;
  /** The action in words: "Run started". */
  label: string;
  /** The event as a sentence: "Mara Quist started run Flame sample A." */
  sentence: string;
  entity: string;
  entityId: string | null;
  /** The page of the record, where it has one. */
  href: string | null;
  reason: string | null;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/**
 * The names of the records events are about, as they read now (a run by its sample's label, a
 * notebook by its title, …): one statement per kind of record, whatever the number of events.
 */
async function recordNames(
  teamId: string,
  events: readonly { entity: string; entityId: string | null }[],
): Promise<Map<string, string>> {
  const idsOf = (entity: string) => [
    ...new Set(
      events
        .filter((e) => e.entity === entity && e.entityId && UUID.test(e.entityId))
        .map((e) => e.entityId!),
    ),
  ];
  const lookups: { entity: string; sql: string }[] = [
    {
      entity: "run",
      sql: `SELECT r.id, coalesce(nullif(s.label, ''), s.file_name) AS name FROM runs r
              JOIN spectrum_files s ON s.id = r.spectrum_id WHERE r.team_id = $1 AND r.id = ANY ($2::uuid[])`,
    },
    {
      entity: "notebook",
      sql: "SELECT id, title AS name FROM notebooks WHERE team_id = $1 AND id = ANY ($2::uuid[])",
    },
    {
      entity: "instrument",
      sql: "SELECT id, name FROM instruments WHERE team_id = $1 AND id = ANY ($2::uuid[])",
    },
    {
      entity: "calibration",
      sql: `SELECT c.id, i.name || ' (' || to_char(c.calibrated_on, 'YYYY-MM-DD') || ')' AS name
              FROM calibrations c JOIN instruments i ON i.id = c.instrument_id
             WHERE c.team_id = $1 AND c.id = ANY ($2::uuid[])`,
    },
    {
      entity: "spectrum_file",
      sql: `SELECT id, coalesce(nullif(label, ''), file_name) AS name FROM spectrum_files
             WHERE team_id = $1 AND id = ANY ($2::uuid[])`,
    },
    {
      entity: "line_release",
      sql: `SELECT id, CASE WHEN number IS NULL THEN 'the draft line table' ELSE 'line-table release ' || number END AS name
              FROM line_releases WHERE team_id = $1 AND id = ANY ($2::uuid[])`,
    },
    {
      entity: "line",
      // A line's events name its key (the same line across releases); any release's row names it.
      sql: `SELECT DISTINCT ON (l.line_key) l.line_key AS id,
                   l.species || ' ' || round(coalesce(l.air_nm, l.vacuum_nm)::numeric, 3) || ' nm' AS name
              FROM lines l JOIN line_releases lr ON lr.id = l.release_id
             WHERE lr.team_id = $1 AND l.line_key = ANY ($2::uuid[])
             ORDER BY l.line_key, lr.created_at DESC`,
    },
  ];
  const names = new Map<string, string>();
  await Promise.all(
    lookups.map(async ({ entity, sql }) => {
      const ids = idsOf(entity);
      if (ids.length === 0) return;
      const rows = await sequelize.query<{ id: string; name: string }>(sql, {
        bind: [teamId, ids],
        type: QueryTypes.SELECT,
      });
      for (const row of rows) names.set(`${entity}:${row.id}`, row.name);
    }),
  );
  return names;
}

/** A name an event carries itself (a person's e-mail, a token's name, a role), when the record has none. */
function carriedName(value: unknown): string | null {
  if (!value || typeof value !== "object") return null;
  const record = value as Record<string, unknown>;
  for (const key of ["title", "name", "email", "label", "fileName"]) {
    if (typeof record[key] === "string" && record[key]) return record[key] as string;
  }
  if (typeof record.role === "string") return ROLE_LABELS[record.role as TeamRole] ?? record.role;
  return null;
}

export async function fetchRecentActivity(
  actor: Actor,
  teamId: string,
  limit = 15,
): Promise<AuditEntry[]> {
  authorize(actor, "audit.view", { teamId });
  const rows = await AuditEvent.findAll({
    where: { teamId },
    order: [["id", "DESC"]],
    limit,
    include: [{ model: User, as: "actor", attributes: ["name"] }],
  });
  const names = await recordNames(teamId, rows);
  return rows.map((row) => {
    const actorName = (row.get("actor") as User | null)?.name ?? null;
    const subject =
      names.get(`${row.entity}:${row.entityId}`) ??
      carriedName(row.after) ??
      carriedName(row.before);
    return {
      id: String(row.id),
      at: row.createdAt.toISOString(),
      actorName,
      action: row.action,
      label: actionLabel(row.action),
      sentence: activitySentence({ actorName, action: row.action, subject }),
      entity: row.entity,
      entityId: row.entityId,
      href: entityHref(row.entity, row.entityId),
      reason: row.reason,
    };
  });
}

// ---------------------------------------------------------------------------------------------
// Reading the trail: one team's events filtered and paged, one entity's trail, and the CSV export.

/** One event as pages, the API and the CSV see it, with the before/after comparison worked out. */
export interface AuditEventRecord {
  id: string;
  /** When the database wrote it, ISO 8601 in UTC. */
  at: string;
  teamId: string | null;
  actorId: string | null;
  actorName: string | null;
  actorEmail: string | null;
  action: string;
  entity: string;
  entityId: string | null;
  reason: string | null;
  before: unknown;
  after: unknown;
  /** Changed leaf fields (none for a creation, which has no before). */
  changes: AuditChange[];
}

export interface AuditFilter {
  teamId: string;
  actorId?: string;
  entity?: string;
  /** With `entity`: that record's trail (see RELATED_BY_REFERENCE). */
  entityId?: string;
  /** An exact action (`run.create`), or a prefix ending in "." (`run.`) for every action under it. */
  action?: string;
  /** First day, YYYY-MM-DD, inclusive, in UTC. */
  from?: string;
  /** Last day, YYYY-MM-DD, inclusive, in UTC. */
  to?: string;
}

export interface AuditPageQuery extends AuditFilter {
  /** The `nextCursor` of the previous page. */
  cursor?: string;
  /** Events per page, 1–200. @default 50 */
  limit?: number;
}

export interface AuditPage {
  events: AuditEventRecord[];
  /** Pass as `cursor` for the next (older) page; null on the last page. */
  nextCursor: string | null;
}

/**
 * Events that belong to a record's trail although they name another entity: the line edits made in
 * a line-table release's draft (entity `line`, whose before/after carry `releaseId`), and events of
 * a run's parts (entities `run_…`, carrying `runId`). Everything else is its entity + entity id.
 */
const RELATED_BY_REFERENCE: Readonly<Record<string, { entityLike: string; key: string }>> = {
  line_release: { entityLike: "line", key: "releaseId" },
  run: { entityLike: "run\\_%", key: "runId" },
};

interface AuditDbRow {
  id: string;
  created_at: Date;
  team_id: string | null;
  actor_id: string | null;
  actor_name: string | null;
  actor_email: string | null;
  action: string;
  entity: string;
  entity_id: string | null;
  reason: string | null;
  before: unknown;
  after: unknown;
}

const AUDIT_SELECT = `SELECT e.id::text AS id, e.created_at, e.team_id, e.actor_id, u.name AS actor_name,
  u.email AS actor_email, e.action, e.entity, e.entity_id, e.reason, e.before, e.after
  FROM audit_events e LEFT JOIN users u ON u.id = e.actor_id`;

const DAY_MS = 86_400_000;

function toAuditEventRecord(row: AuditDbRow): AuditEventRecord {
  return {
    id: row.id,
    at: row.created_at.toISOString(),
    teamId: row.team_id,
    actorId: row.actor_id,
    actorName: row.actor_name,
    actorEmail: row.actor_email,
    action: row.action,
    entity: row.entity,
    entityId: row.entity_id,
    reason: row.reason,
    before: row.before,
    after: row.after,
    changes: diffAuditValues(row.before, row.after),
  };
}

function escapeLike(value: string): string {
  return value.replace(/[\\%_]/g, "\\$&");
}

/** The WHERE clause of a filter; values go into `bind`, never into the SQL text. */
function auditWhere(
  filter: Omit<AuditFilter, "teamId"> & { teamIds: string[]; beforeId?: string; upToId?: string },
  bind: unknown[],
): string {
  const param = (value: unknown) => {
    bind.push(value);
    return `$${bind.length}`;
  };
  const parts = [`e.team_id = ANY(${param(filter.teamIds)}::uuid[])`];
  if (filter.actorId) parts.push(`e.actor_id = ${param(filter.actorId)}::uuid`);
  if (filter.entity && filter.entityId) {
    const entity = param(filter.entity);
    const id = param(filter.entityId);
    const own = `(e.entity = ${entity} AND e.entity_id = ${id})`;
    const related = RELATED_BY_REFERENCE[filter.entity];
    if (related) {
      const key = `${param(related.key)}::text`;
      parts.push(
        `(${own} OR (e.entity LIKE ${param(related.entityLike)} AND (e.after ->> ${key} = ${id} OR e.before ->> ${key} = ${id})))`,
      );
    } else parts.push(own);
  } else if (filter.entity) parts.push(`e.entity = ${param(filter.entity)}`);
  if (filter.action) {
    parts.push(
      filter.action.endsWith(".")
        ? `e.action LIKE ${param(`${escapeLike(filter.action)}%`)}`
        : `e.action = ${param(filter.action)}`,
    );
  }
  if (filter.from)
    parts.push(`e.created_at >= ${param(`${filter.from}T00:00:00.000Z`)}::timestamptz`);
  if (filter.to) {
    const dayAfter = new Date(Date.parse(`${filter.to}T00:00:00.000Z`) + DAY_MS).toISOString();
    parts.push(`e.created_at < ${param(dayAfter)}::timestamptz`);
  }
  if (filter.beforeId) parts.push(`e.id < ${param(filter.beforeId)}::bigint`);
  if (filter.upToId) parts.push(`e.id <= ${param(filter.upToId)}::bigint`);
  return parts.join(" AND ");
}

async function selectEvents(
  filter: Parameters<typeof auditWhere>[0],
  limit: number,
): Promise<AuditDbRow[]> {
  const bind: unknown[] = [];
  const where = auditWhere(filter, bind);
  bind.push(limit);
  return sequelize.query<AuditDbRow>(
    `${AUDIT_SELECT} WHERE ${where} ORDER BY e.id DESC LIMIT $${bind.length}`,
    {
      bind,
      type: QueryTypes.SELECT,
    },
  );
}

/**
 * One team's trail, newest first (by the event's sequence number, which follows the order of
 * writing), a page at a time: pass the previous page's `nextCursor` to get the next. Every event
 * shows up exactly once across the pages, even while new ones are written.
 */
export async function fetchAuditPage(actor: Actor, query: AuditPageQuery): Promise<AuditPage> {
  authorize(actor, "audit.view", { teamId: query.teamId });
  const limit = Math.min(AUDIT_PAGE_MAX, Math.max(1, query.limit ?? AUDIT_PAGE_DEFAULT));
  const rows = await selectEvents(
    { ...query, teamIds: [query.teamId], beforeId: query.cursor },
    limit + 1,
  );
  const events = rows.slice(0, limit).map(toAuditEventRecord);
  return { events, nextCursor: rows.length > limit ? events[events.length - 1].id : null };
}

export interface EntityTrail {
  events: AuditEventRecord[];
  /** True when the trail has older events than those shown. */
  more: boolean;
  /** The team the events belong to (for a link to the full trail); null when there are none. */
  teamId: string | null;
}

/**
 * One record's trail (a run, a calibration, a line-table release, …), newest first, from the teams
 * whose trail the person may read. Other teams' events are simply not there.
 */
export async function fetchEntityTrail(
  actor: Actor,
  entity: string,
  entityId: string,
  limit = 25,
): Promise<EntityTrail> {
  const teamIds = actor.memberships
    .map((m) => m.teamId)
    .filter((teamId) => can(actor, "audit.view", { teamId }));
  if (teamIds.length === 0) return { events: [], more: false, teamId: null };
  const rows = await selectEvents({ teamIds, entity, entityId }, limit + 1);
  const events = rows.slice(0, limit).map(toAuditEventRecord);
  return { events, more: rows.length > limit, teamId: events[0]?.teamId ?? null };
}

export interface AuditFacets {
  /** Entities that occur in the team's trail, sorted. */
  entities: string[];
  /** Actions that occur in the team's trail, sorted. */
  actions: string[];
}

/** What the filters can offer: the entities and actions that occur in the team's trail. */
export async function fetchAuditFacets(actor: Actor, teamId: string): Promise<AuditFacets> {
  authorize(actor, "audit.view", { teamId });
  const rows = await sequelize.query<{ entity: string; action: string }>(
    "SELECT DISTINCT entity, action FROM audit_events WHERE team_id = $1",
    { bind: [teamId], type: QueryTypes.SELECT },
  );
  return {
    entities: [...new Set(rows.map((r) => r.entity))].sort(),
    actions: [...new Set(rows.map((r) => r.action))].sort(),
  };
}

export const AUDIT_CSV_COLUMNS = [
  "time_utc",
  "actor_name",
  "actor_email",
  "action",
  "entity",
  "entity_id",
  "reason",
  "changed_fields",
  "before_json",
  "after_json",
] as const;

/** Events fetched per database round trip while the CSV streams out. */
const CSV_CHUNK = 500;

function csvCells(event: AuditEventRecord): string[] {
  return [
    event.at,
    event.actorName ?? "",
    event.actorEmail ?? "",
    event.action,
    event.entity,
    event.entityId ?? "",
    event.reason ?? "",
    event.changes.map((c) => c.path || "(value)").join("; "),
    event.before == null ? "" : JSON.stringify(event.before),
    event.after == null ? "" : JSON.stringify(event.after),
  ];
}

/** The audit CSV's comment lines: whose trail, which cut of it, and what the file does not prove. */
function auditCsvComments(teamId: string, newest: string | null, filtered: boolean): string {
  return [
    `Emberline audit trail of team ${teamId}: events up to id ${newest ?? "(none)"}, newest first${filtered ? " (filtered)" : ""}`,
    `Exported ${new Date().toISOString()}. The trail is hash-chained in the database: GET /api/audit/verify?teamId=${teamId} checks it; this copy proves nothing by itself.`,
  ]
    .map((line) => `${csvComment(line)}\r\n`)
    .join("");
}

function csvText(rows: string[][], header: boolean): string {
  // RFC 4180: fields with commas, quotes or line breaks are quoted, quotes doubled, CRLF between records.
  const text = Papa.unparse(header ? { fields: [...AUDIT_CSV_COLUMNS], data: rows } : rows, {
    newline: "\r\n",
    // Formula-like cells get a leading apostrophe (lib/reports/formula-guard.ts).
    escapeFormulae: FORMULA_START,
    header,
  });
  return text ? `${text}\r\n` : "";
}

export interface AuditCsvExport {
  filename: string;
  /** The CSV, produced a chunk of events at a time as the client reads it. */
  stream: ReadableStream<Uint8Array>;
}

/**
 * Every event that matches the filter as CSV, newest first. The events written after the export
 * started are left out, so that the file is one consistent cut of the trail.
 */
export async function exportAuditCsv(actor: Actor, filter: AuditFilter): Promise<AuditCsvExport> {
  authorize(actor, "audit.view", { teamId: filter.teamId });
  const [{ newest }] = await sequelize.query<{ newest: string | null }>(
    "SELECT max(id)::text AS newest FROM audit_events WHERE team_id = $1",
    { bind: [filter.teamId], type: QueryTypes.SELECT },
  );
  const teamName = actor.memberships.find((m) => m.teamId === filter.teamId)?.teamName ?? "team";
  const slug =
    teamName
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-|-$/g, "") || "team";
  const filtered = AUDIT_FILTER_KEYS.some((key) => filter[key]);
  const filename = `emberline-audit-${slug}-${new Date().toISOString().slice(0, 10)}${filtered ? "-filtered" : ""}.csv`;
  const encoder = new TextEncoder();
  const comments = auditCsvComments(filter.teamId, newest, filtered);
  let cursor: string | undefined;
  let started = false;
  const stream = new ReadableStream<Uint8Array>({
    async pull(controller) {
      try {
        const rows =
          newest === null
            ? []
            : await selectEvents(
                { ...filter, teamIds: [filter.teamId], beforeId: cursor, upToId: newest },
                CSV_CHUNK,
              );
        const text = csvText(
          rows.map((row) => csvCells(toAuditEventRecord(row))),
          !started,
        );
        if (!started) controller.enqueue(encoder.encode(comments));
        if (!started && rows.length === 0) {
          controller.enqueue(encoder.encode(`${AUDIT_CSV_COLUMNS.join(",")}\r\n`));
        } else if (text) controller.enqueue(encoder.encode(text));
        started = true;
        if (rows.length < CSV_CHUNK) controller.close();
        else cursor = rows[rows.length - 1].id;
      } catch (error) {
        console.error(error);
        controller.error(error);
      }
    },
  });
  return { filename, stream };
}
