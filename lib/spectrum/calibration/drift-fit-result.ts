// A recalibration's drifted model as a fit: its pairs' residuals, RMS, χ² and covered range.
import type { CalibrationModel } from "./calibration-model";
import type { FitCalibrationResult } from "./fit-calibration";
import { modelEvaluation } from "./model-evaluation";
import type { DriftFit } from "./recalibration-types";

/** The drifted model with today's pairs' residuals, in the shape every fit returns. */
export function driftFitResult(
  model: CalibrationModel,
  fitted: DriftFit,
  [low, high]: [number, number],
): FitCalibrationResult {
  const all = [...fitted.pairs, ...fitted.rejected];
  const evaluation = modelEvaluation(
    model,
    all.map((p) => p.x),
  );
  const residuals = all.map((p, i) => p.wavelengthNm - evaluation.wavelengthNm[i]);
  const used = fitted.pairs.length;
  const rmsNm = Math.sqrt(residuals.slice(0, used).reduce((s, r) => s + r * r, 0) / used);
  const chiSquare = fitted.pairs.reduce((s, p, i) => {
    const sigma = (p.xUncertainty ?? 1) * Math.abs(evaluation.dispersion[i]);
    return s + (residuals[i] / sigma) ** 2;
  }, 0);
  const coveredNm = modelEvaluation(model, [low, high]).wavelengthNm;
  const finished: CalibrationModel = {
    ...model,
    coveredX: [low, high],
    coveredNm: [Math.min(coveredNm[0], coveredNm[1]), Math.max(coveredNm[0], coveredNm[1])],
    rmsNm,
    dof: used - 2,
    pairCount: used,
    chiSquare,
  };
  const fittedPairs = all.map((p, i) => ({ ...p, residualNm: residuals[i], used: i < used }));
  return {
    model: finished,
    pairs: fittedPairs,
    rejected: fittedPairs.slice(used),
    rmsNm,
    dof: used - 2,
    warnings:
      fitted.rejected.length > 0
        ? [
            {
              code: "outliers-rejected",
              message: `${fitted.rejected.length} lamp peak(s) near a predicted line stood off the drift and were set aside`,
            },
          ]
        : [],
  };
}
