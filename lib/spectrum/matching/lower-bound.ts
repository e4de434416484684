// Binary search on an ascending typed array: the first position whose value is not below a target.

/** Index of the first element ≥ target in ascending `values` (values.length when none is). */
export function lowerBound(values: Float64Array, target: number): number {
  let lo = 0;
  let hi = values.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (values[mid] < target) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
