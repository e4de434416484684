// The review queue: the runs of a team waiting for the signed-in supervisor, with the filters' options,
// and their count for the navigation.
import "server-only";
import { QueryTypes } from "sequelize";
import type { Actor } from "@/lib/auth/actor";
import { authorize, can } from "@/lib/auth/policy";
import type { ReviewQueueQuery } from "@/lib/validation/review-schemas";
import { sequelize } from "@/models";
import type { ReviewQueue, ReviewQueueItem } from "./run-review-types";
import { overridesByRun } from "./run-records";
import { presentSpecies, standingVerdicts } from "@/lib/runs/standing-verdicts";
import type { StoredRunCall } from "@/lib/runs/types";

interface QueueRow {
  id: string;
  submitted_at: Date;
  review_round: number;
  version_number: number;
  requested_reviewer_id: string | null;
  calls: StoredRunCall[];
  created_by_id: string | null;
  author_name: string | null;
  label: string;
  file_name: string;
  instrument_id: string;
  instrument_name: string;
  notebook_title: string;
}

const WAITING_FOR = `r.team_id = $1 AND r.status = 'submitted'
  AND (r.requested_reviewer_id IS NULL OR r.requested_reviewer_id = $2)
  AND r.created_by_id IS DISTINCT FROM $2`;

/** Runs of the team waiting for the actor (named to them or to no one; never their own), oldest first. */
export async function fetchReviewQueue(
  actor: Actor,
  query: ReviewQueueQuery,
): Promise<ReviewQueue> {
  authorize(actor, "run.review", { teamId: query.teamId });
  const rows = await sequelize.query<QueueRow>(
    `SELECT r.id, r.submitted_at, r.review_round, r.version_number, r.requested_reviewer_id, r.calls, r.created_by_id,
            u.name AS author_name, s.label, s.file_name, i.id AS instrument_id, i.name AS instrument_name, n.title AS notebook_title
       FROM runs r
       JOIN spectrum_files s ON s.id = r.spectrum_id
       JOIN instruments i ON i.id = s.instrument_id
       JOIN notebooks n ON n.id = r.notebook_id
       LEFT JOIN users u ON u.id = r.created_by_id
      WHERE ${WAITING_FOR}
      ORDER BY r.submitted_at ASC, r.id ASC`,
    { bind: [query.teamId, actor.id], type: QueryTypes.SELECT },
  );
  const overrides = await overridesByRun(rows.map((r) => r.id));
  const now = Date.now();
  const all: ReviewQueueItem[] = rows.map((row) => {
    const own = overrides.get(row.id) ?? [];
    const verdicts = standingVerdicts(row.calls, own);
    const submittedAt = new Date(row.submitted_at);
    return {
      runId: row.id,
      label: row.label || row.file_name,
      notebookTitle: row.notebook_title,
      author: row.created_by_id ? { id: row.created_by_id, name: row.author_name ?? "" } : null,
      instrument: { id: row.instrument_id, name: row.instrument_name },
      round: row.review_round,
      versionNumber: row.version_number,
      namedToMe: row.requested_reviewer_id === actor.id,
      submittedAt: submittedAt.toISOString(),
      waitingSeconds: Math.max(0, Math.round((now - submittedAt.getTime()) / 1000)),
      present: presentSpecies(verdicts).sort(),
    };
  });
  const unique = <T extends { id: string; name: string }>(list: T[]) =>
    [...new Map(list.map((x) => [x.id, x])).values()].sort((a, b) => a.name.localeCompare(b.name));
  return {
    items: all.filter(
      (item) =>
        (!query.author || item.author?.id === query.author) &&
        (!query.instrumentId || item.instrument.id === query.instrumentId) &&
        (!query.species || item.present.includes(query.species)),
    ),
    total: all.length,
    options: {
      authors: unique(all.flatMap((i) => (i.author ? [i.author] : []))),
      instruments: unique(all.map((i) => i.instrument)),
      species: [...new Set(all.flatMap((i) => i.present))].sort(),
    },
  };
}

/** How many runs wait for the actor in the team: the navigation's count (0 for non-supervisors). */
export async function countRunsWaitingFor(actor: Actor, teamId: string): Promise<number> {
  if (!can(actor, "run.review", { teamId })) return 0;
  const [row] = await sequelize.query<{ count: string }>(
    `SELECT count(*) AS count FROM runs r WHERE ${WAITING_FOR}`,
    {
      bind: [teamId, actor.id],
      type: QueryTypes.SELECT,
    },
  );
  return Number(row?.count ?? 0);
}
