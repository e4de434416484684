// The coarse search of a recalibration: the drift of the previous calibration that puts the most (and
// strongest) lamp lines on peaks, over a grid of shifts and stretches, and the strongest rivals to it.
import { lowerBound } from "../matching/lower-bound";
import type { GridDrift, Predicted } from "./recalibration-types";

/** The drift grid holds at most about this many hypotheses (it is coarsened beyond). */
const MAX_HYPOTHESES = 40_000;
/** Coarse rival drifts that are searched for a tight consensus of their own. */
const COARSE_RIVALS = 4;

interface DriftGridSearchResult {
  /** The best-scoring drift of the grid, with its score. */
  best: GridDrift & { score: number };
  /** The strongest few distinct drifts against the best, scored only by the lines they pair differently. */
  coarseRivals: GridDrift[];
}

/** Index into sorted `xs` of the value nearest `x` (xs non-empty). */
function nearestIndex(xs: number[], x: number): number {
  const low = lowerBound(xs, x);
  if (low === 0) return 0;
  if (low === xs.length) return xs.length - 1;
  return x - xs[low - 1] <= xs[low] - x ? low - 1 : low;
}

/**
 * The grid's best drift x = middle + (u − middle)·stretch + shift of `predicted` onto the peaks at
 * `sortedX` (shifts up to `maxShiftFraction` of the array, stretches up to `maxStretch`), and its coarse
 * rivals; null when no drift puts any line on a peak.
 */
export function driftGridSearch(
  predicted: Predicted[],
  sortedX: number[],
  [xMin, xMax]: [number, number],
  tolerance: number,
  maxShiftFraction: number,
  maxStretch: number,
): DriftGridSearchResult | null {
  const span = xMax - xMin;
  const middle = 0.5 * (xMin + xMax);
  // The grid: steps of half a tolerance in shift and in stretch at the array's ends, coarsened (with a
  // window to match) when the array is so many tolerances long that the grid would be huge.
  const maxShift = maxShiftFraction * span;
  let shiftStep = 0.5 * tolerance;
  let stretchStep = (0.5 * tolerance) / (0.5 * span);
  const count = () =>
    (2 * Math.ceil(maxShift / shiftStep) + 1) * (2 * Math.ceil(maxStretch / stretchStep) + 1);
  while (count() > MAX_HYPOTHESES) {
    shiftStep *= 1.25;
    stretchStep *= 1.25;
  }
  const window = Math.max(tolerance, shiftStep);
  // A hypothesis scores the lines it puts on a peak, each by its weight and how close it lands; with
  // `unlike`, only lines it puts on another peak than the best hypothesis does (a rival's own evidence).
  const scoreOf = (stretch: number, shift: number, unlike?: Int32Array): number => {
    let score = 0;
    predicted.forEach(({ u, weight }, i) => {
      const x = middle + (u - middle) * stretch + shift;
      if (x < xMin || x > xMax) return;
      const k = nearestIndex(sortedX, x);
      const distance = Math.abs(sortedX[k] - x);
      if (distance <= window && unlike?.[i] !== k) score += weight * (1 - (distance / window) ** 2);
    });
    return score;
  };
  const grid: GridDrift[] = [];
  const shiftSteps = Math.ceil(maxShift / shiftStep);
  const stretchSteps = Math.ceil(maxStretch / stretchStep);
  for (let i = -stretchSteps; i <= stretchSteps; i++) {
    for (let j = -shiftSteps; j <= shiftSteps; j++)
      grid.push({ stretch: 1 + i * stretchStep, shift: j * shiftStep });
  }
  const scores = grid.map((h) => scoreOf(h.stretch, h.shift));
  const bestAt = scores.reduce((b, v, i) => (v > scores[b] ? i : b), 0);
  const best = { ...grid[bestAt], score: scores[bestAt] };
  if (!(best.score > 0)) return null;
  // The peak each line lands on under the best hypothesis (−1: none).
  const bestPeakOf = Int32Array.from(predicted, ({ u }) => {
    const x = middle + (u - middle) * best.stretch + best.shift;
    const k = nearestIndex(sortedX, x);
    return x >= xMin && x <= xMax && Math.abs(sortedX[k] - x) <= window ? k : -1;
  });
  // A rival moves some part of the array by more than two tolerances against the best, and is scored
  // only by the lines it pairs differently.
  const farApart = (a: GridDrift, b: GridDrift) =>
    [xMin, xMax].some(
      (x) => Math.abs(a.shift - b.shift + (a.stretch - b.stretch) * (x - middle)) > 2 * tolerance,
    );
  const differs = (h: GridDrift) => farApart(h, best);
  // The strongest few distinct drifts against the best (each moves the array by more than two
  // tolerances against the best and against each other) are the coarse rivals.
  const rivalScores = grid.map((h) => (differs(h) ? scoreOf(h.stretch, h.shift, bestPeakOf) : 0));
  const coarseRivals: GridDrift[] = [];
  for (const at of rivalScores.map((_, i) => i).sort((a, b) => rivalScores[b] - rivalScores[a])) {
    if (coarseRivals.length >= COARSE_RIVALS || !(rivalScores[at] > 0)) break;
    if (coarseRivals.every((o) => farApart(grid[at], o))) coarseRivals.push(grid[at]);
  }
  return { best, coarseRivals };
}
