// Says when a calibration is being used where its pairs give it no support (extrapolation).
import type { CalibrationModel, CalibrationWarning } from "./calibration-model";

/** Warnings for the x values that lie outside the pairs' covered range or the array domain. */
export function calibrationRangeWarnings(
  model: CalibrationModel,
  x: ArrayLike<number>,
): CalibrationWarning[] {
  let outsideCovered = 0;
  let outsideDomain = 0;
  let low = Infinity;
  let high = -Infinity;
  for (let i = 0; i < x.length; i++) {
    if (x[i] < model.coveredX[0] || x[i] > model.coveredX[1]) outsideCovered++;
    if (x[i] < model.domain[0] || x[i] > model.domain[1]) outsideDomain++;
    low = Math.min(low, x[i]);
    high = Math.max(high, x[i]);
  }
  const warnings: CalibrationWarning[] = [];
  if (outsideCovered > 0) {
    warnings.push({
      code: "outside-covered-range",
      message:
        `${outsideCovered} of ${x.length} values lie outside the calibrated range ` +
        `x ∈ [${model.coveredX[0]}, ${model.coveredX[1]}] (${model.coveredNm[0].toFixed(2)}–` +
        `${model.coveredNm[1].toFixed(2)} nm); wavelengths there are extrapolated (data span ${low}–${high})`,
    });
  }
  if (outsideDomain > 0) {
    warnings.push({
      code: "outside-domain",
      message: `${outsideDomain} of ${x.length} values lie outside the array domain [${model.domain[0]}, ${model.domain[1]}]`,
    });
  }
  return warnings;
}
