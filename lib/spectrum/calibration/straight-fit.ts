// The straight drift through a recalibration's pairs, by weighted least squares with bounded σ.
import { ON_DRIFT_MAX, ON_DRIFT_MIN } from "./recalibration-limits";
import type { Candidate, StraightFit } from "./recalibration-types";
import { weightedLeastSquares } from "./weighted-least-squares";

/**
 * x = a + s·(u − ū) by weighted least squares. A peak finder's σ of a centre is a guide, not a measure:
 * a sharp peak pulled by an unlisted neighbour claims a tiny σ, a saturated one a huge σ. So σ is held
 * between a tenth of a tolerance (about how well a line's centre is known anyway, common practice) and
 * the reach on the drift, and no single pair can carry the fit.
 */
export function straightFit(pairs: Candidate[], tolerance: number): StraightFit | null {
  if (pairs.length < 2) return null;
  const uMean = pairs.reduce((sum, c) => sum + c.u, 0) / pairs.length;
  const sigmas = pairs.map((c) =>
    Math.min(
      Math.max(c.pair.xUncertainty ?? 0, ON_DRIFT_MIN * tolerance),
      ON_DRIFT_MAX * tolerance,
    ),
  );
  let solution;
  try {
    solution = weightedLeastSquares(
      pairs.map((c) => [1, c.u - uMean]),
      pairs.map((c) => c.pair.x),
      sigmas,
    );
  } catch {
    return null;
  }
  const [a, s] = solution.parameters;
  if (!(s > 0)) return null;
  const dof = pairs.length - 2;
  const residuals = pairs.map((c) => c.pair.x - (a + s * (c.u - uMean)));
  const scatter =
    dof > 0
      ? Math.sqrt(residuals.reduce((sum, r) => sum + r * r, 0) / dof)
      : Number.POSITIVE_INFINITY;
  // The covariance is scaled by the reduced χ² when the pairs scatter more than their σ say.
  const inflation = dof > 0 ? Math.max(1, solution.chiSquare / dof) : 1;
  const c = solution.unscaledCovariance;
  return {
    at: (u) => a + s * (u - uMean),
    drift: {
      stretch: s,
      offset: a - s * uMean,
      pivot: a,
      covariance: [
        [inflation * c[0][0], inflation * c[0][1]],
        [inflation * c[1][0], inflation * c[1][1]],
      ],
    },
    scatter,
  };
}
