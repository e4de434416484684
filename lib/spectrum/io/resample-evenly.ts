// A spectrum on an uneven axis (a calibrated pixel array) linearly interpolated onto an even one, for
// programs that take only evenly spaced data (JCAMP-DX XYDATA). Linear, so no value overshoots its
// neighbours; a peak a few samples wide loses a little height, which is why it is a second export.
import type { Spectrum } from "../types";

export interface ResampleEvenlyOptions {
  /**
   * Points of the even axis, spanning the first to the last x.
   * @default the spectrum's own number of points
   */
  points?: number;
}

/** `spectrum` at `points` evenly spaced x from its first x to its last; y by linear interpolation. */
export function resampleEvenly(spectrum: Spectrum, options: ResampleEvenlyOptions = {}): Spectrum {
  const { x, y } = spectrum;
  const n = x.length;
  if (!(x instanceof Float64Array) || !(y instanceof Float64Array) || y.length !== n)
    throw new RangeError("x and y must be Float64Arrays of the same length");
  if (n < 2) throw new RangeError("a spectrum needs at least 2 points to resample");
  const { points = n } = options;
  if (!Number.isInteger(points) || points < 2)
    throw new RangeError(`points must be an integer of at least 2, got ${String(points)}`);
  for (let i = 1; i < n; i++) {
    if (!(x[i] > x[i - 1])) throw new RangeError(`x must be strictly increasing (index ${i})`);
  }
  const first = x[0];
  const last = x[n - 1];
  const step = (last - first) / (points - 1);
  const evenX = new Float64Array(points);
  const evenY = new Float64Array(points);
  let j = 0;
  for (let i = 0; i < points; i++) {
    const at = i === points - 1 ? last : first + i * step;
    while (j < n - 2 && x[j + 1] < at) j++;
    const t = (at - x[j]) / (x[j + 1] - x[j]);
    evenX[i] = at;
    evenY[i] = y[j] + Math.min(1, Math.max(0, t)) * (y[j + 1] - y[j]);
  }
  const resampled: Spectrum = {
    x: evenX,
    y: evenY,
    xUnit: spectrum.xUnit,
    meta: { ...spectrum.meta },
  };
  if (spectrum.medium !== undefined) resampled.medium = spectrum.medium;
  return resampled;
}
