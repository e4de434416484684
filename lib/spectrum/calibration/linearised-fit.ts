// A calibration's weighted least-squares fit linearised at its solution: each pair's weighted Jacobian
// row, the unscaled covariance (JᵀWJ)⁻¹, the weighted residuals and each pair's leverage. Exact for a
// polynomial (a linear model); for a prism or Hartmann curve the first-order picture. The regression
// diagnostics that ask what one pair does to the fit (held-out-miss.ts, pair-influence.ts) share it.
import type { CalibrationModel } from "./calibration-model";
import { fittedXUncertainties } from "./fit-calibration";
import { jacobianCovariance } from "./jacobian-covariance";
import type { LampPair } from "./lamp-pairing-types";
import { modelEvaluation } from "./model-evaluation";

export interface LinearisedFit {
  /** Each pair's σx as the fit weighs it (fittedXUncertainties). */
  sigmaX: number[];
  /** Each pair's Jacobian row ∂λ/∂p divided by its σ in nm. */
  rows: number[][];
  /** (JᵀWJ)⁻¹ of those rows. */
  covariance: number[][];
  /** Each pair's residual λ − λ̂ over its σ in nm. */
  weightedResiduals: number[];
  /** Each pair's σ in nm: its σx through the model's dispersion there. */
  sigmaNm: number[];
  /** |dλ/dx| at each pair (nm per x unit, at least 1e-12). */
  slope: number[];
  /** Each pair's leverage hᵢ, below 1. */
  leverage: number[];
}

/** `model` linearised at `pairs`, weighed as the fit weighs them; null when the Jacobian is singular. */
export function linearisedFit(
  pairs: readonly LampPair[],
  model: CalibrationModel,
): LinearisedFit | null {
  const sigmaX = fittedXUncertainties(pairs);
  const p = model.parameters.length;
  const { wavelengthNm, dispersion, jacobian } = modelEvaluation(
    model,
    pairs.map((q) => q.x),
    true,
  );
  const slope = pairs.map((_, i) => Math.max(Math.abs(dispersion[i]), 1e-12));
  const sigmaNm = sigmaX.map((s, i) => s * slope[i]);
  const rows = pairs.map((_, i) =>
    Array.from({ length: p }, (_, k) => jacobian![i * p + k] / sigmaNm[i]),
  );
  const weightedResiduals = pairs.map((q, i) => (q.wavelengthNm - wavelengthNm[i]) / sigmaNm[i]);
  let covariance: number[][];
  try {
    covariance = jacobianCovariance(rows);
  } catch {
    return null;
  }
  const leverage = rows.map((row) => {
    let h = 0;
    for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) h += row[a] * covariance[a][b] * row[b];
    return Math.min(h, 1 - 1e-12);
  });
  return { sigmaX, rows, covariance, weightedResiduals, sigmaNm, slope, leverage };
}
