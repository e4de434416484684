// Asymmetric least squares baseline (Eilers & Boelens 2005): a smooth curve that hugs the
// lower envelope of a spectrum, suited to a flame's broad, curved continuum.
import { assertFiniteArray } from "./assert-finite-array";
import { assertIntegerInRange } from "./assert-integer-in-range";
import {
  pentadiagonalWorkspace,
  solveSymmetricPentadiagonal,
} from "./solve-symmetric-pentadiagonal";

export interface AsymmetricLeastSquaresOptions {
  /**
   * Smoothness penalty λ on second differences, in samples⁴: the baseline cannot bend on scales
   * much shorter than about 2π·λ^¼ samples (≈ 200 samples at the default), so lines a few tens of
   * samples wide pass over it.
   * @default 1e6
   */
  lambda?: number;
  /**
   * Weight p of samples above the baseline (1 − p below); small p lets peaks rise off it.
   * @default 0.01
   */
  asymmetry?: number;
  /**
   * Re-weighting passes; the loop also stops as soon as no weight changes.
   * @default 10
   */
  maxIterations?: number;
}

/**
 * Minimises Σ wᵢ(yᵢ − zᵢ)² + λ Σ (Δ²zᵢ)² by repeated weighted Whittaker smoothing, each solve
 * being a pentadiagonal system, so the whole baseline costs O(n · iterations).
 */
export function asymmetricLeastSquares(
  y: Float64Array,
  options: AsymmetricLeastSquaresOptions = {},
): Float64Array {
  const { lambda = 1e6, asymmetry = 0.01, maxIterations = 10 } = options;
  assertFiniteArray(y, "y", 3);
  if (!Number.isFinite(lambda) || lambda <= 0)
    throw new RangeError(`lambda must be positive (got ${lambda})`);
  if (!(asymmetry > 0 && asymmetry < 0.5))
    throw new RangeError(`asymmetry must lie in (0, 0.5) (got ${asymmetry})`);
  assertIntegerInRange(maxIterations, "maxIterations", 1);

  const n = y.length;
  // Bands of DᵀD for the (n − 2) × n second-difference matrix D with rows (1, −2, 1).
  const penaltyDiagonal = new Float64Array(n);
  const penaltyUpper1 = new Float64Array(n - 1);
  const penaltyUpper2 = new Float64Array(n - 2);
  for (let row = 0; row < n - 2; row++) {
    penaltyDiagonal[row] += 1;
    penaltyDiagonal[row + 1] += 4;
    penaltyDiagonal[row + 2] += 1;
    penaltyUpper1[row] -= 2;
    penaltyUpper1[row + 1] -= 2;
    penaltyUpper2[row] += 1;
  }
  const upper1 = penaltyUpper1.map((v) => lambda * v);
  const upper2 = penaltyUpper2.map((v) => lambda * v);
  const diagonal = new Float64Array(n);
  const rhs = new Float64Array(n);
  const weights = new Float64Array(n).fill(1);
  const baseline = new Float64Array(n);
  const workspace = pentadiagonalWorkspace(n);
  for (let iteration = 0; iteration < maxIterations; iteration++) {
    for (let i = 0; i < n; i++) {
      diagonal[i] = weights[i] + lambda * penaltyDiagonal[i];
      rhs[i] = weights[i] * y[i];
    }
    solveSymmetricPentadiagonal({ diagonal, upper1, upper2 }, rhs, baseline, workspace);
    let changed = false;
    for (let i = 0; i < n; i++) {
      const weight = y[i] > baseline[i] ? asymmetry : 1 - asymmetry;
      if (weight !== weights[i]) changed = true;
      weights[i] = weight;
    }
    if (!changed) break;
  }
  return baseline;
}
