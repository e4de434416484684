// Reading the line library: a team's releases, a page of a release's lines (filtered and sorted on
// the server), one line, and one line's history across releases. Every function authorises first.
import "server-only";
import { QueryTypes } from "sequelize";
import { notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import { sequelize } from "@/models";
import {
  RELEASE_FROM,
  RELEASE_LINE_COUNT,
  RELEASE_SELECT,
  lineQuerySql,
  toLineRecord,
  toReleaseSummary,
  type LineDbRow,
  type ReleaseDbRow,
  type ReleaseSummaryDbRow,
} from "./line-library-rows";
import { seenBy, selectLines, selectRelease, selectReleaseSummary } from "./line-library-access";
import type {
  LineHistoryEntry,
  LinePage,
  LineQuery,
  LineRecord,
  ReleaseSummary,
} from "./line-library-types";

const MAX_PAGE_SIZE = 500;
const DEFAULT_PAGE_SIZE = 100;

export async function fetchReleases(actor: Actor, teamId: string): Promise<ReleaseSummary[]> {
  authorize(actor, "lines.view", { teamId });
  const rows = await sequelize.query<ReleaseSummaryDbRow>(
    `SELECT ${RELEASE_SELECT}, ${RELEASE_LINE_COUNT} FROM ${RELEASE_FROM} WHERE r.team_id = $1
      ORDER BY (r.status = 'draft') DESC, r.number DESC`,
    { bind: [teamId], type: QueryTypes.SELECT },
  );
  return rows.map(toReleaseSummary);
}

export async function fetchRelease(actor: Actor, releaseId: string): Promise<ReleaseSummary> {
  return toReleaseSummary(seenBy(actor, await selectReleaseSummary("r.id = $1", [releaseId])));
}

/** The release a query names, or the team's newest published one (the draft when none is published). */
async function resolveQueryRelease(actor: Actor, query: LineQuery): Promise<ReleaseDbRow> {
  authorize(actor, "lines.view", { teamId: query.teamId });
  let release: ReleaseDbRow | null;
  if (query.releaseId) {
    release = await selectRelease("r.id = $1 AND r.team_id = $2", [query.releaseId, query.teamId]);
  } else if (query.releaseNumber !== undefined) {
    release = await selectRelease("r.team_id = $1 AND r.number = $2", [
      query.teamId,
      query.releaseNumber,
    ]);
  } else {
    release = await selectRelease(
      `r.team_id = $1 ORDER BY (r.status = 'published') DESC, r.number DESC NULLS LAST LIMIT 1`,
      [query.teamId],
    );
  }
  if (!release) throw notFound("No such release.");
  return release;
}

export async function fetchLines(actor: Actor, query: LineQuery): Promise<LinePage> {
  const release = await resolveQueryRelease(actor, query);
  const pageSize = Math.min(
    Math.max(Math.trunc(query.pageSize ?? DEFAULT_PAGE_SIZE), 1),
    MAX_PAGE_SIZE,
  );
  const page = Math.max(Math.trunc(query.page ?? 1), 1);
  const sql = lineQuerySql(release.id, query, page, pageSize);
  const [rows, counted] = await Promise.all([
    sequelize.query<LineDbRow>(sql.select, { bind: sql.bind, type: QueryTypes.SELECT }),
    sequelize.query<{ total: string }>(sql.count, { bind: sql.bind, type: QueryTypes.SELECT }),
  ]);
  return {
    release: {
      id: release.id,
      number: release.number,
      status: release.status,
      publishedAt: release.published_at ? new Date(release.published_at).toISOString() : null,
    },
    lines: rows.map(toLineRecord),
    total: Number(counted[0].total),
    page,
    pageSize,
  };
}

/** One line row by its id (any release the actor's team holds). */
export async function fetchLine(actor: Actor, lineId: string): Promise<LineRecord> {
  const [row] = await selectLines("l.id = $1", [lineId]);
  if (!row) throw notFound("No such line.");
  const release = await selectRelease("r.id = $1", [row.release_id]);
  authorize(actor, "lines.view", { teamId: release!.team_id });
  return toLineRecord(row);
}

/** Every audit event of one line (by line key) across the releases of the actor's team, oldest first. */
export async function fetchLineHistory(actor: Actor, lineKey: string): Promise<LineHistoryEntry[]> {
  const teams = await sequelize.query<{ team_id: string }>(
    `SELECT DISTINCT r.team_id FROM lines l JOIN line_releases r ON r.id = l.release_id WHERE l.line_key = $1`,
    { bind: [lineKey], type: QueryTypes.SELECT },
  );
  const teamId = teams
    .map((t) => t.team_id)
    .find((id) => actor.memberships.some((m) => m.teamId === id));
  if (!teamId) throw notFound("No such line.");
  authorize(actor, "lines.view", { teamId });
  const events = await sequelize.query<{
    created_at: Date;
    actor_name: string | null;
    action: string;
    release_number: number | null;
    reason: string | null;
    before: unknown;
    after: unknown;
  }>(
    // A reference check is one event for many lines; its `lines` object holds each line's part by key.
    `SELECT e.id, e.created_at, u.name AS actor_name, e.action, r.number AS release_number, e.reason, e.before, e.after
       FROM audit_events e
       LEFT JOIN users u ON u.id = e.actor_id
       LEFT JOIN line_releases r ON r.id::text = coalesce(e.after->>'releaseId', e.before->>'releaseId')
      WHERE e.entity = 'line' AND e.entity_id = $1 AND e.team_id = $2
     UNION ALL
     SELECT e.id, e.created_at, u.name, e.action, r.number, e.reason,
            e.after->'lines'->$1->'before',
            (e.after->'lines'->$1->'after') || jsonb_build_object('decision', e.after->'lines'->$1->'decision')
       FROM audit_events e
       LEFT JOIN users u ON u.id = e.actor_id
       LEFT JOIN line_releases r ON r.id::text = e.entity_id
      WHERE e.entity = 'line_release' AND e.action = 'line_release.reference_check'
        AND e.team_id = $2 AND e.after->'lines' ? $1
      ORDER BY id`,
    { bind: [lineKey, teamId], type: QueryTypes.SELECT },
  );
  return events.map((e) => ({
    at: new Date(e.created_at).toISOString(),
    actorName: e.actor_name,
    action: e.action,
    releaseNumber: e.release_number,
    reason: e.reason,
    before: e.before,
    after: e.after,
  }));
}
