// The workbench's model comparison: every model of the selector fitted to the same pairs, one row each.
import {
  CALIBRATION_MODELS,
  calibrationModelChoice,
} from "../calibration/calibration-model-choice";
import { compareCalibrationModels } from "../calibration/compare-calibration-models";
import type { CalibrationPair } from "../types";
import type {
  EditedLampCalibration,
  EditLampCalibrationOptions,
  WorkbenchModelRow,
} from "./edit-lamp-calibration-types";

const COMPARED_MODELS = CALIBRATION_MODELS.filter((m) => m !== "auto");

/** The comparison's rows in the selector's order, with the ones that could not be fitted and why. */
export function modelComparisonRows(
  pairs: CalibrationPair[],
  options: EditLampCalibrationOptions,
): EditedLampCalibration["comparison"] {
  const { dispersion, domain, glass, apexDeg } = options;
  const comparison = compareCalibrationModels(pairs, { dispersion, domain, glass, apexDeg });
  const finite = (v: number | undefined) => (v !== undefined && Number.isFinite(v) ? v : null);
  const candidates = COMPARED_MODELS.map((choice): WorkbenchModelRow => {
    const c = comparison.candidates.find((k) => calibrationModelChoice(k) === choice);
    if (!c) {
      return {
        model: choice,
        parameterCount: null,
        rmsNm: null,
        aicc: null,
        bic: null,
        ends: null,
        glass: null,
        glassFitted: false,
        failure: `needs more than the ${pairs.length} pairs in the fit`,
      };
    }
    return {
      model: choice,
      parameterCount: c.parameterCount,
      rmsNm: finite(c.rmsNm),
      aicc: finite(c.aicc),
      bic: finite(c.bic),
      ends: c.ends
        ? c.ends.map((e) => ({
            pixel: e.x,
            wavelengthNm: e.wavelengthNm,
            uncertaintyNm: e.uncertaintyNm,
          }))
        : null,
      glass: c.glass ?? null,
      glassFitted: c.glassFitted === true,
      failure: c.failure ? c.failure.message : null,
    };
  });
  const recommended =
    comparison.recommended >= 0
      ? calibrationModelChoice(comparison.candidates[comparison.recommended])
      : null;
  return { candidates, recommended, reason: comparison.reason };
}
