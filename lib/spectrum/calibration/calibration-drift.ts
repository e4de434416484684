// How far a new calibration moved from the instrument's previous one: calibrated wavelength now minus
// then at five pixels across the array, so a lab sees its instrument drift from day to day.
import type { CalibrationModel } from "./calibration-model";
import { evaluateCalibration } from "./evaluate-calibration";

export interface CalibrationDrift {
  /** Where it was measured: the array's ends, quarters and middle. */
  pixels: number[];
  /** λ now − λ before at each pixel, nm (NaN where either model gives no wavelength). */
  deltaNm: number[];
  /** The largest finite |Δλ|, nm. */
  maxAbsNm: number;
}

/** Δλ between two calibrations of one array over `domain` (its first and last pixel). */
export function calibrationDrift(
  current: CalibrationModel,
  previous: CalibrationModel,
  domain: readonly [number, number],
): CalibrationDrift {
  if (!(Number.isFinite(domain[0]) && Number.isFinite(domain[1]) && domain[0] !== domain[1])) {
    throw new RangeError(
      `domain must be two different finite pixels, got [${domain[0]}, ${domain[1]}]`,
    );
  }
  const pixels = [0, 0.25, 0.5, 0.75, 1].map((f) => domain[0] + f * (domain[1] - domain[0]));
  const now = evaluateCalibration(current, Float64Array.from(pixels));
  const before = evaluateCalibration(previous, Float64Array.from(pixels));
  const deltaNm = pixels.map((_, i) => now[i] - before[i]);
  return {
    pixels,
    deltaNm,
    maxAbsNm: Math.max(0, ...deltaNm.map((d) => (Number.isFinite(d) ? Math.abs(d) : 0))),
  };
}
