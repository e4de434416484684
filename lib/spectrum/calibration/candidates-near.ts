// The candidate pairs of a drift: every peak near where the drift puts each lamp line.
import type { LampPair } from "./lamp-pairing-types";
import { positionsWithin } from "../matching/lower-bound";
import type { PairingContext } from "./pairing-context";
import { ON_DRIFT_MAX, ON_DRIFT_MIN } from "./recalibration-limits";
import type { Candidate, Predicted } from "./recalibration-types";
import { toLampPair } from "./to-lamp-pair";

/** Every peak within a tolerance of where `start` puts each line, as a candidate pair. */
export function candidatesNear(
  context: PairingContext,
  predicted: Predicted[],
  sortedX: number[],
  order: number[],
  tolerance: number,
  start: (u: number) => number,
): Candidate[] {
  const candidates: Candidate[] = [];
  for (const line of predicted) {
    const x = start(line.u);
    const [first, end] = positionsWithin(sortedX, x - tolerance, x + tolerance);
    for (let k = first; k < end; k++) {
      const pair = pairOf(context, order[k], line);
      const sigma = pair.xUncertainty ?? 0;
      const reach = Math.min(
        ON_DRIFT_MAX * tolerance,
        Math.max(ON_DRIFT_MIN * tolerance, 2.5 * sigma),
      );
      candidates.push({ pair, u: line.u, weight: line.weight, reach });
    }
  }
  return candidates;
}

/** The pair of one peak and one predicted line, with a blend group's top's σ in its x σ. */
function pairOf(context: PairingContext, peak: number, line: Predicted): LampPair {
  const pair = toLampPair(context, peak, line.line);
  return line.sigmaX > 0
    ? { ...pair, xUncertainty: Math.hypot(pair.xUncertainty ?? 0, line.sigmaX) }
    : pair;
}
