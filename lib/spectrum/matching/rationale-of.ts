// The sentence that sums up a call: lines seen, strong lines missing, peaks shared, and the score.

import type { SeenTally, SpeciesWork } from "./score-elements-stage-types";
import type { MissingLineEvidence, OverlapEvidence, Verdict } from "./score-elements-types";
import { andMore, formatNm, plural } from "./rationale-words";

/** How many shared peaks, and species at each, a call's rationale names (its overlaps keep the credible ones). */
const SHARED_PEAKS_LISTED = 4;
const SHARING_SPECIES_LISTED = 5;

/** The rationale of a call with this verdict, from its seen tally and its missing and shared evidence. */
export function rationaleOf(
  verdict: Verdict,
  tally: SeenTally,
  strongMissing: MissingLineEvidence[],
  strongInRange: number,
  entry: SpeciesWork,
  overlaps: OverlapEvidence[],
): string {
  const { count, listed } = tally;
  const peaks = entry.groups.length;
  // Lines blended into one peak are one piece of evidence: say how many peaks they stand on.
  const atPeaks = peaks < count ? ` at ${peaks} peak${plural(peaks)}` : "";
  const parts: string[] = [];
  parts.push(
    `${count} line${plural(count)} seen${atPeaks} (${formatNm(listed.map((s) => s.referenceNm))}${andMore(count - listed.length)}; within ${tally.worstSigma.toFixed(1)}σ)`,
  );
  if (strongInRange > 0) {
    parts.push(
      `${tally.strongCount} of ${strongInRange} strong line${plural(strongInRange)} in range seen`,
    );
  } else {
    parts.push("its strong lines lie outside the range");
  }
  // strongMissing holds the listed ones; missingStrongCount counts them all.
  const strongCount = entry.missingStrongCount;
  if (strongCount > 0 && strongMissing.every((m) => m.predictedSnr === null)) {
    // No rated line of the species was seen to scale a prediction from: name the lines only.
    parts.push(
      `strong line${plural(strongCount)} missing (${formatNm(strongMissing.map((m) => m.referenceNm))}${andMore(strongCount - strongMissing.length)})`,
    );
  } else if (strongCount > 0) {
    parts.push(
      `strong line${plural(strongCount)} missing though expected at SNR ≈ ${strongMissing
        .map((m) => `${Math.round(m.predictedSnr ?? 0)} (${m.referenceNm.toFixed(2)} nm)`)
        .join(", ")}${andMore(strongCount - strongMissing.length)}`,
    );
  }
  // Every hidden line is listed; the rest of the missing lines are strong or weaker.
  const hiddenCount = entry.hiddenBy.size;
  const weakMissing = entry.missingCount - hiddenCount - strongCount;
  if (weakMissing > 0)
    parts.push(`${weakMissing} weaker expected line${plural(weakMissing)} missing`);
  if (overlaps.length > 0) {
    // Capped both ways: against a dense table every species shares every peak with every other,
    // and an uncapped sentence grew with the square of the species called (megabytes per run).
    const listed = overlaps.slice(0, SHARED_PEAKS_LISTED).map((o) => {
      const named = o.otherSpecies.slice(0, SHARING_SPECIES_LISTED).join(", ");
      return `${o.peakWavelengthNm.toFixed(2)} nm with ${named}${andMore(o.otherSpecies.length - SHARING_SPECIES_LISTED)}`;
    });
    const morePeaks = overlaps.length - SHARED_PEAKS_LISTED;
    parts.push(
      `shares ${listed.join("; ")}${morePeaks > 0 ? `; and ${morePeaks} more peak${plural(morePeaks)}` : ""}`,
    );
  }
  const lead =
    verdict === "present"
      ? "Present"
      : verdict === "possible"
        ? "Possible"
        : "Absent (contradicted)";
  return `${lead}: ${parts.join("; ")}. Score ${entry.score.toFixed(2)}.`;
}
