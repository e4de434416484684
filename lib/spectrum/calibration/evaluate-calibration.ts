// Turns input-axis values (pixels or factory nm) into calibrated wavelengths with a stored model.
import { assertFiniteArray, assertModel } from "./assertions";
import type { CalibrationModel, CalibrationWarning } from "./calibration-model";
import { calibrationRangeWarnings } from "./calibration-range-warnings";
import { modelEvaluation } from "./model-evaluation";

export interface EvaluateCalibrationOptions {
  /**
   * Called once with the range warnings (outside the covered range of the pairs, outside the array
   * domain) when there are any; the values are still returned.
   * @default undefined (warnings are not reported; see calibrationRangeWarnings)
   */
  onWarning?: (warnings: CalibrationWarning[]) => void;
}

/** λ in nm at each x. */
export function evaluateCalibration(
  model: CalibrationModel,
  x: Float64Array,
  options: EvaluateCalibrationOptions = {},
): Float64Array {
  assertModel(model);
  assertFiniteArray(x, "x");
  if (options.onWarning) {
    const warnings = calibrationRangeWarnings(model, x);
    if (warnings.length > 0) options.onWarning(warnings);
  }
  return modelEvaluation(model, x).wavelengthNm;
}
