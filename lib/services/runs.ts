// Identification runs: a sample spectrum analysed on its calibration against the team's newest
// published line-table release, stored with every peak, candidate match and call and everything
// needed to reproduce it (settings, calibration, release, software version).
import "server-only";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import { toReferenceLine } from "@/lib/lines";
import { analyzeSample } from "@/lib/spectrum/analysis";
import { prepareLineIndex, type ElementCall, type LineIndex, type Verdict } from "@/lib/spectrum/matching";
import type { RunCreateInput } from "@/lib/validation/workflow-schemas";
import type { Transaction } from "sequelize";
import { Calibration, Instrument, Run, RunOverride, User, sequelize } from "@/models";
import { recordAudit } from "./audit";
import { newestPublishedRelease } from "./calibrations";
import { latestCalibrationOf } from "./instruments";
import { selectLines } from "./line-library-access";
import { toLineTableRow } from "./line-library-rows";
import { loadNotebook } from "./notebooks";
import { fileAxisInNm } from "./run-spectrum";
import { loadSpectrum, spectrumPoints } from "./spectra";
import { SOFTWARE_VERSION, type RunCall, type RunOverrideRecord, type RunPeak, type RunRecord, type RunTemperature } from "./workflow-types";

// Published releases never change, so an index prepared once per release serves every later run.
const indexCache = new Map<string, Promise<LineIndex>>();
const MAX_CACHED_RELEASES = 16;

function lineIndexOf(releaseId: string): Promise<LineIndex> {
  let index = indexCache.get(releaseId);
  if (!index) {
    index = selectLines("l.release_id = $1", [releaseId]).then((rows) =>
      prepareLineIndex(rows.map((row) => toReferenceLine(toLineTableRow(row), row.id))),
    );
    index.catch(() => indexCache.delete(releaseId));
    if (indexCache.size >= MAX_CACHED_RELEASES) indexCache.delete(indexCache.keys().next().value!);
    indexCache.set(releaseId, index);
  }
  return index;
}

function toRunCall(call: ElementCall): RunCall {
  return {
    species: call.species,
    element: call.element,
    verdict: call.verdict,
    score: call.score,
    lines: call.seen.map((s) => ({
      lineId: s.line.id,
      lineNm: s.referenceNm,
      peakNm: s.peakWavelengthNm,
      deltaNm: s.deltaNm,
      relativeIntensity: s.relativeIntensity,
    })),
    missing: call.missing.map((m) => ({
      lineId: m.line.id,
      lineNm: m.referenceNm,
      relativeIntensity: m.relativeIntensity,
      predictedSnr: m.predictedSnr,
      hidden: m.hiddenByPeakIndex !== null,
    })),
    seenCount: call.seenCount,
    missingCount: call.missingCount,
    missingStrongCount: call.missingStrongCount,
    overlaps: call.overlaps.map((o) => ({ peakNm: o.peakWavelengthNm, otherSpecies: o.otherSpecies })),
    intensityBasis: call.intensityBasis,
    notes: call.notes,
    rationale: call.rationale,
  };
}

async function overridesOf(runId: string, transaction?: Transaction): Promise<RunOverrideRecord[]> {
  const rows = await RunOverride.findAll({
    where: { runId },
    include: [{ model: User, as: "createdBy", attributes: ["name"] }],
    order: [
      ["createdAt", "ASC"],
      ["id", "ASC"],
    ],
    transaction,
  });
  return rows.map((o) => ({
    id: o.id,
    species: o.species,
    computedVerdict: o.computedVerdict,
    verdict: o.verdict,
    reason: o.reason,
    byName: (o as RunOverride & { createdBy?: User }).createdBy?.name ?? null,
    at: o.createdAt.toISOString(),
  }));
}

/** The verdict that stands per species: the newest override, else the computed verdict. */
export function standingVerdicts(calls: readonly RunCall[], overrides: readonly RunOverrideRecord[]): Record<string, Verdict> {
  const verdicts: Record<string, Verdict> = {};
  for (const call of calls) verdicts[call.species] = call.verdict;
  for (const o of overrides) {
    const computed = calls.find((c) => c.species === o.species)?.verdict ?? o.computedVerdict;
    verdicts[o.species] = o.verdict ?? computed;
  }
  return verdicts;
}

export async function toRunRecord(row: Run, transaction?: Transaction): Promise<RunRecord> {
  const calls = row.calls as RunCall[];
  const overrides = await overridesOf(row.id, transaction);
  return {
    id: row.id,
    notebookId: row.notebookId,
    spectrumId: row.spectrumId,
    calibrationId: row.calibrationId,
    lineReleaseId: row.lineReleaseId,
    source: row.source,
    status: row.status,
    versionNumber: row.versionNumber,
    amendsRunId: row.amendsRunId,
    rerunOfId: row.rerunOfId,
    createdById: row.createdById,
    notes: row.notes,
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
    verdicts: standingVerdicts(calls, overrides),
    overrides,
    temperature: (row.temperature as RunTemperature | null) ?? null,
    unexplained: row.unexplained as RunRecord["unexplained"],
    createdAt: row.createdAt.toISOString(),
  };
}

export async function fetchRun(actor: Actor, runId: string): Promise<RunRecord> {
  const row = await Run.findByPk(runId);
  if (!row) throw notFound("No such run.");
  authorize(actor, "team.view", { teamId: row.teamId });
  return await toRunRecord(row);
}

export async function createRun(actor: Actor, input: RunCreateInput): Promise<RunRecord> {
  const notebook = await loadNotebook(actor, input.notebookId, "run.create");
  const spectrum = await loadSpectrum(actor, input.spectrumId);
  if (spectrum.teamId !== notebook.teamId) throw notFound("No such spectrum.");
  const instrument = (await Instrument.findByPk(spectrum.instrumentId))!;

  let calibration: Calibration | null = null;
  if (input.calibrationId) {
    calibration = await Calibration.findByPk(input.calibrationId);
    if (!calibration || calibration.teamId !== notebook.teamId) throw notFound("No such calibration.");
    if (calibration.instrumentId !== spectrum.instrumentId) {
      throw new AppError("validation", "That calibration belongs to another instrument.", {
        fieldErrors: { calibrationId: ["Choose a calibration of the sample's instrument."] },
      });
    }
    if (calibration.xUnit !== spectrum.xUnit) {
      throw new AppError("validation", `That calibration maps a ${calibration.xUnit} axis; the sample's axis is ${spectrum.xUnit}.`, {
        fieldErrors: { calibrationId: ["Choose a calibration made on the same kind of axis."] },
      });
    }
  } else {
    const latest = await latestCalibrationOf(spectrum.instrumentId);
    if (latest && latest.xUnit === spectrum.xUnit) calibration = latest;
    else if (spectrum.xUnit === "pixel") {
      throw new AppError(
        "unprocessable",
        "The sample's axis is in pixels and its instrument has no calibration yet: calibrate with a lamp spectrum first.",
      );
    }
  }

  const release = await newestPublishedRelease(notebook.teamId);
  const index = await lineIndexOf(release.id);
  // Without a calibration the file's own wavelength axis is used, in nm and (when known) in air.
  const { x, y } = calibration ? spectrumPoints(spectrum) : fileAxisInNm(spectrum);
  const settings = input.settings ?? {};
  let analysis;
  try {
    analysis = analyzeSample(x, y, index, {
      calibration: calibration?.model ?? null,
      source: input.source,
      // A prism's resolution in nm varies across the array: each peak's own width stands in for it.
      resolutionNm: instrument.dispersion === "grating" ? instrument.resolutionNm : undefined,
      detectorMax: instrument.detectorMax ?? undefined,
      minSnr: settings.minSnr,
      k: settings.k,
    });
  } catch (error) {
    if (error instanceof RangeError) throw new AppError("unprocessable", `The sample could not be analysed: ${error.message}`);
    throw error;
  }

  const { identification } = analysis;
  const peaks: RunPeak[] = analysis.peaks.map((p) => ({
    x: p.x,
    wavelengthNm: p.wavelengthNm,
    uncertaintyNm: p.wavelengthUncertaintyNm,
    fwhmNm: p.fwhmNm,
    height: p.height,
    snr: p.snr,
    saturated: p.saturated,
    blended: p.blended,
  }));
  const matches = identification.matches.map((m) => ({
    peakIndex: m.peakIndex,
    candidates: m.candidates.map((c) => ({
      lineId: c.line.id,
      species: c.line.species,
      kind: c.kind,
      referenceNm: c.referenceNm,
      deltaNm: c.deltaNm,
      sigmaNm: c.sigmaNm,
      deltaSigma: c.deltaSigma,
    })),
  }));
  const calls = identification.calls.map(toRunCall);
  const overlaps = identification.overlaps.map((o) => ({ peakIndex: o.peakIndex, peakNm: o.peakWavelengthNm, species: o.species }));
  const unexplained = identification.unexplainedPeaks.map((u) => ({
    wavelengthNm: u.peak.wavelengthNm,
    height: u.peak.height,
    snr: u.peak.snr,
    reason: u.reason,
  }));

  return sequelize.transaction(async (transaction) => {
    const row = await Run.create(
      {
        teamId: notebook.teamId,
        notebookId: notebook.id,
        spectrumId: spectrum.id,
        calibrationId: calibration?.id ?? null,
        lineReleaseId: release.id,
        source: input.source,
        status: "draft",
        settings,
        lampChecked: analysis.lampChecked,
        softwareVersion: SOFTWARE_VERSION,
        rangeMinNm: analysis.rangeNm[0],
        rangeMaxNm: analysis.rangeNm[1],
        noiseCounts: analysis.noiseCounts,
        peaks,
        matches,
        calls,
        peakOverlaps: overlaps,
        unexplained,
        warnings: analysis.warnings,
        createdById: actor.id,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        teamId: notebook.teamId,
        action: "run.create",
        entity: "run",
        entityId: row.id,
        after: {
          notebookId: notebook.id,
          spectrumId: spectrum.id,
          calibrationId: calibration?.id ?? null,
          lineReleaseId: release.id,
          source: input.source,
          settings,
          present: calls.filter((c) => c.verdict === "present").map((c) => c.species),
        },
      },
      transaction,
    );
    return await toRunRecord(row, transaction);
  });
}
