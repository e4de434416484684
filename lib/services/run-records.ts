// A run as pages, the API and reports see it: its row mapped to a RunRecord, with the override
// history and the release number the record shows loaded for several runs at once.
import "server-only";
import type { Transaction } from "sequelize";
import { overridesByRunOf, standingOverride, standingVerdicts } from "@/lib/runs/standing-verdicts";
import type {
  RunCall,
  RunOverrideRecord,
  RunPeak,
  RunRecord,
  RunTemperature,
  StoredRunCall,
} from "@/lib/runs/types";
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
        byName: (o as RunOverride & { createdBy?: User }).createdBy?.name ?? null,
        at: o.createdAt.toISOString(),
      },
    })),
  );
}

/**
 * Run records of several runs with two queries in all (their overrides, their releases' numbers),
 * whatever their number: a notebook's calls CSV reads every run of it.
 */
export async function toRunRecords(
  rows: readonly Run[],
  transaction?: Transaction,
): Promise<RunRecord[]> {
  if (rows.length === 0) return [];
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
  const numberOf = new Map(releases.map((r) => [r.id, r.number]));
  return rows.map((row) =>
    runRecordOf(row, overrides.get(row.id) ?? [], numberOf.get(row.lineReleaseId) ?? null),
  );
}

export async function toRunRecord(row: Run, transaction?: Transaction): Promise<RunRecord> {
  return (await toRunRecords([row], transaction))[0];
}

function runRecordOf(
  row: Run,
  overrides: RunOverrideRecord[],
  releaseNumber: number | null,
): RunRecord {
  const stored = row.calls as StoredRunCall[];
  const verdicts = standingVerdicts(stored, overrides);
  const calls: RunCall[] = stored.map((c) => {
    return {
      ...c,
      verdict: verdicts[c.species] ?? c.verdict,
      computedVerdict: c.verdict,
      override: standingOverride(overrides, c.species),
    };
  });
  return {
    id: row.id,
    notebookId: row.notebookId,
    spectrumId: row.spectrumId,
    calibrationId: row.calibrationId,
    lineReleaseId: row.lineReleaseId,
    lineReleaseNumber: releaseNumber,
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
    settings: row.settings as RunRecord["settings"],
    lampChecked: row.lampChecked,
    softwareVersion: row.softwareVersion,
    rangeNm: [row.rangeMinNm, row.rangeMaxNm],
    noiseCounts: row.noiseCounts,
    warnings: row.warnings as RunRecord["warnings"],
    peaks: row.peaks as RunPeak[],
    calls,
    verdicts,
    overrides,
    temperature: (row.temperature as RunTemperature | null) ?? null,
    unexplained: row.unexplained as RunRecord["unexplained"],
    createdAt: row.createdAt.toISOString(),
  };
}
