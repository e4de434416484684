// Cuts per-line values into blocks sorted strongest first with prefix sums, so the sum or count of
// the values above any threshold over a range of lines costs about B + (n / B) · log B, not n.

export interface BuildSortedBlocksOptions {
  /** Lines per block: the partial blocks at a range's ends are scanned, whole ones binary-searched.
   * @default 256 */
  blockSize?: number;
}

/** `values` cut into blocks of `blockSize`; see buildSortedBlocks. */
export interface SortedBlocks {
  /** The values as given (not copied, never changed); NaN means "no value". */
  values: Float64Array;
  blockSize: number;
  /** Block b's values, largest first with NaN last, at [b·blockSize, min(n, (b + 1)·blockSize)). */
  sorted: Float64Array;
  /** prefixSum[b·blockSize + i] = sorted[b·blockSize] + … + sorted[b·blockSize + i] (NaN left out). */
  prefixSum: Float64Array;
}

/**
 * Memory is two Float64Arrays of n. The input is not changed; NaN values ("no value") sort last in
 * their block and never reach a threshold.
 */
export function buildSortedBlocks(
  values: Float64Array,
  options: BuildSortedBlocksOptions = {},
): SortedBlocks {
  const { blockSize = 256 } = options;
  if (!Number.isInteger(blockSize) || blockSize < 1) {
    throw new RangeError(`blockSize must be a positive integer, got ${blockSize}`);
  }
  const sorted = Float64Array.from(values);
  const prefixSum = new Float64Array(values.length);
  // Largest first, NaN after every number.
  const descending = (a: number, b: number) =>
    Number.isNaN(a) ? (Number.isNaN(b) ? 0 : 1) : Number.isNaN(b) ? -1 : b - a;
  for (let start = 0; start < values.length; start += blockSize) {
    const end = Math.min(values.length, start + blockSize);
    sorted.subarray(start, end).sort(descending);
    let sum = 0;
    for (let i = start; i < end; i++) {
      if (!Number.isNaN(sorted[i])) sum += sorted[i];
      prefixSum[i] = sum;
    }
  }
  return { values, blockSize, sorted, prefixSum };
}
