// Public API of the composed analyses: lamp calibration and its workbench edits, calibrated peaks and the identification of a sample.
export { calibratePeaks, type CalibratePeaksOptions } from "./calibrate-peaks";
export { SAMPLE_ANALYSIS_DEFAULTS } from "./sample-analysis-defaults";
export { sampleOnWavelengthAxis, type SampleOnWavelengthAxis } from "./sample-on-wavelength-axis";
export {
  analyzeSample,
  type AnalyzeSampleOptions,
  type InstrumentWidth,
  type SampleAnalysis,
} from "./analyze-sample";
export {
  estimateInstrumentFwhm,
  type EstimateInstrumentFwhmOptions,
} from "./estimate-instrument-fwhm";
export {
  estimateInstrumentFwhmTrend,
  instrumentFwhmAt,
  type EstimateInstrumentFwhmTrendOptions,
  type InstrumentFwhmTrend,
} from "./estimate-instrument-fwhm-trend";
export { calibrateLamp, type CalibrateLampOptions, type LampCalibration } from "./calibrate-lamp";
export { editLampCalibration } from "./edit-lamp-calibration";
export type {
  EditedLampCalibration,
  EditLampCalibrationOptions,
  HandPair,
  LampCalibrationEdits,
  LampPairRecord,
  UnpairedPeakExplanation,
  WorkbenchModelRow,
  WorkbenchPair,
  WorkbenchPairingRecord,
} from "./edit-lamp-calibration-types";
export { HAND_LINE_MATCH_NM } from "./hand-line-match-nm";
export { lampPairRecord } from "./lamp-pair-record";
export {
  excitationTemperature,
  usableBoltzmannLines,
  type ExcitationTemperature,
  type ExcitationTemperatureOptions,
} from "./excitation-temperature";
export { lteReferenceLines } from "./lte-reference-lines";
export {
  detectionLimits,
  type DetectionLimit,
  type DetectionLimitContext,
} from "./detection-limits";
