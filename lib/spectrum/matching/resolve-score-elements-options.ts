// scoreElements' options with their defaults, each checked on entry with a RangeError that names it.

import type { ScoreElementsOptions } from "./score-elements-types";
import type { ScoreSettings } from "./score-elements-stage-types";
import { assertFraction } from "../units/assert-fraction";
import { assertPositiveFinite } from "../units/assert-positive-finite";

/** The options with their defaults filled in; throws on one out of its range (the ranges in nm are
 * resolved and checked by scoredRangesNm). */
export function resolveScoreElementsOptions(options: ScoreElementsOptions): ScoreSettings {
  const {
    source = "flame",
    detectionLimitSnr = 3,
    noiseCounts,
    missingSnrFactor = 2,
    strongLineFraction = 0.3,
    presentScore = 0.5,
    possibleScore = 0.2,
    unratedLineWeight = 0.1,
    ubiquitousSpecies = source === "flame" ? ["Na I"] : [],
    traceFraction = 0.1,
    hidingFwhmFactor = 1.5,
    hidingSnrRatio = 3,
    maxMissingListed = 25,
    maxSeenListed = 25,
    maxListedWhenAbsent = 5,
  } = options;
  assertPositiveFinite(detectionLimitSnr, "detectionLimitSnr");
  if (noiseCounts !== undefined) assertPositiveFinite(noiseCounts, "noiseCounts");
  assertPositiveFinite(missingSnrFactor, "missingSnrFactor");
  assertFraction(strongLineFraction, "strongLineFraction");
  assertFraction(presentScore, "presentScore");
  assertFraction(possibleScore, "possibleScore");
  assertFraction(unratedLineWeight, "unratedLineWeight");
  assertFraction(traceFraction, "traceFraction");
  assertPositiveFinite(hidingFwhmFactor, "hidingFwhmFactor");
  assertPositiveFinite(hidingSnrRatio, "hidingSnrRatio");
  if (!Number.isInteger(maxMissingListed) || maxMissingListed < 0) {
    throw new RangeError(`maxMissingListed must be an integer ≥ 0, got ${maxMissingListed}`);
  }
  if (!Number.isInteger(maxSeenListed) || maxSeenListed < 0) {
    throw new RangeError(`maxSeenListed must be an integer ≥ 0, got ${maxSeenListed}`);
  }
  if (!Number.isInteger(maxListedWhenAbsent) || maxListedWhenAbsent < 0) {
    throw new RangeError(`maxListedWhenAbsent must be an integer ≥ 0, got ${maxListedWhenAbsent}`);
  }
  if (possibleScore > presentScore) {
    throw new RangeError(
      `possibleScore (${possibleScore}) must not exceed presentScore (${presentScore})`,
    );
  }
  return {
    source,
    detectionLimitSnr,
    noiseCounts,
    missingSnrFactor,
    strongLineFraction,
    presentScore,
    possibleScore,
    unratedLineWeight,
    ubiquitousSpecies,
    traceFraction,
    hidingFwhmFactor,
    hidingSnrRatio,
    maxMissingListed,
    maxSeenListed,
    maxListedWhenAbsent,
  };
}
