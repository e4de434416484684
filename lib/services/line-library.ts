// The line library's use cases: browse releases and lines, edit the team's one draft, import and
// export CSV, publish, compare releases. Every function authorises first; every write runs in one
// transaction with its audit event. Published releases are frozen here and in the database.
import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { formatLineTableCsv, parseLineTableCsv, type LineTableRow } from "@/lib/lines";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import { sendMail } from "@/lib/mail/send-mail";
import { releasePublishedMail } from "@/lib/mail/templates";
import Papa from "papaparse";
import { Membership, User, sequelize } from "@/models";
import { checkedLineReason, checkedReleaseNotes } from "@/lib/validation/line-schemas";
import { recordAudit } from "./audit";
import {
  RELEASE_FROM,
  RELEASE_SELECT,
  VALUE_COLUMNS,
  TABULATED_NM,
  differingFields,
  lineQuerySql,
  recordToInput,
  toLineRecord,
  toLineTableRow,
  toReleaseSummary,
  valuesOf,
  type LineDbRow,
  type ReleaseDbRow,
} from "./line-library-rows";
import { lockDraft, selectLines, selectRelease, visibleRelease } from "./line-library-access";
import type {
  LineHistoryEntry,
  LineInput,
  LinePage,
  LineQuery,
  LineRecord,
  ReleaseDiff,
  ReleaseSummary,
} from "./line-library-types";

export { previewImport, applyImport } from "./line-library-import";
export type { ImportApplyResult } from "./line-library-import";

export const MAX_PAGE_SIZE = 500;
const DEFAULT_PAGE_SIZE = 100;
export const CONFLICT_MESSAGE =
  "Someone else changed this line first. Reload it to see their change, then make yours again.";

// ---------------------------------------------------------------------------------------------
// Reading

export async function fetchReleases(actor: Actor, teamId: string): Promise<ReleaseSummary[]> {
  authorize(actor, "lines.view", { teamId });
  const rows = await sequelize.query<ReleaseDbRow>(
    `SELECT ${RELEASE_SELECT} FROM ${RELEASE_FROM} WHERE r.team_id = $1
      ORDER BY (r.status = 'draft') DESC, r.number DESC`,
    { bind: [teamId], type: QueryTypes.SELECT },
  );
  return rows.map(toReleaseSummary);
}

export async function fetchRelease(actor: Actor, releaseId: string): Promise<ReleaseSummary> {
  return toReleaseSummary(await visibleRelease(actor, releaseId));
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

// ---------------------------------------------------------------------------------------------
// The draft

/** Returns the team's draft, or starts one from the newest published release (rows copied, keys kept). */
export async function openDraft(actor: Actor, teamId: string): Promise<ReleaseSummary> {
  authorize(actor, "lines.edit", { teamId });
  const existing = await selectRelease("r.team_id = $1 AND r.status = 'draft'", [teamId]);
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
    return toReleaseSummary((await selectRelease("r.id = $1", [id]))!);
  } catch (error) {
    // Two leads opening the draft at once: the one-draft index refuses the second; both get the first.
    if (error instanceof Error && error.name === "SequelizeUniqueConstraintError") {
      const draft = await selectRelease("r.team_id = $1 AND r.status = 'draft'", [teamId]);
      if (draft) return toReleaseSummary(draft);
    }
    throw error;
  }
}

const FIELD_OF_COLUMN: Record<string, string> = {
  species: "species",
  air_nm: "airNm",
  vacuum_nm: "vacuumNm",
  uncertainty_nm: "uncertaintyNm",
  intensity_flame: "intensities.flame",
  intensity_arc: "intensities.arc",
  intensity_spark: "intensities.spark",
  intensity_plasma: "intensities.plasma",
  intensity_lamp: "intensities.lamp",
  lower_ev: "lowerEv",
  upper_ev: "upperEv",
  g_upper: "gUpper",
  a_per_s: "aPerS",
  flags: "flags",
  band_extent_nm: "band.extentNm",
  band_degrades_to: "band.degradesTo",
  source: "source",
  note: "note",
};

/**
 * Checks a typed line exactly as an imported CSV row is checked (one rule set), by writing it as a
 * one-row CSV and reading it back. Throws a validation error with field errors in LineInput's names.
 */
export function validateLineInput(input: LineInput): LineTableRow {
  const csv = formatLineTableCsv([{ ...input, element: "", ionStage: null, verified: false }], {
    describeColumns: false,
  });
  const parsed = parseLineTableCsv(csv);
  if (parsed.rows.length === 1 && parsed.errors.length === 0) return parsed.rows[0];
  const fieldErrors: Record<string, string[]> = {};
  for (const error of parsed.errors)
    (fieldErrors[FIELD_OF_COLUMN[error.field] ?? "_"] ??= []).push(error.message);
  throw new AppError("validation", "Some values of the line are not right.", { fieldErrors });
}

/** Another live line of the same species within 0.002 nm (vacuum) in the draft, if any. */
async function twinInDraft(
  releaseId: string,
  row: LineTableRow,
  exceptId: string | null,
  transaction: Transaction,
): Promise<LineDbRow | null> {
  const [twin] = await selectLines(
    `l.release_id = $1 AND l.species = $2 AND l.vacuum_nm BETWEEN $3 - 0.002 AND $3 + 0.002
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
        `${twin.species} ${twin.air_nm ?? twin.vacuum_nm} nm is already in the draft (within 0.002 nm).`,
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

/**
 * Corrects a draft line. `line` holds the fields to change; a changed air wavelength without a
 * vacuum one (or the reverse) recomputes the other. Values changed → the line is unverified again.
 */
export async function updateLine(
  actor: Actor,
  input: { lineId: string; version: number; line: Partial<LineInput>; reason: string },
): Promise<LineRecord> {
  const reason = checkedLineReason(input.reason);
  await sequelize.transaction(async (transaction) => {
    const { row, teamId } = await lockLineForEdit(actor, input.lineId, input.version, transaction);
    const current = toLineRecord(row);
    const merged: LineInput = { ...recordToInput(current), ...input.line };
    if ("airNm" in input.line && !("vacuumNm" in input.line))
      merged.vacuumNm = null as unknown as number;
    if ("vacuumNm" in input.line && !("airNm" in input.line)) merged.airNm = null;
    const next = validateLineInput(merged);
    const before = toLineTableRow(row);
    const fields = differingFields(before, next);
    if (fields.length === 0) return;
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
    await recordAudit(
      {
        actorId: actor.id,
        teamId,
        action: "line.update",
        entity: "line",
        entityId: row.line_key,
        before: { releaseId: row.release_id, ...before },
        after: { releaseId: row.release_id, ...next, verified: false, fields },
        reason,
      },
      transaction,
    );
  });
  return reloadLine(input.lineId);
}

async function setLineState(
  actor: Actor,
  input: { lineId: string; version: number; reason: string },
  action: "line.retire" | "line.restore" | "line.verify",
): Promise<LineRecord> {
  const reason = checkedLineReason(input.reason);
  await sequelize.transaction(async (transaction) => {
    const { row, teamId } = await lockLineForEdit(actor, input.lineId, input.version, transaction);
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
    await recordAudit(
      {
        actorId: actor.id,
        teamId,
        action,
        entity: "line",
        entityId: row.line_key,
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
        reason,
      },
      transaction,
    );
  });
  return reloadLine(input.lineId);
}

/** Marks a draft line retired: it stays visible in the draft and is left out when publishing. */
export function retireLine(
  actor: Actor,
  input: { lineId: string; version: number; reason: string },
) {
  return setLineState(actor, input, "line.retire");
}

export function restoreLine(
  actor: Actor,
  input: { lineId: string; version: number; reason: string },
) {
  return setLineState(actor, input, "line.restore");
}

/** Records that a lab lead checked the line against its source (who and when). */
export function verifyLine(
  actor: Actor,
  input: { lineId: string; version: number; reason: string },
) {
  return setLineState(actor, input, "line.verify");
}

// ---------------------------------------------------------------------------------------------
// Publishing, comparing, exporting

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
    comments: [
      `Emberline line table, ${label}${release.published_at ? `, published ${new Date(release.published_at).toISOString()}` : ""}.`,
      "line_key identifies each line across releases; keep it when editing this file for re-import.",
      "A value whose source says it was typed from memory stays unverified (verified=false) until a lab lead checks it against the source.",
    ],
  });
  return {
    filename: `line-table-${release.number ?? "draft"}.csv`,
    csv: withLineKeyColumn(
      csv,
      rows.map((r) => r.line_key),
    ),
  };
}

/** Prefixes the header and every data row of a formatted table with the line_key column. */
function withLineKeyColumn(csv: string, keys: string[]): string {
  const comments = csv.split("\n").filter((line) => line.startsWith("#"));
  const records = Papa.parse<string[]>(csv, { comments: "#", skipEmptyLines: true }).data;
  const [header, ...body] = records;
  const table = Papa.unparse(
    { fields: ["line_key", ...header], data: body.map((cells, i) => [keys[i], ...cells]) },
    { newline: "\n", quotes: false },
  );
  return [...comments, table.replace(/\n$/, "")].join("\n") + "\n";
}
