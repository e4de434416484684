// Public API of the composed analyses: calibrated peaks and the identification of a sample.
export { calibratePeaks, type CalibratePeaksOptions } from "./calibrate-peaks";
export { analyzeSample, type AnalyzeSampleOptions, type SampleAnalysis } from "./analyze-sample";
export { calibrateLamp, type CalibrateLampOptions, type LampCalibration } from "./calibrate-lamp";
