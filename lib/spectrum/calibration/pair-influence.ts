// How far the calibration moves, inside the span of the other pairs, when one pair is left out: the
// largest |λ̂(x) − λ̂₋ᵢ(x)| over that span, in x units through the local dispersion. Where it is more
// than the accuracy a calibration claims, the axis there rests on that one pair's centre, and a centre
// pulled by an unlisted neighbour moves it unseen: a cubic follows a lone pair in a gap, so its
// residual stays small and the others' prediction across the gap is too loose for the held-out check
// to hold it to (instrument 12400022, an Ar grating: one pair pulled by a third of a line width stood
// alone in a gap of 760 px, and the axis there was 0.15 nm off, 0.27 of a line width). The change of
// the parameters is the linearised DFBETA of Belsley, Kuh & Welsch, Regression Diagnostics (1980;
// cited from memory), C·Jᵢᵀ·rᵢ/(1 − hᵢ) in the weighted fit, exact for a polynomial.
import type { CalibrationModel } from "./calibration-model";
import type { LampPair } from "./lamp-pairing-types";
import { linearisedFit, type LinearisedFit } from "./linearised-fit";
import { modelEvaluation } from "./model-evaluation";

/** Points at which the shift is looked for, evenly over the pairs' span. */
const GRID_POINTS = 41;

/**
 * The pair whose absence moves `model` farthest inside the others' span, and by how much (x units);
 * null with too few pairs to leave one out, or when the fit cannot be linearised. `given` is `model`
 * linearised at `pairs` when the caller has it already (null: it cannot be).
 */
export function largestPairInfluence(
  pairs: readonly LampPair[],
  model: CalibrationModel,
  given?: LinearisedFit | null,
): { pair: LampPair; shiftX: number } | null {
  const n = pairs.length;
  const p = model.parameters.length;
  if (n - 1 < p + 1) return null;
  const fit = given === undefined ? linearisedFit(pairs, model) : given;
  if (!fit) return null;
  const xs = pairs.map((q) => q.x);
  const [low, high] = [Math.min(...xs), Math.max(...xs)];
  const grid = Array.from(
    { length: GRID_POINTS },
    (_, g) => low + ((high - low) * g) / (GRID_POINTS - 1),
  );
  const { dispersion, jacobian } = modelEvaluation(model, grid, true);
  let worst: { pair: LampPair; shiftX: number } | null = null;
  pairs.forEach((pair, i) => {
    // The parameters' change when pair i is left out.
    const scale = fit.weightedResiduals[i] / (1 - fit.leverage[i]);
    const change = fit.covariance.map(
      (row) => row.reduce((sum, c, b) => sum + c * fit.rows[i][b], 0) * scale,
    );
    const others = xs.filter((_, k) => k !== i);
    const [from, to] = [Math.min(...others), Math.max(...others)];
    let shiftX = 0;
    grid.forEach((x, g) => {
      if (x < from || x > to) return;
      let shiftNm = 0;
      for (let a = 0; a < p; a++) shiftNm += jacobian![g * p + a] * change[a];
      shiftX = Math.max(shiftX, Math.abs(shiftNm / dispersion[g]));
    });
    if (!worst || shiftX > worst.shiftX) worst = { pair, shiftX };
  });
  return worst;
}
