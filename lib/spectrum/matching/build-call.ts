// One species' call: its verdict from the score and the strong lines, its evidence and its notes.

import type { ReferenceLine } from "../types";
import { borrowed } from "./borrowed";
import { rationaleOf } from "./rationale-of";
import type { CallContext, SpeciesWork } from "./score-elements-stage-types";
import type {
  ElementCall,
  MissingLineEvidence,
  OverlapEvidence,
  Verdict,
} from "./score-elements-types";
import { tallySeen } from "./tally-seen";
import { andMore, formatNm, plural } from "./rationale-words";

const UBIQUITOUS_NOTE = "Ubiquitous in flames: trace contamination likely; judge by intensity.";

/** The call for `species` from its scored work; null for an unseen species with nothing to report
 * (no strong line in range, or its strong lines all where no peak could show them). */
export function buildCall(
  species: string,
  entry: SpeciesWork,
  context: CallContext,
): ElementCall | null {
  const { info } = entry;
  const { relative } = info.scale;
  const strong = context.strongLineFraction;
  const tally = tallySeen(
    entry.groups,
    context.candidates,
    info.scale.relative,
    context.positionInSpecies,
    strong,
    context.maxSeenListed,
  );
  const seen = tally.listed;
  const { strongInRange } = entry;
  if (tally.count === 0) {
    // Report an unseen species only where it had strong lines to show; keeps the output small.
    if (strongInRange === 0) return null;
    const missing = missingEvidence(
      entry,
      entry.missing.filter((p) => relative[p] >= strong),
      context.lines,
    );
    const count = entry.missingStrongCount;
    // Its strong lines all lie at the array's ends, where no peak could show them: nothing to say.
    if (count === 0 && missing.length === 0) return null;
    return {
      species,
      element: info.lines.element,
      ionStage: info.lines.ionStage,
      verdict: "absent",
      score: 0,
      seen,
      seenCount: 0,
      seenPeaks: 0,
      missing,
      missingCount: entry.missingCount,
      missingStrongCount: count,
      overlaps: [],
      intensityBasis: info.basis,
      notes: context.ubiquitous ? [UBIQUITOUS_NOTE] : [],
      rationale: `No line seen; its strong line${plural(count)} in range (${formatNm(
        missing.map((m) => m.referenceNm),
      )}${andMore(count - missing.length)}) show${count === 1 ? "s" : ""} no peak.`,
    };
  }

  const overlaps: OverlapEvidence[] = [];
  for (const group of entry.groups) {
    const others = context.speciesAtPeak.get(group.peakIndex)!.filter((other) => other !== species);
    if (others.length > 0) {
      overlaps.push({
        peakIndex: group.peakIndex,
        peakWavelengthNm: group.peak.wavelengthNm,
        otherSpecies: others,
      });
    }
  }

  const strongMissing = missingEvidence(
    entry,
    entry.missing.filter((p) => relative[p] >= strong && !entry.hiddenBy.has(p)),
    context.lines,
  );
  const notes: string[] = [];
  for (const p of entry.missing) {
    const hiddenBy = entry.hiddenBy.get(p);
    if (hiddenBy === undefined) continue;
    const hider = context.matchByPeak.get(hiddenBy)!;
    notes.push(
      `${info.lines.nm[p].toFixed(2)} nm may be hidden in the wing of the stronger peak at ${hider.peak.wavelengthNm.toFixed(2)} nm.`,
    );
  }
  let verdict: Verdict;
  if (
    entry.score >= context.presentScore &&
    tally.strongCount > 0 &&
    entry.missingStrongCount === 0
  ) {
    verdict = "present";
  } else if (entry.score >= context.possibleScore) {
    verdict = "possible";
  } else {
    verdict = "absent";
  }

  if (borrowed(info.basis, context.source)) {
    notes.push(
      `No ${context.source} intensities in the table; used ${info.basis} intensities instead.`,
    );
  }
  if (info.basis === "none") {
    notes.push(
      "The table gives no relative intensities for this species: missing lines are not weighed.",
    );
  }
  if (entry.anchor?.peak.saturated) {
    notes.push("Its strongest observed line is saturated: predicted intensities are lower bounds.");
  }
  if (context.ubiquitous) {
    notes.push(UBIQUITOUS_NOTE);
    const strongestHeight = entry.groups.reduce((h, g) => Math.max(h, g.peak.height), -Infinity);
    const share = context.tallestHeight > 0 ? strongestHeight / context.tallestHeight : 1;
    if (verdict === "present" && share < context.traceFraction) {
      verdict = "possible";
      notes.push(
        `Its strongest peak is ${(100 * share).toFixed(1)} % of the tallest peak: treated as a trace, not called present.`,
      );
    }
  }

  return {
    species,
    element: info.lines.element,
    ionStage: info.lines.ionStage,
    verdict,
    score: entry.score,
    seen,
    seenCount: tally.count,
    seenPeaks: entry.groups.length,
    // An absent call lists only its first few (see trimAbsentEvidence); its verdict stands from here.
    missing: missingEvidence(
      entry,
      verdict === "absent" ? entry.missing.slice(0, context.maxListedWhenAbsent) : entry.missing,
      context.lines,
    ),
    missingCount: entry.missingCount,
    missingStrongCount: entry.missingStrongCount,
    overlaps,
    intensityBasis: info.basis,
    notes,
    rationale: rationaleOf(verdict, tally, strongMissing, strongInRange, entry, overlaps),
  };
}

/** The evidence of the missing lines at `positions` of `entry`'s species (see predictMissing). */
function missingEvidence(
  entry: SpeciesWork,
  positions: readonly number[],
  lines: readonly ReferenceLine[],
): MissingLineEvidence[] {
  const { relative } = entry.info.scale;
  const { order, nm } = entry.info.lines;
  const scale = entry.snrPerRelative;
  return positions.map((position) => ({
    lineIndex: order[position],
    line: lines[order[position]],
    referenceNm: nm[position],
    relativeIntensity: relative[position],
    predictedSnr: scale === null ? null : scale * relative[position],
    hiddenByPeakIndex: entry.hiddenBy.get(position) ?? null,
  }));
}
