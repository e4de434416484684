// How the workbench's pairs were found and what the chemist changed, as the saved calibration records it.
import type { LampLine, LampPairingResult } from "../calibration/lamp-pairing-types";
import type { Peak } from "../types";
import type { WorkbenchPairingRecord, WorkPair } from "./edit-lamp-calibration-types";

/**
 * The record of `pairing` with `manualSeeds` seeds, the pairs left out (`excludedWork`) and those
 * added by hand (in `work`), each resolved to its peak and line.
 */
export function workbenchPairingRecord(
  pairing: LampPairingResult,
  manualSeeds: number,
  work: readonly WorkPair[],
  excludedWork: readonly WorkPair[],
  addedByHand: number,
  peaks: readonly Peak[],
  lines: readonly LampLine[],
): WorkbenchPairingRecord {
  const pairRefOf = (w: WorkPair) => ({
    pixel: peaks[w.peakIndex].x,
    wavelengthNm: lines[w.lineIndex].wavelengthNm,
    species: lines[w.lineIndex].species,
  });
  return {
    status: pairing.status,
    confidence: pairing.confidence,
    message: pairing.message,
    manualSeeds,
    excludedByHand: excludedWork.length,
    addedByHand,
    // Which ones, as resolved to a peak and a line, so the record says what the chemist changed.
    handPairs: [
      ...excludedWork.map((w) => ({ change: "excluded" as const, ...pairRefOf(w) })),
      ...work
        .filter((w) => w.origin === "added")
        .map((w) => ({ change: "added" as const, ...pairRefOf(w) })),
    ],
  };
}
