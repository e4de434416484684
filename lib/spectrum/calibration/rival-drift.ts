// The strongest rival of a recalibration's drift: another drift of the previous calibration on which
// lamp lines agree as tightly, each on another peak than the chosen drift gives it.
import { candidatesNear } from "./candidates-near";
import { dailyDriftShare } from "./daily-drift-share";
import { driftConsensus } from "./drift-consensus";
import type { LampPair } from "./lamp-pairing-types";
import { onDrift } from "./on-drift";
import type { PairingContext } from "./pairing-context";
import { CONSENSUS_REACH } from "./recalibration-limits";
import type { DriftFit, GridDrift, Predicted } from "./recalibration-types";

/**
 * The best tight consensus near any of `coarseRivals` that moves some end of the array by more than two
 * tolerances against `fitted`'s drift, counting only pairs `fitted` does not hold: its score and pairs
 * (score 0 and no pairs when there is none). Against a day's drift, one beyond a day's counts only
 * when it scores higher.
 */
export function rivalDrift(
  context: PairingContext,
  predicted: Predicted[],
  sortedX: number[],
  order: number[],
  tolerance: number,
  coarseRivals: readonly GridDrift[],
  fitted: DriftFit,
  maxStretch: number,
): { score: number; pairs: LampPair[] } {
  const [xMin, xMax] = context.domain;
  const middle = 0.5 * (xMin + xMax);
  const { drift, pairs } = fitted;
  // A rival counts only the lines it puts tightly on other peaks, as the chosen drift's do.
  const chosen = new Set(pairs.map((p) => `${p.lineIndex}:${p.peakIndex}`));
  const departs = (at: (u: number) => number) =>
    [xMin, xMax].some((x) => Math.abs(at((x - drift.offset) / drift.stretch) - x) > 2 * tolerance);
  // Against a day's drift, a drift beyond a day's (a realignment since the previous calibration, the
  // rarer event) is a rival only when its lines outscore the chosen drift's, each scored as the
  // consensus scores them (by weight and how tightly it sits); another day's drift is one as before.
  // On the re-recorded sweep (seeds 15400000, 16300000 and 17700000, n 200 each) the rivals that held
  // right daily recalibrations back moved the array by 12–60 px against 1–3 px.
  const isDaily = (at: (u: number) => number) =>
    dailyDriftShare({ stretch: at(1) - at(0), offset: at(0) }, context.domain) <= 1;
  const chosenIsDaily = dailyDriftShare(drift, context.domain) <= 1;
  const chosenScore = chosenIsDaily ? fitted.tightScore : Infinity;
  let rival: { score: number; pairs: LampPair[] } = { score: 0, pairs: [] };
  for (const h of coarseRivals) {
    const near = candidatesNear(
      context,
      predicted,
      sortedX,
      order,
      tolerance,
      (u) => middle + (u - middle) * h.stretch + h.shift,
    ).filter((c) => !chosen.has(`${c.pair.lineIndex}:${c.pair.peakIndex}`));
    let found = driftConsensus(near, tolerance, maxStretch, departs);
    if (found && chosenIsDaily && !isDaily(found.at) && found.score <= chosenScore)
      found = driftConsensus(near, tolerance, maxStretch, (at) => departs(at) && isDaily(at));
    if (found && found.score > rival.score) {
      rival = {
        score: found.score,
        pairs: onDrift(near, found.at, CONSENSUS_REACH * tolerance).map((c) => c.pair),
      };
    }
  }
  return rival;
}
