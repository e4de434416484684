// Where the workbench starts: the automatic pairing and its fit, a pairing extended from seeds picked
// by hand, or a pairing left to check shown for the chemist to confirm.
import { CalibrationError } from "../calibration/calibration-error";
import type { FitCalibrationResult } from "../calibration/fit-calibration";
import type { LampLine, LampPairingResult } from "../calibration/lamp-pairing-types";
import { pairManually } from "../calibration/pair-manually";
import type { DispersionKind } from "../types";
import type { LampCalibration } from "./calibrate-lamp";
import type { LampCalibrationEdits } from "./edit-lamp-calibration-types";
import { resolveHandPair } from "./resolve-hand-pair";

/**
 * The pairing the edits start from and its fit: `calibration`'s, or the seeds' (extended over the
 * nominal range), or an automatic pairing to check (`toCheck`, its candidate fit). Throws
 * CalibrationError "not-paired" when there is no fit to start from, "invalid-edit" for a bad seed.
 */
export function startingLampFit(
  calibration: LampCalibration,
  lines: LampLine[],
  edits: LampCalibrationEdits,
  pairingOptions: {
    nominalRangeNm: [number, number];
    dispersion: DispersionKind;
    resolutionNm?: number;
    domain: [number, number];
  },
): {
  pairing: LampPairingResult;
  pairingFit: FitCalibrationResult;
  toCheck: FitCalibrationResult | null;
} {
  const { peaks } = calibration;
  let pairing: LampPairingResult = calibration.pairing;
  let fit: FitCalibrationResult | null = calibration.fit;
  if (edits.seeds) {
    const seeds = edits.seeds.map((seed, i) => resolveHandPair(peaks, lines, seed, `pairs.${i}`));
    pairing = pairManually(peaks, lines, seeds, pairingOptions);
    fit = pairing.status === "paired" ? pairing.model : null;
  }
  // An automatic pairing to check is shown for the chemist to confirm or correct (saving it as the
  // default then needs a reason, see editedCalibrationDoubts); only with no candidate at all is there nothing to show.
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
  return { pairing, pairingFit: fit, toCheck };
}
