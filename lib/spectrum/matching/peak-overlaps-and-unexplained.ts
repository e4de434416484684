// The peaks several credible species share, and the peaks no credible species explains.

import type { PeakMatch } from "./match-peaks-to-lines";
import type { PeakOverlap, UnexplainedPeak, Verdict } from "./score-elements-types";

/** Per peak, in the order of `matches`: an overlap where two or more species called present or
 * possible have a candidate, and an unexplained peak where it has no candidate or none of them is. */
export function peakOverlapsAndUnexplained(
  matches: readonly PeakMatch[],
  speciesAtPeak: ReadonlyMap<number, string[]>,
  verdictOf: ReadonlyMap<string, Verdict>,
): { overlaps: PeakOverlap[]; unexplainedPeaks: UnexplainedPeak[] } {
  const credible = (species: string) => {
    const verdict = verdictOf.get(species);
    return verdict === "present" || verdict === "possible";
  };
  const overlaps: PeakOverlap[] = [];
  const unexplainedPeaks: UnexplainedPeak[] = [];
  for (const match of matches) {
    const credibleHere = speciesAtPeak.get(match.peakIndex)!.filter(credible);
    if (credibleHere.length >= 2) {
      overlaps.push({
        peakIndex: match.peakIndex,
        peakWavelengthNm: match.peak.wavelengthNm,
        species: credibleHere,
      });
    }
    if (match.columns.count === 0) {
      unexplainedPeaks.push({
        peakIndex: match.peakIndex,
        peak: match.peak,
        reason: "no-candidate",
      });
    } else if (credibleHere.length === 0) {
      unexplainedPeaks.push({
        peakIndex: match.peakIndex,
        peak: match.peak,
        reason: "only-absent-species",
      });
    }
  }
  return { overlaps, unexplainedPeaks };
}
