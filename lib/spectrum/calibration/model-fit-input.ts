// The cleaned input every model fitter takes, and the bookkeeping they share to build a stored model.
import type { CalibrationModelBase, XNormalisation } from "./calibration-model";

/** Pairs as parallel arrays, with a 1σ x uncertainty for each (1 when the caller gave none). */
export interface ModelFitInput {
  x: number[];
  wavelengthNm: number[];
  xUncertainty: number[];
  domain: [number, number];
}

/** How the parameter covariance is scaled. */
export type CovarianceScaling = "residual" | "absolute";

/** t = (x − centre)/halfRange maps the domain onto [−1, 1]. */
export function domainNormalisation(domain: [number, number]): XNormalisation {
  return { centre: (domain[0] + domain[1]) / 2, halfRange: (domain[1] - domain[0]) / 2 };
}

/**
 * Fields common to every model. With "residual" scaling the covariance is multiplied by χ²/dof (as
 * numpy.polyfit(cov=True) and scipy's curve_fit with absolute_sigma=False do), because peak-centre
 * uncertainties from a peak finder rarely include every error of a lamp calibration.
 */
export function modelBase(
  input: ModelFitInput,
  parameters: number[],
  parameterNames: string[],
  unscaledCovariance: number[][],
  chiSquare: number,
  fittedNm: number[],
  scaling: CovarianceScaling,
): CalibrationModelBase {
  const n = input.x.length;
  const dof = n - parameters.length;
  const factor = scaling === "residual" && dof > 0 ? chiSquare / dof : 1;
  let sumSquares = 0;
  for (let i = 0; i < n; i++) sumSquares += (input.wavelengthNm[i] - fittedNm[i]) ** 2;
  return {
    version: 1,
    domain: [input.domain[0], input.domain[1]],
    xNormalisation: domainNormalisation(input.domain),
    coveredX: [Math.min(...input.x), Math.max(...input.x)],
    coveredNm: [Math.min(...input.wavelengthNm), Math.max(...input.wavelengthNm)],
    parameters,
    parameterNames,
    covariance: unscaledCovariance.map((row) => row.map((value) => value * factor)),
    rmsNm: Math.sqrt(sumSquares / n),
    dof,
    pairCount: n,
    chiSquare,
  };
}
