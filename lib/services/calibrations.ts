// Lamp calibrations: peaks of a lamp spectrum paired with the lamp lines of the team's newest
// published line-table release, a dispersion relation fitted by the core, and the record kept with
// everything it came from (release, software version) and its drift from the previous calibration.
import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import { calibrateLamp } from "@/lib/spectrum/analysis";
import {
  CalibrationError,
  calibrationUncertainty,
  evaluateCalibration,
  fitCalibration,
  pairManually,
  type CalibrationModel,
  type FitCalibrationResult,
  type FittedCalibrationPair,
  type GlassName,
  type LampLine,
  type LampPairingResult,
} from "@/lib/spectrum/calibration";
import type { CalibrationCreateInput } from "@/lib/validation/workflow-schemas";
import { Calibration, sequelize } from "@/models";
import { recordAudit } from "./audit";
import { latestCalibrationOf, loadInstrument } from "./instruments";
import { selectLines } from "./line-library-access";
import { loadSpectrum, spectrumPoints } from "./spectra";
import { SOFTWARE_VERSION, type CalibrationPairRecord, type CalibrationRecord } from "./workflow-types";

/** The team's newest published line-table release; calibrations and runs are tied to it. */
export async function newestPublishedRelease(teamId: string, transaction?: Transaction): Promise<{ id: string; number: number }> {
  const [release] = await sequelize.query<{ id: string; number: number }>(
    `SELECT id, number FROM line_releases WHERE team_id = $1 AND status = 'published' ORDER BY number DESC LIMIT 1`,
    { bind: [teamId], type: QueryTypes.SELECT, transaction },
  );
  if (!release) {
    throw new AppError("unprocessable", "The team has no published line-table release yet: a lab lead publishes one first.");
  }
  return release;
}

/** The release's lamp lines of the given gases inside [minNm, maxNm], as the tables give them (air above 200 nm). */
async function lampLinesOf(releaseId: string, lamps: string[], rangeNm: [number, number]): Promise<LampLine[]> {
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

function modelLabel(model: CalibrationModel): string {
  return model.kind === "polynomial" ? `polynomial-${model.degree}` : model.kind;
}

function toPairRecord(pair: FittedCalibrationPair): CalibrationPairRecord {
  return {
    pixel: pair.x,
    wavelengthNm: pair.wavelengthNm,
    residualNm: pair.residualNm,
    species: pair.species ?? null,
    lineId: pair.lineId ?? null,
  };
}

function toCalibrationRecord(row: Calibration): CalibrationRecord {
  return {
    id: row.id,
    instrumentId: row.instrumentId,
    spectrumId: row.spectrumId,
    lineReleaseId: row.lineReleaseId,
    lamps: row.lamps,
    requestedModel: row.requestedModel,
    model: modelLabel(row.model),
    rmsNm: row.rmsNm,
    dof: row.dof,
    pairs: row.pairs as CalibrationPairRecord[],
    rejected: row.rejected as CalibrationPairRecord[],
    coveredRangeNm: [row.coveredMinNm, row.coveredMaxNm],
    uncertainty: row.uncertainty as CalibrationRecord["uncertainty"],
    drift: row.drift as CalibrationRecord["drift"],
    pairing: row.pairing as CalibrationRecord["pairing"],
    warnings: row.warnings as CalibrationRecord["warnings"],
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

export async function fetchCalibration(actor: Actor, calibrationId: string): Promise<CalibrationRecord> {
  return toCalibrationRecord(await loadCalibration(actor, calibrationId));
}

/** An instrument's calibration history, newest (the default for new runs) first. */
export async function fetchCalibrations(actor: Actor, instrumentId: string): Promise<CalibrationRecord[]> {
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
): Promise<{ wavelengthsNm: (number | null)[]; uncertaintiesNm: (number | null)[]; warnings: string[] }> {
  const row = await loadCalibration(actor, calibrationId);
  const x = Float64Array.from(pixels);
  const warnings: string[] = [];
  const wavelengths = evaluateCalibration(row.model, x, { onWarning: (w) => warnings.push(...w.map((e) => e.message)) });
  const sigma = calibrationUncertainty(row.model, x);
  const finite = (v: number) => (Number.isFinite(v) ? v : null);
  return { wavelengthsNm: Array.from(wavelengths, finite), uncertaintiesNm: Array.from(sigma, finite), warnings };
}

function requestedFit(choice: CalibrationCreateInput["model"]): { kind: "polynomial" | "hartmann" | "prism"; degree?: number } | null {
  if (choice === "auto") return null;
  if (choice.startsWith("polynomial-")) return { kind: "polynomial", degree: Number(choice.slice("polynomial-".length)) };
  return { kind: choice as "hartmann" | "prism" };
}

const NEEDS_MANUAL_HINT =
  "Pair two or three lamp peaks with their lines by hand (send pairs: [{pixel, wavelengthNm}, …]) and calibrate again.";

export async function createCalibration(actor: Actor, input: CalibrationCreateInput): Promise<CalibrationRecord> {
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
  const pairingOptions = {
    nominalRangeNm,
    dispersion: instrument.dispersion,
    resolutionNm: instrument.resolutionNm,
    domain,
  };

  let pairing: LampPairingResult;
  let fit: FitCalibrationResult | null;
  try {
    const auto = calibrateLamp(x, y, lines, { ...pairingOptions, model: "auto" });
    pairing = auto.pairing;
    fit = auto.fit;
    if (input.pairs) {
      const seeds = input.pairs.map((seed, i) => {
        let peakIndex = -1;
        auto.peaks.forEach((p, k) => {
          if (peakIndex < 0 || Math.abs(p.x - seed.pixel) < Math.abs(auto.peaks[peakIndex].x - seed.pixel)) peakIndex = k;
        });
        if (peakIndex < 0 || Math.abs(auto.peaks[peakIndex].x - seed.pixel) > Math.max(3, 2 * auto.peaks[peakIndex].fwhm)) {
          throw new AppError("validation", `No lamp peak was found near pixel ${seed.pixel}.`, {
            fieldErrors: { [`pairs.${i}.pixel`]: ["No lamp peak near this pixel."] },
          });
        }
        const lineIndex = lines.findIndex((l) => Math.abs(l.wavelengthNm - seed.wavelengthNm) <= 0.05);
        if (lineIndex < 0) {
          throw new AppError("validation", `No lamp line of ${lamps.join(", ")} at ${seed.wavelengthNm} nm (±0.05 nm).`, {
            fieldErrors: { [`pairs.${i}.wavelengthNm`]: ["No lamp line at this wavelength."] },
          });
        }
        return { peakIndex, lineIndex };
      });
      pairing = pairManually(auto.peaks, lines, seeds, pairingOptions);
      fit = pairing.status === "paired" ? pairing.model : null;
    }
    if (pairing.status !== "paired" || !fit) {
      throw new AppError(
        "unprocessable",
        `The lamp peaks could not be paired with the lamp lines automatically (needs-manual: ${pairing.message}). ${NEEDS_MANUAL_HINT}`,
      );
    }
    const wanted = requestedFit(input.model);
    const glass = (instrument.glass as GlassName | null) ?? undefined;
    const physical = instrument.dispersion === "prism" && (glass !== undefined || instrument.apexDeg !== null);
    if (wanted || (physical && fit.model.kind === "prism")) {
      fit = fitCalibration(pairing.pairs, {
        model: wanted?.kind ?? "prism",
        degree: wanted?.degree,
        domain,
        glass,
        apexDeg: instrument.apexDeg ?? undefined,
      });
    }
  } catch (error) {
    if (error instanceof CalibrationError) {
      throw new AppError("unprocessable", `The calibration could not be fitted (${error.code}): ${error.message}.`);
    }
    throw error;
  }

  const model = fit.model;
  const covered = Float64Array.from({ length: 41 }, (_, i) => model.coveredX[0] + ((model.coveredX[1] - model.coveredX[0]) * i) / 40);
  const sigma = Array.from(calibrationUncertainty(model, covered)).filter(Number.isFinite).sort((a, b) => a - b);
  const uncertainty = { medianNm: sigma[sigma.length >> 1] ?? 0, maxNm: sigma[sigma.length - 1] ?? 0 };

  return sequelize.transaction(async (transaction) => {
    const previous = await latestCalibrationOf(instrument.id, transaction);
    let drift: CalibrationRecord["drift"] = null;
    if (previous && previous.xUnit === spectrum.xUnit) {
      const pixels = [0, 0.25, 0.5, 0.75, 1].map((f) => domain[0] + f * (domain[1] - domain[0]));
      const now = evaluateCalibration(model, Float64Array.from(pixels));
      const before = evaluateCalibration(previous.model, Float64Array.from(pixels));
      const deltaNm = pixels.map((_, i) => now[i] - before[i]);
      drift = {
        previousCalibrationId: previous.id,
        pixels,
        deltaNm,
        maxAbsNm: Math.max(...deltaNm.map((d) => (Number.isFinite(d) ? Math.abs(d) : 0))),
      };
    }
    const row = await Calibration.create(
      {
        teamId: instrument.teamId,
        instrumentId: instrument.id,
        spectrumId: spectrum.id,
        lineReleaseId: release.id,
        previousCalibrationId: previous?.id ?? null,
        lamps,
        requestedModel: input.model,
        modelKind: model.kind,
        model,
        xUnit: spectrum.xUnit,
        pairs: fit.pairs.filter((p) => p.used).map(toPairRecord),
        rejected: fit.rejected.map(toPairRecord),
        rmsNm: fit.rmsNm,
        dof: fit.dof,
        coveredMinNm: model.coveredNm[0],
        coveredMaxNm: model.coveredNm[1],
        uncertainty,
        drift,
        pairing: {
          status: pairing.status,
          confidence: pairing.confidence,
          message: pairing.message,
          manualSeeds: input.pairs?.length ?? 0,
        },
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
        after: {
          instrumentId: instrument.id,
          spectrumId: spectrum.id,
          lineReleaseId: release.id,
          model: record.model,
          rmsNm: record.rmsNm,
          pairs: record.pairs.length,
          rejected: record.rejected.length,
          coveredRangeNm: record.coveredRangeNm,
          driftMaxAbsNm: drift?.maxAbsNm ?? null,
        },
      },
      transaction,
    );
    return record;
  });
}
