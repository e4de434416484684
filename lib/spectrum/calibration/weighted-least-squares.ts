// Weighted linear least squares through ml-matrix's QR solve, with the unscaled covariance (AᵀWA)⁻¹.
import { Matrix, QrDecomposition, inverse } from "ml-matrix";
import { CalibrationError } from "./calibration-error";

/** Solution of a weighted linear least-squares problem. */
export interface LeastSquaresSolution {
  parameters: number[];
  /** (AᵀWA)⁻¹, not yet scaled by the residual variance. */
  unscaledCovariance: number[][];
  /** Σ ((yᵢ − ŷᵢ)/σᵢ)². */
  chiSquare: number;
}

/** Minimises Σ ((yᵢ − Σⱼ Aᵢⱼ pⱼ)/σᵢ)² for design rows A, observations y and 1σ uncertainties σ. */
export function weightedLeastSquares(
  design: number[][],
  y: number[],
  sigma: number[],
): LeastSquaresSolution {
  const rows = design.length;
  const columns = design[0]?.length ?? 0;
  const weighted = new Matrix(rows, columns);
  const rhs = new Matrix(rows, 1);
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < columns; j++) weighted.set(i, j, design[i][j] / sigma[i]);
    rhs.set(i, 0, y[i] / sigma[i]);
  }
  const qr = new QrDecomposition(weighted);
  if (!qr.isFullRank()) {
    throw new CalibrationError(
      "fit-failed",
      "the pairs do not determine the model (rank-deficient design)",
    );
  }
  const solution = qr.solve(rhs).getColumn(0);
  let chiSquare = 0;
  for (let i = 0; i < rows; i++) {
    let predicted = 0;
    for (let j = 0; j < columns; j++) predicted += design[i][j] * solution[j];
    chiSquare += ((y[i] - predicted) / sigma[i]) ** 2;
  }
  // AᵀWA summed directly: a transposed copy and a general product cost more than the fit itself at
  // the handful of columns a calibration has, thousands of times per calibration.
  const normal = new Matrix(columns, columns);
  for (let j = 0; j < columns; j++) {
    for (let k = 0; k <= j; k++) {
      let sum = 0;
      for (let i = 0; i < rows; i++) sum += (design[i][j] * design[i][k]) / (sigma[i] * sigma[i]);
      normal.set(j, k, sum);
      normal.set(k, j, sum);
    }
  }
  const unscaledCovariance = inverse(normal).to2DArray();
  return { parameters: solution, unscaledCovariance, chiSquare };
}
