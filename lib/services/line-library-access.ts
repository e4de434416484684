// Loading and locking helpers shared by the line-library services: releases the actor may see,
// the draft locked for a write, line rows by SQL condition.
import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import { sequelize } from "@/models";
import {
  LINE_FROM,
  LINE_SELECT,
  RELEASE_FROM,
  RELEASE_LINE_COUNT,
  RELEASE_SELECT,
  type LineDbRow,
  type ReleaseDbRow,
  type ReleaseSummaryDbRow,
} from "./line-library-rows";

/** The first release matching `where`, with the given columns. */
async function firstRelease<Row extends object>(
  columns: string,
  where: string,
  bind: unknown[],
  transaction?: Transaction,
): Promise<Row | null> {
  const rows = await sequelize.query<Row>(`SELECT ${columns} FROM ${RELEASE_FROM} WHERE ${where}`, {
    bind,
    type: QueryTypes.SELECT,
    transaction,
  });
  return rows[0] ?? null;
}

export async function selectRelease(
  where: string,
  bind: unknown[],
  transaction?: Transaction,
): Promise<ReleaseDbRow | null> {
  return firstRelease<ReleaseDbRow>(RELEASE_SELECT, where, bind, transaction);
}

/** The first release matching `where`, with its number of lines (see `RELEASE_LINE_COUNT`). */
export async function selectReleaseSummary(
  where: string,
  bind: unknown[],
): Promise<ReleaseSummaryDbRow | null> {
  return firstRelease<ReleaseSummaryDbRow>(`${RELEASE_SELECT}, ${RELEASE_LINE_COUNT}`, where, bind);
}

/** `release` when the actor may see it (404 when there is none or it is another team's). */
export function seenBy<Row extends ReleaseDbRow>(actor: Actor, release: Row | null): Row {
  if (!release) throw notFound("No such release.");
  authorize(actor, "lines.view", { teamId: release.team_id });
  return release;
}

/** A release the actor may see (404 for another team's, whatever the reason). */
export async function visibleRelease(
  actor: Actor,
  releaseId: string,
  transaction?: Transaction,
): Promise<ReleaseDbRow> {
  return seenBy(actor, await selectRelease("r.id = $1", [releaseId], transaction));
}

/**
 * Locks a release for a write into it and checks that it is the actor's team's draft. Lines are
 * written only after their release is locked, the order publishDraft follows too (no deadlock).
 */
export async function lockDraft(
  actor: Actor,
  releaseId: string,
  action: "lines.edit" | "lines.publish",
  transaction: Transaction,
  mode: "SHARE" | "UPDATE" = "SHARE",
): Promise<{ id: string; teamId: string; number: number | null }> {
  const rows = await sequelize.query<{
    id: string;
    team_id: string;
    status: string;
    number: number | null;
  }>(`SELECT id, team_id, status, number FROM line_releases WHERE id = $1 FOR ${mode}`, {
    bind: [releaseId],
    type: QueryTypes.SELECT,
    transaction,
  });
  const release = rows[0];
  if (!release) throw notFound("No such release.");
  authorize(actor, action, { teamId: release.team_id });
  if (release.status !== "draft") {
    throw new AppError(
      "conflict",
      `Release ${release.number} is published and never changes. Open the draft to make changes.`,
    );
  }
  return { id: release.id, teamId: release.team_id, number: release.number };
}

export async function selectLines(
  where: string,
  bind: unknown[],
  transaction?: Transaction,
  tail = "",
): Promise<LineDbRow[]> {
  return sequelize.query<LineDbRow>(
    `SELECT ${LINE_SELECT} FROM ${LINE_FROM} WHERE ${where} ${tail}`,
    {
      bind,
      type: QueryTypes.SELECT,
      transaction,
    },
  );
}
