// Where the detector clipped: runs of samples at (or within a hair of) its maximum count.
import { assertFiniteArray } from "./assert-finite-array";
import { assertIntegerInRange } from "./assert-integer-in-range";

/** An inclusive run of sample indices, start ≤ end. */
export interface IndexRange {
  start: number;
  end: number;
}

export interface FindSaturatedRangesOptions {
  /**
   * The detector's full-scale count (e.g. 65535 for 16 bits). When omitted, the array's own maximum
   * stands in, and only flat tops (runs of ≥ minRunLength samples) count as clipping.
   * @default undefined
   */
  detectorMax?: number;
  /**
   * Samples at or above reference × (1 − nearMaxFraction) count as saturated; some detectors clip a
   * few counts below full scale.
   * @default 0.001 with detectorMax, 0 without
   */
  nearMaxFraction?: number;
  /**
   * Shortest run reported.
   * @default 1 with detectorMax, 3 without
   */
  minRunLength?: number;
}

/** Saturated runs of `y`, in increasing order. A constant spectrum without detectorMax has none. */
export function findSaturatedRanges(
  y: Float64Array,
  options: FindSaturatedRangesOptions = {},
): IndexRange[] {
  assertFiniteArray(y, "y", 1);
  const { detectorMax } = options;
  const known = detectorMax !== undefined;
  if (known && !Number.isFinite(detectorMax)) {
    throw new RangeError(`detectorMax must be finite (got ${detectorMax})`);
  }
  const { nearMaxFraction = known ? 0.001 : 0, minRunLength = known ? 1 : 3 } = options;
  if (!(nearMaxFraction >= 0 && nearMaxFraction < 1)) {
    throw new RangeError(`nearMaxFraction must lie in [0, 1) (got ${nearMaxFraction})`);
  }
  assertIntegerInRange(minRunLength, "minRunLength", 1);

  let reference = detectorMax ?? -Infinity;
  if (!known) {
    let min = Infinity;
    for (let i = 0; i < y.length; i++) {
      if (y[i] > reference) reference = y[i];
      if (y[i] < min) min = y[i];
    }
    // A flat line tells nothing about clipping.
    if (reference === min) return [];
  }
  const threshold = reference - nearMaxFraction * Math.abs(reference);
  const ranges: IndexRange[] = [];
  let start = -1;
  for (let i = 0; i <= y.length; i++) {
    const high = i < y.length && y[i] >= threshold;
    if (high && start < 0) start = i;
    if (!high && start >= 0) {
      if (i - start >= minRunLength) ranges.push({ start, end: i - 1 });
      start = -1;
    }
  }
  return ranges;
}
