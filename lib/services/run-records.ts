// A run as pages, the API and reports see it: the one mapper of its row to a RunRecord (the only
// place that lists its columns), and what the record needs besides the row, the override history and
// the release's number, loaded for any number of runs with one query per kind.
import "server-only";
import type { Transaction } from "sequelize";
import { overridesByRunOf, standingOverride, standingVerdicts } from "@/lib/runs/standing-verdicts";
import type { RunCall, RunOverrideRecord, RunRecord } from "@/lib/runs/types";
import { LineRelease, Run, RunOverride, User } from "@/models";

/** The override history of several runs at once (one query), oldest first per run, as standingVerdicts expects. */
export async function overridesByRun(
  runIds: readonly string[],
  transaction?: Transaction,
): Promise<Map<string, RunOverrideRecord[]>> {
  if (runIds.length === 0) return new Map();
  const rows = await RunOverride.findAll({
    where: { runId: [...runIds] },
    include: [{ model: User, as: "createdBy", attributes: ["name"] }],
    order: [
      ["createdAt", "ASC"],
      ["id", "ASC"],
    ],
    transaction,
  });
  return overridesByRunOf(
    rows.map((o) => ({
      runId: o.runId,
      override: {
        id: o.id,
        species: o.species,
        computedVerdict: o.computedVerdict,
        verdict: o.verdict,
        reason: o.reason,
        byName: o.createdBy?.name ?? null,
        at: o.createdAt.toISOString(),
      },
    })),
  );
}

/**
 * A run's columns as its record and the pages read them: all but the stored candidate lines
 * (`matches`, megabytes against a large table), which only the peaks CSV and an amendment's copy read.
 */
export const RUN_RECORD_ATTRIBUTES = { exclude: ["matches"] };

/** What a run's record shows besides its row: the override history and the release's number. */
export interface RunRecordContext {
  /** Per run, oldest first. */
  overrides: ReadonlyMap<string, RunOverrideRecord[]>;
  /** Per line-table release. */
  releaseNumbers: ReadonlyMap<string, number | null>;
}

/**
 * The context of several runs' records in two queries in all (their overrides, their releases'
 * numbers), whatever their number: a notebook's calls CSV reads every run of it.
 */
export async function loadRunRecordContext(
  rows: readonly Pick<Run, "id" | "lineReleaseId">[],
  transaction?: Transaction,
): Promise<RunRecordContext> {
  if (rows.length === 0) return { overrides: new Map(), releaseNumbers: new Map() };
  const [overrides, releases] = await Promise.all([
    overridesByRun(
      rows.map((r) => r.id),
      transaction,
    ),
    LineRelease.findAll({
      where: { id: [...new Set(rows.map((r) => r.lineReleaseId))] },
      attributes: ["id", "number"],
      transaction,
    }),
  ]);
  return { overrides, releaseNumbers: new Map(releases.map((r) => [r.id, r.number])) };
}

/** The one mapping of a run's row to its record; it queries nothing (see loadRunRecordContext). */
export function toRunRecord(row: Run, context: RunRecordContext): RunRecord {
  const overrides = context.overrides.get(row.id) ?? [];
  const verdicts = standingVerdicts(row.calls, overrides);
  const calls: RunCall[] = row.calls.map((c) => ({
    ...c,
    verdict: verdicts[c.species] ?? c.verdict,
    computedVerdict: c.verdict,
    override: standingOverride(overrides, c.species),
  }));
  return {
    id: row.id,
    notebookId: row.notebookId,
    spectrumId: row.spectrumId,
    calibrationId: row.calibrationId,
    lineReleaseId: row.lineReleaseId,
    lineReleaseNumber: context.releaseNumbers.get(row.lineReleaseId) ?? null,
    source: row.source,
    status: row.status,
    versionNumber: row.versionNumber,
    amendsRunId: row.amendsRunId,
    rerunOfId: row.rerunOfId,
    createdById: row.createdById,
    notes: row.notes,
    lockVersion: row.lockVersion,
    reviewRound: row.reviewRound,
    requestedReviewerId: row.requestedReviewerId,
    submittedAt: row.submittedAt?.toISOString() ?? null,
    signedAt: row.signedAt?.toISOString() ?? null,
    settings: row.settings,
    lampChecked: row.lampChecked,
    softwareVersion: row.softwareVersion,
    rangeNm: [row.rangeMinNm, row.rangeMaxNm],
    noiseCounts: row.noiseCounts,
    warnings: row.warnings,
    peaks: row.peaks,
    calls,
    verdicts,
    overrides,
    temperature: row.temperature ?? null,
    unexplained: row.unexplained,
    createdAt: row.createdAt.toISOString(),
  };
}
