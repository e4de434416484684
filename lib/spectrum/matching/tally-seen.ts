// A species' seen lines counted in full, with evidence built for the strongest only.

import type { SeenLineEvidence } from "./score-elements-types";
import type { FlatCandidates, SeenGroup, SeenTally } from "./score-elements-stage-types";

/**
 * Counts every seen line but builds evidence only for the `maxListed` strongest (unrated last;
 * ties to the earlier line), kept by partial selection in a small buffer ordered weakest first,
 * and listed in peak and table order, the order of a call that lists them all.
 */
export function tallySeen(
  groups: readonly SeenGroup[],
  candidates: FlatCandidates,
  relativeInSpecies: Float64Array,
  positionInSpecies: Uint32Array,
  strong: number,
  maxListed: number,
): SeenTally {
  let count = 0;
  let strongCount = 0;
  let worstSigma = -Infinity;
  // Chosen lines as [key, ordinal, group, candidate], the weakest (then the latest) first.
  const chosen: [number, number, SeenGroup, number][] = [];
  for (const group of groups) {
    for (const member of group.members) {
      const ordinal = count++;
      // NaN marks an unrated line: it counts as intensity 0 and is listed after every rated one.
      const relative = relativeInSpecies[positionInSpecies[candidates.lineIndex[member]]];
      if ((Number.isNaN(relative) ? 0 : relative) >= strong) strongCount++;
      worstSigma = Math.max(worstSigma, candidates.absSigma[member]);
      if (maxListed === 0) continue;
      const key = Number.isNaN(relative) ? -1 : relative;
      // A later line displaces a chosen one only when strictly stronger.
      if (chosen.length === maxListed && !(key > chosen[0][0])) continue;
      if (chosen.length === maxListed) chosen.shift();
      let at = 0;
      while (
        at < chosen.length &&
        (chosen[at][0] < key || (chosen[at][0] === key && chosen[at][1] > ordinal))
      )
        at++;
      chosen.splice(at, 0, [key, ordinal, group, member]);
    }
  }
  chosen.sort((a, b) => a[1] - b[1]);
  const listed = chosen.map(([key, , group, member]): SeenLineEvidence => {
    const columns = candidates.columns[candidates.matchOf[member]];
    const at = candidates.at[member];
    const lineIndex = columns.lineIndex[at];
    return {
      lineIndex,
      line: columns.lines[lineIndex],
      peakIndex: group.peakIndex,
      peakWavelengthNm: group.peak.wavelengthNm,
      referenceNm: columns.referenceNm[at],
      deltaNm: columns.deltaNm[at],
      deltaSigma: columns.deltaSigma[at],
      relativeIntensity: key < 0 ? null : key,
      snr: group.snr,
    };
  });
  return { count, strongCount, worstSigma, listed };
}
