// Tells from the values alone whether an x column is a whole detector's pixel indices, and from which
// number they count: only a column that covers exactly the detector, one index per pixel, says so.

/**
 * 0 or 1 when `x` holds the integers 0 … pixels − 1 or 1 … pixels, each once, in steps of 1 in
 * either direction; null otherwise (other values, gaps, or a count that is not the detector's).
 */
export function detectorPixelOrigin(x: ArrayLike<number>, pixels: number): 0 | 1 | null {
  if (!Number.isInteger(pixels) || pixels < 2) {
    throw new RangeError(`pixels must be an integer of at least 2, got ${String(pixels)}`);
  }
  if (x.length !== pixels) return null;
  const first = x[0];
  const step = x[1] - first;
  if (step !== 1 && step !== -1) return null;
  for (let i = 0; i < x.length; i++) if (x[i] !== first + i * step) return null;
  const low = Math.min(first, x[x.length - 1]);
  return low === 0 || low === 1 ? low : null;
}
