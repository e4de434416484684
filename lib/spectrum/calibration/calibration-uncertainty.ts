// One-sigma uncertainty of the calibrated wavelength at each x, from the parameter covariance.
import { assertFiniteArray, assertModel } from "./assertions";
import type { CalibrationModel } from "./calibration-model";
import { modelEvaluation } from "./model-evaluation";

/**
 * σλ(x) = sqrt(J C Jᵀ) with J = ∂λ/∂p at x (delta method). It is the uncertainty of the fitted curve
 * itself, so it is smallest among the pairs and grows in gaps between lamp lines and beyond them; a peak's
 * own centre uncertainty is added separately (through dispersionAt).
 */
export function calibrationUncertainty(model: CalibrationModel, x: Float64Array): Float64Array {
  assertModel(model);
  assertFiniteArray(x, "x");
  const p = model.parameters.length;
  const { jacobian } = modelEvaluation(model, x, true);
  const result = new Float64Array(x.length);
  const c = model.covariance;
  for (let i = 0; i < x.length; i++) {
    let variance = 0;
    for (let a = 0; a < p; a++) {
      const ja = jacobian![i * p + a];
      for (let b = 0; b < p; b++) variance += ja * c[a][b] * jacobian![i * p + b];
    }
    // NaN stays NaN: the model has no wavelength there.
    result[i] = Number.isNaN(variance) ? Number.NaN : Math.sqrt(Math.max(variance, 0));
  }
  return result;
}
