// The pairs the chemist works with: the pairing's, less those left out by hand, with those added by hand.
import type { FitCalibrationResult } from "../calibration/fit-calibration";
import type { LampLine } from "../calibration/lamp-pairing-types";
import type { Peak } from "../types";
import type { HandPair, WorkPair } from "./edit-lamp-calibration-types";
import { HAND_LINE_MATCH_NM } from "./hand-line-match-nm";
import { invalidEdit } from "./invalid-edit";
import { resolveHandPair } from "./resolve-hand-pair";

/**
 * The pairing's pairs (with those its outlier rejection set aside, in its order) as peak and line
 * indices into `peaks` and `lines`, less the `excluded` (returned apart, as `excludedWork`), with the
 * `added`. Throws CalibrationError "invalid-edit" for a hand pair that names nothing, repeats one added
 * already, or leaves out a pair that does not exist.
 */
export function editedWorkPairs(
  peaks: readonly Peak[],
  lines: readonly LampLine[],
  pairingFit: FitCalibrationResult,
  addedInput: readonly HandPair[],
  excludedInput: readonly HandPair[],
): { work: WorkPair[]; excludedWork: WorkPair[] } {
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
  return { work, excludedWork };
}
