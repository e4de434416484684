// Builds a range-maximum tree over per-line values, so the lines above a threshold in a range can
// be listed without visiting the others.

/**
 * A complete binary tree in one array: leaves at [size, size + n) hold `values` (NaN, "no value",
 * becomes −∞), padding leaves are −∞, and node j holds the larger of nodes 2j and 2j + 1; size is
 * the smallest power of two ≥ n (at least 1). The input is not changed.
 */
export function buildMaxTree(values: Float64Array): Float64Array {
  let size = 1;
  while (size < values.length) size *= 2;
  const tree = new Float64Array(2 * size).fill(-Infinity);
  for (let i = 0; i < values.length; i++) {
    if (!Number.isNaN(values[i])) tree[size + i] = values[i];
  }
  for (let node = size - 1; node >= 1; node--) {
    tree[node] = Math.max(tree[2 * node], tree[2 * node + 1]);
  }
  return tree;
}
