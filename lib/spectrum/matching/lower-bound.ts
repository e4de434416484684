// Binary search on an ascending typed array: the first position whose value is not below a target,
// or above it.

/** Index of the first element ≥ target in ascending `values[from … to)` (`to` when none is). */
export function lowerBound(
  values: Float64Array,
  target: number,
  from = 0,
  to = values.length,
): number {
  return firstPast(values, target, from, to, false);
}

/** Index of the first element > target in ascending `values[from … to)` (`to` when none is). */
export function firstAbove(
  values: Float64Array,
  target: number,
  from = 0,
  to = values.length,
): number {
  return firstPast(values, target, from, to, true);
}

/** The first position whose value is not below target, or, with `pastEqual`, above it. */
function firstPast(
  values: Float64Array,
  target: number,
  from: number,
  to: number,
  pastEqual: boolean,
): number {
  let lo = from;
  let hi = to;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (values[mid] < target || (pastEqual && values[mid] === target)) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
