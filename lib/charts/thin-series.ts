// Thins a long series for the browser without losing a peak: beyond MAX_CHART_POINTS each bucket keeps
// its lowest and highest sample (and the same samples of any companion series on that axis). Pure, and
// in lib/ so services (the upload preview) and server components share it.

/** Most points a chart is sent. */
export const MAX_CHART_POINTS = 8000;

/** Indices of the samples to keep, ascending, chosen on `y`. */
export function thinnedIndices(y: ArrayLike<number>, maxPoints = MAX_CHART_POINTS): number[] {
  const n = y.length;
  if (n <= maxPoints) return Array.from({ length: n }, (_, i) => i);
  const bucket = Math.ceil((2 * n) / maxPoints);
  const kept: number[] = [];
  for (let start = 0; start < n; start += bucket) {
    let lo = start;
    let hi = start;
    for (let i = start; i < Math.min(n, start + bucket); i++) {
      if (y[i] < y[lo]) lo = i;
      if (y[i] > y[hi]) hi = i;
    }
    if (lo === hi) kept.push(lo);
    else kept.push(Math.min(lo, hi), Math.max(lo, hi));
  }
  return kept;
}

/** x and y (and any companion series) at the kept indices, as plain arrays for a chart. */
export function thinSeries(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  companions: Record<string, ArrayLike<number>> = {},
  maxPoints = MAX_CHART_POINTS,
): { x: number[]; y: number[]; companions: Record<string, number[]> } {
  const kept = thinnedIndices(y, maxPoints);
  const out: Record<string, number[]> = {};
  for (const [name, values] of Object.entries(companions)) out[name] = kept.map((i) => values[i]);
  return { x: kept.map((i) => x[i]), y: kept.map((i) => y[i]), companions: out };
}
