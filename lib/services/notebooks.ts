// A team's notebooks: created, renamed and listed by its members; each holds identification runs,
// listed with their status, the species that stand as present, instrument, sample and author.
import "server-only";
import { QueryTypes } from "sequelize";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize, type TeamAction } from "@/lib/auth/policy";
import type {
  NotebookListQuery,
  NotebookRenameInput,
  NotebookRunsQuery,
} from "@/lib/validation/notebook-schemas";
import { Notebook, sequelize } from "@/models";
import { recordAudit } from "./audit";
import { overridesByRun } from "./run-records";
import { presentSpecies, standingVerdicts } from "@/lib/runs/standing-verdicts";
import type { RunStatus, StoredRunCall } from "@/lib/runs/types";
import type { NotebookRecord, RunSummary } from "./notebook-types";

/** A notebook the actor may act on; another team's is not found. */
export async function loadNotebook(
  actor: Actor,
  notebookId: string,
  action: TeamAction = "team.view",
): Promise<Notebook> {
  const row = await Notebook.findByPk(notebookId);
  if (!row) throw notFound("No such notebook.");
  authorize(actor, action, { teamId: row.teamId });
  return row;
}

interface NotebookRow {
  id: string;
  team_id: string;
  title: string;
  version: number;
  created_at: Date;
  updated_at: Date;
  run_count: string;
  draft_count: string;
  submitted_count: string;
  returned_count: string;
  signed_count: string;
  last_run_at: Date | null;
}

const NOTEBOOK_SELECT = `
  SELECT n.id, n.team_id, n.title, n.version, n.created_at, n.updated_at,
         count(r.id) AS run_count,
         count(r.id) FILTER (WHERE r.status = 'draft') AS draft_count,
         count(r.id) FILTER (WHERE r.status = 'submitted') AS submitted_count,
         count(r.id) FILTER (WHERE r.status = 'returned') AS returned_count,
         count(r.id) FILTER (WHERE r.status = 'signed') AS signed_count,
         max(greatest(r.created_at, r.updated_at)) AS last_run_at
    FROM notebooks n LEFT JOIN runs r ON r.notebook_id = n.id`;

function toNotebookRecord(r: NotebookRow): NotebookRecord {
  const updated = new Date(r.updated_at);
  const lastRun = r.last_run_at ? new Date(r.last_run_at) : null;
  return {
    id: r.id,
    teamId: r.team_id,
    title: r.title,
    version: Number(r.version),
    createdAt: new Date(r.created_at).toISOString(),
    lastActivityAt: (lastRun && lastRun > updated ? lastRun : updated).toISOString(),
    runCount: Number(r.run_count),
    statusCounts: {
      draft: Number(r.draft_count),
      submitted: Number(r.submitted_count),
      returned: Number(r.returned_count),
      signed: Number(r.signed_count),
    },
  };
}

/** `%` and `_` typed into a search box are matched as themselves. */
function likePattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/** The team's notebooks whose title contains `q` (any case), most recently active first. */
export async function fetchNotebooks(
  actor: Actor,
  teamId: string,
  query: NotebookListQuery = {},
): Promise<NotebookRecord[]> {
  authorize(actor, "team.view", { teamId });
  const rows = await sequelize.query<NotebookRow>(
    `${NOTEBOOK_SELECT}
      WHERE n.team_id = $1 AND ($2::text IS NULL OR n.title ILIKE $2)
      GROUP BY n.id`,
    { bind: [teamId, query.q ? likePattern(query.q) : null], type: QueryTypes.SELECT },
  );
  return rows
    .map(toNotebookRecord)
    .sort(
      (a, b) =>
        b.lastActivityAt.localeCompare(a.lastActivityAt) ||
        b.createdAt.localeCompare(a.createdAt) ||
        a.id.localeCompare(b.id),
    );
}

export async function fetchNotebook(actor: Actor, notebookId: string): Promise<NotebookRecord> {
  const notebook = await loadNotebook(actor, notebookId);
  const [row] = await sequelize.query<NotebookRow>(
    `${NOTEBOOK_SELECT} WHERE n.id = $1 GROUP BY n.id`,
    {
      bind: [notebook.id],
      type: QueryTypes.SELECT,
    },
  );
  return toNotebookRecord(row);
}

export async function createNotebook(
  actor: Actor,
  input: { teamId: string; title: string },
): Promise<NotebookRecord> {
  authorize(actor, "notebook.create", { teamId: input.teamId });
  return sequelize.transaction(async (transaction) => {
    const row = await Notebook.create(
      { teamId: input.teamId, title: input.title, createdById: actor.id },
      { transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        teamId: input.teamId,
        action: "notebook.create",
        entity: "notebook",
        entityId: row.id,
        after: { title: row.title },
      },
      transaction,
    );
    const created = row.createdAt.toISOString();
    return {
      id: row.id,
      teamId: row.teamId,
      title: row.title,
      version: row.version,
      createdAt: created,
      lastActivityAt: created,
      runCount: 0,
      statusCounts: { draft: 0, submitted: 0, returned: 0, signed: 0 },
    };
  });
}

/**
 * Renames a notebook edited at `version`: a stale version (someone renamed it since) is a conflict and
 * changes nothing. The same title again changes nothing and writes no audit event.
 */
export async function renameNotebook(
  actor: Actor,
  notebookId: string,
  input: NotebookRenameInput,
): Promise<NotebookRecord> {
  const found = await loadNotebook(actor, notebookId, "notebook.create");
  await sequelize.transaction(async (transaction) => {
    const row = (await Notebook.findByPk(found.id, {
      transaction,
      lock: transaction.LOCK.UPDATE,
    }))!;
    if (row.version !== input.version) {
      throw new AppError(
        "conflict",
        "Someone renamed this notebook since you opened it. Reload to see the new title, then try again.",
        {
          fieldErrors: { title: [`It is now called “${row.title}”.`] },
        },
      );
    }
    if (row.title === input.title) return;
    const before = { title: row.title, version: row.version };
    row.title = input.title;
    await row.save({ transaction });
    await recordAudit(
      {
        actorId: actor.id,
        teamId: row.teamId,
        action: "notebook.rename",
        entity: "notebook",
        entityId: row.id,
        before,
        after: { title: row.title, version: row.version },
      },
      transaction,
    );
  });
  return fetchNotebook(actor, found.id);
}

interface RunRow {
  id: string;
  status: RunStatus;
  version_number: number;
  spectrum_id: string;
  source: RunSummary["source"];
  calls: StoredRunCall[];
  created_at: Date;
  created_by_id: string | null;
  author_name: string | null;
  spectrum_label: string;
  spectrum_file_name: string;
  instrument_id: string;
  instrument_name: string;
}

/** Whether a species (e.g. "K I") answers a search for "K I", "k i" or the element "K". */
function speciesMatches(species: string, needle: string): boolean {
  const s = species.toLowerCase();
  return s === needle || s.split(" ")[0] === needle;
}

/**
 * A notebook's runs, newest first, as summaries: status, the species whose standing verdict (after
 * the chemist's overrides) is present, instrument, sample, author and version; filtered by status,
 * instrument, a species that stands as present, and free text (sample label or file name, instrument,
 * author, notes).
 */
export async function fetchNotebookRuns(
  actor: Actor,
  notebookId: string,
  query: NotebookRunsQuery = {},
): Promise<RunSummary[]> {
  const notebook = await loadNotebook(actor, notebookId);
  const rows = await sequelize.query<RunRow>(
    `SELECT r.id, r.status, r.version_number, r.spectrum_id, r.source, r.calls, r.created_at, r.created_by_id,
            u.name AS author_name, s.label AS spectrum_label, s.file_name AS spectrum_file_name,
            i.id AS instrument_id, i.name AS instrument_name
       FROM runs r
       JOIN spectrum_files s ON s.id = r.spectrum_id
       JOIN instruments i ON i.id = s.instrument_id
       LEFT JOIN users u ON u.id = r.created_by_id
      WHERE r.notebook_id = $1
        AND ($2::text IS NULL OR r.status = $2)
        AND ($3::uuid IS NULL OR i.id = $3)
        AND ($4::text IS NULL OR s.label ILIKE $4 OR s.file_name ILIKE $4 OR i.name ILIKE $4
             OR u.name ILIKE $4 OR r.notes ILIKE $4)
      ORDER BY r.created_at DESC, r.id`,
    {
      bind: [
        notebook.id,
        query.status ?? null,
        query.instrumentId ?? null,
        query.q ? likePattern(query.q) : null,
      ],
      type: QueryTypes.SELECT,
    },
  );
  const overrides = await overridesByRun(rows.map((r) => r.id));
  const needle = query.species?.toLowerCase().replace(/\s+/g, " ");
  return rows
    .map((r): RunSummary => {
      const verdicts = standingVerdicts(r.calls, overrides.get(r.id) ?? []);
      return {
        id: r.id,
        status: r.status,
        versionNumber: Number(r.version_number),
        spectrumId: r.spectrum_id,
        spectrumLabel: r.spectrum_label,
        spectrumFileName: r.spectrum_file_name,
        instrumentId: r.instrument_id,
        instrumentName: r.instrument_name,
        source: r.source,
        present: presentSpecies(verdicts),
        authorId: r.created_by_id,
        authorName: r.author_name,
        createdAt: new Date(r.created_at).toISOString(),
      };
    })
    .filter((r) => !needle || r.present.some((species) => speciesMatches(species, needle)));
}
