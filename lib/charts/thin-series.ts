// Thins a long series for the browser without losing a peak: beyond MAX_CHART_POINTS the series is cut
// into equal stretches of samples and each keeps its lowest and highest sample, in x order (and the same
// samples of any companion series on that axis). Pure, and in lib/ so services (the upload preview) and
// server components share it; the charts say when what they draw was thinned.

/**
 * Most points a chart is sent. 2,000 stretches keep their lowest and highest sample, which is more
 * stretches than a chart is wide in pixels, so the line looks the same; Plotly draws and hovers over
 * 4,000 points far faster than over a 100,000-point upload. Typical arrays of 2,048 or 3,648 pixels
 * pass unthinned.
 */
export const MAX_CHART_POINTS = 4000;

function assertMaxPoints(maxPoints: number): void {
  if (!Number.isInteger(maxPoints) || maxPoints < 2)
    throw new RangeError(`maxPoints must be an integer of at least 2, got ${maxPoints}.`);
}

/**
 * Indices of the samples to keep, ascending, chosen on `y`: all of them when there are at most
 * `maxPoints`, else each stretch's lowest and highest (never more than `maxPoints`). A NaN sample is
 * kept only when its whole stretch is NaN.
 */
export function thinnedIndices(y: ArrayLike<number>, maxPoints = MAX_CHART_POINTS): number[] {
  assertMaxPoints(maxPoints);
  const n = y.length;
  if (n <= maxPoints) return Array.from({ length: n }, (_, i) => i);
  // ⌈n / bucket⌉ ≤ ⌊maxPoints / 2⌋ stretches of two samples each.
  const bucket = Math.ceil(n / Math.floor(maxPoints / 2));
  const kept: number[] = [];
  for (let start = 0; start < n; start += bucket) {
    const end = Math.min(n, start + bucket);
    let lo = -1;
    let hi = -1;
    for (let i = start; i < end; i++) {
      const value = y[i];
      if (Number.isNaN(value)) continue;
      if (lo < 0 || value < y[lo]) lo = i;
      if (hi < 0 || value > y[hi]) hi = i;
    }
    if (lo < 0) kept.push(start);
    else if (lo === hi) kept.push(lo);
    else kept.push(Math.min(lo, hi), Math.max(lo, hi));
  }
  return kept;
}

export interface ThinnedSeries {
  x: number[];
  y: number[];
  companions: Record<string, number[]>;
  /** How many points the series had before thinning (equal to x.length when nothing was dropped). */
  sourcePoints: number;
}

/** x and y (and any companion series) at the kept indices, as plain arrays for a chart. */
export function thinSeries(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  companions: Record<string, ArrayLike<number>> = {},
  maxPoints = MAX_CHART_POINTS,
): ThinnedSeries {
  if (x.length !== y.length)
    throw new RangeError(`x and y must have the same length, got ${x.length} and ${y.length}.`);
  for (const [name, values] of Object.entries(companions))
    if (values.length !== y.length)
      throw new RangeError(
        `The companion series ${name} must have as many points as y (${y.length}), got ${values.length}.`,
      );
  const kept = thinnedIndices(y, maxPoints);
  const out: Record<string, number[]> = {};
  for (const [name, values] of Object.entries(companions)) out[name] = kept.map((i) => values[i]);
  return {
    x: kept.map((i) => x[i]),
    y: kept.map((i) => y[i]),
    companions: out,
    sourcePoints: y.length,
  };
}
