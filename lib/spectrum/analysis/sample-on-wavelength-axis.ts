// A sample as an analysis saw it, on ascending wavelengths: through its calibration when it has one
// (samples the calibration cannot place, beyond a prism's reach say, are left out), else on the axis it
// came on. A run's chart and its report exports show exactly these points.
import type { CalibrationModel } from "../calibration";
import { evaluateCalibration } from "../calibration/evaluate-calibration";

export interface SampleOnWavelengthAxis {
  /** Ascending wavelengths in nm. */
  wavelengthNm: Float64Array;
  counts: Float64Array;
  /** The companion series (a run's continuum) at the same samples; null when none was given. */
  companion: Float64Array | null;
}

/**
 * `x`, `y` and an optional `companion` (one value per sample) on ascending wavelengths: `x` through
 * `calibration` when one is given (samples it maps to no finite wavelength are dropped), else `x` as
 * nm. Inputs are not changed.
 */
export function sampleOnWavelengthAxis(
  points: { x: Float64Array; y: Float64Array; companion?: Float64Array | null },
  calibration: CalibrationModel | null,
): SampleOnWavelengthAxis {
  const { y } = points;
  const companion = points.companion ?? null;
  if (y.length !== points.x.length || (companion && companion.length !== points.x.length)) {
    throw new RangeError("x, y and the companion series need one value per sample.");
  }
  let x = points.x;
  let keep: number[] | null = null;
  if (calibration) {
    x = evaluateCalibration(calibration, points.x);
    keep = [];
    for (let i = 0; i < x.length; i++) if (Number.isFinite(x[i])) keep.push(i);
  }
  const order = keep ?? Array.from(x, (_, i) => i);
  if (order.length > 1 && x[order[0]] > x[order[order.length - 1]]) order.reverse();
  return {
    wavelengthNm: Float64Array.from(order, (i) => x[i]),
    counts: Float64Array.from(order, (i) => y[i]),
    companion: companion ? Float64Array.from(order, (i) => companion[i]) : null,
  };
}
