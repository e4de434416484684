// Public API of the wavelength calibration stage: glass catalogue, models, fitting and lamp pairing.
export {
  GLASS_CATALOGUE,
  GLASS_NAMES,
  type GlassName,
  type SellmeierGlass,
} from "./glass-catalogue";
export { refractiveIndex } from "./refractive-index";
export { CalibrationError, type CalibrationErrorCode } from "./calibration-error";
export type {
  CalibrationModel,
  CalibrationModelBase,
  CalibrationModelKind,
  CalibrationWarning,
  FittedCalibrationPair,
  HartmannCalibrationModel,
  PolynomialCalibrationModel,
  PrismCalibrationModel,
  XNormalisation,
} from "./calibration-model";
export { evaluateCalibration, type EvaluateCalibrationOptions } from "./evaluate-calibration";
export { calibrationUncertainty } from "./calibration-uncertainty";
export { dispersionAt } from "./dispersion-at";
export { calibrationRangeWarnings } from "./calibration-range-warnings";
export { assertMonotonicCalibration } from "./assert-monotonic-calibration";
export {
  fitCalibration,
  type FitCalibrationOptions,
  type FitCalibrationResult,
} from "./fit-calibration";
export { informationCriteria, type InformationCriteria } from "./information-criteria";
export {
  compareCalibrationModels,
  type CalibrationCandidate,
  type CompareCalibrationModelsOptions,
  type CompareCalibrationModelsResult,
} from "./compare-calibration-models";
export { autoPairLampPeaks, type AutoPairLampPeaksOptions } from "./auto-pair-lamp-peaks";
export { pairManually, type ManualSeedPair, type PairManuallyOptions } from "./pair-manually";
export type {
  LampLine,
  LampPair,
  LampPairingOptions,
  LampPairingResult,
  LampPeak,
} from "./lamp-pairing-types";
export {
  calibrationDoubts,
  type CalibrationDoubtsFit,
  type CalibrationDoubtsOptions,
} from "./calibration-doubts";
export {
  UNPAIRED_REACH_FWHM,
  unpairedLampPeaks,
  type UnpairedLampLineInput,
  type UnpairedLampPeakInput,
  type UnpairedLampPeaksOptions,
  type UnpairedLampPeaksResult,
  type UnpairedPeakReason,
  type UnpairedPeakReasonCode,
} from "./unpaired-lamp-peaks";
export {
  CALIBRATION_MODELS,
  calibrationModelChoice,
  type CalibrationModelChoice,
} from "./calibration-model-choice";
export { calibrationDrift, type CalibrationDrift } from "./calibration-drift";
