// Unscaled parameter covariance (JᵀJ)⁻¹ from a weighted Jacobian, computed through the SVD of the
// column-scaled Jacobian: prism and Hartmann parameters are strongly correlated, and forming JᵀJ and
// inverting it directly loses the digits that the uncertainty J·C·Jᵀ needs.
import { Matrix, SingularValueDecomposition } from "ml-matrix";
import { CalibrationError } from "./calibration-error";

/** (JᵀJ)⁻¹ for the rows of J (one row per pair, already divided by σ). */
export function jacobianCovariance(rows: number[][]): number[][] {
  const p = rows[0]?.length ?? 0;
  const scales = Array.from(
    { length: p },
    (_, k) => Math.sqrt(rows.reduce((sum, row) => sum + row[k] ** 2, 0)) || 1,
  );
  const scaled = new Matrix(rows.map((row) => row.map((value, k) => value / scales[k])));
  const svd = new SingularValueDecomposition(scaled, { autoTranspose: true });
  const singular = svd.diagonal;
  const v = svd.rightSingularVectors;
  const largest = Math.max(...singular);
  if (!(largest > 0) || singular.some((s) => !(s > largest * 1e-13))) {
    throw new CalibrationError(
      "fit-failed",
      "the pairs do not determine the model's parameters (singular Jacobian)",
    );
  }
  const covariance: number[][] = [];
  for (let a = 0; a < p; a++) {
    covariance.push([]);
    for (let b = 0; b < p; b++) {
      let sum = 0;
      for (let k = 0; k < p; k++) sum += (v.get(a, k) * v.get(b, k)) / singular[k] ** 2;
      covariance[a].push(sum / (scales[a] * scales[b]));
    }
  }
  return covariance;
}
