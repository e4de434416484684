// Places peaks found on the input axis (pixels or a factory wavelength axis) onto the calibrated
// wavelength axis, carrying both the peak's own centre uncertainty and the calibration's, and the
// instrument's line-profile width at each peak when it is known.
import type { CalibrationModel } from "../calibration/calibration-model";
import { calibrationUncertainty } from "../calibration/calibration-uncertainty";
import { dispersionAt } from "../calibration/dispersion-at";
import { evaluateCalibration } from "../calibration/evaluate-calibration";
import type { CalibratedPeak, Peak } from "../types";
import { assertPositiveFinite } from "../units/assert-positive-finite";

export interface CalibratePeaksOptions {
  /**
   * The dispersion relation; null when the input axis already is a wavelength axis in nm that is
   * used as it is (not lamp-checked: only the peaks' own uncertainty is carried).
   * @default null
   */
  calibration?: CalibrationModel | null;
  /**
   * FWHM of the instrument's line profile on the input axis, in the peaks' x units (pixels on a
   * pixel axis; nm when calibration is null). A slit image is about as many pixels wide across the
   * whole array, so each peak gets resolutionNm = instrumentFwhm × |dλ/dx| there and the broad flag.
   * A function gives the FWHM at each peak's x instead (a prism's width in nm on an axis in nm).
   * @default undefined (neither resolutionNm nor broad is set)
   */
  instrumentFwhm?: number | ((x: number) => number);
  /**
   * A peak wider than this many instrument FWHM is flagged broad. One line, or an unresolved blend
   * of lines closer than a FWHM, reads at most about twice the instrument's width (two equal lines
   * one FWHM apart), and noise at SNR 5 moves a measured FWHM by about ±20 %: 3 keeps every such
   * peak, while molecular bands and continuum structure are wider still.
   * @default 3
   */
  broadFactor?: number;
}

/**
 * σ_λ² = (|dλ/dx| · σ_x)² + σ_cal(x)²: the peak's centre uncertainty through the local
 * dispersion, and the fit's own uncertainty at that x (delta method on its covariance).
 * A saturated peak is never flagged broad: its half-height is taken from the clipped top, so its
 * FWHM reads wider than the line is (twice as wide when clipped at a twentieth of its height).
 */
export function calibratePeaks(
  peaks: readonly Peak[],
  options: CalibratePeaksOptions = {},
): CalibratedPeak[] {
  const { calibration = null, instrumentFwhm, broadFactor = 3 } = options;
  if (typeof instrumentFwhm === "number") assertPositiveFinite(instrumentFwhm, "instrumentFwhm");
  assertPositiveFinite(broadFactor, "broadFactor");
  if (peaks.length === 0) return [];
  const withResolution = (peak: Peak, slope: number) => {
    if (instrumentFwhm === undefined) return {};
    const width = typeof instrumentFwhm === "number" ? instrumentFwhm : instrumentFwhm(peak.x);
    assertPositiveFinite(width, "instrumentFwhm at a peak");
    return {
      resolutionNm: width * slope,
      broad: !peak.saturated && peak.fwhm > broadFactor * width,
    };
  };
  if (!calibration) {
    return peaks.map((peak) => ({
      ...peak,
      wavelengthNm: peak.x,
      wavelengthUncertaintyNm: peak.xUncertainty,
      fwhmNm: peak.fwhm,
      ...withResolution(peak, 1),
      ...(peak.asymmetry !== undefined ? { redAsymmetry: peak.asymmetry } : {}),
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
      ...withResolution(peak, slope),
      // On an axis whose wavelength falls with x the lean turns round.
      ...(peak.asymmetry !== undefined
        ? { redAsymmetry: Math.sign(dispersion[i]) * peak.asymmetry }
        : {}),
    };
  });
}
