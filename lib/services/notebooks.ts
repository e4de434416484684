// A team's notebooks: created and listed by its members; each holds identification runs.
import "server-only";
import { QueryTypes } from "sequelize";
import { notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize, type TeamAction } from "@/lib/auth/policy";
import { Notebook, sequelize } from "@/models";
import { recordAudit } from "./audit";
import type { NotebookRecord } from "./workflow-types";

/** A notebook the actor may act on; another team's is not found. */
export async function loadNotebook(actor: Actor, notebookId: string, action: TeamAction = "team.view"): Promise<Notebook> {
  const row = await Notebook.findByPk(notebookId);
  if (!row) throw notFound("No such notebook.");
  authorize(actor, action, { teamId: row.teamId });
  return row;
}

export async function fetchNotebooks(actor: Actor, teamId: string): Promise<NotebookRecord[]> {
  authorize(actor, "team.view", { teamId });
  const rows = await sequelize.query<{ id: string; team_id: string; title: string; created_at: Date; run_count: string }>(
    `SELECT n.id, n.team_id, n.title, n.created_at, count(r.id) AS run_count
       FROM notebooks n LEFT JOIN runs r ON r.notebook_id = n.id
      WHERE n.team_id = $1 GROUP BY n.id ORDER BY n.created_at DESC, n.id`,
    { bind: [teamId], type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    id: r.id,
    teamId: r.team_id,
    title: r.title,
    createdAt: new Date(r.created_at).toISOString(),
    runCount: Number(r.run_count),
  }));
}

export async function createNotebook(actor: Actor, input: { teamId: string; title: string }): Promise<NotebookRecord> {
  authorize(actor, "notebook.create", { teamId: input.teamId });
  return sequelize.transaction(async (transaction) => {
    const row = await Notebook.create({ teamId: input.teamId, title: input.title, createdById: actor.id }, { transaction });
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
    return { id: row.id, teamId: row.teamId, title: row.title, createdAt: row.createdAt.toISOString(), runCount: 0 };
  });
}
