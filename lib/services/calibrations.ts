// Lamp calibrations: peaks of a lamp spectrum paired with the lamp lines of the team's newest
// published line-table release, a dispersion relation fitted by the core, and the record kept with
// everything it came from (release, software version) and its drift from the previous calibration.
// One computation serves the workbench's preview and the save, so what is saved is what was shown.
import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import {
  lampPairRecord,
  type EditedLampCalibration,
  type WorkbenchPair,
} from "@/lib/spectrum/analysis";
import {
  CalibrationError,
  calibrationDrift,
  calibrationModelChoice,
  calibrationUncertainty,
  evaluateCalibration,
  type CalibrationModelChoice,
  type FitCalibrationResult,
  type LampLine,
} from "@/lib/spectrum/calibration";
import { runHeavyTask } from "@/lib/workers/heavy-pool";
import type { CalibrationRecord } from "@/lib/calibrations/types";
import type { CalibrationCreateInput } from "@/lib/validation/calibration-schemas";
import { Calibration, sequelize } from "@/models";
import { recordAudit } from "./audit";
import { latestCalibrationOf, loadInstrument } from "./instruments";
import { selectLines } from "./line-library-access";
import { loadSpectrum, spectrumPoints } from "./spectra";
import { SOFTWARE_VERSION } from "./software-version";

/** The team's newest published line-table release; calibrations and runs are tied to it. */
export async function newestPublishedRelease(
  teamId: string,
  transaction?: Transaction,
): Promise<{ id: string; number: number }> {
  const [release] = await sequelize.query<{ id: string; number: number }>(
    `SELECT id, number FROM line_releases WHERE team_id = $1 AND status = 'published' ORDER BY number DESC LIMIT 1`,
    { bind: [teamId], type: QueryTypes.SELECT, transaction },
  );
  if (!release) {
    throw new AppError(
      "unprocessable",
      "The team has no published line-table release yet: a lab lead publishes one first.",
    );
  }
  return release;
}

/** The release's lamp lines of the given gases inside [minNm, maxNm], as the tables give them (air above 200 nm). */
async function lampLinesOf(
  releaseId: string,
  lamps: string[],
  rangeNm: [number, number],
): Promise<LampLine[]> {
  const rows = await selectLines(
    `l.release_id = $1 AND 'lamp' = ANY(l.flags) AND l.element = ANY($2::text[])
       AND coalesce(l.air_nm, l.vacuum_nm) BETWEEN $3 AND $4`,
    [releaseId, lamps, rangeNm[0], rangeNm[1]],
    undefined,
    "ORDER BY coalesce(l.air_nm, l.vacuum_nm)",
  );
  return rows.map((row) => ({
    wavelengthNm: row.air_nm ?? row.vacuum_nm,
    intensity: row.intensity_lamp ?? 1,
    species: row.species,
    id: row.id,
  }));
}

/**
 * Tells two calibrations of one instrument apart, even on one date: gases, time (UTC, like calibratedOn),
 * model, RMS and covered range, e.g. "Ne+Ar · 14:05 · polynomial-3 · RMS 0.012 nm · 402–918 nm".
 */
export function calibrationLabel(parts: {
  lamps: string[];
  createdAt: Date;
  model: string;
  rmsNm: number;
  coveredRangeNm: [number, number];
}): string {
  const time = parts.createdAt.toISOString().slice(11, 16);
  const [fromNm, toNm] = parts.coveredRangeNm;
  return [
    parts.lamps.join("+"),
    time,
    parts.model,
    `RMS ${parts.rmsNm.toFixed(3)} nm`,
    `${Math.round(fromNm)}–${Math.round(toNm)} nm`,
  ].join(" · ");
}

export function toCalibrationRecord(row: Calibration): CalibrationRecord {
  const model = calibrationModelChoice(row.model);
  const coveredRangeNm: [number, number] = [row.coveredMinNm, row.coveredMaxNm];
  return {
    id: row.id,
    label: calibrationLabel({
      lamps: row.lamps,
      createdAt: row.createdAt,
      model,
      rmsNm: row.rmsNm,
      coveredRangeNm,
    }),
    instrumentId: row.instrumentId,
    spectrumId: row.spectrumId,
    lineReleaseId: row.lineReleaseId,
    lamps: row.lamps,
    requestedModel: row.requestedModel,
    model,
    rmsNm: row.rmsNm,
    dof: row.dof,
    pairs: row.pairs,
    rejected: row.rejected,
    coveredRangeNm,
    uncertainty: row.uncertainty,
    drift: row.drift,
    pairing: row.pairing,
    warnings: row.warnings,
    softwareVersion: row.softwareVersion,
    calibratedOn: String(row.calibratedOn),
    createdAt: row.createdAt.toISOString(),
  };
}

/** A calibration the actor may see; another team's is not found. */
export async function loadCalibration(actor: Actor, calibrationId: string): Promise<Calibration> {
  const row = await Calibration.findByPk(calibrationId);
  if (!row) throw notFound("No such calibration.");
  authorize(actor, "instrument.view", { teamId: row.teamId });
  return row;
}

export async function fetchCalibration(
  actor: Actor,
  calibrationId: string,
): Promise<CalibrationRecord> {
  return toCalibrationRecord(await loadCalibration(actor, calibrationId));
}

/** An instrument's calibration history, newest (the default for new runs) first. */
export async function fetchCalibrations(
  actor: Actor,
  instrumentId: string,
): Promise<CalibrationRecord[]> {
  const instrument = await loadInstrument(actor, instrumentId);
  const rows = await Calibration.findAll({
    where: { instrumentId: instrument.id },
    order: [
      ["createdAt", "DESC"],
      ["id", "DESC"],
    ],
  });
  return rows.map(toCalibrationRecord);
}

export async function evaluateStoredCalibration(
  actor: Actor,
  calibrationId: string,
  pixels: number[],
): Promise<{
  wavelengthsNm: (number | null)[];
  uncertaintiesNm: (number | null)[];
  warnings: string[];
}> {
  const row = await loadCalibration(actor, calibrationId);
  const x = Float64Array.from(pixels);
  const warnings: string[] = [];
  const wavelengths = evaluateCalibration(row.model, x, {
    onWarning: (w) => warnings.push(...w.map((e) => e.message)),
  });
  const sigma = calibrationUncertainty(row.model, x);
  const finite = (v: number) => (Number.isFinite(v) ? v : null);
  return {
    wavelengthsNm: Array.from(wavelengths, finite),
    uncertaintiesNm: Array.from(sigma, finite),
    warnings,
  };
}

const NEEDS_MANUAL_HINT =
  "Pair two or three lamp peaks with their lines by hand (send pairs: [{pixel, wavelengthNm}, …]) and calibrate again.";

/** What the workbench shows: the core's edited calibration, with the records it was made from. */
export interface CalibrationPreview extends Omit<EditedLampCalibration, "fit"> {
  instrumentId: string;
  spectrumId: string;
  lineRelease: { id: string; number: number };
  lamps: string[];
  requestedModel: CalibrationModelChoice;
  xUnit: string;
  /** The array's extent on the file's axis. */
  domain: [number, number];
}

/** A pair as the workbench shows it (see WorkbenchPair). */
export type CalibrationPreviewPair = WorkbenchPair;

interface ComputedCalibration {
  preview: CalibrationPreview;
  instrument: Awaited<ReturnType<typeof loadInstrument>>;
  spectrum: Awaited<ReturnType<typeof loadSpectrum>>;
  fit: FitCalibrationResult;
}

/** A calibration error as the reply a chemist reads: a bad hand edit is a 400 on its field, the rest 422. */
function calibrationAppError(error: CalibrationError): AppError {
  const field = typeof error.details.field === "string" ? error.details.field : null;
  const fieldMessage =
    typeof error.details.fieldMessage === "string" ? error.details.fieldMessage : error.message;
  const fieldErrors = field ? { [field]: [fieldMessage] } : undefined;
  switch (error.code) {
    case "invalid-edit":
      return new AppError("validation", error.message, { fieldErrors });
    case "not-paired":
      return new AppError("unprocessable", `${error.message} ${NEEDS_MANUAL_HINT}`);
    case "too-few-pairs-left":
      return new AppError("unprocessable", error.message, { fieldErrors });
    default:
      return new AppError(
        "unprocessable",
        `The calibration could not be fitted (${error.code}): ${error.message}.`,
      );
  }
}

/**
 * The one computation behind the preview and the saved calibration: load the instrument, the lamp and
 * its lines, and let the core pair them (automatically, or from hand-picked seeds), apply the chemist's
 * edits, fit the chosen model and compare every model — in the worker pool, off the request thread.
 * Writes nothing.
 */
async function computeCalibration(
  actor: Actor,
  input: CalibrationCreateInput,
): Promise<ComputedCalibration> {
  const instrument = await loadInstrument(actor, input.instrumentId, "calibration.create");
  const spectrum = await loadSpectrum(actor, input.spectrumId);
  if (spectrum.instrumentId !== instrument.id) {
    throw new AppError("validation", "That spectrum was recorded on another instrument.", {
      fieldErrors: { spectrumId: ["Choose a lamp spectrum of this instrument."] },
    });
  }
  if (spectrum.kind !== "lamp") {
    throw new AppError("validation", "Calibrate with a lamp spectrum, not a sample.", {
      fieldErrors: { spectrumId: ["Choose a lamp spectrum."] },
    });
  }
  const release = await newestPublishedRelease(instrument.teamId);
  const lamps = [...new Set(input.lamps)];
  const nominalRangeNm: [number, number] = [instrument.nominalMinNm, instrument.nominalMaxNm];
  const lines = await lampLinesOf(release.id, lamps, nominalRangeNm);
  if (lines.length < 3) {
    throw new AppError(
      "unprocessable",
      `Line-table release ${release.number} has ${lines.length} lamp line(s) of ${lamps.join(", ")} between ` +
        `${nominalRangeNm[0]} and ${nominalRangeNm[1]} nm: too few to calibrate. Check the lamp gases.`,
    );
  }
  const { x, y } = spectrumPoints(spectrum);
  const domain: [number, number] = [x[0], x[x.length - 1]];
  // A recalibration starts from the instrument's last calibration on the same axis (the daily case).
  const last = await latestCalibrationOf(instrument.id);
  const previous = last && last.xUnit === spectrum.xUnit ? { previous: last.model } : {};

  try {
    const edited = await runHeavyTask({
      kind: "edit-lamp-calibration",
      x,
      y,
      lines,
      options: {
        nominalRangeNm,
        dispersion: instrument.dispersion,
        resolutionNm: instrument.resolutionNm,
        domain,
        glass: instrument.glass ?? undefined,
        apexDeg: instrument.apexDeg ?? undefined,
        model: "auto",
        ...previous,
      },
      edits: {
        seeds: input.pairs,
        added: input.added,
        excluded: input.excluded,
        model: input.model,
      },
    });
    const { fit, ...shown } = edited;
    const preview: CalibrationPreview = {
      instrumentId: instrument.id,
      spectrumId: spectrum.id,
      lineRelease: release,
      lamps,
      requestedModel: input.model,
      xUnit: spectrum.xUnit,
      domain,
      ...shown,
    };
    return { preview, instrument, spectrum, fit };
  } catch (error) {
    if (error instanceof CalibrationError) throw calibrationAppError(error);
    throw error;
  }
}

/** What saving would record, computed the same way, without writing anything. */
export async function previewCalibration(
  actor: Actor,
  input: CalibrationCreateInput,
): Promise<CalibrationPreview> {
  return (await computeCalibration(actor, input)).preview;
}

export async function createCalibration(
  actor: Actor,
  input: CalibrationCreateInput,
): Promise<CalibrationRecord> {
  const { preview, instrument, spectrum, fit } = await computeCalibration(actor, input);
  const model = fit.model;
  const { domain } = preview;
  const release = preview.lineRelease;
  // The newest calibration becomes the instrument's default: a doubtful one only with a stated reason.
  const { doubts } = preview.result;
  if (doubts.length > 0 && !input.confirmReason) {
    throw new AppError(
      "unprocessable",
      `This calibration would become the instrument's default but is doubtful: ${doubts.join(" ")} ` +
        "Improve the pairs, or say why it can be trusted and save it again.",
      {
        fieldErrors: {
          confirmReason: [
            `Say why this calibration can be trusted (10–500 characters). Its doubts: ${doubts.join(" ")}`,
          ],
        },
      },
    );
  }
  const confirmation =
    doubts.length > 0 && input.confirmReason
      ? { reason: input.confirmReason, doubts, by: actor.id }
      : null;

  return sequelize.transaction(async (transaction) => {
    const previous = await latestCalibrationOf(instrument.id, transaction);
    const drift: CalibrationRecord["drift"] =
      previous && previous.xUnit === spectrum.xUnit
        ? { previousCalibrationId: previous.id, ...calibrationDrift(model, previous.model, domain) }
        : null;
    const row = await Calibration.create(
      {
        teamId: instrument.teamId,
        instrumentId: instrument.id,
        spectrumId: spectrum.id,
        lineReleaseId: release.id,
        previousCalibrationId: previous?.id ?? null,
        lamps: preview.lamps,
        requestedModel: input.model,
        modelKind: model.kind,
        model,
        xUnit: spectrum.xUnit,
        pairs: fit.pairs.filter((p) => p.used).map(lampPairRecord),
        rejected: fit.rejected.map(lampPairRecord),
        rmsNm: fit.rmsNm,
        dof: fit.dof,
        coveredMinNm: model.coveredNm[0],
        coveredMaxNm: model.coveredNm[1],
        uncertainty: preview.result.uncertainty,
        drift,
        // Rows are frozen after insert: the confirmation of a doubtful calibration is written with it.
        pairing: confirmation
          ? { ...preview.result.pairing, confirmation }
          : preview.result.pairing,
        warnings: fit.warnings,
        softwareVersion: SOFTWARE_VERSION,
        calibratedOn: new Date().toISOString().slice(0, 10),
        createdById: actor.id,
      },
      { transaction },
    );
    const record = toCalibrationRecord(row);
    await recordAudit(
      {
        actorId: actor.id,
        teamId: instrument.teamId,
        action: "calibration.create",
        entity: "calibration",
        entityId: row.id,
        reason: confirmation?.reason ?? null,
        after: {
          label: record.label,
          instrumentId: instrument.id,
          spectrumId: spectrum.id,
          lineReleaseId: release.id,
          model: record.model,
          rmsNm: record.rmsNm,
          pairs: record.pairs.length,
          rejected: record.rejected.length,
          excludedByHand: preview.result.pairing.excludedByHand ?? 0,
          addedByHand: preview.result.pairing.addedByHand ?? 0,
          coveredRangeNm: record.coveredRangeNm,
          driftMaxAbsNm: drift?.maxAbsNm ?? null,
          doubts,
          confirmation: confirmation
            ? { reason: confirmation.reason, doubts: confirmation.doubts }
            : null,
        },
      },
      transaction,
    );
    return record;
  });
}

/** A calibration with what its page shows beside it: the release number and the previous calibration. */
export async function fetchCalibrationView(
  actor: Actor,
  calibrationId: string,
): Promise<{
  calibration: CalibrationRecord;
  releaseNumber: number | null;
  previous: CalibrationRecord | null;
}> {
  const row = await loadCalibration(actor, calibrationId);
  const [release] = await sequelize.query<{ number: number }>(
    `SELECT number FROM line_releases WHERE id = $1`,
    {
      bind: [row.lineReleaseId],
      type: QueryTypes.SELECT,
    },
  );
  const previousRow = row.previousCalibrationId
    ? await Calibration.findByPk(row.previousCalibrationId)
    : null;
  return {
    calibration: toCalibrationRecord(row),
    releaseNumber: release?.number ?? null,
    previous:
      previousRow && previousRow.teamId === row.teamId ? toCalibrationRecord(previousRow) : null,
  };
}
