// Binary search of a sorted array: the index of the first value at or above a given one.

/** Index of the first element of ascending `sorted` that is ≥ `value`; sorted.length when none is. */
export function firstAtOrAbove(sorted: ArrayLike<number>, value: number): number {
  let low = 0;
  let high = sorted.length;
  while (low < high) {
    const mid = (low + high) >> 1;
    if (sorted[mid] < value) low = mid + 1;
    else high = mid;
  }
  return low;
}
