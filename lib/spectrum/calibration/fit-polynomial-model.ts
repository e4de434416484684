// Weighted polynomial fit of λ against normalised x: the grating calibration.
import type { PolynomialCalibrationModel } from "./calibration-model";
import {
  domainNormalisation,
  modelBase,
  type CovarianceScaling,
  type ModelFitInput,
} from "./model-fit-input";
import { weightedLeastSquares } from "./weighted-least-squares";

/** Fits λ(t) = Σ cₖ tᵏ; the x uncertainties become nm through the dispersion of a first pass. */
export function fitPolynomialModel(
  input: ModelFitInput,
  degree: number,
  scaling: CovarianceScaling,
  uniformWeights: boolean,
): PolynomialCalibrationModel {
  const { centre, halfRange } = domainNormalisation(input.domain);
  const t = input.x.map((x) => (x - centre) / halfRange);
  const design = t.map((value) => Array.from({ length: degree + 1 }, (_, k) => value ** k));
  // First pass in x-uncertainty units only to learn the local dispersion that converts σx into σλ.
  let sigmaNm = input.xUncertainty.slice();
  let solution = weightedLeastSquares(design, input.wavelengthNm, sigmaNm);
  for (let pass = 0; pass < (uniformWeights ? 0 : 2); pass++) {
    const c = solution.parameters;
    sigmaNm = t.map((value, i) => {
      let slope = 0;
      for (let k = 1; k <= degree; k++) slope += k * c[k] * value ** (k - 1);
      return input.xUncertainty[i] * Math.max(Math.abs(slope / halfRange), 1e-12);
    });
    solution = weightedLeastSquares(design, input.wavelengthNm, sigmaNm);
  }
  const fitted = design.map((row) =>
    row.reduce((sum, value, k) => sum + value * solution.parameters[k], 0),
  );
  return {
    kind: "polynomial",
    degree,
    ...modelBase(
      input,
      solution.parameters,
      Array.from({ length: degree + 1 }, (_, k) => `c${k}`),
      solution.unscaledCovariance,
      solution.chiSquare,
      fitted,
      scaling,
    ),
  };
}
