// Visits the positions of a range strongest first, using a tree from buildMaxTree, so the few
// strongest lines of a long range are found without visiting the rest.

/**
 * Calls `visit(position)` for each position p in [from, to) with value ≥ threshold, by value
 * descending and, among equal values, by position ascending, until `visit` returns false. A
 * priority queue of tree nodes keyed by their maximum is expanded best-first, so visiting N
 * positions costs about N · log n. Nodes are disjoint intervals, so on equal keys the one that
 * starts first holds the earlier positions.
 */
export function walkStrongestFirst(
  maxTree: Float64Array,
  from: number,
  to: number,
  threshold: number,
  visit: (position: number) => boolean,
): void {
  const size = maxTree.length >> 1;
  if (!(from < to) || !(maxTree[1] >= threshold)) return;
  const heap: number[] = [1];
  const startOf = (node: number) => {
    const level = 31 - Math.clz32(node);
    return (node - (1 << level)) * (size >>> level);
  };
  // a comes out before b.
  const before = (a: number, b: number) =>
    maxTree[a] > maxTree[b] || (maxTree[a] === maxTree[b] && startOf(a) < startOf(b));
  const push = (node: number) => {
    heap.push(node);
    let i = heap.length - 1;
    while (i > 0) {
      const parent = (i - 1) >> 1;
      if (!before(heap[i], heap[parent])) break;
      const held = heap[i];
      heap[i] = heap[parent];
      heap[parent] = held;
      i = parent;
    }
  };
  const pop = (): number => {
    const top = heap[0];
    const last = heap.pop()!;
    if (heap.length > 0) {
      heap[0] = last;
      let i = 0;
      for (;;) {
        const left = 2 * i + 1;
        const right = left + 1;
        let best = i;
        if (left < heap.length && before(heap[left], heap[best])) best = left;
        if (right < heap.length && before(heap[right], heap[best])) best = right;
        if (best === i) break;
        const held = heap[i];
        heap[i] = heap[best];
        heap[best] = held;
        i = best;
      }
    }
    return top;
  };
  while (heap.length > 0) {
    const node = pop();
    if (node >= size) {
      if (!visit(node - size)) return;
      continue;
    }
    // A child straddling the range's ends keeps its maximum as the key: an upper bound of what it
    // holds inside the range, which keeps the order right (it is only split sooner).
    const width = size >>> (31 - Math.clz32(node) + 1);
    for (let child = 2 * node; child <= 2 * node + 1; child++) {
      const childFrom = startOf(child);
      if (childFrom >= to || childFrom + width <= from || !(maxTree[child] >= threshold)) continue;
      push(child);
    }
  }
}
