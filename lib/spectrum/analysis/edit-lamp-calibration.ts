// The calibration workbench's computation: from an automatic lamp calibration and the chemist's edits
// (seed pairs by hand, pairs left out, pairs added, a model asked for) to the fit, every model compared
// on the same pairs, the uncertainty, and each peak and line with why it is or is not paired. Pure: the
// service loads the lamp and the lines, runs this (in the worker pool) and saves what it returns.
import { CalibrationError } from "../calibration/calibration-error";
import type { CalibrationModel } from "../calibration/calibration-model";
import { calibrationDoubts } from "../calibration/calibration-doubts";
import {
  CALIBRATION_MODELS,
  calibrationModelChoice,
  type CalibrationModelChoice,
} from "../calibration/calibration-model-choice";
import { calibrationUncertainty } from "../calibration/calibration-uncertainty";
import { compareCalibrationModels } from "../calibration/compare-calibration-models";
import { dispersionAt } from "../calibration/dispersion-at";
import { evaluateCalibration } from "../calibration/evaluate-calibration";
import { withBlendUncertainty } from "../calibration/centre-uncertainty";
import { fitCalibration, type FitCalibrationResult } from "../calibration/fit-calibration";
import type { GlassName } from "../calibration/glass-catalogue";
import type { LampLine, LampPair, LampPairingResult } from "../calibration/lamp-pairing-types";
import { pairManually } from "../calibration/pair-manually";
import {
  UNPAIRED_REACH_FWHM,
  unpairedLampPeaks,
  type UnpairedPeakReasonCode,
} from "../calibration/unpaired-lamp-peaks";
import type { CalibrationPair, DispersionKind, Peak } from "../types";
import type { LampCalibration } from "./calibrate-lamp";
import { upperMedian } from "../statistics/upper-median";

/** A line given by hand must sit this close to a lamp line of the table. */
export const HAND_LINE_MATCH_NM = 0.05;

/** A pair as the chemist names it: the peak by its pixel, the line by its wavelength. */
export interface HandPair {
  pixel: number;
  wavelengthNm: number;
}

export interface LampCalibrationEdits {
  /** Two or three pairs picked by hand that replace the automatic pairing (extended to a full pairing). */
  seeds?: HandPair[];
  /** Pairs made by hand: each overrides whatever the pairing did with that peak or that line. */
  added?: HandPair[];
  /** Pairs left out of the fit (matched within 1 pixel and HAND_LINE_MATCH_NM). */
  excluded?: HandPair[];
  /** The model to fit; "auto" keeps the pairing's.
   * @default "auto" */
  model?: CalibrationModelChoice;
}

export interface EditLampCalibrationOptions {
  /** The instrument's nominal range, nm (seed pairs are extended over it). */
  nominalRangeNm: [number, number];
  dispersion: DispersionKind;
  /** Instrument resolution (FWHM) in nm: the width of a peak the model cannot turn into nm.
   * @default nominal span / 500 */
  resolutionNm?: number;
  /** The array's first and last pixel. */
  domain: [number, number];
  /** The prism's glass, when the instrument names one. */
  glass?: GlassName;
  /** The prism's apex angle in degrees, when the instrument states one. */
  apexDeg?: number;
}

/** A pair with its residual under the fitted model. */
export interface LampPairRecord {
  pixel: number;
  wavelengthNm: number;
  residualNm: number;
  species: string | null;
  lineId: string | null;
}

/** A pair as the workbench shows it: where it came from and whether the fit used it. */
export interface WorkbenchPair extends LampPairRecord {
  /** "auto": found by the pairing; "added": made by hand. */
  origin: "auto" | "added";
  /** "used" in the fit, "rejected" by the fit's outlier rejection, or "excluded" by hand. */
  state: "used" | "rejected" | "excluded";
}

/** One model of the comparison, fitted to the same pairs. */
export interface WorkbenchModelRow {
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

/** An unpaired peak's reason in words the workbench shows as they are. */
export interface UnpairedPeakExplanation {
  code: UnpairedPeakReasonCode;
  /** "too broad for one lamp line", "blend", "not in the table", "line paired with another peak", "left unpaired", "no wavelength". */
  reason: string;
  lines: { wavelengthNm: number; species: string }[];
}

/** How the pairs were found and what the chemist changed, as the saved calibration records it. */
export interface WorkbenchPairingRecord {
  status: LampPairingResult["status"];
  confidence: number;
  message: string;
  manualSeeds: number;
  excludedByHand: number;
  addedByHand: number;
  handPairs: {
    change: "excluded" | "added";
    pixel: number;
    wavelengthNm: number;
    species: string;
  }[];
}

export interface EditedLampCalibration {
  /** The chosen model's fit (its pairs in the workbench's order: auto pairs, then added ones). */
  fit: FitCalibrationResult;
  result: {
    /** "polynomial-3", "hartmann" or "prism". */
    model: CalibrationModelChoice;
    rmsNm: number;
    dof: number;
    /** Every pair: used, rejected by the fit, or excluded by hand; by pixel. */
    pairs: WorkbenchPair[];
    coveredRangeNm: [number, number];
    uncertainty: { medianNm: number; maxNm: number };
    warnings: { code: string; message: string }[];
    pairing: WorkbenchPairingRecord;
    /** Why this calibration should not silently become the instrument's default (see calibrationDoubts). */
    doubts: string[];
    /** A competing automatic pairing that explains the lamp nearly as well (empty when there is none). */
    rival: { pixel: number; wavelengthNm: number; species: string }[];
  };
  comparison: {
    candidates: WorkbenchModelRow[];
    recommended: CalibrationModelChoice | null;
    reason: string;
  };
  /** The lamp's peaks, with the wavelength the fitted model puts them at and their line when paired. */
  peaks: {
    pixel: number;
    height: number;
    fwhm: number;
    snr: number;
    predictedNm: number | null;
    pairedWith: { wavelengthNm: number; species: string } | null;
    /** Why an unpaired peak is unpaired (null when paired). */
    unpaired: UnpairedPeakExplanation | null;
  }[];
  /** The lamp lines, with a blend the pairing paired at its centroid as a line of its own. */
  lines: {
    wavelengthNm: number;
    species: string;
    intensity: number;
    lineId: string;
    paired: boolean;
  }[];
  /**
   * The tolerances the workbench states, as applied here: a line given by hand must lie within
   * lineMatchNm of a table line; an expected line "has a peak" within expectedPeakReachFwhm local FWHMs.
   */
  tolerances: { lineMatchNm: number; expectedPeakReachFwhm: number };
  /** Unpaired lamp lines the calibration puts on the array with no peak within reach: below the peak threshold. */
  expectedWithoutPeak: {
    wavelengthNm: number;
    species: string;
    intensity: number;
    reason: "below threshold";
  }[];
}

const UNPAIRED_REASON_WORDS: Record<UnpairedPeakReasonCode, string> = {
  broad: "too broad for one lamp line",
  blend: "blend",
  "not-in-table": "not in the table",
  "line-paired-elsewhere": "line paired with another peak",
  "left-unpaired": "left unpaired",
  "no-wavelength": "no wavelength",
};

const COMPARED_MODELS = CALIBRATION_MODELS.filter((m) => m !== "auto");

const modelName = (kind: string, degree?: number) =>
  kind === "polynomial" ? `degree-${degree} polynomial` : `${kind} model`;

/** A bad hand edit: a 400 in the service, with the field it is about. */
function invalidEdit(message: string, field: string, fieldMessage: string): CalibrationError {
  return new CalibrationError("invalid-edit", message, { field, fieldMessage });
}

/** The peak nearest a pixel, if it lies within its own width (at least 3 pixels) of it; −1 otherwise. */
function peakNear(peaks: readonly Peak[], pixel: number): number {
  if (!Number.isFinite(pixel)) return -1;
  let nearest = -1;
  peaks.forEach((p, k) => {
    if (nearest < 0 || Math.abs(p.x - pixel) < Math.abs(peaks[nearest].x - pixel)) nearest = k;
  });
  if (nearest < 0 || Math.abs(peaks[nearest].x - pixel) > Math.max(3, 2 * peaks[nearest].fwhm))
    return -1;
  return nearest;
}

/** The lamp line nearest a wavelength, if within HAND_LINE_MATCH_NM of it; −1 otherwise. */
function lineAt(lines: readonly LampLine[], wavelengthNm: number): number {
  if (!Number.isFinite(wavelengthNm)) return -1;
  let nearest = -1;
  lines.forEach((l, k) => {
    if (
      nearest < 0 ||
      Math.abs(l.wavelengthNm - wavelengthNm) < Math.abs(lines[nearest].wavelengthNm - wavelengthNm)
    )
      nearest = k;
  });
  return nearest >= 0 && Math.abs(lines[nearest].wavelengthNm - wavelengthNm) <= HAND_LINE_MATCH_NM
    ? nearest
    : -1;
}

/** A hand pair resolved to a peak and a line, or the 400 that says which part names nothing. */
function resolveHandPair(
  peaks: readonly Peak[],
  lines: readonly LampLine[],
  given: HandPair,
  field: string,
): { peakIndex: number; lineIndex: number } {
  const peakIndex = peakNear(peaks, given.pixel);
  if (peakIndex < 0)
    throw invalidEdit(
      `No lamp peak was found near pixel ${given.pixel}.`,
      `${field}.pixel`,
      "No lamp peak near this pixel.",
    );
  const lineIndex = lineAt(lines, given.wavelengthNm);
  if (lineIndex < 0) {
    throw invalidEdit(
      `No lamp line of the chosen gases at ${given.wavelengthNm} nm (±${HAND_LINE_MATCH_NM} nm) in the nominal range.`,
      `${field}.wavelengthNm`,
      "No lamp line at this wavelength.",
    );
  }
  return { peakIndex, lineIndex };
}

/** The model a choice asks for, or null for "auto". */
function requestedFit(
  choice: CalibrationModelChoice,
): { kind: "polynomial" | "hartmann" | "prism"; degree?: number } | null {
  if (choice === "auto") return null;
  if (choice.startsWith("polynomial-"))
    return { kind: "polynomial", degree: Number(choice.slice("polynomial-".length)) };
  return { kind: choice as "hartmann" | "prism" };
}

/** A fitted pair as the workbench and the saved calibration list it. */
export function lampPairRecord(pair: {
  x: number;
  wavelengthNm: number;
  residualNm: number;
  species?: string;
  lineId?: string;
}): LampPairRecord {
  return {
    pixel: pair.x,
    wavelengthNm: pair.wavelengthNm,
    residualNm: pair.residualNm,
    species: pair.species ?? null,
    lineId: pair.lineId ?? null,
  };
}

/** The comparison's rows in the selector's order, with the ones that could not be fitted and why. */
function comparisonRows(
  pairs: CalibrationPair[],
  options: EditLampCalibrationOptions,
): EditedLampCalibration["comparison"] {
  const { dispersion, domain, glass, apexDeg } = options;
  const comparison = compareCalibrationModels(pairs, { dispersion, domain, glass, apexDeg });
  const finite = (v: number | undefined) => (v !== undefined && Number.isFinite(v) ? v : null);
  const candidates = COMPARED_MODELS.map((choice): WorkbenchModelRow => {
    const c = comparison.candidates.find((k) => calibrationModelChoice(k) === choice);
    if (!c) {
      return {
        model: choice,
        parameterCount: null,
        rmsNm: null,
        aicc: null,
        bic: null,
        ends: null,
        glass: null,
        failure: `needs more than the ${pairs.length} pairs in the fit`,
      };
    }
    return {
      model: choice,
      parameterCount: c.parameterCount,
      rmsNm: finite(c.rmsNm),
      aicc: finite(c.aicc),
      bic: finite(c.bic),
      ends: c.ends
        ? c.ends.map((e) => ({
            pixel: e.x,
            wavelengthNm: e.wavelengthNm,
            uncertaintyNm: e.uncertaintyNm,
          }))
        : null,
      glass: c.glass ?? null,
      failure: c.failure ? c.failure.message : null,
    };
  });
  const recommended =
    comparison.recommended >= 0
      ? calibrationModelChoice(comparison.candidates[comparison.recommended])
      : null;
  return { candidates, recommended, reason: comparison.reason };
}

/** Median and largest 1σ over the covered range (41 points). */
function coveredUncertainty(model: CalibrationModel): { medianNm: number; maxNm: number } {
  const covered = Float64Array.from(
    { length: 41 },
    (_, i) => model.coveredX[0] + ((model.coveredX[1] - model.coveredX[0]) * i) / 40,
  );
  const sigma = Array.from(calibrationUncertainty(model, covered))
    .filter(Number.isFinite)
    .sort((a, b) => a - b);
  return {
    medianNm: sigma.length > 0 ? upperMedian(sigma) : 0,
    maxNm: sigma[sigma.length - 1] ?? 0,
  };
}

/**
 * Applies the chemist's edits to an automatic calibration and fits the chosen model. Throws
 * CalibrationError: "invalid-edit" (a hand pair names no peak or line, repeats one, or leaves out a pair
 * that does not exist; details.field names it), "not-paired" (no automatic pairing to start from and no
 * seeds), "too-few-pairs-left" (the edits or the chosen model need more pairs than remain), or the fit's own.
 */
export function editLampCalibration(
  calibration: LampCalibration,
  tableLines: readonly LampLine[],
  edits: LampCalibrationEdits,
  options: EditLampCalibrationOptions,
): EditedLampCalibration {
  const { peaks } = calibration;
  const { domain, glass, apexDeg } = options;
  const requested = edits.model ?? "auto";
  const addedInput = edits.added ?? [];
  const excludedInput = edits.excluded ?? [];
  const lines = [...tableLines];
  const pairingOptions = {
    nominalRangeNm: options.nominalRangeNm,
    dispersion: options.dispersion,
    resolutionNm: options.resolutionNm,
    domain,
  };

  let pairing: LampPairingResult = calibration.pairing;
  let fit: FitCalibrationResult | null = calibration.fit;
  if (edits.seeds) {
    const seeds = edits.seeds.map((seed, i) => resolveHandPair(peaks, lines, seed, `pairs.${i}`));
    pairing = pairManually(peaks, lines, seeds, pairingOptions);
    fit = pairing.status === "paired" ? pairing.model : null;
  }
  // An automatic pairing to check is shown for the chemist to confirm or correct (saving it as the
  // default then needs a reason, see the doubts below); only with no candidate at all is there nothing to show.
  const toCheck =
    !edits.seeds && pairing.status === "check" && pairing.candidate ? pairing.candidate : null;
  if (toCheck) fit = toCheck;
  if ((pairing.status !== "paired" && !toCheck) || !fit) {
    const why =
      pairing.status === "check"
        ? `An automatic pairing was found but is not trusted — ${(pairing.reasons ?? []).join(" ")}`
        : `The lamp peaks could not be paired with the lamp lines automatically (${pairing.message}).`;
    throw new CalibrationError("not-paired", why, { status: pairing.status });
  }
  const pairingFit = fit;

  // A blend the pairing paired at its centroid (the Hg 365 nm group) is a line of its own here, at that
  // centroid, so that the workbench refits and shows the pair the pairing made.
  const rival = toCheck ? (pairing.rivalSuggestion ?? []) : [];
  for (const p of [...pairingFit.pairs, ...rival]) {
    const member = lines.find((l) => l.id === p.lineId);
    const id = `blend:${p.lineId}`;
    if (
      member &&
      Math.abs(member.wavelengthNm - p.wavelengthNm) > 1e-9 &&
      !lines.some((l) => l.id === id)
    ) {
      lines.push({
        wavelengthNm: p.wavelengthNm,
        intensity: member.intensity,
        species: member.species,
        id,
      });
    }
  }
  lines.sort((a, b) => a.wavelengthNm - b.wavelengthNm);

  // The pairs the chemist works with: the pairing's (with those its outlier rejection set aside, in its
  // order), less the excluded, with the added ones.
  type WorkPair = { peakIndex: number; lineIndex: number; origin: "auto" | "added" };
  let work: WorkPair[] = pairingFit.pairs.map((p) => ({
    peakIndex: peaks.findIndex((k) => k.x === p.x),
    lineIndex: lines.findIndex(
      (l) =>
        (l.id === p.lineId || l.id === `blend:${p.lineId}`) &&
        Math.abs(l.wavelengthNm - p.wavelengthNm) < 1e-9,
    ),
    origin: "auto",
  }));
  if (work.some((w) => w.peakIndex < 0 || w.lineIndex < 0))
    throw new Error("a pair of the pairing names no peak or line");
  const overridden: WorkPair[] = [];
  addedInput.forEach((given, i) => {
    const { peakIndex, lineIndex } = resolveHandPair(peaks, lines, given, `added.${i}`);
    if (
      work.some(
        (w) => w.origin === "added" && (w.peakIndex === peakIndex || w.lineIndex === lineIndex),
      )
    ) {
      throw invalidEdit(
        `The pair at pixel ${given.pixel} repeats a peak or a line already added by hand.`,
        `added.${i}.pixel`,
        "This peak or line is already paired by hand.",
      );
    }
    // A pair made by hand overrides whatever the pairing did with that peak or that line.
    overridden.push(...work.filter((w) => w.peakIndex === peakIndex || w.lineIndex === lineIndex));
    work = work.filter((w) => w.peakIndex !== peakIndex && w.lineIndex !== lineIndex);
    work.push({ peakIndex, lineIndex, origin: "added" });
  });
  const excludedWork: WorkPair[] = [];
  excludedInput.forEach((given, i) => {
    const matches = (w: WorkPair) =>
      Math.abs(peaks[w.peakIndex].x - given.pixel) <= 1 &&
      Math.abs(lines[w.lineIndex].wavelengthNm - given.wavelengthNm) <= HAND_LINE_MATCH_NM;
    const k = work.findIndex(matches);
    // Leaving out a pair that a pair made by hand already replaced asks for nothing more (trying a
    // competing pairing replaces some pairs and leaves out the rest).
    if (k < 0 && overridden.some(matches)) return;
    if (k < 0) {
      throw invalidEdit(
        `No pair at pixel ${given.pixel} with the line at ${given.wavelengthNm} nm to leave out.`,
        `excluded.${i}.pixel`,
        "No such pair: pair again and choose from the table.",
      );
    }
    excludedWork.push(...work.splice(k, 1));
  });
  // Centres as uncertain as the automatic pairing takes them (a floor, and more for a peak wider than its
  // neighbours): a very strong peak placed to 0.001 px would otherwise carry a refit alone, and one wrong
  // pair made by hand on it would bend the fit through itself and reject the right pairs it pulled away.
  const centred = withBlendUncertainty(peaks);
  const toPair = (w: WorkPair): LampPair => ({
    x: peaks[w.peakIndex].x,
    xUncertainty: centred[w.peakIndex].xUncertainty,
    wavelengthNm: lines[w.lineIndex].wavelengthNm,
    species: lines[w.lineIndex].species,
    lineId: lines[w.lineIndex].id,
    peakIndex: w.peakIndex,
    lineIndex: w.lineIndex,
  });
  const pairs = work.map(toPair);
  const edited = excludedWork.length > 0 || addedInput.length > 0;
  if (edited && pairs.length < 3) {
    throw new CalibrationError(
      "too-few-pairs-left",
      `Too few pairs left: ${pairs.length} remain after ${excludedWork.length} exclusion(s); at least 3 are needed to fit even a straight line. Include some pairs again.`,
      { remaining: pairs.length },
    );
  }

  // The model the pairing chose, refitted to the edited pairs (a polynomial's degree as the pairs allow).
  const autoFit = (): FitCalibrationResult => {
    const kind = pairingFit.model.kind;
    const degree =
      pairingFit.model.kind === "polynomial"
        ? Math.min(pairingFit.model.degree, Math.max(1, pairs.length - 2))
        : undefined;
    return fitCalibration(pairs, {
      model: kind,
      degree,
      domain,
      glass: kind === "prism" ? glass : undefined,
      apexDeg,
    });
  };
  const wanted = requestedFit(requested);
  const physical = options.dispersion === "prism" && (glass !== undefined || apexDeg !== undefined);
  // The model asked for first: that it needs more pairs than remain is what the chemist must hear, even
  // when the automatic model cannot be refitted to what remains either (a cubic through five pairs at
  // one end of the array can turn over before the other).
  let requestedResult: FitCalibrationResult | undefined;
  if (wanted) {
    try {
      requestedResult = fitCalibration(pairs, {
        model: wanted.kind,
        degree: wanted.degree,
        domain,
        glass,
        apexDeg,
      });
    } catch (error) {
      if (error instanceof CalibrationError && error.code === "too-few-pairs") {
        throw new CalibrationError(
          "too-few-pairs-left",
          `The ${modelName(wanted.kind, wanted.degree)} needs more pairs than remain (${error.message}). Include pairs again or choose a simpler model.`,
          {
            remaining: pairs.length,
            field: "model",
            fieldMessage: "Needs more pairs than remain.",
          },
        );
      }
      throw error;
    }
  }
  let baseline: FitCalibrationResult;
  try {
    baseline = edited ? autoFit() : pairingFit;
  } catch (error) {
    // The comparison then starts from the requested fit's clean pairs.
    if (!requestedResult) throw error;
    baseline = requestedResult;
  }
  if (!wanted && physical && baseline.model.kind === "prism") {
    baseline = fitCalibration(pairs, { model: "prism", domain, glass, apexDeg });
  }
  const chosen = requestedResult ?? baseline;

  // Every model compared on the same clean pairs: those the baseline fit kept.
  const comparison = comparisonRows(
    baseline.pairs.filter((p) => p.used),
    options,
  );

  const model = chosen.model;
  const excludedPairs = excludedWork.map(toPair);
  const excludedFitted = evaluateCalibration(
    model,
    Float64Array.from(excludedPairs.map((p) => p.x)),
  );
  const excluded = excludedPairs.map((p, i) =>
    lampPairRecord({ ...p, residualNm: p.wavelengthNm - excludedFitted[i] }),
  );
  const predicted = evaluateCalibration(model, Float64Array.from(peaks.map((p) => p.x)));
  // Excluded pairs stay paired on the chart (drawn as excluded); only peaks without any pair are offered.
  const pairedPeak = new Map([...work, ...excludedWork].map((w) => [w.peakIndex, w.lineIndex]));
  const pairedLines = new Set(work.map((w) => w.lineIndex));
  const pairRefOf = (w: WorkPair) => ({
    pixel: peaks[w.peakIndex].x,
    wavelengthNm: lines[w.lineIndex].wavelengthNm,
    species: lines[w.lineIndex].species,
  });
  const pairingRecord: WorkbenchPairingRecord = {
    status: pairing.status,
    confidence: pairing.confidence,
    message: pairing.message,
    manualSeeds: edits.seeds?.length ?? 0,
    excludedByHand: excludedWork.length,
    addedByHand: addedInput.length,
    // Which ones, as resolved to a peak and a line, so the record says what the chemist changed.
    handPairs: [
      ...excludedWork.map((w) => ({ change: "excluded" as const, ...pairRefOf(w) })),
      ...work
        .filter((w) => w.origin === "added")
        .map((w) => ({ change: "added" as const, ...pairRefOf(w) })),
    ],
  };
  // Doubts about the chosen fit; the confidence counts only for an automatic pairing (no seeds by hand).
  const doubts = [
    ...(toCheck
      ? [`The automatic pairing is not trusted: ${(pairing.reasons ?? []).join(" ")}`]
      : []),
    ...calibrationDoubts(chosen, edits.seeds ? {} : { automaticConfidence: pairing.confidence }),
  ];

  // Why peaks stay unpaired, in calibrated wavelength with each peak's FWHM turned into nm.
  const localDispersion = dispersionAt(model, Float64Array.from(peaks.map((p) => p.x)));
  const arrayEndsNm = Array.from(evaluateCalibration(model, Float64Array.from(domain)));
  const fallbackFwhmNm =
    options.resolutionNm ?? Math.abs(options.nominalRangeNm[1] - options.nominalRangeNm[0]) / 500;
  const explained =
    arrayEndsNm.every(Number.isFinite) && arrayEndsNm[0] !== arrayEndsNm[1]
      ? unpairedLampPeaks(
          peaks.map((p, i) => ({
            wavelengthNm: predicted[i],
            // A width the model cannot turn into nm falls back to the instrument's resolution.
            fwhmNm:
              Number.isFinite(localDispersion[i]) && localDispersion[i] !== 0
                ? p.fwhm * Math.abs(localDispersion[i])
                : fallbackFwhmNm,
            paired: pairedPeak.has(i),
          })),
          lines.map((l, i) => ({ wavelengthNm: l.wavelengthNm, paired: pairedLines.has(i) })),
          { arrayRangeNm: [Math.min(...arrayEndsNm), Math.max(...arrayEndsNm)] },
        )
      : null;
  const lineRef = (j: number) => ({
    wavelengthNm: lines[j].wavelengthNm,
    species: lines[j].species,
  });

  return {
    fit: chosen,
    result: {
      model: calibrationModelChoice(model),
      rmsNm: chosen.rmsNm,
      dof: chosen.dof,
      pairs: [
        ...chosen.pairs.map((p, i) => ({
          ...lampPairRecord(p),
          origin: work[i].origin,
          state: p.used ? ("used" as const) : ("rejected" as const),
        })),
        ...excluded.map((p, i) => ({
          ...p,
          origin: excludedWork[i].origin,
          state: "excluded" as const,
        })),
      ].sort((a, b) => a.pixel - b.pixel),
      coveredRangeNm: [model.coveredNm[0], model.coveredNm[1]],
      uncertainty: coveredUncertainty(model),
      warnings: chosen.warnings,
      pairing: pairingRecord,
      doubts,
      rival: rival.map((p) => ({
        pixel: p.x,
        wavelengthNm: p.wavelengthNm,
        species: p.species ?? "",
      })),
    },
    comparison,
    peaks: peaks.map((p, i) => {
      const line = pairedPeak.has(i) ? lines[pairedPeak.get(i)!] : null;
      const reason = explained?.peakReasons[i] ?? null;
      const code = reason?.code ?? "no-wavelength";
      return {
        pixel: p.x,
        height: p.height,
        fwhm: p.fwhm,
        snr: p.snr,
        predictedNm: Number.isFinite(predicted[i]) ? predicted[i] : null,
        pairedWith: line ? { wavelengthNm: line.wavelengthNm, species: line.species } : null,
        unpaired: line
          ? null
          : {
              code,
              reason: UNPAIRED_REASON_WORDS[code],
              lines: (reason?.lineIndices ?? []).map(lineRef),
            },
      };
    }),
    lines: lines.map((l, i) => ({
      wavelengthNm: l.wavelengthNm,
      species: l.species,
      intensity: l.intensity,
      lineId: l.id,
      paired: pairedLines.has(i),
    })),
    tolerances: { lineMatchNm: HAND_LINE_MATCH_NM, expectedPeakReachFwhm: UNPAIRED_REACH_FWHM },
    expectedWithoutPeak: (explained?.expectedWithoutPeak ?? []).map((j) => ({
      wavelengthNm: lines[j].wavelengthNm,
      species: lines[j].species,
      intensity: lines[j].intensity,
      reason: "below threshold" as const,
    })),
  };
}
