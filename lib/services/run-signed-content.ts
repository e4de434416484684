// The content a signature covers, read from the tables: the run, its spectrum's hash, calibration,
// release and overrides, built and hashed by run-content.ts. Signing, returning and the audit chain's
// verifier all read it here, so they hash the same thing.
import "server-only";
import type { Transaction } from "sequelize";
import { Calibration, LineRelease, Run, RunOverride, SpectrumFile } from "@/models";
import { buildRunContent, calibrationModelLabel, runContentHash } from "./run-content";

/** A run's canonical content as it stands in the tables, read in the caller's transaction when given. */
export async function runContentOf(run: Run, transaction?: Transaction) {
  const [spectrum, calibration, release, overrides] = await Promise.all([
    SpectrumFile.findByPk(run.spectrumId, { attributes: ["id", "sha256"], transaction }),
    run.calibrationId
      ? Calibration.findByPk(run.calibrationId, {
          attributes: ["id", "model", "rmsNm"],
          transaction,
        })
      : null,
    LineRelease.findByPk(run.lineReleaseId, { attributes: ["id", "number"], transaction }),
    RunOverride.findAll({
      where: { runId: run.id },
      order: [
        ["createdAt", "ASC"],
        ["id", "ASC"],
      ],
      transaction,
    }),
  ]);
  return buildRunContent({
    run: {
      id: run.id,
      teamId: run.teamId,
      notebookId: run.notebookId,
      spectrumId: run.spectrumId,
      calibrationId: run.calibrationId,
      lineReleaseId: run.lineReleaseId,
      source: run.source,
      settings: run.settings,
      lampChecked: run.lampChecked,
      softwareVersion: run.softwareVersion,
      rangeMinNm: run.rangeMinNm,
      rangeMaxNm: run.rangeMaxNm,
      noiseCounts: run.noiseCounts,
      peaks: run.peaks,
      calls: run.calls,
      unexplained: run.unexplained,
      warnings: run.warnings,
      notes: run.notes,
      versionNumber: run.versionNumber,
      amendsRunId: run.amendsRunId,
      rerunOfId: run.rerunOfId,
      createdById: run.createdById,
    },
    spectrumSha256: spectrum!.sha256,
    calibration: calibration
      ? {
          id: calibration.id,
          model: calibrationModelLabel(calibration.model),
          rmsNm: calibration.rmsNm,
        }
      : null,
    lineRelease: { id: release!.id, number: release!.number },
    overrides: overrides.map((o) => ({
      id: o.id,
      species: o.species,
      computedVerdict: o.computedVerdict,
      verdict: o.verdict,
      reason: o.reason,
      createdById: o.createdById,
      createdAt: o.createdAt.toISOString(),
    })),
  });
}

/**
 * The SHA-256 of a run's content as it stands in the tables now, or null when there is no such run.
 * Unauthorised: for the audit chain's verifier, which compares it with what was signed.
 */
export async function recomputeRunContentHash(
  runId: string,
  transaction?: Transaction,
): Promise<string | null> {
  const run = await Run.findByPk(runId, { transaction });
  return run ? runContentHash(await runContentOf(run, transaction)) : null;
}
