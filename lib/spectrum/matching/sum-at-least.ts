// Sums the values of a range of lines that reach a threshold, using blocks from buildSortedBlocks.

import type { SortedBlocks } from "./build-sorted-blocks";

/**
 * Σ values[p] over p in [from, to) with values[p] ≥ threshold (NaN never counts): the partial
 * blocks at the ends are scanned, each whole block gives its share by one binary search. The terms
 * are added block by block, so the last bits may differ from a sum in position order.
 */
export function sumAtLeast(
  blocks: SortedBlocks,
  from: number,
  to: number,
  threshold: number,
): number {
  const { values, blockSize, sorted, prefixSum } = blocks;
  const start = Math.max(0, from);
  const end = Math.min(values.length, to);
  let sum = 0;
  let p = start;
  for (; p < end && p % blockSize !== 0; p++) if (values[p] >= threshold) sum += values[p];
  for (; p + blockSize <= end; p += blockSize) {
    const reached = reachedInBlock(sorted, p, p + blockSize, threshold);
    if (reached > 0) sum += prefixSum[p + reached - 1];
  }
  for (; p < end; p++) if (values[p] >= threshold) sum += values[p];
  return sum;
}

/** How many of the block's values (largest first, NaN last) at [start, end) reach the threshold. */
function reachedInBlock(sorted: Float64Array, start: number, end: number, threshold: number) {
  let lo = start;
  let hi = end;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] >= threshold) lo = mid + 1;
    else hi = mid;
  }
  return lo - start;
}
