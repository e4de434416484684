// Every pair of the workbench's fit as it shows them: used, rejected by the fit, or excluded by hand.
import { evaluateCalibration } from "../calibration/evaluate-calibration";
import type { FitCalibrationResult } from "../calibration/fit-calibration";
import type { LampPair } from "../calibration/lamp-pairing-types";
import type { WorkbenchPair, WorkPair } from "./edit-lamp-calibration-types";
import { lampPairRecord } from "./lamp-pair-record";

/**
 * The pairs of `chosen` (fitted in the order of `work`) and `excludedPairs` (those of `excludedWork`,
 * with their residuals under the chosen model), by pixel.
 */
export function workbenchPairs(
  chosen: FitCalibrationResult,
  work: readonly WorkPair[],
  excludedWork: readonly WorkPair[],
  excludedPairs: readonly LampPair[],
): WorkbenchPair[] {
  const excludedFitted = evaluateCalibration(
    chosen.model,
    Float64Array.from(excludedPairs.map((p) => p.x)),
  );
  const excluded = excludedPairs.map((p, i) =>
    lampPairRecord({ ...p, residualNm: p.wavelengthNm - excludedFitted[i] }),
  );
  return [
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
  ].sort((a, b) => a.pixel - b.pixel);
}
