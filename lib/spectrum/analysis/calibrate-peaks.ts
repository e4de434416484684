// Places peaks found on the input axis (pixels or a factory wavelength axis) onto the calibrated
// wavelength axis, carrying both the peak's own centre uncertainty and the calibration's.
import type { CalibrationModel } from "../calibration/calibration-model";
import { calibrationUncertainty } from "../calibration/calibration-uncertainty";
import { dispersionAt } from "../calibration/dispersion-at";
import { evaluateCalibration } from "../calibration/evaluate-calibration";
import type { CalibratedPeak, Peak } from "../types";

export interface CalibratePeaksOptions {
  /**
   * The dispersion relation; null when the input axis already is a wavelength axis in nm that is
   * used as it is (not lamp-checked: only the peaks' own uncertainty is carried).
   * @default null
   */
  calibration?: CalibrationModel | null;
}

/**
 * σ_λ² = (|dλ/dx| · σ_x)² + σ_cal(x)²: the peak's centre uncertainty through the local
 * dispersion, and the fit's own uncertainty at that x (delta method on its covariance).
 */
export function calibratePeaks(peaks: readonly Peak[], options: CalibratePeaksOptions = {}): CalibratedPeak[] {
  const { calibration = null } = options;
  if (peaks.length === 0) return [];
  if (!calibration) {
    return peaks.map((peak) => ({
      ...peak,
      wavelengthNm: peak.x,
      wavelengthUncertaintyNm: peak.xUncertainty,
      fwhmNm: peak.fwhm,
    }));
  }
  const x = Float64Array.from(peaks, (peak) => peak.x);
  const wavelengthNm = evaluateCalibration(calibration, x);
  const dispersion = dispersionAt(calibration, x);
  const fitSigma = calibrationUncertainty(calibration, x);
  return peaks.map((peak, i) => {
    const slope = Math.abs(dispersion[i]);
    return {
      ...peak,
      wavelengthNm: wavelengthNm[i],
      wavelengthUncertaintyNm: Math.hypot(slope * peak.xUncertainty, fitSigma[i]),
      fwhmNm: slope * peak.fwhm,
    };
  });
}
