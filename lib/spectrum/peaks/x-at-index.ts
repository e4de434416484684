// Maps a fractional sample index to the x axis, so sub-sample results work on non-uniform wavelength axes.

/** x at fractional index `t` by linear interpolation between neighbouring samples, clamped to the array. */
export function xAtIndex(x: Float64Array, t: number): number {
  const last = x.length - 1;
  if (t <= 0) return x[0];
  if (t >= last) return x[last];
  const i = Math.floor(t);
  const f = t - i;
  return f === 0 ? x[i] : x[i] + f * (x[i + 1] - x[i]);
}
