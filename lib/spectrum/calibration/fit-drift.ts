// The refined drift of a recalibration: the tight consensus of the lamp lines near the coarse drift,
// refitted by weighted least squares until its pairs settle.
import { candidatesNear } from "./candidates-near";
import { driftBend } from "./drift-bend";
import { driftConsensus, tightScore } from "./drift-consensus";
import type { LampPair } from "./lamp-pairing-types";
import { onDrift } from "./on-drift";
import type { PairingContext } from "./pairing-context";
import { CONSENSUS_REACH } from "./recalibration-limits";
import type { DriftFit, Predicted, StraightFit } from "./recalibration-types";
import { straightFit } from "./straight-fit";

/**
 * The drift most lamp lines agree on: each peak within a tolerance of where the coarse drift puts a
 * line is a candidate pair; every two candidates of different lines fix a drift, and the one on which
 * the most (and strongest) lines find a pair within a small reach wins. A dense lamp puts unlisted
 * lines next to listed ones, so the nearest peak is often not the line's own, and half the pairs may be
 * pulled: only a consensus that asks for tight agreement separates them. The winner is refitted by
 * weighted least squares on its pairs until they settle.
 */
export function fitDrift(
  context: PairingContext,
  predicted: Predicted[],
  sortedX: number[],
  order: number[],
  tolerance: number,
  start: (u: number) => number,
  maxStretch: number,
): DriftFit | null {
  const candidates = candidatesNear(context, predicted, sortedX, order, tolerance, start);
  const best = driftConsensus(candidates, tolerance, maxStretch);
  if (!best) return null;
  let kept = onDrift(candidates, best.at);
  let line: StraightFit | null = null;
  let settled = false;
  for (let round = 0; round < 4 && !settled; round++) {
    line = straightFit(kept, tolerance);
    if (!line) return null;
    const next = onDrift(candidates, line.at);
    if (next.length < 2) return null;
    settled = next.length === kept.length && next.every((c, i) => c === kept[i]);
    kept = next;
  }
  // Pairs that settled were just fitted (the same pairs, in the same order); the last round's were not.
  if (!settled) line = straightFit(kept, tolerance);
  if (!line) return null;
  const keptLines = new Set(kept.map((c) => c.pair.lineIndex));
  // The lines that found no pair on the drift, with the peak nearest their place: set aside, shown.
  const rejected: LampPair[] = [];
  for (const l of new Set(candidates.map((c) => c.pair.lineIndex))) {
    if (keptLines.has(l)) continue;
    const own = candidates.filter((c) => c.pair.lineIndex === l);
    const nearest = own.reduce((a, b) =>
      Math.abs(b.pair.x - line!.at(b.u)) < Math.abs(a.pair.x - line!.at(a.u)) ? b : a,
    );
    rejected.push(nearest.pair);
  }
  const byX = kept.slice().sort((a, b) => a.pair.x - b.pair.x);
  const { drift } = line;
  return {
    pairs: byX.map((c) => c.pair),
    score: kept.reduce((sum, c) => sum + c.weight, 0),
    tightScore: tightScore(
      byX,
      (u) => drift.stretch * u + drift.offset,
      CONSENSUS_REACH * tolerance,
    ),
    rejected,
    drift,
    scatterX: line.scatter,
    bendX: driftBend(kept, line, context.domain),
  };
}
