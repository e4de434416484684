// Counts significant negative curvature minima in a stretch: two or more under one peak mean a shoulder.

export interface CountCurvatureMinimaOptions {
  /** First index of the stretch. */
  start: number;
  /** Last index of the stretch (inclusive). */
  end: number;
  /**
   * Significance: a minimum counts when it lies below −threshold, and successive minima must be
   * separated by a rise and fall of at least threshold (hysteresis, so noise does not split one lobe).
   */
  threshold: number;
}

/**
 * Each line component makes its own negative lobe in the second derivative, even when it has no
 * maximum of its own (a shoulder), so the count of significant minima is a component count.
 */
export function countCurvatureMinima(
  curvature: Float64Array,
  options: CountCurvatureMinimaOptions,
): number {
  const { threshold } = options;
  const start = Math.max(0, options.start);
  const end = Math.min(curvature.length - 1, options.end);
  let count = 0;
  let seekingMinimum = true;
  let extreme = Infinity;
  for (let i = start; i <= end; i++) {
    const value = curvature[i];
    if (seekingMinimum) {
      if (value < extreme) extreme = value;
      if (extreme < -threshold && value > extreme + threshold) {
        count++;
        seekingMinimum = false;
        extreme = value;
      }
    } else {
      if (value > extreme) extreme = value;
      if (value < extreme - threshold) {
        seekingMinimum = true;
        extreme = value;
      }
    }
  }
  if (seekingMinimum && extreme < -threshold) count++;
  return count;
}
