// Amendment of a signed run: a new draft version linked to it, carrying the analysis, the notes and
// the standing overrides, which goes through review again. The signed version never changes.
import "server-only";
import { UniqueConstraintError } from "sequelize";
import { AppError, forbidden } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { can } from "@/lib/auth/policy";
import { standingOverride } from "@/lib/runs/standing-verdicts";
import { Run, RunOverride, sequelize } from "@/models";
import { recordAudit } from "./audit";
import { loadRun } from "./run-lifecycle";

/** A new draft version of a signed run: the same analysis, notes and standing overrides, linked to it. */
export async function amendRun(
  actor: Actor,
  runId: string,
): Promise<{ id: string; versionNumber: number; amendsRunId: string }> {
  try {
    return await sequelize.transaction(async (transaction) => {
      const signed = await loadRun(actor, runId, "run.edit", transaction, { withMatches: true });
      if (signed.status !== "signed") {
        throw new AppError(
          "conflict",
          "Only a signed run is amended; this one can still be changed by its author.",
        );
      }
      if (signed.createdById !== actor.id && !can(actor, "run.review", { teamId: signed.teamId })) {
        throw forbidden("Only the run's author or a supervisor of the team amends a signed run.");
      }
      const existing = await Run.findOne({
        where: { amendsRunId: signed.id },
        attributes: ["id", "versionNumber"],
        transaction,
      });
      if (existing)
        throw new AppError(
          "conflict",
          `This run already has an amendment (version ${existing.versionNumber}): amend that one once it is signed.`,
        );
      const amendment = await Run.create(
        {
          teamId: signed.teamId,
          notebookId: signed.notebookId,
          spectrumId: signed.spectrumId,
          calibrationId: signed.calibrationId,
          lineReleaseId: signed.lineReleaseId,
          source: signed.source,
          status: "draft",
          settings: signed.settings,
          lampChecked: signed.lampChecked,
          softwareVersion: signed.softwareVersion,
          rangeMinNm: signed.rangeMinNm,
          rangeMaxNm: signed.rangeMaxNm,
          noiseCounts: signed.noiseCounts,
          peaks: signed.peaks,
          matches: signed.matches,
          calls: signed.calls,
          peakOverlaps: signed.peakOverlaps,
          unexplained: signed.unexplained,
          warnings: signed.warnings,
          temperature: signed.temperature,
          continuum: signed.continuum,
          versionNumber: signed.versionNumber + 1,
          amendsRunId: signed.id,
          rerunOfId: signed.rerunOfId,
          notes: signed.notes,
          createdById: actor.id,
        },
        { transaction },
      );
      // The overrides that stand on the signed version stand on the amendment too (withdrawn ones do not).
      const overrides = await RunOverride.findAll({
        where: { runId: signed.id },
        order: [
          ["createdAt", "ASC"],
          ["id", "ASC"],
        ],
        transaction,
      });
      const carried = [...new Set(overrides.map((o) => o.species))]
        .map((species) => standingOverride(overrides, species))
        .filter((o) => o !== null);
      for (const o of carried) {
        await RunOverride.create(
          {
            runId: amendment.id,
            species: o.species,
            computedVerdict: o.computedVerdict,
            verdict: o.verdict,
            reason: o.reason,
            createdById: o.createdById,
          },
          { transaction },
        );
      }
      await recordAudit(
        {
          actorId: actor.id,
          teamId: signed.teamId,
          action: "run.amend",
          entity: "run",
          entityId: amendment.id,
          before: {
            runId: signed.id,
            status: signed.status,
            round: signed.reviewRound,
            versionNumber: signed.versionNumber,
          },
          after: {
            status: "draft",
            round: 0,
            versionNumber: amendment.versionNumber,
            amendsRunId: signed.id,
            carriedOverrides: carried.map((o) => ({ species: o.species, verdict: o.verdict })),
          },
        },
        transaction,
      );
      return { id: amendment.id, versionNumber: amendment.versionNumber, amendsRunId: signed.id };
    });
  } catch (error) {
    // Two amendments at once: the unique index lets one through.
    if (error instanceof UniqueConstraintError)
      throw new AppError("conflict", "This run already has an amendment.");
    throw error;
  }
}
