// Checking the draft against a reference file: a preview that writes nothing (rows that agree within the
// combined uncertainty, disagreements, lines on one side only), and an apply that marks the agreeing rows
// verified with their reference's citation and carries out the lab lead's decisions, in one transaction
// with one audit event.
import "server-only";
import { createHash } from "node:crypto";
import type { Transaction } from "sequelize";
import {
  compareWithReference,
  parseReferenceCsv,
  type ReferenceFileLine,
  type ReferencePairing,
  type WavelengthMedium,
} from "@/lib/lines";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { sequelize } from "@/models";
import { MAX_REFERENCE_BYTES, MAX_REFERENCE_LABEL } from "@/lib/validation/line-schemas";
import { recordAudit } from "./audit";
import { lockDraft, selectLines } from "./line-library-access";
import { assertCsvWithinLimits, type CsvLimits } from "./line-csv-limits";
import { validateLineInput } from "./line-library-draft";
import {
  BULK_UPDATE_LINES_SQL,
  recordToInput,
  toLineRecord,
  valuesOf,
  type LineDbRow,
} from "./line-library-rows";
import type {
  ReferenceCheckPair,
  ReferenceCheckPreview,
  ReferenceCheckResult,
  ReferenceDecision,
} from "./line-library-types";

/** Reference lines one check takes (counted before parsing), as many as one import. */
const MAX_REFERENCE_ROWS = 20_000;
/** Agreement is |Δ| ≤ k·u_c; k = 1 is "within the combined uncertainty" as the check promises. */
const COVERAGE_FACTOR = 1;
/** Published lamp wavelengths differ by 0.001–0.002 nm between conventions (common practice). */
const MIN_TOLERANCE_NM = 0.002;
/** Further apart than this, a reference line and a draft row are taken as different lines. */
const PAIRING_WINDOW_NM = 0.1;

export interface ReferenceCheckInput {
  releaseId: string;
  csvText: string;
  /** Medium of rows without a medium cell. */
  medium?: WavelengthMedium;
}

const REFERENCE_LIMITS: CsvLimits = {
  maxBytes: MAX_REFERENCE_BYTES,
  maxRows: MAX_REFERENCE_ROWS,
  empty: () =>
    new AppError("validation", "The reference file is empty.", {
      fieldErrors: { csv: ["Choose a reference CSV file."] },
    }),
  tooLarge: () =>
    new AppError(
      "too_large",
      `The reference file is larger than ${MAX_REFERENCE_LABEL}; nothing was compared. Split it by element and check the parts one after the other.`,
      { fieldErrors: { csv: [`At most ${MAX_REFERENCE_LABEL} per file.`] } },
    ),
  tooManyRows: (rows, limit) =>
    new AppError(
      "too_large",
      `The reference file has ${rows} rows; one check takes at most ${limit}. Split it by element and check the parts one after the other.`,
      { fieldErrors: { csv: [`At most ${limit} rows per file.`] } },
    ),
};

/** Parses the file; any problem refuses the whole file, with every located problem in fieldErrors.csv. */
function readReference(csvText: string, medium?: WavelengthMedium): ReferenceFileLine[] {
  const { lines, errors } = parseReferenceCsv(csvText, { medium });
  if (errors.length > 0) {
    const located = errors.map(
      (e) =>
        `Line ${e.line}${e.column ? `, column ${e.column}` : ""}${e.field !== "row" && e.field !== "header" ? ` (${e.field})` : ""}: ${e.message}.`,
    );
    const first = located[0];
    throw new AppError(
      "validation",
      `The reference file has ${errors.length === 1 ? "a problem" : `${errors.length} problems`}, so nothing was compared or written. ${first}${errors.length > 1 ? " The others are listed with the file." : ""}`,
      { fieldErrors: { csv: located.slice(0, 50) } },
    );
  }
  return lines;
}

function sha256(text: string): string {
  return createHash("sha256").update(text, "utf8").digest("hex");
}

interface Planned {
  draft: { id: string; teamId: string };
  rows: Map<string, LineDbRow>;
  lines: ReferenceFileLine[];
  preview: ReferenceCheckPreview;
}

async function plan(
  actor: Actor,
  input: ReferenceCheckInput,
  transaction: Transaction,
  mode: "SHARE" | "UPDATE",
): Promise<Planned> {
  // Authorise before reading the file's contents: only a lab lead of the team learns what it says.
  const draft = await lockDraft(actor, input.releaseId, "lines.edit", transaction, mode);
  const lines = readReference(input.csvText, input.medium);
  const dbRows = await selectLines("l.release_id = $1", [draft.id], transaction, "ORDER BY l.id");
  const rows = new Map(dbRows.map((row) => [row.id, row]));
  const comparison = compareWithReference(
    dbRows.map((row) => ({
      id: row.id,
      species: row.species,
      airNm: row.air_nm,
      vacuumNm: row.vacuum_nm,
      uncertaintyNm: row.uncertainty_nm,
      verified: row.verified_at !== null,
      retired: row.retired,
    })),
    lines,
    {
      coverageFactor: COVERAGE_FACTOR,
      minToleranceNm: MIN_TOLERANCE_NM,
      pairingWindowNm: PAIRING_WINDOW_NM,
    },
  );
  const pair = (p: ReferencePairing): ReferenceCheckPair => {
    const row = rows.get(p.lineId)!;
    const reference = lines[p.referenceIndex];
    return {
      lineId: row.id,
      lineKey: row.line_key,
      species: row.species,
      medium: p.medium,
      draftNm: p.draftNm,
      referenceNm: p.referenceNm,
      differenceNm: p.differenceNm,
      combinedUncertaintyNm: p.combinedUncertaintyNm,
      toleranceNm: p.toleranceNm,
      draftUncertaintyNm: row.uncertainty_nm,
      referenceUncertaintyNm: reference.uncertaintyNm,
      citation: reference.citation,
      csvLine: reference.line,
      verified: row.verified_at !== null,
      verifiedCitation: row.verified_citation,
    };
  };
  const fileSha256 = sha256(input.csvText);
  const fingerprint = sha256(
    [fileSha256, input.medium ?? "", ...dbRows.map((row) => `${row.id}:${row.version}`)].join("\n"),
  );
  const agreeing = comparison.agreeing.map(pair);
  const disagreeing = comparison.disagreeing.map(pair);
  const preview: ReferenceCheckPreview = {
    releaseId: draft.id,
    fileSha256,
    fingerprint,
    referenceLineCount: lines.length,
    agreeing,
    alreadyVerified: comparison.alreadyVerified.map(pair),
    disagreeing,
    referenceOnly: comparison.referenceOnly.map((index) => {
      const line = lines[index];
      return {
        csvLine: line.line,
        species: line.species,
        medium: line.medium,
        wavelengthNm: line.wavelengthNm,
        uncertaintyNm: line.uncertaintyNm,
        citation: line.citation,
      };
    }),
    draftOnly: comparison.draftOnly
      .map((id) => {
        const row = rows.get(id)!;
        return {
          lineId: row.id,
          lineKey: row.line_key,
          species: row.species,
          airNm: row.air_nm,
          vacuumNm: row.vacuum_nm,
          uncertaintyNm: row.uncertainty_nm,
          verified: row.verified_at !== null,
        };
      })
      .sort((a, b) => a.species.localeCompare(b.species) || a.vacuumNm - b.vacuumNm),
    otherSpeciesCount: comparison.otherSpeciesCount,
    retiredCount: comparison.retiredCount,
    citations: [...new Set([...agreeing, ...disagreeing].map((p) => p.citation))],
    coverageFactor: COVERAGE_FACTOR,
    minToleranceNm: MIN_TOLERANCE_NM,
    pairingWindowNm: PAIRING_WINDOW_NM,
  };
  return { draft, rows, lines, preview };
}

/** What checking the draft against the file would show. Writes nothing. */
export async function previewReferenceCheck(
  actor: Actor,
  input: ReferenceCheckInput,
): Promise<ReferenceCheckPreview> {
  assertCsvWithinLimits(input.csvText, REFERENCE_LIMITS);
  return sequelize.transaction(async (transaction) => {
    return (await plan(actor, input, transaction, "SHARE")).preview;
  });
}

/** The row's values with the reference wavelength (in its medium) and uncertainty, checked as any edit. */
function takeReference(row: LineDbRow, pair: ReferenceCheckPair) {
  const input = recordToInput(toLineRecord(row));
  const changed = {
    ...input,
    airNm: pair.medium === "air" ? pair.referenceNm : null,
    vacuumNm: (pair.medium === "vacuum" ? pair.referenceNm : null) as number,
    uncertaintyNm: pair.referenceUncertaintyNm,
  };
  try {
    return validateLineInput(changed);
  } catch (error) {
    const detail =
      error instanceof AppError
        ? Object.values(error.fieldErrors ?? {})
            .flat()
            .join(" ")
        : "";
    throw new AppError(
      "unprocessable",
      `Taking the reference value ${pair.referenceNm} nm (${pair.medium}) for ${row.species} ${row.air_nm ?? row.vacuum_nm} nm fails the table's own checks, so nothing was written. ${detail} Correct the row by hand, or leave it.`,
    );
  }
}

/**
 * Marks every agreeing row verified with its reference's citation, takes the reference value where
 * the lab lead chose "take" (and marks those verified too), records "keep" decisions, all in one
 * transaction with one audit event; or writes nothing. Refuses a stale preview (409).
 */
export async function applyReferenceCheck(
  actor: Actor,
  input: ReferenceCheckInput & {
    fingerprint: string;
    decisions?: { lineId: string; decision: ReferenceDecision }[];
    reason?: string;
  },
): Promise<ReferenceCheckResult> {
  assertCsvWithinLimits(input.csvText, REFERENCE_LIMITS);
  const reason = input.reason?.trim() || "Checked against a reference";
  return sequelize.transaction(async (transaction) => {
    // UPDATE mode: no edit of the draft can slip in between the comparison and the writes.
    const { draft, rows, preview } = await plan(actor, input, transaction, "UPDATE");
    if (preview.fingerprint !== input.fingerprint) {
      throw new AppError(
        "conflict",
        "The draft, the file or its medium has changed since the preview. Check the file again.",
      );
    }
    const disagreeing = new Map(preview.disagreeing.map((p) => [p.lineId, p]));
    const decided = new Map<string, ReferenceDecision>();
    for (const { lineId, decision } of input.decisions ?? []) {
      if (!disagreeing.has(lineId)) {
        throw new AppError(
          "unprocessable",
          `Line ${lineId} is not among the disagreements of this check; decisions are only for rows that disagree with the reference. Nothing was written.`,
          { fieldErrors: { decisions: [`${lineId} does not disagree with the reference.`] } },
        );
      }
      if (decided.has(lineId)) {
        throw new AppError("validation", `Line ${lineId} has two decisions; send one.`, {
          fieldErrors: { decisions: [`${lineId} is named twice.`] },
        });
      }
      decided.set(lineId, decision);
    }
    const taken = [...decided].filter(([, d]) => d === "take").map(([id]) => disagreeing.get(id)!);
    const kept = [...decided].filter(([, d]) => d === "keep").map(([id]) => disagreeing.get(id)!);
    const left = preview.disagreeing.filter((p) => !decided.has(p.lineId));
    if (preview.agreeing.length + taken.length + kept.length === 0) {
      throw new AppError(
        "unprocessable",
        "Nothing to record: no draft row agrees with the reference and no disagreement has a decision. Nothing was written.",
      );
    }

    // Values first (an update clears verification), then every verification in one statement.
    const takenValues = taken.map((pair) => ({
      pair,
      row: rows.get(pair.lineId)!,
      next: takeReference(rows.get(pair.lineId)!, pair),
    }));
    for (const { pair, next } of takenValues) {
      const twin = [...rows.values()].find(
        (other) =>
          other.id !== pair.lineId &&
          !other.retired &&
          other.species === next.species &&
          Math.abs(other.vacuum_nm - next.vacuumNm) <= 0.002,
      );
      if (twin) {
        throw new AppError(
          "unprocessable",
          `Taking the reference value for ${pair.species} ${pair.draftNm} nm would make it the same line as ${twin.species} ${twin.air_nm ?? twin.vacuum_nm} nm, already in the draft (within 0.002 nm). Nothing was written; retire one of them first.`,
        );
      }
    }
    if (takenValues.length > 0) {
      await sequelize.query(BULK_UPDATE_LINES_SQL, {
        bind: [
          JSON.stringify(takenValues.map(({ row, next }) => ({ id: row.id, ...valuesOf(next) }))),
        ],
        transaction,
      });
    }
    const verify = [...preview.agreeing, ...taken].map((p) => ({
      id: p.lineId,
      citation: p.citation,
    }));
    await sequelize.query(
      `UPDATE lines l SET verified_by_id = $2, verified_at = now(), verified_citation = v.citation,
         version = l.version + 1, updated_at = now()
       FROM jsonb_to_recordset($3::jsonb) AS v(id uuid, citation text)
       WHERE l.id = v.id AND l.release_id = $1`,
      { bind: [draft.id, actor.id, JSON.stringify(verify)], transaction },
    );

    // One event for the whole step; `lines` keyed by line key lets each line's history find its part.
    const lines: Record<string, unknown> = {};
    for (const p of preview.agreeing) {
      lines[p.lineKey] = {
        decision: "verified",
        before: { verified: false },
        after: { verified: true, verifiedCitation: p.citation },
        differenceNm: p.differenceNm,
        toleranceNm: p.toleranceNm,
      };
    }
    for (const { pair, row, next } of takenValues) {
      lines[pair.lineKey] = {
        decision: "take",
        before: {
          airNm: row.air_nm,
          vacuumNm: row.vacuum_nm,
          uncertaintyNm: row.uncertainty_nm,
          verified: row.verified_at !== null,
        },
        after: {
          airNm: next.airNm,
          vacuumNm: next.vacuumNm,
          uncertaintyNm: next.uncertaintyNm,
          verified: true,
          verifiedCitation: pair.citation,
        },
        differenceNm: pair.differenceNm,
        toleranceNm: pair.toleranceNm,
      };
    }
    for (const p of kept) {
      lines[p.lineKey] = {
        decision: "keep",
        before: { verified: p.verified },
        after: { verified: p.verified, referenceNm: p.referenceNm, referenceCitation: p.citation },
        differenceNm: p.differenceNm,
        toleranceNm: p.toleranceNm,
      };
    }
    await recordAudit(
      {
        actorId: actor.id,
        teamId: draft.teamId,
        action: "line_release.reference_check",
        entity: "line_release",
        entityId: draft.id,
        after: {
          fileSha256: preview.fileSha256,
          medium: input.medium ?? null,
          citations: [...new Set(verify.map((v) => v.citation))],
          verified: verify.length,
          taken: taken.length,
          kept: kept.length,
          left: left.length,
          alreadyVerified: preview.alreadyVerified.length,
          referenceOnly: preview.referenceOnly.length,
          draftOnly: preview.draftOnly.length,
          referenceLines: preview.referenceLineCount,
          coverageFactor: preview.coverageFactor,
          minToleranceNm: preview.minToleranceNm,
          lines,
        },
        reason,
      },
      transaction,
    );
    return {
      releaseId: draft.id,
      verified: verify.length,
      taken: taken.length,
      kept: kept.length,
      left: left.length,
    };
  });
}
