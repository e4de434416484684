// How well a calibration knows λ over its covered range, in two numbers the workbench shows.
import { upperMedianOfSorted } from "../statistics/upper-median";
import type { CalibrationModel } from "../calibration/calibration-model";
import { calibrationUncertainty } from "../calibration/calibration-uncertainty";

/** Median and largest 1σ over the covered range (41 points). */
export function coveredUncertainty(model: CalibrationModel): { medianNm: number; maxNm: number } {
  const covered = Float64Array.from(
    { length: 41 },
    (_, i) => model.coveredX[0] + ((model.coveredX[1] - model.coveredX[0]) * i) / 40,
  );
  const sigma = Array.from(calibrationUncertainty(model, covered))
    .filter(Number.isFinite)
    .sort((a, b) => a - b);
  return {
    medianNm: sigma.length > 0 ? upperMedianOfSorted(sigma) : 0,
    maxNm: sigma[sigma.length - 1] ?? 0,
  };
}
