// Weighs the matched lines per species into a present / possible / absent call with its evidence.

import type { CalibratedPeak, ReferenceLine } from "../types";
import { assignLinesToPeaks } from "./assign-lines-to-peaks";
import { buildCall } from "./build-call";
import { capBorrowedCalls } from "./cap-borrowed-calls";
import { demoteSinglePeakCalls } from "./demote-single-peak-calls";
import { dropAbsentFromOverlaps } from "./drop-absent-from-overlaps";
import { groupSeenLines } from "./group-seen-lines";
import { hidingPeaks } from "./hiding-peaks";
import type { PeakMatch } from "./match-peaks-to-lines";
import { peakOverlapsAndUnexplained } from "./peak-overlaps-and-unexplained";
import { predictMissing } from "./predict-missing";
import { prepareLineIndex, type LineIndex } from "./prepare-line-index";
import { resolveScoreElementsOptions } from "./resolve-score-elements-options";
import type {
  ElementCall,
  ElementScoring,
  ScoreElementsOptions,
  Verdict,
} from "./score-elements-types";
import { scoredRangesNm } from "./scored-ranges-nm";
import { setUpSpeciesWork } from "./set-up-species-work";
import { sharePeakCredit } from "./share-peak-credit";
import { trimAbsentEvidence } from "./trim-absent-evidence";

const VERDICT_RANK: Record<Verdict, number> = { present: 0, possible: 1, absent: 2 };

/**
 * Calls each species with lines in range. Seen lines earn credit by relative intensity × match
 * closeness × share of the peak; missing lines that should have been well above the detection
 * limit (scaled from the species' strongest observed line) add to the expected total. The method
 * is laid out in docs/identification-scoring.md.
 */
export function scoreElements(
  matches: readonly PeakMatch[],
  lines: readonly ReferenceLine[] | LineIndex,
  options: ScoreElementsOptions = {},
): ElementScoring {
  const settings = resolveScoreElementsOptions(options);
  const { source, noiseCounts, maxListedWhenAbsent } = settings;
  const index = Array.isArray(lines)
    ? prepareLineIndex(lines as readonly ReferenceLine[])
    : (lines as LineIndex);
  const { rangeNm, judgedRangeNm } = scoredRangesNm(matches, options);
  const snrOf = (peak: CalibratedPeak) => (noiseCounts ? peak.height / noiseCounts : peak.snr);
  const tallestHeight = matches.reduce((h, m) => Math.max(h, m.peak.height), 0);
  const hiding = hidingPeaks(matches, snrOf, settings.hidingFwhmFactor, settings.hidingSnrRatio);
  const missingSnr = settings.detectionLimitSnr * settings.missingSnrFactor;

  const assignment = assignLinesToPeaks(matches, index);
  const { candidates, isMatched } = assignment;
  const seen = groupSeenLines(matches, index, assignment, snrOf);
  const work = setUpSpeciesWork(index, seen, candidates, { ...settings, rangeNm, judgedRangeNm });
  for (const entry of work.values()) {
    predictMissing(entry, candidates, isMatched, index, source, {
      missingSnr,
      strongLineFraction: settings.strongLineFraction,
      maxListed: settings.maxMissingListed,
      hiding,
    });
  }
  sharePeakCredit(work, seen.groupsByPeak, missingSnr);

  const matchByPeak = new Map(matches.map((match) => [match.peakIndex, match]));
  const calls: ElementCall[] = [];
  for (const [species, entry] of work) {
    const call = buildCall(species, entry, {
      strongLineFraction: settings.strongLineFraction,
      presentScore: settings.presentScore,
      possibleScore: settings.possibleScore,
      ubiquitous: settings.ubiquitousSpecies.includes(species),
      source,
      traceFraction: settings.traceFraction,
      tallestHeight,
      matchByPeak,
      speciesAtPeak: seen.speciesAtPeak,
      positionInSpecies: index.positionInSpecies,
      maxSeenListed: settings.maxSeenListed,
      maxListedWhenAbsent,
      candidates,
      lines: index.lines,
    });
    if (call) calls.push(call);
  }
  calls.sort(byStanding);

  const verdictOf = new Map(calls.map((call) => [call.species, call.verdict]));
  dropAbsentFromOverlaps(calls, verdictOf);
  demoteSinglePeakCalls(calls, { matchByPeak, work, index, isMatched, hiding, missingSnr, source });
  capBorrowedCalls(calls, source);
  calls.sort(byStanding);

  const { overlaps, unexplainedPeaks } = peakOverlapsAndUnexplained(
    matches,
    seen.speciesAtPeak,
    verdictOf,
  );
  for (const call of calls) {
    if (call.verdict === "absent") trimAbsentEvidence(call, maxListedWhenAbsent);
  }
  return { calls, overlaps, unexplainedPeaks };
}

/** Highest score first, then present before possible before absent, then by species. */
function byStanding(a: ElementCall, b: ElementCall): number {
  return (
    b.score - a.score ||
    VERDICT_RANK[a.verdict] - VERDICT_RANK[b.verdict] ||
    (a.species < b.species ? -1 : a.species > b.species ? 1 : 0)
  );
}
