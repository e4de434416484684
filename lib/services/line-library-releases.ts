// Releases of the line table: publish the draft as the next numbered release (and tell the team),
// compare two releases, export one as CSV. Published releases are frozen here and in the database.
import "server-only";
import { QueryTypes } from "sequelize";
import { formatLineTableCsv } from "@/lib/lines";
import { notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import { sendMail } from "@/lib/mail/send-mail";
import { releasePublishedMail } from "@/lib/mail/templates";
import { Membership, User, sequelize } from "@/models";
import { checkedReleaseNotes } from "@/lib/validation/line-schemas";
import { recordAudit } from "./audit";
import { TABULATED_NM, differingFields, toLineRecord, toLineTableRow } from "./line-library-rows";
import { lockDraft, selectLines, visibleRelease } from "./line-library-access";
import { fetchRelease } from "./line-library-reads";
import type { ReleaseDiff, ReleaseSummary } from "./line-library-types";

/** Freezes the draft as release previous + 1 (retired lines dropped) and e-mails the team. */
export async function publishDraft(
  actor: Actor,
  input: { releaseId: string; notes: string },
): Promise<ReleaseSummary> {
  const notes = checkedReleaseNotes(input.notes);
  const published = await sequelize.transaction(async (transaction) => {
    const draft = await lockDraft(actor, input.releaseId, "lines.publish", transaction, "UPDATE");
    const [{ next }] = await sequelize.query<{ next: number }>(
      `SELECT coalesce(max(number), 0) + 1 AS next FROM line_releases WHERE team_id = $1`,
      { bind: [draft.teamId], type: QueryTypes.SELECT, transaction },
    );
    const retired = await sequelize.query<{ line_key: string }>(
      `DELETE FROM lines WHERE release_id = $1 AND retired RETURNING line_key`,
      { bind: [draft.id], type: QueryTypes.SELECT, transaction },
    );
    await sequelize.query(
      `UPDATE line_releases SET status = 'published', number = $2, notes = $3, published_by_id = $4,
         published_at = now(), version = version + 1, updated_at = now() WHERE id = $1`,
      { bind: [draft.id, next, notes, actor.id], transaction },
    );
    const [{ count }] = await sequelize.query<{ count: string }>(
      `SELECT count(*) AS count FROM lines WHERE release_id = $1`,
      { bind: [draft.id], type: QueryTypes.SELECT, transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        teamId: draft.teamId,
        action: "line_release.publish",
        entity: "line_release",
        entityId: draft.id,
        before: { status: "draft" },
        after: {
          status: "published",
          number: next,
          lineCount: Number(count),
          retiredDropped: retired.length,
        },
        reason: notes,
      },
      transaction,
    );
    return { teamId: draft.teamId, number: next, lineCount: Number(count) };
  });
  await announceRelease(actor, input.releaseId, published, notes);
  return fetchRelease(actor, input.releaseId);
}

/** One message to every member of the team; a mail failure is logged, the release stands. */
async function announceRelease(
  actor: Actor,
  releaseId: string,
  published: { teamId: string; number: number; lineCount: number },
  notes: string,
): Promise<void> {
  const members = await Membership.findAll({
    where: { teamId: published.teamId },
    include: [{ model: User, as: "user", attributes: ["email"] }],
  });
  const to = members.map((m) => (m.get("user") as User).email);
  if (to.length === 0) return;
  const teamName =
    actor.memberships.find((m) => m.teamId === published.teamId)?.teamName ?? "your team";
  try {
    await sendMail({
      to,
      ...releasePublishedMail({
        teamName,
        number: published.number,
        lineCount: published.lineCount,
        notes,
        publisherName: actor.name,
        releaseId,
      }),
    });
  } catch (error) {
    console.error("[emberline] The release mail could not be sent:", error);
  }
}

export async function diffReleases(
  actor: Actor,
  input: { teamId: string; fromId: string; toId: string },
): Promise<ReleaseDiff> {
  authorize(actor, "lines.view", { teamId: input.teamId });
  const [from, to] = await Promise.all([
    visibleRelease(actor, input.fromId),
    visibleRelease(actor, input.toId),
  ]);
  if (from.team_id !== input.teamId || to.team_id !== input.teamId)
    throw notFound("No such release.");
  const [fromRows, toRows] = await Promise.all([
    selectLines("l.release_id = $1", [from.id], undefined, "ORDER BY l.vacuum_nm"),
    selectLines("l.release_id = $1", [to.id], undefined, "ORDER BY l.vacuum_nm"),
  ]);
  const before = new Map(fromRows.map((row) => [row.line_key, row]));
  const after = new Map(toRows.map((row) => [row.line_key, row]));
  const diff: ReleaseDiff = {
    from: { id: from.id, number: from.number, status: from.status },
    to: { id: to.id, number: to.number, status: to.status },
    added: [],
    removed: [],
    changed: [],
  };
  for (const row of toRows) {
    const old = before.get(row.line_key);
    if (!old) {
      diff.added.push(toLineRecord(row));
      continue;
    }
    const fields = differingFields(toLineTableRow(old), toLineTableRow(row));
    if ((old.verified_at === null) !== (row.verified_at === null)) fields.push("verified");
    if (old.retired !== row.retired) fields.push("retired");
    if (fields.length)
      diff.changed.push({ before: toLineRecord(old), after: toLineRecord(row), fields });
  }
  for (const row of fromRows) if (!after.has(row.line_key)) diff.removed.push(toLineRecord(row));
  return diff;
}

/** The release as Emberline CSV with a line_key column first, and a file name for the download. */
export async function exportReleaseCsv(
  actor: Actor,
  releaseId: string,
): Promise<{ filename: string; csv: string }> {
  const release = await visibleRelease(actor, releaseId);
  const rows = await selectLines(
    "l.release_id = $1",
    [release.id],
    undefined,
    `ORDER BY ${TABULATED_NM}, l.species, l.id`,
  );
  const label = release.number === null ? "draft" : `release ${release.number}`;
  const csv = formatLineTableCsv(rows.map(toLineTableRow), {
    lineKeys: rows.map((r) => r.line_key),
    comments: [
      `Emberline line table, ${label}${release.published_at ? `, published ${new Date(release.published_at).toISOString()}` : ""}.`,
      "line_key identifies each line across releases; keep it when editing this file for re-import.",
      "A value whose source says it was typed from memory stays unverified (verified=false) until a lab lead checks it against the source.",
    ],
  });
  return { filename: `line-table-${release.number ?? "draft"}.csv`, csv };
}
