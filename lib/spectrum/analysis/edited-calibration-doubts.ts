// Why the workbench's calibration should not silently become the instrument's default.
import { calibrationDoubts } from "../calibration/calibration-doubts";
import type { FitCalibrationResult } from "../calibration/fit-calibration";
import type { LampPairingResult } from "../calibration/lamp-pairing-types";

/**
 * Doubts about the chosen fit; the confidence counts only for an automatic pairing (no seeds by hand),
 * and an automatic pairing left to check (`checked`) says why it is not trusted.
 */
export function editedCalibrationDoubts(
  chosen: FitCalibrationResult,
  pairing: LampPairingResult,
  checked: boolean,
  seeded: boolean,
): string[] {
  return [
    ...(checked
      ? [`The automatic pairing is not trusted: ${(pairing.reasons ?? []).join(" ")}`]
      : []),
    ...calibrationDoubts(chosen, seeded ? {} : { automaticConfidence: pairing.confidence }),
  ];
}
