// Whether a recalibration's drift bends: a realigned instrument is not moved by a straight drift.
import type { Candidate, StraightFit } from "./recalibration-types";
import { weightedLeastSquares } from "./weighted-least-squares";

/** How far a quadratic drift departs from the straight one on the array, when its curvature is significant. */
export function driftBend(
  pairs: Candidate[],
  straight: StraightFit,
  [xMin, xMax]: [number, number],
): number {
  if (pairs.length < 6) return 0;
  const half = 0.5 * (xMax - xMin);
  const centre = 0.5 * (xMin + xMax);
  const vs = pairs.map((c) => (c.u - centre) / half);
  let solution;
  try {
    solution = weightedLeastSquares(
      vs.map((v) => [1, v, v * v]),
      pairs.map((c) => c.pair.x),
      pairs.map(() => 1),
    );
  } catch {
    return 0;
  }
  const [c0, c1, c2] = solution.parameters;
  const sigma2 = solution.chiSquare / Math.max(pairs.length - 3, 1);
  const c2Sigma = Math.sqrt(sigma2 * solution.unscaledCovariance[2][2]);
  if (!(Math.abs(c2) > 3 * c2Sigma)) return 0;
  let largest = 0;
  for (let k = 0; k <= 20; k++) {
    const v = -1 + k / 10;
    const u = centre + v * half;
    largest = Math.max(largest, Math.abs(c0 + c1 * v + c2 * v * v - straight.at(u)));
  }
  return largest;
}
