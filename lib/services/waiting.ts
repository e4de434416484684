// What is waiting for the signed-in person in a team, by role: their returned runs and unsubmitted
// drafts; for a supervisor, the review queue with ages; for a lab lead, the draft line table, the
// unverified lines of the published one, and instruments whose last calibration is old (or missing).
import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import { roleIn } from "@/lib/auth/actor";
import { authorize, can } from "@/lib/auth/policy";
import type { TeamRole } from "@/lib/auth/roles";

import { OLD_CALIBRATION_DAYS } from "./waiting-rules";
/** At most this many runs or instruments are listed per heading; the counts are exact. */
const LISTED = 8;

export interface WaitingRun {
  runId: string;
  /** The sample's label (or its file's name). */
  label: string;
  notebookTitle: string;
  authorName: string | null;
  /** Since when it waits: returned, submitted, or made (a draft). ISO 8601. */
  since: string;
  waitingSeconds: number;
}

export interface OldCalibration {
  instrumentId: string;
  instrumentName: string;
  /** The day of its newest calibration, or null when it has none. */
  lastCalibratedOn: string | null;
  ageDays: number | null;
}

export interface WaitingForYou {
  role: TeamRole;
  returned: { count: number; runs: WaitingRun[] };
  drafts: { count: number; runs: WaitingRun[] };
  /** Supervisors only (null for others): runs waiting for their review, oldest first. */
  review: { count: number; runs: WaitingRun[] } | null;
  /** Lab leads only (null for others). */
  lineTable: {
    draft: { releaseId: string; openedAt: string; lineCount: number } | null;
    published: { releaseId: string; number: number; unverifiedCount: number } | null;
    oldCalibrations: { count: number; instruments: OldCalibration[] };
  } | null;
}

interface RunRow {
  id: string;
  label: string;
  notebook_title: string;
  author_name: string | null;
  since: Date;
  total: string;
}

const RUN_COLUMNS = `r.id, coalesce(nullif(s.label, ''), s.file_name) AS label, n.title AS notebook_title,
  u.name AS author_name, count(*) OVER () AS total`;
const RUN_JOINS = `FROM runs r
  JOIN spectrum_files s ON s.id = r.spectrum_id
  JOIN notebooks n ON n.id = r.notebook_id
  LEFT JOIN users u ON u.id = r.created_by_id`;

async function runList(
  sql: string,
  bind: unknown[],
  now: number,
): Promise<{ count: number; runs: WaitingRun[] }> {
  const rows = await sequelize.query<RunRow>(sql, { bind, type: QueryTypes.SELECT });
  return {
    count: rows.length ? Number(rows[0].total) : 0,
    runs: rows.map((row) => {
      const since = new Date(row.since);
      return {
        runId: row.id,
        label: row.label,
        notebookTitle: row.notebook_title,
        authorName: row.author_name,
        since: since.toISOString(),
        waitingSeconds: Math.max(0, Math.round((now - since.getTime()) / 1000)),
      };
    }),
  };
}

export async function fetchWaitingForYou(actor: Actor, teamId: string): Promise<WaitingForYou> {
  authorize(actor, "team.view", { teamId });
  const role = roleIn(actor, teamId)!;
  const now = Date.now();
  const [returned, drafts, review, lineTable] = await Promise.all([
    // Returned runs wait since the reviewer's decision (their last change).
    runList(
      `SELECT ${RUN_COLUMNS}, r.updated_at AS since ${RUN_JOINS}
        WHERE r.team_id = $1 AND r.created_by_id = $2 AND r.status = 'returned'
        ORDER BY r.updated_at ASC, r.id LIMIT ${LISTED}`,
      [teamId, actor.id],
      now,
    ),
    runList(
      `SELECT ${RUN_COLUMNS}, r.created_at AS since ${RUN_JOINS}
        WHERE r.team_id = $1 AND r.created_by_id = $2 AND r.status = 'draft'
        ORDER BY r.created_at ASC, r.id LIMIT ${LISTED}`,
      [teamId, actor.id],
      now,
    ),
    can(actor, "run.review", { teamId })
      ? runList(
          // The review page's own rule: named to them or to no one, never their own.
          `SELECT ${RUN_COLUMNS}, r.submitted_at AS since ${RUN_JOINS}
            WHERE r.team_id = $1 AND r.status = 'submitted'
              AND (r.requested_reviewer_id IS NULL OR r.requested_reviewer_id = $2)
              AND r.created_by_id IS DISTINCT FROM $2
            ORDER BY r.submitted_at ASC, r.id LIMIT ${LISTED}`,
          [teamId, actor.id],
          now,
        )
      : Promise.resolve(null),
    role === "lab_lead" ? labLeadItems(teamId, now) : Promise.resolve(null),
  ]);
  return { role, returned, drafts, review, lineTable };
}

async function labLeadItems(
  teamId: string,
  now: number,
): Promise<NonNullable<WaitingForYou["lineTable"]>> {
  const [releases, instruments] = await Promise.all([
    sequelize.query<{
      id: string;
      status: "draft" | "published";
      number: number | null;
      created_at: Date;
      line_count: string;
      unverified_count: string;
    }>(
      `SELECT lr.id, lr.status, lr.number, lr.created_at,
              (SELECT count(*) FROM lines l WHERE l.release_id = lr.id AND NOT l.retired) AS line_count,
              (SELECT count(*) FROM lines l WHERE l.release_id = lr.id AND NOT l.retired
                 AND l.verified_at IS NULL) AS unverified_count
         FROM line_releases lr
        WHERE lr.team_id = $1
          AND (lr.status = 'draft' OR lr.id = (SELECT id FROM line_releases
                 WHERE team_id = $1 AND status = 'published' ORDER BY number DESC LIMIT 1))`,
      { bind: [teamId], type: QueryTypes.SELECT },
    ),
    sequelize.query<{ id: string; name: string; last_on: string | null; total: string }>(
      `SELECT i.id, i.name, to_char(c.last_on, 'YYYY-MM-DD') AS last_on, count(*) OVER () AS total
         FROM instruments i
         LEFT JOIN LATERAL (SELECT max(calibrated_on) AS last_on FROM calibrations
                             WHERE instrument_id = i.id) c ON true
        WHERE i.team_id = $1
          AND (c.last_on IS NULL OR c.last_on < current_date - ${OLD_CALIBRATION_DAYS})
        ORDER BY c.last_on ASC NULLS FIRST, i.name
        LIMIT ${LISTED}`,
      { bind: [teamId], type: QueryTypes.SELECT },
    ),
  ]);
  const draft = releases.find((r) => r.status === "draft");
  const published = releases.find((r) => r.status === "published");
  // Today's midnight (UTC), the day calibrated_on counts from.
  const today = Math.floor(now / 86_400_000) * 86_400_000;
  return {
    draft: draft
      ? {
          releaseId: draft.id,
          openedAt: new Date(draft.created_at).toISOString(),
          lineCount: Number(draft.line_count),
        }
      : null,
    published: published
      ? {
          releaseId: published.id,
          number: published.number!,
          unverifiedCount: Number(published.unverified_count),
        }
      : null,
    oldCalibrations: {
      count: instruments.length ? Number(instruments[0].total) : 0,
      instruments: instruments.map((i) => ({
        instrumentId: i.id,
        instrumentName: i.name,
        lastCalibratedOn: i.last_on,
        ageDays: i.last_on
          ? Math.round((today - Date.parse(`${i.last_on}T00:00:00Z`)) / 86_400_000)
          : null,
      })),
    },
  };
}
