// Where a peak's flanks cross a level (half its height), by linear interpolation between samples.

export interface HalfHeightCrossingsOptions {
  /** Index of the peak's top sample. */
  index: number;
  /** Level to cross, in signal units (height / 2 for the FWHM). */
  level: number;
  /** Lowest index the left flank may use (the valley to the left neighbour, or 0). */
  leftLimit: number;
  /** Highest index the right flank may use (the valley to the right neighbour, or length − 1). */
  rightLimit: number;
}

/**
 * Fractional indices where `signal` first falls to `level` on each side of `index`, or null where
 * it does not before the limit (a blended or truncated flank). Same interpolation as SciPy's
 * peak_widths.
 */
export function halfHeightCrossings(
  signal: Float64Array,
  options: HalfHeightCrossingsOptions,
): { left: number | null; right: number | null } {
  const { index, level, leftLimit, rightLimit } = options;
  let left: number | null = null;
  for (let i = index; i > leftLimit; i--) {
    if (signal[i - 1] <= level) {
      const rise = signal[i] - signal[i - 1];
      left = rise > 0 ? i - 1 + (level - signal[i - 1]) / rise : i - 1;
      break;
    }
  }
  let right: number | null = null;
  for (let i = index; i < rightLimit; i++) {
    if (signal[i + 1] <= level) {
      const fall = signal[i] - signal[i + 1];
      right = fall > 0 ? i + (signal[i] - level) / fall : i + 1;
      break;
    }
  }
  return { left, right };
}
