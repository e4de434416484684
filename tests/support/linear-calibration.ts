// The calibration of a straight grating for tests that draw their own spectra: a straight line fitted
// through five points of `wavelengthOfPixel` spread over an array of `pixels`.
import { fitCalibration, type CalibrationModel } from "@/lib/spectrum/calibration";

export function linearCalibration(
  pixels: number,
  wavelengthOfPixel: (px: number) => number,
): CalibrationModel {
  return fitCalibration(
    [0, 0.25, 0.5, 0.75, 1].map((u) => ({
      x: u * (pixels - 1),
      wavelengthNm: wavelengthOfPixel(u * (pixels - 1)),
    })),
    { model: "polynomial", degree: 1, domain: [0, pixels - 1] },
  ).model;
}
