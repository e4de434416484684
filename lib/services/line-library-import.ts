// CSV import into a draft: a preview that writes nothing (adds, changes old → new, unchanged, every
// rejected row located in the file), and an apply that writes exactly that preview in one transaction.
import "server-only";
import { createHash, randomUUID } from "node:crypto";
import Papa from "papaparse";
import type { Transaction } from "sequelize";
import { lineLocator, parseLineTableCsv, type LineTableError, type LineTableRow } from "@/lib/lines";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { AuditEvent, sequelize } from "@/models";
import { recordAudit } from "./audit";
import { lockDraft, selectLines } from "./line-library-access";
import {
  BULK_INSERT_LINES_SQL,
  BULK_UPDATE_LINES_SQL,
  bulkInsertPayload,
  differingFields,
  toLineTableRow,
  valuesOf,
  type LineDbRow,
} from "./line-library-rows";
import type { ImportChange, ImportPreview } from "./line-library-types";

/** Rows of one species closer than this in vacuum wavelength are taken as the same line (common practice). */
export const MATCH_TOLERANCE_NM = 0.002;
export const MAX_IMPORT_BYTES = 5 * 1024 * 1024;
const UUID_PATTERN = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export interface ImportApplyResult {
  releaseId: string;
  added: number;
  changed: number;
  unchangedCount: number;
  /** Rows left out (only with skipRejected). */
  rejected: LineTableError[];
}

interface LineKeyColumn {
  /** The text without the line_key column, line numbers unchanged. */
  text: string;
  /** line_key by the file line where its record starts. */
  keys: Map<number, string>;
  /** 1-based CSV column of line_key in the original file. */
  column: number | null;
}

/**
 * parseLineTableCsv knows only the table's own columns, so the line_key column that exports carry
 * is cut out first. Each record is written back at the line where it started (comment lines become
 * blank), so every error the parser reports still points at the right line of the original file.
 */
function splitLineKeyColumn(original: string): LineKeyColumn {
  const text = original.startsWith("\uFEFF") ? original.slice(1) : original;
  const none: LineKeyColumn = { text, keys: new Map(), column: null };
  const lineOf = lineLocator(text);
  const out: string[] = new Array(lineOf(text.length)).fill("");
  const keys = new Map<number, string>();
  let keyIndex: number | null = null;
  let sawHeader = false;
  Papa.parse<string[]>(text, {
    delimiter: ",",
    comments: "#",
    skipEmptyLines: false,
    step: (result, parser) => {
      const cells = result.data;
      if (cells.every((cell) => cell.trim() === "")) return;
      let end = result.meta.cursor;
      if (text[end - 1] === "\n") end -= 1;
      if (text[end - 1] === "\r") end -= 1;
      const innerBreaks = cells.reduce((sum, cell) => sum + (cell.match(/\n/g)?.length ?? 0), 0);
      const line = lineOf(Math.max(end - 1, 0)) - innerBreaks;
      if (!sawHeader) {
        sawHeader = true;
        const index = cells.findIndex((cell) => cell.trim() === "line_key");
        if (index === -1) {
          parser.abort();
          return;
        }
        keyIndex = index;
      } else if (
        keyIndex !== null &&
        cells[keyIndex] !== undefined &&
        cells[keyIndex].trim() !== ""
      ) {
        keys.set(line, cells[keyIndex].trim());
      }
      const kept = cells.filter((_, i) => i !== keyIndex);
      const written = Papa.unparse([kept], { newline: "\n" }).split("\n");
      written.forEach((part, i) => {
        if (line - 1 + i < out.length) out[line - 1 + i] = part;
      });
    },
  });
  return keyIndex === null ? none : { text: out.join("\n"), keys, column: keyIndex + 1 };
}

/** The draft's state in one hash: any edit (a new row, a bumped version) changes it. */
function draftStateHash(rows: readonly LineDbRow[]): string {
  const hash = createHash("sha256");
  for (const row of [...rows].sort((a, b) => (a.id < b.id ? -1 : 1)))
    hash.update(`${row.id}:${row.version};`);
  return hash.digest("hex");
}

interface PlannedImport {
  preview: ImportPreview;
  addRows: LineTableRow[];
  changeRows: { row: LineDbRow; next: LineTableRow; fields: string[] }[];
}

/** Matches a file against the draft's rows. Pure apart from the rows it is given. */
function planImport(releaseId: string, csvText: string, draftRows: LineDbRow[]): PlannedImport {
  // One line-break convention: a file re-sent by a form (CRLF) keeps its preview's fingerprint.
  csvText = csvText.replace(/\r\n?/g, "\n");
  const split = splitLineKeyColumn(csvText);
  const parsed = parseLineTableCsv(split.text);
  const errors: LineTableError[] = parsed.errors.map((error) =>
    split.column !== null && error.column !== undefined && error.column >= split.column
      ? { ...error, column: error.column + 1 }
      : error,
  );
  const reject = (line: number, field: string, message: string) =>
    errors.push(
      field === "line_key" && split.column !== null
        ? { line, column: split.column, field, message }
        : { line, field, message },
    );

  const byKey = new Map(draftRows.map((row) => [row.line_key, row]));
  const bySpecies = new Map<string, LineDbRow[]>();
  for (const row of draftRows) {
    const list = bySpecies.get(row.species) ?? [];
    list.push(row);
    bySpecies.set(row.species, list);
  }
  const nearest = (row: LineTableRow, pool: readonly { vacuumNm: number }[]) => {
    let best: number | null = null;
    pool.forEach((candidate, index) => {
      const distance = Math.abs(candidate.vacuumNm - row.vacuumNm);
      if (
        distance <= MATCH_TOLERANCE_NM &&
        (best === null || distance < Math.abs(pool[best].vacuumNm - row.vacuumNm))
      ) {
        best = index;
      }
    });
    return best;
  };

  const matchedBy = new Map<string, number>();
  const adds: ImportPreview["adds"] = [];
  const addRows: LineTableRow[] = [];
  const addsBySpecies = new Map<string, { vacuumNm: number; csvLine: number }[]>();
  const changes: ImportChange[] = [];
  const changeRows: PlannedImport["changeRows"] = [];
  let unchangedCount = 0;

  parsed.rows.forEach((row, index) => {
    const csvLine = parsed.rowLines[index];
    const key = split.keys.get(csvLine);
    let match: LineDbRow | undefined;
    if (key !== undefined) {
      if (!UUID_PATTERN.test(key)) return reject(csvLine, "line_key", `"${key}" is not a line key`);
      match = byKey.get(key.toLowerCase());
      if (!match) {
        return reject(
          csvLine,
          "line_key",
          `line_key ${key} is not a line of this draft; leave the cell blank to add the row as a new line`,
        );
      }
    } else {
      const pool = (bySpecies.get(row.species) ?? []).map((r) => ({
        vacuumNm: r.vacuum_nm,
        row: r,
      }));
      const best = nearest(row, pool);
      if (best !== null) match = pool[best].row;
    }
    if (match) {
      const earlier = matchedBy.get(match.id);
      if (earlier !== undefined) {
        return reject(
          csvLine,
          "row",
          `duplicate inside the file: line ${earlier} already describes ${match.species} ${match.air_nm ?? match.vacuum_nm} nm`,
        );
      }
      matchedBy.set(match.id, csvLine);
      const before = toLineTableRow(match);
      const fields = differingFields(before, row);
      if (fields.length === 0) unchangedCount += 1;
      else {
        changes.push({
          lineId: match.id,
          lineKey: match.line_key,
          csvLine,
          before,
          after: row,
          fields,
        });
        changeRows.push({ row: match, next: row, fields });
      }
      return;
    }
    const twins = addsBySpecies.get(row.species) ?? [];
    const twin = nearest(row, twins);
    if (twin !== null) {
      return reject(
        csvLine,
        "row",
        `duplicate inside the file: line ${twins[twin].csvLine} already adds ${row.species} within ${MATCH_TOLERANCE_NM} nm`,
      );
    }
    twins.push({ vacuumNm: row.vacuumNm, csvLine });
    addsBySpecies.set(row.species, twins);
    adds.push({ csvLine, row });
    addRows.push(row);
  });

  errors.sort((a, b) => a.line - b.line || (a.column ?? 0) - (b.column ?? 0));
  const fingerprint = createHash("sha256")
    .update(`${releaseId}\n${draftStateHash(draftRows)}\n`)
    .update(csvText)
    .digest("hex");
  return {
    preview: { releaseId, adds, changes, unchangedCount, errors, fingerprint },
    addRows,
    changeRows,
  };
}

function assertSize(csvText: string): void {
  if (typeof csvText !== "string" || csvText.trim() === "") {
    throw new AppError("validation", "The file is empty.", {
      fieldErrors: { csv: ["Choose a CSV file."] },
    });
  }
  if (Buffer.byteLength(csvText, "utf8") > MAX_IMPORT_BYTES) {
    throw new AppError(
      "too_large",
      `The file is larger than ${MAX_IMPORT_BYTES / 1024 / 1024} MB.`,
    );
  }
}

async function plan(
  actor: Actor,
  releaseId: string,
  csvText: string,
  transaction: Transaction,
  mode: "SHARE" | "UPDATE",
) {
  const draft = await lockDraft(actor, releaseId, "lines.edit", transaction, mode);
  const rows = await selectLines("l.release_id = $1", [draft.id], transaction);
  return { draft, planned: planImport(draft.id, csvText, rows) };
}

/** What applying the file would do to the draft. Writes nothing. */
export async function previewImport(
  actor: Actor,
  input: { releaseId: string; csvText: string },
): Promise<ImportPreview> {
  assertSize(input.csvText);
  return sequelize.transaction(async (transaction) => {
    const { planned } = await plan(actor, input.releaseId, input.csvText, transaction, "SHARE");
    return planned.preview;
  });
}

/**
 * Writes exactly the previewed adds and changes in one transaction, or nothing: refuses a stale
 * fingerprint (409) and a file with rejected rows unless `skipRejected` (422).
 */
export async function applyImport(
  actor: Actor,
  input: {
    releaseId: string;
    csvText: string;
    fingerprint: string;
    skipRejected?: boolean;
    reason?: string;
  },
): Promise<ImportApplyResult> {
  assertSize(input.csvText);
  const reason = input.reason?.trim() || "CSV import";
  try {
    return await sequelize.transaction(async (transaction) => {
      // UPDATE mode: no edit of the draft can slip in between this check and the writes.
      const { draft, planned } = await plan(
        actor,
        input.releaseId,
        input.csvText,
        transaction,
        "UPDATE",
      );
      const { preview } = planned;
      if (preview.fingerprint !== input.fingerprint) {
        throw new AppError(
          "conflict",
          "The draft or the file has changed since the preview. Preview the file again.",
        );
      }
      if (preview.errors.length > 0 && !input.skipRejected) {
        throw new AppError(
          "unprocessable",
          `${preview.errors.length} problem(s) in the file. Fix them, or apply only the good rows.`,
        );
      }
      if (planned.changeRows.length > 0) {
        const payload = planned.changeRows.map(({ row, next }) => ({
          id: row.id,
          ...valuesOf(next),
        }));
        await sequelize.query(BULK_UPDATE_LINES_SQL, {
          bind: [JSON.stringify(payload)],
          transaction,
        });
      }
      const keys = planned.addRows.map(() => randomUUID());
      if (planned.addRows.length > 0) {
        await sequelize.query(BULK_INSERT_LINES_SQL, {
          bind: [draft.id, bulkInsertPayload(planned.addRows, keys)],
          transaction,
        });
      }
      const common = { actorId: actor.id, teamId: draft.teamId, entity: "line", reason };
      await AuditEvent.bulkCreate(
        [
          ...planned.changeRows.map(({ row, next, fields }) => ({
            ...common,
            action: "line.update",
            entityId: row.line_key,
            before: { releaseId: draft.id, ...toLineTableRow(row) },
            after: { releaseId: draft.id, ...next, verified: false, fields, import: true },
          })),
          ...planned.addRows.map((row, i) => ({
            ...common,
            action: "line.add",
            entityId: keys[i],
            before: null,
            after: { releaseId: draft.id, ...row, verified: false, import: true },
          })),
        ],
        { transaction },
      );
      await recordAudit(
        {
          actorId: actor.id,
          teamId: draft.teamId,
          action: "line_release.import",
          entity: "line_release",
          entityId: draft.id,
          after: {
            added: planned.addRows.length,
            changed: planned.changeRows.length,
            unchanged: preview.unchangedCount,
            rejected: preview.errors.length,
            fingerprint: preview.fingerprint,
          },
          reason,
        },
        transaction,
      );
      return {
        releaseId: draft.id,
        added: planned.addRows.length,
        changed: planned.changeRows.length,
        unchangedCount: preview.unchangedCount,
        rejected: preview.errors,
      };
    });
  } catch (error) {
    // A value the file's checks accept but a column cannot hold (an integer beyond 2^31): the
    // transaction has rolled back, so say so in words instead of a bare 500.
    if (error instanceof Error && error.name === "SequelizeDatabaseError") {
      console.error("[emberline] Import rolled back:", error.message);
      throw new AppError(
        "unprocessable",
        "Writing the import failed in the database, so nothing was applied. A value is beyond what the table can hold (g_upper must be below 2,147,483,648).",
      );
    }
    throw error;
  }
}
