// Scores each species, sharing the credit of a peak that several species claim.

import { EXPLAINING_SHARE } from "./explaining-share";
import type { SeenGroup, SpeciesWork } from "./score-elements-stage-types";

const CREDIT_FLOOR = 0.01;

/**
 * First pass with every peak fully credited. Then a peak claimed by several species is shared in
 * proportion to what each is expected to contribute there, capped at what was observed, times its
 * first-pass support, so a weak line of a well-supported species cannot take the peak of another
 * species' strongest line. The expected contribution scales from the species' strongest observed
 * line, but no further than its missing lines allow: had it been brighter, its strongest missing
 * line would have reached missingSnr and been seen. Without that cap a species anchored on another
 * species' peak (a lamp gas on the K I doublet) expects the whole peak by construction, however many
 * of its own strong lines are absent. Sets each entry's score and heldPeaks.
 */
export function sharePeakCredit(
  work: Map<string, SpeciesWork>,
  groupsByPeak: Map<number, Map<string, SeenGroup>>,
  missingSnr: number,
): void {
  const claimOf = (entry: SpeciesWork, group: SeenGroup): number => {
    const { anchor } = entry;
    if (!anchor || group.ratedWeight === 0 || group.snr <= 0) return CREDIT_FLOOR;
    let scale = anchor.snr / anchor.ratedWeight;
    if (entry.strongestMissingRelative > 0) {
      scale = Math.min(scale, missingSnr / entry.strongestMissingRelative);
    }
    return Math.max(CREDIT_FLOOR, Math.min(1, (scale * group.ratedWeight) / group.snr));
  };
  const scoreRound = (credit: (species: string, group: SeenGroup) => number) => {
    const next = new Map<string, number>();
    for (const [species, entry] of work) {
      let earned = 0;
      let expected = entry.missingWeight;
      for (const group of entry.groups) {
        earned += group.weight * group.quality * credit(species, group);
        expected += group.weight;
      }
      next.set(species, expected > 0 ? earned / expected : 0);
    }
    return next;
  };
  const firstPass = scoreRound(() => 1);
  const weightOf = (name: string, claimantGroup: SeenGroup) =>
    claimOf(work.get(name)!, claimantGroup) * Math.max(CREDIT_FLOOR, firstPass.get(name)!);
  // Each shared peak's total claim is summed once, in the order its claimants were grouped.
  const totalClaim = new Map<number, number>();
  const share = (species: string, group: SeenGroup): number => {
    const claimants = groupsByPeak.get(group.peakIndex)!;
    if (claimants.size === 1) return 1;
    let total = totalClaim.get(group.peakIndex);
    if (total === undefined) {
      total = 0;
      for (const [name, claimantGroup] of claimants) total += weightOf(name, claimantGroup);
      totalClaim.set(group.peakIndex, total);
    }
    return weightOf(species, group) / total;
  };
  for (const [species, score] of scoreRound(share)) work.get(species)!.score = score;
  // The peaks a species could have made a fair share of: evidence of its own. A sliver of another
  // species' peak is no second line seen.
  for (const [species, entry] of work) {
    entry.heldPeaks = entry.groups
      .filter((group) => share(species, group) >= EXPLAINING_SHARE)
      .map((group) => group.peakIndex);
  }
}
