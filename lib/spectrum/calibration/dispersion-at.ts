// Local dispersion dλ/dx of a calibration, to turn a peak's centre uncertainty in x into nm.
import { assertFiniteArray, assertModel } from "./assertions";
import type { CalibrationModel } from "./calibration-model";
import { modelEvaluation } from "./model-evaluation";

/** dλ/dx at each x, nm per x unit (negative when λ falls with x). */
export function dispersionAt(model: CalibrationModel, x: Float64Array): Float64Array {
  assertModel(model);
  assertFiniteArray(x, "x");
  return modelEvaluation(model, x).dispersion;
}
