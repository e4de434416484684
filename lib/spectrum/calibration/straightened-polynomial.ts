// x as a polynomial in the straightened axis g(λ), fitted to pairs by unweighted least squares, with
// the statistical σ of a prediction: the forward model that lamp pairing grows its pairs with.
import type { CalibrationPair } from "../types";
import { weightedLeastSquares } from "./weighted-least-squares";

export interface StraightenedPolynomial {
  degree: number;
  /** x predicted for a wavelength. */
  predictX: (wavelengthNm: number) => number;
  /** 1σ statistical uncertainty of predictX (the residual scatter propagated through the covariance); 0 without spare pairs. */
  sigmaX: (wavelengthNm: number) => number;
  /** RMS of the residuals in x, with the degrees of freedom counted; 0 without spare pairs. */
  rmsX: number;
}

/**
 * Fits x = Σ aₖ uᵏ, u = g(λ) mapped linearly onto [−1, 1] over `gRange`; null when the pairs do not
 * determine the polynomial. Every pair weighs the same: peak-centre uncertainties are far below the
 * model-form errors this fit meets while pairing, and a mis-stated one must not steer the growth.
 */
export function fitStraightenedPolynomial(
  pairs: readonly CalibrationPair[],
  straighten: (wavelengthNm: number) => number,
  gRange: [number, number],
  degree: number,
): StraightenedPolynomial | null {
  if (!(Number.isInteger(degree) && degree >= 0))
    throw new RangeError(`degree must be a whole number ≥ 0, got ${degree}`);
  if (pairs.length < degree + 1) return null;
  const [g0, g1] = gRange;
  const u = (lambda: number) => (2 * (straighten(lambda) - g0)) / (g1 - g0) - 1;
  const powers = (lambda: number) => {
    const value = u(lambda);
    const row = [1];
    for (let k = 1; k <= degree; k++) row.push(row[k - 1] * value);
    return row;
  };
  let solution;
  try {
    solution = weightedLeastSquares(
      pairs.map((p) => powers(p.wavelengthNm)),
      pairs.map((p) => p.x),
      pairs.map(() => 1),
    );
  } catch {
    return null;
  }
  const { parameters, unscaledCovariance, chiSquare } = solution;
  if (!parameters.every(Number.isFinite)) return null;
  const spare = pairs.length - degree - 1;
  const variance = spare > 0 ? chiSquare / spare : 0;
  return {
    degree,
    predictX: (lambda) => powers(lambda).reduce((sum, v, k) => sum + parameters[k] * v, 0),
    sigmaX: (lambda) => {
      if (variance === 0) return 0;
      const row = powers(lambda);
      let quadratic = 0;
      for (let i = 0; i <= degree; i++)
        for (let j = 0; j <= degree; j++) quadratic += row[i] * unscaledCovariance[i][j] * row[j];
      return Math.sqrt(Math.max(0, variance * quadratic));
    },
    rmsX: Math.sqrt(variance),
  };
}
