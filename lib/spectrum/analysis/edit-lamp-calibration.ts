// The calibration workbench's computation: from an automatic lamp calibration and the chemist's edits
// (seed pairs by hand, pairs left out, pairs added, a model asked for) to the fit, every model compared
// on the same pairs, the uncertainty, and each peak and line with why it is or is not paired. Pure: the
// service loads the lamp and the lines, runs this (in the worker pool) and saves what it returns.
import { CalibrationError } from "../calibration/calibration-error";
import { calibrationModelChoice } from "../calibration/calibration-model-choice";
import { withBlendUncertainty } from "../calibration/centre-uncertainty";
import type { LampLine, LampPair } from "../calibration/lamp-pairing-types";
import { UNPAIRED_REACH_FWHM } from "../calibration/unpaired-lamp-peaks";
import type { LampCalibration } from "./calibrate-lamp";
import { coveredUncertainty } from "./covered-uncertainty";
import type {
  EditedLampCalibration,
  EditLampCalibrationOptions,
  LampCalibrationEdits,
  WorkPair,
} from "./edit-lamp-calibration-types";
import { editedCalibrationDoubts } from "./edited-calibration-doubts";
import { editedWorkPairs } from "./edited-work-pairs";
import { explainedLampPeaks } from "./explained-lamp-peaks";
import { fitEditedPairs } from "./fit-edited-pairs";
import { HAND_LINE_MATCH_NM } from "./hand-line-match-nm";
import { linesWithPairedBlends } from "./lines-with-paired-blends";
import { modelComparisonRows } from "./model-comparison-rows";
import { startingLampFit } from "./starting-lamp-fit";
import { workbenchPairingRecord } from "./workbench-pairing-record";
import { workbenchPairs } from "./workbench-pairs";

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
  const { domain } = options;
  const addedInput = edits.added ?? [];
  const excludedInput = edits.excluded ?? [];
  const pairingOptions = {
    nominalRangeNm: options.nominalRangeNm,
    dispersion: options.dispersion,
    resolutionNm: options.resolutionNm,
    domain,
  };
  const { pairing, pairingFit, toCheck } = startingLampFit(
    calibration,
    [...tableLines],
    edits,
    pairingOptions,
  );
  const rival = toCheck ? (pairing.rivalSuggestion ?? []) : [];
  const lines = linesWithPairedBlends(tableLines, [...pairingFit.pairs, ...rival]);
  const { work, excludedWork } = editedWorkPairs(
    peaks,
    lines,
    pairingFit,
    addedInput,
    excludedInput,
  );
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
  const { chosen, baseline } = fitEditedPairs(
    pairs,
    pairingFit,
    edits.model ?? "auto",
    edited,
    options,
  );
  // Every model compared on the same clean pairs: those the baseline fit kept.
  const comparison = modelComparisonRows(
    baseline.pairs.filter((p) => p.used),
    options,
  );
  const model = chosen.model;
  const shownPairs = workbenchPairs(chosen, work, excludedWork, excludedWork.map(toPair));
  // Excluded pairs stay paired on the chart (drawn as excluded); only peaks without any pair are offered.
  const pairedPeak = new Map([...work, ...excludedWork].map((w) => [w.peakIndex, w.lineIndex]));
  const pairedLines = new Set(work.map((w) => w.lineIndex));
  const pairingRecord = workbenchPairingRecord(
    pairing,
    edits.seeds?.length ?? 0,
    work,
    excludedWork,
    addedInput.length,
    peaks,
    lines,
  );
  const doubts = editedCalibrationDoubts(chosen, pairing, toCheck !== null, Boolean(edits.seeds));
  const explained = explainedLampPeaks(model, peaks, lines, pairedPeak, pairedLines, options);

  return {
    fit: chosen,
    result: {
      model: calibrationModelChoice(model),
      rmsNm: chosen.rmsNm,
      dof: chosen.dof,
      pairs: shownPairs,
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
    peaks: explained.peaks,
    lines: lines.map((l, i) => ({
      wavelengthNm: l.wavelengthNm,
      species: l.species,
      intensity: l.intensity,
      lineId: l.id,
      paired: pairedLines.has(i),
    })),
    tolerances: { lineMatchNm: HAND_LINE_MATCH_NM, expectedPeakReachFwhm: UNPAIRED_REACH_FWHM },
    expectedWithoutPeak: explained.expectedWithoutPeak,
  };
}
