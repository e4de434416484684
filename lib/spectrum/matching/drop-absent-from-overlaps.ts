// Keeps out of each call's overlaps the species called absent: they share no peak worth naming.

import type { ElementCall, Verdict } from "./score-elements-types";

/** Removes the species `verdictOf` calls absent from each call's overlaps, then the overlaps left
 * with no other species; a species without a call stays. */
export function dropAbsentFromOverlaps(
  calls: readonly ElementCall[],
  verdictOf: ReadonlyMap<string, Verdict>,
): void {
  for (const call of calls) {
    for (const overlap of call.overlaps) {
      overlap.otherSpecies = overlap.otherSpecies.filter(
        (other) => verdictOf.get(other) !== "absent",
      );
    }
    call.overlaps = call.overlaps.filter((overlap) => overlap.otherSpecies.length > 0);
  }
}
