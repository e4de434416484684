// Calls weighed on another source's intensities stay possible at most.

import type { SourceKind } from "../types";
import { borrowed } from "./borrowed";
import { demoteToPossible } from "./demote-to-possible";
import type { ElementCall } from "./score-elements-types";

/**
 * A species the table rates only for other kinds of source is "possible" at most: the curated table
 * does not list it as seen in this one, so a peak of it here is more likely another species' line or a
 * contaminant's than a line the source excites (nitrogen, oxygen and the noble gases, weighed on arc
 * intensities, were called present in flames on the sample sweep; docs/identification-scoring.md §7).
 */
export function capBorrowedCalls(calls: ElementCall[], source: SourceKind): void {
  for (const call of calls) {
    if (call.verdict !== "present" || !borrowed(call.intensityBasis, source)) continue;
    demoteToPossible(
      call,
      `The table lists none of its lines for a ${source}: called possible, not present.`,
      `The table does not list it for a ${source}.`,
    );
  }
}
