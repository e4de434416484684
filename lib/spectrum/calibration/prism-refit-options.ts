// The options that refit a prism model in its own glass: the catalogue glass it names, or its fitted
// glass, refitted from its own angles and terms.
import type { PrismCalibrationModel } from "./calibration-model";
import type { FitCalibrationOptions } from "./fit-calibration";

/** fitCalibration's options for `model`'s glass (the caller adds the angles it keeps or frees). */
export function prismRefitOptions(model: PrismCalibrationModel): FitCalibrationOptions {
  return model.glassFitted
    ? { model: "prism", glass: model.glass, fitGlass: true, fittedGlassFrom: model }
    : { model: "prism", glass: model.glass, fitGlass: false };
}
