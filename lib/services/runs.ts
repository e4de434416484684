// Identification runs: a sample spectrum analysed on its calibration against the team's newest
// published line-table release, stored with every peak, candidate match and call and everything
// needed to reproduce it (settings, calibration, release, software version).
import "server-only";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import { toReferenceLine } from "@/lib/lines";
import { standingOverride, standingVerdicts } from "@/lib/runs/standing-verdicts";
import type {
  RunNotesRecord,
  RunPeak,
  RunRecord,
  RunTemperature,
  StoredRunCall,
} from "@/lib/runs/types";
import {
  analyzeSample,
  type AnalyzeSampleOptions,
  type DetectionLimit,
  type SampleAnalysis,
} from "@/lib/spectrum/analysis";
import { prepareLineIndex, type ElementCall, type LineIndex } from "@/lib/spectrum/matching";
import type { RunCreateInput, RunNotesInput, RunOverrideInput } from "@/lib/validation/run-schemas";
import { pixelNumberingDiffers } from "@/lib/spectrum/io/stored-pixel-numbering";
import { runHeavyTask } from "@/lib/workers/heavy-pool";
import {
  Calibration,
  Instrument,
  LineRelease,
  Notebook,
  Run,
  RunOverride,
  SpectrumFile,
  sequelize,
} from "@/models";
import { recordAudit } from "./audit";
import { float64ToBytes } from "./float64-bytes";
import { newestPublishedRelease } from "./calibrations";
import { latestCalibrationOf } from "./instruments";
import { selectLines } from "./line-library-access";
import { toLineTableRow } from "./line-library-rows";
import { loadNotebook } from "./notebooks";
import {
  RUN_RECORD_ATTRIBUTES,
  loadRunRecordContext,
  overridesByRun,
  toRunRecord,
} from "./run-records";
import { assertAuthorMayEdit, loadRun } from "./run-lifecycle";
import { analysedPoints } from "./run-spectrum";
import { loadSpectrum, storedAxisFacts } from "./spectra";
import { runChanges, type RunChanges } from "@/lib/runs/run-changes";
import { SOFTWARE_VERSION } from "./software-version";

// Published releases never change, so an index prepared once per release serves every later run.
// Its lines are loaded in wavelength order: the order is then the same on every load (ties between
// lines follow it), and lines near one another in wavelength sit near one another in the index's
// arrays, which the matching reads by table position.
const indexCache = new Map<string, Promise<LineIndex>>();
const MAX_CACHED_RELEASES = 16;

function lineIndexOf(releaseId: string): Promise<LineIndex> {
  let index = indexCache.get(releaseId);
  if (!index) {
    index = selectLines(
      "l.release_id = $1",
      [releaseId],
      undefined,
      "ORDER BY coalesce(l.air_nm, l.vacuum_nm), l.id",
    ).then((rows) =>
      prepareLineIndex(rows.map((row) => toReferenceLine(toLineTableRow(row), row.id))),
    );
    index.catch(() => indexCache.delete(releaseId));
    if (indexCache.size >= MAX_CACHED_RELEASES) indexCache.delete(indexCache.keys().next().value!);
    indexCache.set(releaseId, index);
  }
  return index;
}

/**
 * Samples of at least this many points are analysed in the worker pool; smaller ones take a few
 * milliseconds, less than handing them over. EMBERLINE_WORKER_ANALYSIS_MIN_POINTS changes it.
 */
const WORKER_ANALYSIS_MIN_POINTS = Number(process.env.EMBERLINE_WORKER_ANALYSIS_MIN_POINTS ?? 8192);

/**
 * analyzeSample, in the worker pool when the sample is large or an assumed excitation temperature makes
 * it re-weigh the whole table (seconds on a large table). A worker keeps its own index per release:
 * the lines are sent only when the worker answers that it has none.
 */
async function analyzeOffThreadWhenLarge(
  x: Float64Array,
  y: Float64Array,
  releaseId: string,
  index: LineIndex,
  options: AnalyzeSampleOptions,
): Promise<SampleAnalysis> {
  const heavy = x.length >= WORKER_ANALYSIS_MIN_POINTS || options.lteTemperatureK != null;
  if (!heavy) return analyzeSample(x, y, index, options);
  const task = { kind: "analyze-sample" as const, x, y, releaseId, options };
  const first = await runHeavyTask({ ...task, lines: null });
  return first ?? (await runHeavyTask({ ...task, lines: index.lines }))!;
}

function toRunCall(call: ElementCall, limit: DetectionLimit | undefined): StoredRunCall {
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
    seenPeaks: call.seenPeaks,
    missingCount: call.missingCount,
    missingStrongCount: call.missingStrongCount,
    overlaps: call.overlaps.map((o) => ({
      peakNm: o.peakWavelengthNm,
      otherSpecies: o.otherSpecies,
    })),
    intensityBasis: call.intensityBasis,
    notes: call.notes,
    rationale: call.rationale,
    detectionLimit: limit ?? null,
  };
}

export async function fetchRun(actor: Actor, runId: string): Promise<RunRecord> {
  const row = await Run.findByPk(runId, { attributes: RUN_RECORD_ATTRIBUTES });
  if (!row) throw notFound("No such run.");
  authorize(actor, "team.view", { teamId: row.teamId });
  return toRunRecord(row, await loadRunRecordContext([row]));
}

export async function createRun(actor: Actor, input: RunCreateInput): Promise<RunRecord> {
  const notebook = await loadNotebook(actor, input.notebookId, "run.create");
  const spectrum = await loadSpectrum(actor, input.spectrumId);
  if (spectrum.teamId !== notebook.teamId) throw notFound("No such spectrum.");
  const instrument = (await Instrument.findByPk(spectrum.instrumentId))!;

  let calibration: Calibration | null = null;
  if (input.calibrationId) {
    calibration = await Calibration.findByPk(input.calibrationId);
    if (!calibration || calibration.teamId !== notebook.teamId)
      throw notFound("No such calibration.");
    if (calibration.instrumentId !== spectrum.instrumentId) {
      throw new AppError("validation", "That calibration belongs to another instrument.", {
        fieldErrors: { calibrationId: ["Choose a calibration of the sample's instrument."] },
      });
    }
    if (calibration.xUnit !== spectrum.xUnit) {
      throw new AppError(
        "validation",
        `That calibration maps a ${calibration.xUnit} axis; the sample's axis is ${spectrum.xUnit}.`,
        {
          fieldErrors: { calibrationId: ["Choose a calibration made on the same kind of axis."] },
        },
      );
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
  if (calibration && spectrum.xUnit === "pixel")
    await assertSamePixelNumbering(calibration, spectrum);
  const release = await newestPublishedRelease(notebook.teamId);
  return await analyseAndStore(actor, {
    notebook,
    spectrum,
    instrument,
    calibration,
    release,
    source: input.source,
    settings: input.settings ?? {},
    rerunOf: null,
  });
}

/**
 * Refuses a calibration whose lamp counted its pixels otherwise than the sample is stored: an older
 * lamp upload counted from 1 against a sample stored from 0 (or the reverse) would be one pixel off.
 */
async function assertSamePixelNumbering(
  calibration: Calibration,
  sample: SpectrumFile,
): Promise<void> {
  const lamp = await SpectrumFile.findByPk(calibration.spectrumId, {
    attributes: ["id", "xUnit", "meta", "xValues", "pointCount"],
  });
  if (!lamp || !pixelNumberingDiffers(storedAxisFacts(lamp), storedAxisFacts(sample))) return;
  throw new AppError(
    "unprocessable",
    "That calibration's lamp file was stored before Emberline knew how this instrument counts its pixels, and it counts them differently from this sample, so every line would be one pixel off. Calibrate again from a new lamp upload of this instrument.",
    { fieldErrors: { calibrationId: ["Calibrate again from a new lamp upload."] } },
  );
}

/**
 * A new run of an earlier run's sample (same notebook, spectrum, calibration, source and settings)
 * against the team's newest published release; 422 when the earlier run already used it.
 */
export async function rerunRun(actor: Actor, runId: string): Promise<RunRecord> {
  const earlier = await loadRun(actor, runId, "run.create");
  const notebook = (await Notebook.findByPk(earlier.notebookId))!;
  const spectrum = (await SpectrumFile.findByPk(earlier.spectrumId))!;
  const instrument = (await Instrument.findByPk(spectrum.instrumentId))!;
  const calibration = earlier.calibrationId
    ? await Calibration.findByPk(earlier.calibrationId)
    : null;
  const [release, used] = await Promise.all([
    newestPublishedRelease(earlier.teamId),
    LineRelease.findByPk(earlier.lineReleaseId, { attributes: ["number"] }),
  ]);
  if (release.id === earlier.lineReleaseId || (used?.number ?? 0) >= release.number) {
    throw new AppError(
      "unprocessable",
      `This run already used line-table release ${used?.number ?? release.number}, the team's newest: there is nothing newer to run it against.`,
    );
  }
  return await analyseAndStore(actor, {
    notebook,
    spectrum,
    instrument,
    calibration,
    release,
    source: earlier.source,
    settings: earlier.settings,
    rerunOf: earlier,
  });
}

/** The team's newest published release when it is newer than the one the run used, else null. */
export async function newerReleaseFor(
  actor: Actor,
  runId: string,
): Promise<{ id: string; number: number } | null> {
  const run = await loadRun(actor, runId);
  const [newest, used] = await Promise.all([
    newestPublishedRelease(run.teamId),
    LineRelease.findByPk(run.lineReleaseId, { attributes: ["number"] }),
  ]);
  return newest.id !== run.lineReleaseId && newest.number > (used?.number ?? 0) ? newest : null;
}

function toRunTemperature(temperature: SampleAnalysis["temperature"]): RunTemperature {
  return temperature.ok
    ? {
        ok: true,
        species: temperature.species,
        temperatureK: temperature.temperatureK,
        temperatureUncertaintyK: temperature.temperatureUncertaintyK,
        lineCount: temperature.lineCount,
        rSquared: temperature.rSquared,
        points: temperature.points,
      }
    : { ok: false, message: temperature.message };
}

interface RunPlan {
  notebook: Notebook;
  spectrum: SpectrumFile;
  instrument: Instrument;
  calibration: Calibration | null;
  release: { id: string; number: number };
  source: RunCreateInput["source"];
  settings: RunRecord["settings"];
  rerunOf: Run | null;
}

async function analyseAndStore(actor: Actor, plan: RunPlan): Promise<RunRecord> {
  const { notebook, spectrum, instrument, calibration, release, source, settings, rerunOf } = plan;
  const index = await lineIndexOf(release.id);
  // Without a calibration the file's own wavelength axis is used, in nm and (when known) in air.
  const { x, y } = analysedPoints(spectrum, calibration !== null);
  let analysis: SampleAnalysis;
  try {
    analysis = await analyzeOffThreadWhenLarge(x, y, release.id, index, {
      calibration: calibration?.model ?? null,
      source,
      resolutionNm: instrument.resolutionNm,
      dispersion: instrument.dispersion,
      detectorMax: instrument.detectorMax ?? undefined,
      minSnr: settings.minSnr,
      k: settings.k,
      lteTemperatureK: settings.temperatureK,
    });
  } catch (error) {
    if (error instanceof RangeError)
      throw new AppError("unprocessable", `The sample could not be analysed: ${error.message}`);
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
  const calls = identification.calls.map((call) =>
    toRunCall(call, analysis.detectionLimits[call.species]),
  );
  const overlaps = identification.overlaps.map((o) => ({
    peakIndex: o.peakIndex,
    peakNm: o.peakWavelengthNm,
    species: o.species,
  }));
  const unexplained = identification.unexplainedPeaks.map((u) => ({
    wavelengthNm: u.peak.wavelengthNm,
    height: u.peak.height,
    snr: u.peak.snr,
    reason: u.reason,
  }));
  const temperature = toRunTemperature(analysis.temperature);

  return sequelize.transaction(async (transaction) => {
    const row = await Run.create(
      {
        teamId: notebook.teamId,
        notebookId: notebook.id,
        spectrumId: spectrum.id,
        calibrationId: calibration?.id ?? null,
        lineReleaseId: release.id,
        source,
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
        temperature,
        continuum: float64ToBytes(analysis.continuum),
        rerunOfId: rerunOf?.id ?? null,
        createdById: actor.id,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        teamId: notebook.teamId,
        action: rerunOf ? "run.rerun" : "run.create",
        entity: "run",
        entityId: row.id,
        before: rerunOf ? { runId: rerunOf.id, lineReleaseId: rerunOf.lineReleaseId } : undefined,
        after: {
          notebookId: notebook.id,
          spectrumId: spectrum.id,
          calibrationId: calibration?.id ?? null,
          lineReleaseId: release.id,
          lineReleaseNumber: release.number,
          source,
          settings,
          rerunOfId: rerunOf?.id ?? null,
          present: calls.filter((c) => c.verdict === "present").map((c) => c.species),
          temperatureK: temperature.ok ? temperature.temperatureK : null,
        },
      },
      transaction,
    );
    return toRunRecord(row, await loadRunRecordContext([row], transaction));
  });
}

/**
 * Overrides one call with a reason (verdict null withdraws the standing override): appended to the
 * run's overrides with the computed verdict, audited with the standing verdict before and after.
 * Only the run's author, only while it is a draft or returned.
 */
export async function overrideCall(
  actor: Actor,
  runId: string,
  input: RunOverrideInput,
): Promise<RunRecord> {
  return sequelize.transaction(async (transaction) => {
    const run = await loadRun(actor, runId, "run.edit", transaction);
    assertAuthorMayEdit(actor, run);
    const calls = run.calls;
    const call = calls.find((c) => c.species === input.species);
    if (!call) {
      throw new AppError("validation", `This run has no call for ${input.species}.`, {
        fieldErrors: { species: [`Choose one of the run's species (${calls.length} weighed).`] },
      });
    }
    const overrides = (await overridesByRun([run.id], transaction)).get(run.id) ?? [];
    const before = standingVerdicts(calls, overrides)[call.species];
    if (input.verdict === null && standingOverride(overrides, call.species) === null) {
      throw new AppError(
        "validation",
        `The call for ${call.species} has no override to withdraw.`,
        {
          fieldErrors: { verdict: ["Choose a verdict: there is no override to withdraw."] },
        },
      );
    }
    await RunOverride.create(
      {
        runId: run.id,
        species: call.species,
        computedVerdict: call.verdict,
        verdict: input.verdict,
        reason: input.reason,
        createdById: actor.id,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        teamId: run.teamId,
        action: "run.override",
        entity: "run",
        entityId: run.id,
        before: { species: call.species, verdict: before },
        after: {
          species: call.species,
          verdict: input.verdict ?? call.verdict,
          override: input.verdict,
          computedVerdict: call.verdict,
        },
        reason: input.reason,
      },
      transaction,
    );
    return toRunRecord(run, await loadRunRecordContext([run], transaction));
  });
}

/**
 * Saves the run's notes when `lockVersion` is the one stored (else 409); author only, while editable.
 * Answers the notes' own record: the row is read without its analysis (the calls alone are hundreds
 * of kilobytes against a large table), which a notes save neither changes nor needs to send back.
 */
export async function updateRunNotes(
  actor: Actor,
  runId: string,
  input: RunNotesInput,
): Promise<RunNotesRecord> {
  return sequelize.transaction(async (transaction) => {
    const run = await loadRun(actor, runId, "run.edit", transaction, {
      attributes: ["id", "teamId", "status", "createdById", "notes", "lockVersion", "updatedAt"],
    });
    assertAuthorMayEdit(actor, run);
    if (run.lockVersion !== input.lockVersion) {
      throw new AppError(
        "conflict",
        "The notes were changed since you opened them: reload the run, then write your change again.",
      );
    }
    if (run.notes !== input.notes) {
      const before = run.notes;
      await run.update({ notes: input.notes, lockVersion: run.lockVersion + 1 }, { transaction });
      await recordAudit(
        {
          actorId: actor.id,
          teamId: run.teamId,
          action: "run.notes",
          entity: "run",
          entityId: run.id,
          before: { notes: before, lockVersion: input.lockVersion },
          after: { notes: input.notes, lockVersion: run.lockVersion },
        },
        transaction,
      );
    }
    return {
      id: run.id,
      notes: run.notes,
      lockVersion: run.lockVersion,
      updatedAt: run.updatedAt.toISOString(),
    };
  });
}

/** What changed from the run a re-run repeats to the re-run; null when the run is no re-run. */
export async function fetchRunChanges(actor: Actor, run: RunRecord): Promise<RunChanges | null> {
  if (!run.rerunOfId) return null;
  return runChanges(await fetchRun(actor, run.rerunOfId), run);
}
