// Lists the positions in a range whose value reaches a threshold, using a tree from buildMaxTree.

/**
 * Appends to `found`, in ascending order, every position p in [from, to) with value ≥ threshold.
 * Subtrees whose maximum is below the threshold are skipped, so the cost is about
 * (1 + positions found) · log n rather than the length of the range.
 */
export function collectAtLeast(
  maxTree: Float64Array,
  from: number,
  to: number,
  threshold: number,
  found: number[],
): number[] {
  const size = maxTree.length >> 1;
  if (!(from < to) || !(maxTree[1] >= threshold)) return found;
  visit(maxTree, 1, 0, size, from, to, threshold, found);
  return found;
}

function visit(
  tree: Float64Array,
  node: number,
  nodeFrom: number,
  nodeTo: number,
  from: number,
  to: number,
  threshold: number,
  found: number[],
): void {
  if (nodeTo <= from || nodeFrom >= to || !(tree[node] >= threshold)) return;
  if (nodeTo - nodeFrom === 1) {
    found.push(nodeFrom);
    return;
  }
  const middle = (nodeFrom + nodeTo) >>> 1;
  visit(tree, 2 * node, nodeFrom, middle, from, to, threshold, found);
  visit(tree, 2 * node + 1, middle, nodeTo, from, to, threshold, found);
}
