// Median of a sample in O(n) (quickselect) so the noise estimate stays linear up to a million points.

/** Median of `values` (mean of the two middle values for an even count); the input is not modified. */
export function xMedian(values: Float64Array): number {
  const n = values.length;
  if (n === 0) throw new RangeError("xMedian needs at least one value");
  const work = Float64Array.from(values);
  const upper = select(work, n >> 1);
  if (n % 2 === 1) return upper;
  // After selecting k = n/2, everything left of k is ≤ work[k]; the lower middle is their maximum.
  let lower = -Infinity;
  for (let i = 0; i < n >> 1; i++) if (work[i] > lower) lower = work[i];
  return (lower + upper) / 2;
}

/** Hoare-style quickselect with median-of-three pivots; reorders `a` in place and returns its k-th smallest. */
function select(a: Float64Array, k: number): number {
  let left = 0;
  let right = a.length - 1;
  while (right > left) {
    const mid = (left + right) >> 1;
    // Median of three guards against the quadratic case on sorted or constant input.
    if (a[mid] < a[left]) swap(a, mid, left);
    if (a[right] < a[left]) swap(a, right, left);
    if (a[right] < a[mid]) swap(a, right, mid);
    const pivot = a[mid];
    let i = left;
    let j = right;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        swap(a, i, j);
        i++;
        j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else return a[k];
  }
  return a[k];
}

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i];
  a[i] = a[j];
  a[j] = t;
}
