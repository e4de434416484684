// Counts the values of a range of lines that reach a threshold, using blocks from buildSortedBlocks.

import type { SortedBlocks } from "./build-sorted-blocks";

/**
 * Number of p in [from, to) with values[p] ≥ threshold (NaN never counts): the partial blocks at
 * the ends are scanned, each whole block is counted by one binary search, so any threshold costs
 * about blockSize + (n / blockSize) · log blockSize.
 */
export function countAtLeast(
  blocks: SortedBlocks,
  from: number,
  to: number,
  threshold: number,
): number {
  const { values, blockSize, sorted } = blocks;
  const start = Math.max(0, from);
  const end = Math.min(values.length, to);
  let count = 0;
  let p = start;
  for (; p < end && p % blockSize !== 0; p++) if (values[p] >= threshold) count++;
  for (; p + blockSize <= end; p += blockSize) {
    let lo = p;
    let hi = p + blockSize;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (sorted[mid] >= threshold) lo = mid + 1;
      else hi = mid;
    }
    count += lo - p;
  }
  for (; p < end; p++) if (values[p] >= threshold) count++;
  return count;
}
