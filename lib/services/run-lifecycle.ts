// Where a run is in its life, and who may change it now. Every service that changes a run (notes,
// overrides, submission, review, amendment) asks here first, so the rules live in one place:
// a draft or returned run is changed by its author; a submitted run waits for its reviewer; a
// signed run is never changed (an amendment makes a new version).
import "server-only";
import type { Transaction } from "sequelize";
import { AppError, forbidden, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize, type TeamAction } from "@/lib/auth/policy";
import { Run } from "@/models";
import { RUN_RECORD_ATTRIBUTES } from "./run-records";
import type { RunStatus } from "@/lib/runs/types";

export const STATUS_LABEL: Record<RunStatus, string> = {
  draft: "Draft",
  submitted: "Awaiting review",
  returned: "Returned for revision",
  signed: "Signed",
};

/** A run the actor may see (or take `action` on); another team's run is not found. */
export async function loadRun(
  actor: Actor,
  runId: string,
  action: TeamAction = "team.view",
  transaction?: Transaction,
  {
    withMatches = false,
    attributes,
  }: {
    withMatches?: boolean;
    /** Only these columns (a change of the workflow's columns needs none of the analysis). */
    attributes?: readonly (keyof Run & string)[];
  } = {},
): Promise<Run> {
  // Every candidate line of every peak is kept with the run (megabytes against a large table); only
  // the peaks CSV and an amendment's copy read them, so the rest never load them.
  const row = await Run.findByPk(runId, {
    attributes: attributes ? [...attributes] : withMatches ? undefined : RUN_RECORD_ATTRIBUTES,
    transaction,
    lock: transaction ? transaction.LOCK.UPDATE : undefined,
  });
  if (!row) throw notFound("No such run.");
  authorize(actor, action, { teamId: row.teamId });
  return row;
}

/** Why the run cannot be changed now, in the chemist's words; null when it can. */
export function lockReason(run: Pick<Run, "status">): string | null {
  switch (run.status) {
    case "signed":
      return "This run is signed and is never edited: amend it to make a new version.";
    case "submitted":
      return "This run is waiting for review: it can be changed again once the reviewer returns it.";
    default:
      return null;
  }
}

/** Throws 409 when the run is locked and 403 when the actor is not its author. */
export function assertAuthorMayEdit(actor: Actor, run: Pick<Run, "status" | "createdById">): void {
  const locked = lockReason(run);
  if (locked) throw new AppError("conflict", locked);
  if (run.createdById !== actor.id) throw forbidden("Only the run's author changes it.");
}

/** May the actor change the run now? For showing or hiding the page's editing controls. */
export function authorMayEdit(actor: Actor, run: Pick<Run, "status" | "createdById">): boolean {
  return lockReason(run) === null && run.createdById === actor.id;
}
