// Counts a species' lines in a range whose relative intensity reaches a threshold, in constant time
// once the table's prefix counts for that threshold exist.

import type { SpeciesBasis } from "./prepare-line-index";

/** Prefix counts depend on the table and the threshold only; a few thresholds are kept per basis. */
const KEPT_THRESHOLDS = 4;
const cache = new WeakMap<SpeciesBasis, Map<number, Uint32Array>>();

/**
 * Number of positions p in [from, to) with (relative[p], or 0 when unrated) ≥ threshold. The
 * first call for a threshold builds prefix counts over the species (O(n)); later calls are O(1).
 */
export function countAtLeast(
  basis: SpeciesBasis,
  from: number,
  to: number,
  threshold: number,
): number {
  if (!(from < to)) return 0;
  let byThreshold = cache.get(basis);
  if (!byThreshold) {
    byThreshold = new Map();
    cache.set(basis, byThreshold);
  }
  let prefix = byThreshold.get(threshold);
  if (!prefix) {
    prefix = new Uint32Array(basis.relative.length + 1);
    for (let p = 0; p < basis.relative.length; p++) {
      const value = Number.isNaN(basis.relative[p]) ? 0 : basis.relative[p];
      prefix[p + 1] = prefix[p] + (value >= threshold ? 1 : 0);
    }
    if (byThreshold.size >= KEPT_THRESHOLDS) {
      byThreshold.delete(byThreshold.keys().next().value!);
    }
    byThreshold.set(threshold, prefix);
  }
  return prefix[to] - prefix[from];
}
