// CSV import into a draft: a preview that writes nothing (adds, changes old → new, unchanged, every
// rejected row located in the file), and an apply that writes exactly that preview in one transaction.
import "server-only";
import { randomUUID } from "node:crypto";
import type { Transaction } from "sequelize";
import type { LineTableError } from "@/lib/lines";
import { AppError } from "@/lib/errors";
import { runHeavyTask } from "@/lib/workers/heavy-pool";
import type { Actor } from "@/lib/auth/actor";
import { AuditEvent, sequelize } from "@/models";
import { recordAudit } from "./audit";
import { assertCsvWithinLimits, type CsvLimits } from "./line-csv-limits";
import { lockDraft, selectLines } from "./line-library-access";
import {
  BULK_INSERT_LINES_SQL,
  BULK_UPDATE_LINES_SQL,
  bulkInsertPayload,
  toLineTableRow,
  valuesOf,
} from "./line-library-rows";
import type { ImportPreview } from "./line-library-types";
import { countOf } from "@/lib/text/count-of";
import { MAX_IMPORT_BYTES, MAX_IMPORT_LABEL } from "@/lib/validation/line-schemas";

/**
 * Rows one import takes. A 100,000-row file held the draft's lock for minutes; a bounded file keeps the
 * preview and the apply to seconds, and a larger table goes in as several files one after the other.
 */
export const MAX_IMPORT_ROWS = 20_000;

export interface ImportApplyResult {
  releaseId: string;
  added: number;
  changed: number;
  unchangedCount: number;
  /** Rows left out (only with skipRejected). */
  rejected: LineTableError[];
}

const IMPORT_LIMITS: CsvLimits = {
  maxBytes: MAX_IMPORT_BYTES,
  maxRows: MAX_IMPORT_ROWS,
  empty: () =>
    new AppError("validation", "The file is empty.", {
      fieldErrors: { csv: ["Choose a CSV file."] },
    }),
  tooLarge: () => new AppError("too_large", `The file is larger than ${MAX_IMPORT_LABEL}.`),
  tooManyRows: (rows, limit) =>
    new AppError(
      "too_large",
      `The file has ${rows} rows; one import takes at most ${limit}. ` +
        `Split it into files of at most ${limit} rows and import them one after the other.`,
      { fieldErrors: { csv: [`At most ${limit} rows per file.`] } },
    ),
};

async function plan(
  actor: Actor,
  releaseId: string,
  csvText: string,
  transaction: Transaction,
  mode: "SHARE" | "UPDATE",
) {
  const draft = await lockDraft(actor, releaseId, "lines.edit", transaction, mode);
  const rows = await selectLines("l.release_id = $1", [draft.id], transaction);
  // The parse and the matching run in the worker pool: a large file no longer stalls other requests.
  const planned = await runHeavyTask({
    kind: "plan-line-import",
    releaseId: draft.id,
    csvText,
    draftRows: rows,
  });
  return { draft, planned };
}

/** What applying the file would do to the draft. Writes nothing. */
export async function previewImport(
  actor: Actor,
  input: { releaseId: string; csvText: string },
): Promise<ImportPreview> {
  assertCsvWithinLimits(input.csvText, IMPORT_LIMITS);
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
  assertCsvWithinLimits(input.csvText, IMPORT_LIMITS);
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
          `The file has ${countOf(preview.errors.length, "problem")}. Fix them, or apply only the good rows.`,
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
