// Editing the team's one draft of the line table: open it, add, correct, retire, restore and verify
// lines. Every write runs in one transaction with its audit event, carries a reason, and (for an
// existing line) the version the editor saw. CSV import into the draft is line-library-import.ts.
import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import {
  LINE_TABLE_COLUMNS,
  lineTableCells,
  readLineTableRow,
  type LineTableRow,
} from "@/lib/lines";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import { sequelize } from "@/models";
import { checkedLineReason } from "@/lib/validation/line-schemas";
import { recordAudit } from "./audit";
import {
  VALUE_COLUMNS,
  differingFields,
  recordToInput,
  toLineRecord,
  toLineTableRow,
  toReleaseSummary,
  valuesOf,
  type LineDbRow,
} from "./line-library-rows";
import { lockDraft, selectLines, selectReleaseSummary } from "./line-library-access";
import type { LineInput, LineRecord, ReleaseSummary } from "./line-library-types";
import { MATCH_TOLERANCE_NM } from "./line-import-plan";

const CONFLICT_MESSAGE =
  "Someone else changed this line first. Reload it to see their change, then make yours again.";

/** Returns the team's draft, or starts one from the newest published release (rows copied, keys kept). */
export async function openDraft(actor: Actor, teamId: string): Promise<ReleaseSummary> {
  authorize(actor, "lines.edit", { teamId });
  const existing = await selectReleaseSummary("r.team_id = $1 AND r.status = 'draft'", [teamId]);
  if (existing) return toReleaseSummary(existing);
  try {
    const id = await sequelize.transaction(async (transaction) => {
      const [base] = await sequelize.query<{ id: string; number: number }>(
        `SELECT id, number FROM line_releases WHERE team_id = $1 AND status = 'published' ORDER BY number DESC LIMIT 1`,
        { bind: [teamId], type: QueryTypes.SELECT, transaction },
      );
      const [created] = await sequelize.query<{ id: string }>(
        `INSERT INTO line_releases (team_id, based_on_release_id, created_by_id) VALUES ($1, $2, $3) RETURNING id`,
        { bind: [teamId, base?.id ?? null, actor.id], type: QueryTypes.SELECT, transaction },
      );
      if (base) {
        const columns = [
          "line_key",
          ...VALUE_COLUMNS,
          "verified_by_id",
          "verified_at",
          "verified_citation",
        ].join(", ");
        await sequelize.query(
          `INSERT INTO lines (release_id, ${columns}) SELECT $1, ${columns} FROM lines WHERE release_id = $2`,
          { bind: [created.id, base.id], transaction },
        );
      }
      await recordAudit(
        {
          actorId: actor.id,
          teamId,
          action: "line_release.open_draft",
          entity: "line_release",
          entityId: created.id,
          after: { basedOnReleaseId: base?.id ?? null, basedOnNumber: base?.number ?? null },
        },
        transaction,
      );
      return created.id;
    });
    return toReleaseSummary((await selectReleaseSummary("r.id = $1", [id]))!);
  } catch (error) {
    // Two leads opening the draft at once: the one-draft index refuses the second; both get the first.
    if (error instanceof Error && error.name === "SequelizeUniqueConstraintError") {
      const draft = await selectReleaseSummary("r.team_id = $1 AND r.status = 'draft'", [teamId]);
      if (draft) return toReleaseSummary(draft);
    }
    throw error;
  }
}

/** A column's field errors go under the typed line's field ("air_nm" → "airNm"). */
const FIELD_OF_COLUMN = new Map(LINE_TABLE_COLUMNS.map((column) => [column.name, column.field]));

/**
 * Checks a typed line exactly as an imported CSV row is checked (one rule set, readLineTableRow, on
 * the cells an export would write for it). Throws a validation error with field errors in LineInput's
 * names.
 */
export function validateLineInput(input: LineInput): LineTableRow {
  const { row, errors } = readLineTableRow(
    lineTableCells({ ...input, element: "", ionStage: null, verified: false }),
  );
  if (row) return row;
  const fieldErrors: Record<string, string[]> = {};
  for (const error of errors)
    (fieldErrors[FIELD_OF_COLUMN.get(error.field) ?? "_"] ??= []).push(error.message);
  throw new AppError("validation", "Some values of the line are not right.", { fieldErrors });
}

/** Another live line of the same species within MATCH_TOLERANCE_NM (vacuum) in the draft, if any. */
async function twinInDraft(
  releaseId: string,
  row: LineTableRow,
  exceptId: string | null,
  transaction: Transaction,
): Promise<LineDbRow | null> {
  const [twin] = await selectLines(
    `l.release_id = $1 AND l.species = $2 AND l.vacuum_nm BETWEEN $3 - ${MATCH_TOLERANCE_NM} AND $3 + ${MATCH_TOLERANCE_NM}
       AND NOT l.retired AND ($4::uuid IS NULL OR l.id <> $4)`,
    [releaseId, row.species, row.vacuumNm, exceptId],
    transaction,
  );
  return twin ?? null;
}

function duplicateError(twin: LineDbRow): AppError {
  return new AppError("validation", "The draft already has this line.", {
    fieldErrors: {
      vacuumNm: [
        `${twin.species} ${twin.air_nm ?? twin.vacuum_nm} nm is already in the draft (within ${MATCH_TOLERANCE_NM} nm).`,
      ],
    },
  });
}

export async function addLine(
  actor: Actor,
  input: { releaseId: string; line: LineInput; reason: string },
): Promise<LineRecord> {
  const reason = checkedLineReason(input.reason);
  const id = await sequelize.transaction(async (transaction) => {
    const draft = await lockDraft(actor, input.releaseId, "lines.edit", transaction);
    const row = validateLineInput(input.line);
    const twin = await twinInDraft(draft.id, row, null, transaction);
    if (twin) throw duplicateError(twin);
    const values = valuesOf(row);
    const [created] = await sequelize.query<{ id: string; line_key: string }>(
      `INSERT INTO lines (release_id, ${VALUE_COLUMNS.join(", ")})
       VALUES ($1, ${VALUE_COLUMNS.map((_, i) => `$${i + 2}`).join(", ")}) RETURNING id, line_key`,
      {
        bind: [draft.id, ...VALUE_COLUMNS.map((c) => values[c])],
        type: QueryTypes.SELECT,
        transaction,
      },
    );
    await recordAudit(
      {
        actorId: actor.id,
        teamId: draft.teamId,
        action: "line.add",
        entity: "line",
        entityId: created.line_key,
        after: { releaseId: draft.id, ...row },
        reason,
      },
      transaction,
    );
    return created.id;
  });
  return toLineRecord((await selectLines("l.id = $1", [id]))[0]);
}

/** Locks a draft line for an edit, checking team, role, draft status and the caller's version. */
async function lockLineForEdit(
  actor: Actor,
  lineId: string,
  version: number,
  transaction: Transaction,
): Promise<{ row: LineDbRow; teamId: string }> {
  const [located] = await sequelize.query<{ release_id: string }>(
    `SELECT release_id FROM lines WHERE id = $1`,
    {
      bind: [lineId],
      type: QueryTypes.SELECT,
      transaction,
    },
  );
  if (!located) throw notFound("No such line.");
  const draft = await lockDraft(actor, located.release_id, "lines.edit", transaction);
  const [row] = await selectLines("l.id = $1", [lineId], transaction, "FOR UPDATE OF l");
  if (!row) throw notFound("No such line.");
  if (row.version !== version) throw new AppError("conflict", CONFLICT_MESSAGE);
  return { row, teamId: draft.teamId };
}

async function reloadLine(lineId: string): Promise<LineRecord> {
  return toLineRecord((await selectLines("l.id = $1", [lineId]))[0]);
}

/** Which draft line, the version the editor saw, and why. */
type LineEditInput = { lineId: string; version: number; reason: string };

/**
 * One edit of a draft line: the reason checked, the line locked at the editor's version, the change
 * and its audit event in one transaction, then the line as it now stands. `change` writes and returns
 * the event's before and after, or null when there is nothing to record.
 */
async function editDraftLine(
  actor: Actor,
  input: LineEditInput,
  action: "line.update" | "line.retire" | "line.restore" | "line.verify",
  change: (
    row: LineDbRow,
    transaction: Transaction,
  ) => Promise<{ before: Record<string, unknown>; after: Record<string, unknown> } | null>,
): Promise<LineRecord> {
  const reason = checkedLineReason(input.reason);
  await sequelize.transaction(async (transaction) => {
    const { row, teamId } = await lockLineForEdit(actor, input.lineId, input.version, transaction);
    const event = await change(row, transaction);
    if (!event) return;
    await recordAudit(
      {
        actorId: actor.id,
        teamId,
        action,
        entity: "line",
        entityId: row.line_key,
        before: event.before,
        after: event.after,
        reason,
      },
      transaction,
    );
  });
  return reloadLine(input.lineId);
}

/**
 * Corrects a draft line. `line` holds the fields to change; a changed air wavelength without a
 * vacuum one (or the reverse) recomputes the other. Values changed → the line is unverified again.
 */
export async function updateLine(
  actor: Actor,
  input: LineEditInput & { line: Partial<LineInput> },
): Promise<LineRecord> {
  return editDraftLine(actor, input, "line.update", async (row, transaction) => {
    const current = toLineRecord(row);
    const merged: LineInput = { ...recordToInput(current), ...input.line };
    if ("airNm" in input.line && !("vacuumNm" in input.line))
      merged.vacuumNm = null as unknown as number;
    if ("vacuumNm" in input.line && !("airNm" in input.line)) merged.airNm = null;
    const next = validateLineInput(merged);
    const before = toLineTableRow(row);
    const fields = differingFields(before, next);
    if (fields.length === 0) return null;
    const twin = await twinInDraft(row.release_id, next, row.id, transaction);
    if (twin) throw duplicateError(twin);
    const values = valuesOf(next);
    await sequelize.query(
      `UPDATE lines SET ${VALUE_COLUMNS.map((c, i) => `${c} = $${i + 2}`).join(", ")},
         verified_by_id = NULL, verified_at = NULL, verified_citation = NULL, version = version + 1,
         updated_at = now()
       WHERE id = $1`,
      { bind: [row.id, ...VALUE_COLUMNS.map((c) => values[c])], transaction },
    );
    return {
      before: { releaseId: row.release_id, ...before },
      after: { releaseId: row.release_id, ...next, verified: false, fields },
    };
  });
}

function setLineState(
  actor: Actor,
  input: LineEditInput,
  action: "line.retire" | "line.restore" | "line.verify",
): Promise<LineRecord> {
  return editDraftLine(actor, input, action, async (row, transaction) => {
    const set =
      action === "line.verify"
        ? "verified_by_id = $2, verified_at = now(), verified_citation = NULL"
        : `retired = ${action === "line.retire" ? "true" : "false"}`;
    if (action === "line.restore") {
      const twin = await twinInDraft(row.release_id, toLineTableRow(row), row.id, transaction);
      if (twin) throw duplicateError(twin);
    }
    await sequelize.query(
      `UPDATE lines SET ${set}, version = version + 1, updated_at = now() WHERE id = $1`,
      {
        bind: action === "line.verify" ? [row.id, actor.id] : [row.id],
        transaction,
      },
    );
    return {
      before: {
        releaseId: row.release_id,
        retired: row.retired,
        verified: row.verified_at !== null,
      },
      after: {
        releaseId: row.release_id,
        retired: action === "line.verify" ? row.retired : action === "line.retire",
        verified: action === "line.verify" ? true : row.verified_at !== null,
      },
    };
  });
}

/** Marks a draft line retired: it stays visible in the draft and is left out when publishing. */
export function retireLine(actor: Actor, input: LineEditInput) {
  return setLineState(actor, input, "line.retire");
}

export function restoreLine(actor: Actor, input: LineEditInput) {
  return setLineState(actor, input, "line.restore");
}

/** Records that a lab lead checked the line against its source (who and when). */
export function verifyLine(actor: Actor, input: LineEditInput) {
  return setLineState(actor, input, "line.verify");
}
