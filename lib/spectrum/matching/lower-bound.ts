// Binary search on an ascending array (typed or plain): the first position whose value is not below a target,
// or above it, and the positions of the values inside a range.

/** Index of the first element ≥ target in ascending `values[from … to)` (`to` when none is). */
export function lowerBound(
  values: ArrayLike<number>,
  target: number,
  from = 0,
  to = values.length,
): number {
  return firstPast(values, target, from, to, false);
}

/** Index of the first element > target in ascending `values[from … to)` (`to` when none is). */
export function firstAbove(
  values: ArrayLike<number>,
  target: number,
  from = 0,
  to = values.length,
): number {
  return firstPast(values, target, from, to, true);
}

/** Positions [start, end) of the values inside [low, high] in ascending `values[from … to)`. */
export function positionsWithin(
  values: ArrayLike<number>,
  low: number,
  high: number,
  from = 0,
  to = values.length,
): [number, number] {
  const start = lowerBound(values, low, from, to);
  return [start, firstAbove(values, high, start, to)];
}

/** The first position whose value is not below target, or, with `pastEqual`, above it. */
function firstPast(
  values: ArrayLike<number>,
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
