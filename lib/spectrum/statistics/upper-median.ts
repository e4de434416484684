// The upper median of some numbers: the middle one, and the upper of the middle two for an even count
// (no averaging, so the result is always one of the values); NaN for none. Robust spreads and typical
// widths in calibration take it where `median` would average two neighbours.
export function upperMedian(values: readonly number[]): number {
  return upperMedianOfSorted(values.slice().sort((a, b) => a - b));
}

/** The upper median of values already sorted ascending (no copy, no sort); NaN for none. */
export function upperMedianOfSorted(sorted: readonly number[]): number {
  return sorted.length === 0 ? Number.NaN : sorted[sorted.length >> 1];
}
