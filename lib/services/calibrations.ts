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
  CalibrationError,
  calibrationDoubts,
  calibrationUncertainty,
  compareCalibrationModels,
  dispersionAt,
  evaluateCalibration,
  fitCalibration,
  pairManually,
  UNPAIRED_REACH_FWHM,
  unpairedLampPeaks,
  type CalibrationModel,
  type FitCalibrationResult,
  type FittedCalibrationPair,
  type GlassName,
  type LampLine,
  type LampPair,
  type LampPairingResult,
  type UnpairedPeakReasonCode,
} from "@/lib/spectrum/calibration";
import type { Peak } from "@/lib/spectrum/types";
import { runHeavyTask } from "@/lib/workers/heavy-pool";
import { CALIBRATION_MODELS, type CalibrationCreateInput, type CalibrationModelChoice } from "@/lib/validation/workflow-schemas";
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

/**
 * Tells two calibrations of one instrument apart, even on one date: gases, time (UTC, like calibratedOn),
 * model, RMS and covered range, e.g. "Ne+Ar · 14:05 · polynomial-3 · RMS 0.012 nm · 402–918 nm".
 */
export function calibrationLabel(parts: { lamps: string[]; createdAt: Date; model: string; rmsNm: number; coveredRangeNm: [number, number] }): string {
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
  const model = modelLabel(row.model);
  const coveredRangeNm: [number, number] = [row.coveredMinNm, row.coveredMaxNm];
  return {
    id: row.id,
    label: calibrationLabel({ lamps: row.lamps, createdAt: row.createdAt, model, rmsNm: row.rmsNm, coveredRangeNm }),
    instrumentId: row.instrumentId,
    spectrumId: row.spectrumId,
    lineReleaseId: row.lineReleaseId,
    lamps: row.lamps,
    requestedModel: row.requestedModel,
    model,
    rmsNm: row.rmsNm,
    dof: row.dof,
    pairs: row.pairs as CalibrationPairRecord[],
    rejected: row.rejected as CalibrationPairRecord[],
    coveredRangeNm,
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

/** A line given by hand must sit this close to a lamp line of the table. */
const LINE_MATCH_NM = 0.05;

/** A pair as the workbench shows it: where it came from and whether the fit used it. */
export interface CalibrationPreviewPair extends CalibrationPairRecord {
  /** "auto": found by the pairing; "added": made by hand. */
  origin: "auto" | "added";
  /** "used" in the fit, "rejected" by the fit's outlier rejection, or "excluded" by hand. */
  state: "used" | "rejected" | "excluded";
}

/** One model of the core's comparison, fitted to the same pairs. */
export interface CalibrationComparisonRow {
  /** "polynomial-2", "hartmann", "prism": the value of the model selector. */
  model: CalibrationModelChoice;
  parameterCount: number | null;
  rmsNm: number | null;
  aicc: number | null;
  bic: number | null;
  /** λ ± 1σ at the array's first and last pixel: how the model extrapolates. */
  ends: { pixel: number; wavelengthNm: number; uncertaintyNm: number }[] | null;
  glass: string | null;
  /** Why it could not be fitted. */
  failure: string | null;
}

export interface CalibrationPreview {
  instrumentId: string;
  spectrumId: string;
  lineRelease: { id: string; number: number };
  lamps: string[];
  requestedModel: CalibrationModelChoice;
  xUnit: string;
  /** The array's extent on the file's axis. */
  domain: [number, number];
  result: {
    model: string;
    rmsNm: number;
    dof: number;
    /** Every pair: used, rejected by the fit, or excluded by hand (residuals under the fitted model). */
    pairs: CalibrationPreviewPair[];
    coveredRangeNm: [number, number];
    uncertainty: { medianNm: number; maxNm: number };
    warnings: { code: string; message: string }[];
    pairing: CalibrationRecord["pairing"];
    /**
     * Why this calibration should not silently become the instrument's default (calibrationDoubts);
     * saving it then needs confirmReason.
     */
    doubts: string[];
    /**
     * A competing automatic pairing that explains the lamp nearly as well (empty when there is none):
     * the chemist decides between them.
     */
    rival: { pixel: number; wavelengthNm: number; species: string }[];
  };
  comparison: { candidates: CalibrationComparisonRow[]; recommended: CalibrationModelChoice | null; reason: string };
  /** The lamp's peaks, with the wavelength the fitted model puts them at and their line when paired. */
  peaks: {
    pixel: number;
    height: number;
    fwhm: number;
    snr: number;
    predictedNm: number | null;
    pairedWith: { wavelengthNm: number; species: string } | null;
    /** Why an unpaired peak is unpaired (null when paired), with the lamp lines the reason is about. */
    unpaired: UnpairedPeakExplanation | null;
  }[];
  /** Lamp lines of the chosen gases in the instrument's nominal range. */
  lines: { wavelengthNm: number; species: string; intensity: number; lineId: string; paired: boolean }[];
  /**
   * The tolerances the workbench states, as the service and the core apply them: a line given by hand
   * must lie within lineMatchNm of a table line; an expected line "has a peak" within
   * expectedPeakReachFwhm local FWHMs.
   */
  tolerances: { lineMatchNm: number; expectedPeakReachFwhm: number };
  /** Unpaired lamp lines the calibration puts on the array with no peak within tolerances.expectedPeakReachFwhm FWHM: below the peak threshold. */
  expectedWithoutPeak: { wavelengthNm: number; species: string; intensity: number; reason: "below threshold" }[];
}

/** An unpaired peak's reason in words the workbench shows as they are. */
export interface UnpairedPeakExplanation {
  code: UnpairedPeakReasonCode;
  /** "blend", "not in the table", "line paired with another peak", "left unpaired", "no wavelength". */
  reason: string;
  lines: { wavelengthNm: number; species: string }[];
}

const UNPAIRED_REASON_WORDS: Record<UnpairedPeakReasonCode, string> = {
  blend: "blend",
  "not-in-table": "not in the table",
  "line-paired-elsewhere": "line paired with another peak",
  "left-unpaired": "left unpaired",
  "no-wavelength": "no wavelength",
};

interface ComputedCalibration {
  preview: CalibrationPreview;
  instrument: Awaited<ReturnType<typeof loadInstrument>>;
  spectrum: Awaited<ReturnType<typeof loadSpectrum>>;
  fit: FitCalibrationResult;
  /** Pairs the chemist left out, with their residuals under the final model. */
  excluded: CalibrationPairRecord[];
}

const COMPARED_MODELS: CalibrationModelChoice[] = CALIBRATION_MODELS.filter((m) => m !== "auto");

function choiceOf(kind: string, degree?: number): CalibrationModelChoice {
  return (kind === "polynomial" ? `polynomial-${degree}` : kind) as CalibrationModelChoice;
}

/** The peak nearest a pixel, if it lies within its own width (at least 3 pixels) of it. */
function peakNear(peaks: Peak[], pixel: number): number {
  let nearest = -1;
  peaks.forEach((p, k) => {
    if (nearest < 0 || Math.abs(p.x - pixel) < Math.abs(peaks[nearest].x - pixel)) nearest = k;
  });
  if (nearest < 0 || Math.abs(peaks[nearest].x - pixel) > Math.max(3, 2 * peaks[nearest].fwhm)) return -1;
  return nearest;
}

/** The lamp line nearest a wavelength, if within LINE_MATCH_NM of it. */
function lineAt(lines: LampLine[], wavelengthNm: number): number {
  let nearest = -1;
  lines.forEach((l, k) => {
    if (nearest < 0 || Math.abs(l.wavelengthNm - wavelengthNm) < Math.abs(lines[nearest].wavelengthNm - wavelengthNm)) nearest = k;
  });
  return nearest >= 0 && Math.abs(lines[nearest].wavelengthNm - wavelengthNm) <= LINE_MATCH_NM ? nearest : -1;
}

/** An unpaired peak's reason in words; a peak without a calibrated wavelength says so. */
function explainUnpaired(
  paired: boolean,
  reason: { code: UnpairedPeakReasonCode; lineIndices: number[] } | null,
  lineRef: (j: number) => { wavelengthNm: number; species: string },
): UnpairedPeakExplanation | null {
  if (paired) return null;
  const code = reason?.code ?? "no-wavelength";
  return { code, reason: UNPAIRED_REASON_WORDS[code], lines: (reason?.lineIndices ?? []).map(lineRef) };
}

const modelName = (kind: string, degree?: number) => (kind === "polynomial" ? `degree-${degree} polynomial` : `${kind} model`);

/**
 * The one computation behind the preview and the saved calibration: pair the lamp's peaks with the
 * lamp lines (automatically, or from hand-picked seeds), drop the pairs the chemist excluded, add the
 * ones made by hand, fit the chosen model and compare every model on the same pairs. Writes nothing.
 */
async function computeCalibration(actor: Actor, input: CalibrationCreateInput): Promise<ComputedCalibration> {
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
  const excludedInput = input.excluded ?? [];
  const addedInput = input.added ?? [];
  const glass = (instrument.glass as GlassName | null) ?? undefined;
  const apexDeg = instrument.apexDeg ?? undefined;

  // A recalibration starts from the instrument's last calibration on the same axis (the daily case).
  const last = await latestCalibrationOf(instrument.id);
  const previous = last && last.xUnit === spectrum.xUnit ? { previous: last.model } : {};

  try {
    // Automatic pairing (up to seconds of CPU on a prism) runs in the worker pool, off the request thread.
    const auto = await runHeavyTask({
      kind: "calibrate-lamp",
      x,
      y,
      lines,
      options: { ...pairingOptions, ...previous, model: "auto" },
    });
    const peaks = auto.peaks;
    let pairing: LampPairingResult = auto.pairing;
    let fit: FitCalibrationResult | null = auto.fit;
    if (input.pairs) {
      const seeds = input.pairs.map((seed, i) => {
        const peakIndex = peakNear(peaks, seed.pixel);
        if (peakIndex < 0) {
          throw new AppError("validation", `No lamp peak was found near pixel ${seed.pixel}.`, {
            fieldErrors: { [`pairs.${i}.pixel`]: ["No lamp peak near this pixel."] },
          });
        }
        const lineIndex = lineAt(lines, seed.wavelengthNm);
        if (lineIndex < 0) {
          throw new AppError("validation", `No lamp line of ${lamps.join(", ")} at ${seed.wavelengthNm} nm (±${LINE_MATCH_NM} nm).`, {
            fieldErrors: { [`pairs.${i}.wavelengthNm`]: ["No lamp line at this wavelength."] },
          });
        }
        return { peakIndex, lineIndex };
      });
      pairing = pairManually(peaks, lines, seeds, pairingOptions);
      fit = pairing.status === "paired" ? pairing.model : null;
    }
    // An automatic pairing to check is shown for the chemist to confirm or correct (saving it as the
    // default then needs a reason, see the doubts below); only with no candidate at all is there nothing to show.
    const toCheck = !input.pairs && pairing.status === "check" && pairing.candidate ? pairing.candidate : null;
    if (toCheck) fit = toCheck;
    if ((pairing.status !== "paired" && !toCheck) || !fit) {
      const why =
        pairing.status === "check"
          ? `An automatic pairing was found but is not trusted — ${(pairing.reasons ?? []).join(" ")}`
          : `The lamp peaks could not be paired with the lamp lines automatically (${pairing.message}).`;
      throw new AppError("unprocessable", `${why} ${NEEDS_MANUAL_HINT}`);
    }

    // The pairs the chemist works with: the pairing's, less the excluded, with the added ones.
    type WorkPair = { peakIndex: number; lineIndex: number; origin: "auto" | "added" };
    // Taken from the pairing's fit, which also holds the pairs its outlier rejection set aside, in its order.
    const pairingFit = fit;
    // A blend the pairing paired at its centroid (the Hg 365 nm group) is a line of its own here, at that
    // centroid, so that the workbench refits and shows the pair the pairing made.
    const rival = toCheck ? (pairing.rivalSuggestion ?? []) : [];
    for (const p of [...pairingFit.pairs, ...rival]) {
      const member = lines.find((l) => l.id === p.lineId);
      const id = `blend:${p.lineId}`;
      if (member && Math.abs(member.wavelengthNm - p.wavelengthNm) > 1e-9 && !lines.some((l) => l.id === id)) {
        lines.push({ wavelengthNm: p.wavelengthNm, intensity: member.intensity, species: member.species, id });
      }
    }
    lines.sort((a, b) => a.wavelengthNm - b.wavelengthNm);
    let work: WorkPair[] = pairingFit.pairs.map((p) => ({
      peakIndex: peaks.findIndex((k) => k.x === p.x),
      lineIndex: lines.findIndex((l) => (l.id === p.lineId || l.id === `blend:${p.lineId}`) && Math.abs(l.wavelengthNm - p.wavelengthNm) < 1e-9),
      origin: "auto",
    }));
    if (work.some((w) => w.peakIndex < 0 || w.lineIndex < 0)) throw new Error("a pair of the pairing names no peak or line");
    const overridden: WorkPair[] = [];
    addedInput.forEach((given, i) => {
      const peakIndex = peakNear(peaks, given.pixel);
      if (peakIndex < 0) {
        throw new AppError("validation", `No lamp peak was found near pixel ${given.pixel}.`, {
          fieldErrors: { [`added.${i}.pixel`]: ["No lamp peak near this pixel."] },
        });
      }
      const lineIndex = lineAt(lines, given.wavelengthNm);
      if (lineIndex < 0) {
        throw new AppError(
          "validation",
          `No lamp line of ${lamps.join(", ")} at ${given.wavelengthNm} nm (±${LINE_MATCH_NM} nm) in the nominal range.`,
          { fieldErrors: { [`added.${i}.wavelengthNm`]: ["No lamp line at this wavelength."] } },
        );
      }
      if (work.some((w) => w.origin === "added" && (w.peakIndex === peakIndex || w.lineIndex === lineIndex))) {
        throw new AppError("validation", `The pair at pixel ${given.pixel} repeats a peak or a line already added by hand.`, {
          fieldErrors: { [`added.${i}.pixel`]: ["This peak or line is already paired by hand."] },
        });
      }
      // A pair made by hand overrides whatever the pairing did with that peak or that line.
      overridden.push(...work.filter((w) => w.peakIndex === peakIndex || w.lineIndex === lineIndex));
      work = work.filter((w) => w.peakIndex !== peakIndex && w.lineIndex !== lineIndex);
      work.push({ peakIndex, lineIndex, origin: "added" });
    });
    const excludedWork: WorkPair[] = [];
    excludedInput.forEach((given, i) => {
      const matches = (w: WorkPair) =>
        Math.abs(peaks[w.peakIndex].x - given.pixel) <= 1 && Math.abs(lines[w.lineIndex].wavelengthNm - given.wavelengthNm) <= LINE_MATCH_NM;
      const k = work.findIndex(matches);
      // Leaving out a pair that a pair made by hand already replaced asks for nothing more (trying a
      // competing pairing replaces some pairs and leaves out the rest).
      if (k < 0 && overridden.some(matches)) return;
      if (k < 0) {
        throw new AppError("validation", `No pair at pixel ${given.pixel} with the line at ${given.wavelengthNm} nm to leave out.`, {
          fieldErrors: { [`excluded.${i}.pixel`]: ["No such pair: pair again and choose from the table."] },
        });
      }
      excludedWork.push(...work.splice(k, 1));
    });
    const toPair = (w: WorkPair): LampPair => ({
      x: peaks[w.peakIndex].x,
      xUncertainty: peaks[w.peakIndex].xUncertainty,
      wavelengthNm: lines[w.lineIndex].wavelengthNm,
      species: lines[w.lineIndex].species,
      lineId: lines[w.lineIndex].id,
      peakIndex: w.peakIndex,
      lineIndex: w.lineIndex,
    });
    const pairs = work.map(toPair);
    const pairRefOf = (w: WorkPair) => ({ pixel: peaks[w.peakIndex].x, wavelengthNm: lines[w.lineIndex].wavelengthNm, species: lines[w.lineIndex].species });
    const edited = excludedWork.length > 0 || addedInput.length > 0;
    if (edited && pairs.length < 3) {
      throw new AppError(
        "unprocessable",
        `Too few pairs left: ${pairs.length} remain after ${excludedWork.length} exclusion(s); at least 3 are needed to fit even a straight line. Include some pairs again.`,
      );
    }

    // The model the pairing chose, refitted to the edited pairs (a polynomial's degree as the pairs allow).
    const autoFit = (): FitCalibrationResult => {
      const kind = pairingFit.model.kind;
      const degree = pairingFit.model.kind === "polynomial" ? Math.min(pairingFit.model.degree, Math.max(1, pairs.length - 2)) : undefined;
      return fitCalibration(pairs, { model: kind, degree, domain, glass: kind === "prism" ? glass : undefined, apexDeg });
    };
    const wanted = requestedFit(input.model);
    const physical = instrument.dispersion === "prism" && (glass !== undefined || instrument.apexDeg !== null);
    let baseline: FitCalibrationResult = edited ? autoFit() : pairingFit;
    if (!wanted && physical && baseline.model.kind === "prism") {
      baseline = fitCalibration(pairs, { model: "prism", domain, glass, apexDeg });
    }
    let chosen = baseline;
    if (wanted) {
      try {
        chosen = fitCalibration(pairs, { model: wanted.kind, degree: wanted.degree, domain, glass, apexDeg });
      } catch (error) {
        if (error instanceof CalibrationError && error.code === "too-few-pairs") {
          throw new AppError(
            "unprocessable",
            `The ${modelName(wanted.kind, wanted.degree)} needs more pairs than remain (${error.message}). Include pairs again or choose a simpler model.`,
            { fieldErrors: { model: ["Needs more pairs than remain."] } },
          );
        }
        throw error;
      }
    }

    // Every model compared on the same clean pairs: those the baseline fit kept.
    const clean = baseline.pairs.filter((p) => p.used);
    const comparison = compareCalibrationModels(clean, { dispersion: instrument.dispersion, domain, glass, apexDeg });
    const candidates: CalibrationComparisonRow[] = COMPARED_MODELS.map((choice) => {
      const c = comparison.candidates.find((k) => choiceOf(k.kind, k.degree) === choice);
      if (!c) {
        return { model: choice, parameterCount: null, rmsNm: null, aicc: null, bic: null, ends: null, glass: null, failure: `needs more than the ${clean.length} pairs in the fit` };
      }
      const finite = (v: number | undefined) => (v !== undefined && Number.isFinite(v) ? v : null);
      return {
        model: choice,
        parameterCount: c.parameterCount,
        rmsNm: finite(c.rmsNm),
        aicc: finite(c.aicc),
        bic: finite(c.bic),
        ends: c.ends ? c.ends.map((e) => ({ pixel: e.x, wavelengthNm: e.wavelengthNm, uncertaintyNm: e.uncertaintyNm })) : null,
        glass: c.glass ?? null,
        failure: c.failure ? c.failure.message : null,
      };
    });
    const recommended = comparison.recommended >= 0 ? comparison.candidates[comparison.recommended] : null;

    const model = chosen.model;
    const covered = Float64Array.from({ length: 41 }, (_, i) => model.coveredX[0] + ((model.coveredX[1] - model.coveredX[0]) * i) / 40);
    const sigma = Array.from(calibrationUncertainty(model, covered)).filter(Number.isFinite).sort((a, b) => a - b);
    const uncertainty = { medianNm: sigma[sigma.length >> 1] ?? 0, maxNm: sigma[sigma.length - 1] ?? 0 };
    const quiet = { onWarning: () => undefined };
    const excludedPairs = excludedWork.map(toPair);
    const excludedFitted = evaluateCalibration(model, Float64Array.from(excludedPairs.map((p) => p.x)), quiet);
    const excluded: CalibrationPairRecord[] = excludedPairs.map((p, i) => ({
      pixel: p.x,
      wavelengthNm: p.wavelengthNm,
      residualNm: p.wavelengthNm - excludedFitted[i],
      species: p.species ?? null,
      lineId: p.lineId ?? null,
    }));
    const predicted = evaluateCalibration(model, Float64Array.from(peaks.map((p) => p.x)), quiet);
    // Excluded pairs stay paired on the chart (drawn as excluded); only peaks without any pair are offered.
    const pairedPeak = new Map([...work, ...excludedWork].map((w) => [w.peakIndex, w.lineIndex]));
    const pairedLines = new Set(work.map((w) => w.lineIndex));
    const pairingRecord: CalibrationRecord["pairing"] = {
      status: pairing.status,
      confidence: pairing.confidence,
      message: pairing.message,
      manualSeeds: input.pairs?.length ?? 0,
      excludedByHand: excludedWork.length,
      addedByHand: addedInput.length,
      // Which ones, as resolved to a peak and a line, so the record says what the chemist changed.
      handPairs: [
        ...excludedWork.map((w) => ({ change: "excluded" as const, ...pairRefOf(w) })),
        ...work.filter((w) => w.origin === "added").map((w) => ({ change: "added" as const, ...pairRefOf(w) })),
      ],
    };
    // Doubts about the chosen fit; the confidence counts only for an automatic pairing (no seeds by hand).
    const doubts = [
      ...(toCheck ? [`The automatic pairing is not trusted: ${(pairing.reasons ?? []).join(" ")}`] : []),
      ...calibrationDoubts(chosen, input.pairs ? {} : { automaticConfidence: pairing.confidence }),
    ];
    // Why peaks stay unpaired, in calibrated wavelength with each peak's FWHM turned into nm.
    const localDispersion = dispersionAt(model, Float64Array.from(peaks.map((p) => p.x)));
    const arrayEndsNm = Array.from(evaluateCalibration(model, Float64Array.from(domain), quiet));
    const explained =
      arrayEndsNm.every(Number.isFinite) && arrayEndsNm[0] !== arrayEndsNm[1]
        ? unpairedLampPeaks(
            peaks.map((p, i) => ({
              wavelengthNm: predicted[i],
              // A width the model cannot turn into nm falls back to the instrument's resolution.
              fwhmNm: Number.isFinite(localDispersion[i]) && localDispersion[i] !== 0 ? p.fwhm * Math.abs(localDispersion[i]) : instrument.resolutionNm,
              paired: pairedPeak.has(i),
            })),
            lines.map((l, i) => ({ wavelengthNm: l.wavelengthNm, paired: pairedLines.has(i) })),
            { arrayRangeNm: [Math.min(...arrayEndsNm), Math.max(...arrayEndsNm)] },
          )
        : null;
    const lineRef = (j: number) => ({ wavelengthNm: lines[j].wavelengthNm, species: lines[j].species });
    const previewPairs: CalibrationPreviewPair[] = [
      ...chosen.pairs.map((p, i) => ({ ...toPairRecord(p), origin: work[i].origin, state: p.used ? ("used" as const) : ("rejected" as const) })),
      ...excluded.map((p, i) => ({ ...p, origin: excludedWork[i].origin, state: "excluded" as const })),
    ].sort((a, b) => a.pixel - b.pixel);

    const preview: CalibrationPreview = {
      instrumentId: instrument.id,
      spectrumId: spectrum.id,
      lineRelease: release,
      lamps,
      requestedModel: input.model,
      xUnit: spectrum.xUnit,
      domain,
      result: {
        model: modelLabel(model),
        rmsNm: chosen.rmsNm,
        dof: chosen.dof,
        pairs: previewPairs,
        coveredRangeNm: [model.coveredNm[0], model.coveredNm[1]],
        uncertainty,
        warnings: chosen.warnings,
        pairing: pairingRecord,
        doubts,
        rival: rival.map((p) => ({ pixel: p.x, wavelengthNm: p.wavelengthNm, species: p.species ?? "" })),
      },
      comparison: {
        candidates,
        recommended: recommended ? choiceOf(recommended.kind, recommended.degree) : null,
        reason: comparison.reason,
      },
      peaks: peaks.map((p, i) => {
        const line = pairedPeak.has(i) ? lines[pairedPeak.get(i)!] : null;
        return {
          pixel: p.x,
          height: p.height,
          fwhm: p.fwhm,
          snr: p.snr,
          predictedNm: Number.isFinite(predicted[i]) ? predicted[i] : null,
          pairedWith: line ? { wavelengthNm: line.wavelengthNm, species: line.species } : null,
          unpaired: explainUnpaired(line !== null, explained?.peakReasons[i] ?? null, lineRef),
        };
      }),
      lines: lines.map((l, i) => ({ wavelengthNm: l.wavelengthNm, species: l.species, intensity: l.intensity, lineId: l.id, paired: pairedLines.has(i) })),
      tolerances: { lineMatchNm: LINE_MATCH_NM, expectedPeakReachFwhm: UNPAIRED_REACH_FWHM },
      expectedWithoutPeak: (explained?.expectedWithoutPeak ?? []).map((j) => ({
        wavelengthNm: lines[j].wavelengthNm,
        species: lines[j].species,
        intensity: lines[j].intensity,
        reason: "below threshold" as const,
      })),
    };
    return { preview, instrument, spectrum, fit: chosen, excluded };
  } catch (error) {
    if (error instanceof CalibrationError) {
      throw new AppError("unprocessable", `The calibration could not be fitted (${error.code}): ${error.message}.`);
    }
    throw error;
  }
}

/** What saving would record, computed the same way, without writing anything. */
export async function previewCalibration(actor: Actor, input: CalibrationCreateInput): Promise<CalibrationPreview> {
  return (await computeCalibration(actor, input)).preview;
}

export async function createCalibration(actor: Actor, input: CalibrationCreateInput): Promise<CalibrationRecord> {
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
          confirmReason: [`Say why this calibration can be trusted (10–500 characters). Its doubts: ${doubts.join(" ")}`],
        },
      },
    );
  }
  const confirmation = doubts.length > 0 && input.confirmReason ? { reason: input.confirmReason, doubts, by: actor.id } : null;

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
        lamps: preview.lamps,
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
        uncertainty: preview.result.uncertainty,
        drift,
        // Rows are frozen after insert: the confirmation of a doubtful calibration is written with it.
        pairing: confirmation ? { ...preview.result.pairing, confirmation } : preview.result.pairing,
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
          confirmation: confirmation ? { reason: confirmation.reason, doubts: confirmation.doubts } : null,
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
): Promise<{ calibration: CalibrationRecord; releaseNumber: number | null; previous: CalibrationRecord | null }> {
  const row = await loadCalibration(actor, calibrationId);
  const [release] = await sequelize.query<{ number: number }>(`SELECT number FROM line_releases WHERE id = $1`, {
    bind: [row.lineReleaseId],
    type: QueryTypes.SELECT,
  });
  const previousRow = row.previousCalibrationId ? await Calibration.findByPk(row.previousCalibrationId) : null;
  return {
    calibration: toCalibrationRecord(row),
    releaseNumber: release?.number ?? null,
    previous: previousRow && previousRow.teamId === row.teamId ? toCalibrationRecord(previousRow) : null,
  };
}
