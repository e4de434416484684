// One call from calibrated peaks to element calls: matching, scoring and unexplained peaks.

import type { CalibratedPeak, ReferenceLine } from "../types";
import {
  matchPeaksToLines,
  type MatchPeaksToLinesOptions,
  type PeakMatch,
} from "./match-peaks-to-lines";
import { prepareLineIndex, type LineIndex } from "./prepare-line-index";
import { scoreElements } from "./score-elements";
import type { ElementScoring, ScoreElementsOptions } from "./score-elements-types";

export type IdentifyElementsOptions = MatchPeaksToLinesOptions & ScoreElementsOptions;

export interface ElementIdentification extends ElementScoring {
  /** Every peak with its candidate lines, in input order. */
  matches: PeakMatch[];
}

/**
 * Matches the peaks against the table and scores the species; pass a prepared LineIndex to
 * reuse one sorted table across analyses.
 */
export function identifyElements(
  peaks: readonly CalibratedPeak[],
  lines: readonly ReferenceLine[] | LineIndex,
  options: IdentifyElementsOptions = {},
): ElementIdentification {
  const index = Array.isArray(lines)
    ? prepareLineIndex(lines as readonly ReferenceLine[], { medium: options.medium ?? "air" })
    : (lines as LineIndex);
  const matches = matchPeaksToLines(peaks, index, options);
  return { matches, ...scoreElements(matches, index, options) };
}
