// The drift most candidate pairs of a recalibration agree on tightly, found from every two of them.
import { onDrift } from "./on-drift";
import { CONSENSUS_REACH } from "./recalibration-limits";
import type { Candidate } from "./recalibration-types";

/** Candidate pairs the consensus search draws its pairs of pairs from (heaviest first). */
const MAX_CANDIDATES = 160;

/**
 * The drift most candidates agree on tightly: every two candidates of different lines fix one, scored
 * by the weights of the lines with a candidate within the consensus reach; `accept` may refuse drifts.
 */
export function driftConsensus(
  candidates: Candidate[],
  tolerance: number,
  maxStretch: number,
  accept: (at: (u: number) => number) => boolean = () => true,
): { score: number; at: (u: number) => number } | null {
  const drawn = candidates
    .slice()
    .sort((a, b) => b.weight - a.weight)
    .slice(0, MAX_CANDIDATES);
  const reach = CONSENSUS_REACH * tolerance;
  let best: { score: number; at: (u: number) => number } | null = null;
  for (let i = 0; i < drawn.length; i++) {
    for (let j = i + 1; j < drawn.length; j++) {
      const [p, q] = [drawn[i], drawn[j]];
      if (p.pair.lineIndex === q.pair.lineIndex || p.pair.peakIndex === q.pair.peakIndex) continue;
      const stretch = (q.pair.x - p.pair.x) / (q.u - p.u);
      if (!(Math.abs(stretch - 1) <= 1.5 * maxStretch)) continue;
      // The two candidates' line, refitted to the lines it gathers, is scored by how tightly they sit:
      // two near-equal sets of lines (the right drift, and one tilted to take in a few pulled peaks)
      // differ in how close their lines land, not in how many they gather (measured on the re-recorded
      // sweep, seeds 50000, 90000, 100000: 4 silent wrongs of 600 became 2, success +0.5–1.7 points).
      let at = (u: number) => p.pair.x + stretch * (u - p.u);
      let kept = onDrift(candidates, at, reach);
      const refitted = kept.length >= 3 ? plainLine(kept) : null;
      if (refitted && Math.abs(refitted.stretch - 1) <= 1.5 * maxStretch) {
        at = refitted.at;
        kept = onDrift(candidates, at, reach);
      }
      const score = tightScore(kept, at, reach);
      if ((!best || score > best.score) && accept(at)) best = { score, at };
    }
  }
  return best;
}

/**
 * The consensus's score of the candidates a drift keeps: each line's weight, less the more it misses
 * the drift `at`, nothing from `reach` on.
 */
export function tightScore(
  kept: readonly Candidate[],
  at: (u: number) => number,
  reach: number,
): number {
  return kept.reduce(
    (sum, c) => sum + c.weight * Math.max(0, 1 - ((c.pair.x - at(c.u)) / reach) ** 2),
    0,
  );
}

/** x = x̄ + stretch·(u − ū) by ordinary least squares (the consensus's quick refit); null when u does not vary. */
function plainLine(pairs: Candidate[]): { stretch: number; at: (u: number) => number } | null {
  const n = pairs.length;
  const uMean = pairs.reduce((sum, c) => sum + c.u, 0) / n;
  const xMean = pairs.reduce((sum, c) => sum + c.pair.x, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (const c of pairs) {
    sxy += (c.u - uMean) * (c.pair.x - xMean);
    sxx += (c.u - uMean) ** 2;
  }
  if (!(sxx > 0)) return null;
  const stretch = sxy / sxx;
  return { stretch, at: (u) => xMean + stretch * (u - uMean) };
}
